// A grower acknowledges and comments on the recommendation of a dig on their farm; the rep serving
// the farm reads the answers (through the API and on the dig page) and may comment but not
// acknowledge; other farms' growers get 404, a supervisor (reads only) 403. Fixture digs on Alder
// Creek Farms (rep1, grower1), removed afterwards with their answers.
import { randomUUID } from "node:crypto";
import type { Kysely } from "kysely";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { Database } from "@/db/schema";
import { DEMO_USERS } from "@/db/seed/demo-users";
import { testEnv } from "../helpers/env";
import { type ApiClient, signedInAs } from "../helpers/session";

const suffix = randomUUID().slice(0, 8);
const RECOMMENDATION = `Side-dress before the first irrigation; recheck the 2x2 band spacing (${suffix}).`;
let db: Kysely<Database>;
const fx = { fieldId: "", digId: "", bareDigId: "" };
const clients: Record<string, ApiClient> = {};
const path = (id = fx.digId) => `/api/dig-sites/${id}/responses`;

interface ResponseView {
  userName: string;
  userRole: string;
  kind: string;
  body: string | null;
}

beforeAll(async () => {
  db = createDb(testEnv.databaseUrl, 2);
  const alder = await db
    .selectFrom("account")
    .select("id")
    .where("name", "=", "Alder Creek Farms")
    .executeTakeFirstOrThrow();
  const rep1 = await db
    .selectFrom("appUser")
    .select("id")
    .where("email", "=", DEMO_USERS.find((u) => u.key === "rep1")!.email)
    .executeTakeFirstOrThrow();
  fx.fieldId = randomUUID();
  fx.digId = randomUUID();
  fx.bareDigId = randomUUID();
  await db
    .insertInto("field")
    .values({ id: fx.fieldId, accountId: alder.id, name: `Answers ${suffix}` })
    .execute();
  await db
    .insertInto("digSite")
    .values([
      {
        id: fx.digId,
        fieldId: fx.fieldId,
        accountId: alder.id,
        repId: rep1.id,
        dugAt: new Date("2031-05-12T15:00:00Z"),
        recommendation: RECOMMENDATION,
      },
      {
        id: fx.bareDigId,
        fieldId: fx.fieldId,
        accountId: alder.id,
        repId: rep1.id,
        dugAt: new Date("2031-05-13T15:00:00Z"),
      },
    ])
    .execute();
  for (const who of ["grower1", "grower2", "grower3", "rep1", "rep2", "supervisor"]) {
    clients[who] = await signedInAs(who);
  }
});

afterAll(async () => {
  await db.deleteFrom("digSite").where("fieldId", "=", fx.fieldId).execute();
  await db.deleteFrom("field").where("id", "=", fx.fieldId).execute();
  await db.destroy();
});

describe("recommendation responses", () => {
  it("lets the farm's grower acknowledge once and comment", async () => {
    const first = await clients.grower1!.json(path(), "POST", { kind: "acknowledged" });
    expect(first.status).toBe(201);
    const again = await clients.grower1!.json(path(), "POST", { kind: "acknowledged" });
    expect(again.status).toBe(200);
    expect(((await again.json()) as { created: boolean }).created).toBe(false);
    const comment = await clients.grower1!.json(path(), "POST", {
      kind: "comment",
      body: `  Will the side-dress wait for the wind? ${suffix}  `,
    });
    expect(comment.status).toBe(201);
    const rows = await db
      .selectFrom("recommendationResponse")
      .select(["kind", "body"])
      .where("digSiteId", "=", fx.digId)
      .orderBy("createdAt")
      .execute();
    expect(rows).toEqual([
      { kind: "acknowledged", body: null },
      { kind: "comment", body: `Will the side-dress wait for the wind? ${suffix}` },
    ]);
  });

  it("refuses an empty or oversized comment and an acknowledgement without a recommendation", async () => {
    expect((await clients.grower1!.json(path(), "POST", { kind: "comment", body: "   " })).status).toBe(422);
    expect(
      (await clients.grower1!.json(path(), "POST", { kind: "comment", body: "x".repeat(2001) })).status,
    ).toBe(422);
    expect((await clients.grower1!.json(path(), "POST", { kind: "shrug" })).status).toBe(422);
    expect((await clients.grower1!.json(path(fx.bareDigId), "POST", { kind: "acknowledged" })).status).toBe(
      422,
    );
  });

  it("answers 404 to growers of other farms and to ids that are not uuids", async () => {
    for (const who of ["grower2", "grower3", "rep2"]) {
      expect((await clients[who]!.json(path(), "POST", { kind: "acknowledged" })).status, who).toBe(404);
      expect((await clients[who]!.json(path(), "POST", { kind: "comment", body: "hi" })).status, who).toBe(
        404,
      );
      expect((await clients[who]!.fetch(path())).status, who).toBe(404);
      expect((await clients[who]!.fetch(`/digs/${fx.digId}`)).status, who).toBe(404);
    }
    expect((await clients.grower1!.fetch(path("not-a-uuid"))).status).toBe(404);
    expect((await clients.grower1!.json(path(randomUUID()), "POST", { kind: "acknowledged" })).status).toBe(
      404,
    );
    expect((await clients.grower1!.fetch("/digs/not-a-uuid")).status).toBe(404);
  });

  it("shows the rep the acknowledgement and the comment, and lets them answer but not acknowledge", async () => {
    const res = await clients.rep1!.fetch(path());
    expect(res.status).toBe(200);
    const { responses } = (await res.json()) as { responses: ResponseView[] };
    expect(responses.map((r) => [r.kind, r.userName, r.userRole])).toEqual([
      ["acknowledged", DEMO_USERS.find((u) => u.key === "grower1")!.name, "grower"],
      ["comment", DEMO_USERS.find((u) => u.key === "grower1")!.name, "grower"],
    ]);
    expect((await clients.rep1!.json(path(), "POST", { kind: "acknowledged" })).status).toBe(403);
    expect(
      (
        await clients.rep1!.json(path(), "POST", {
          kind: "comment",
          body: `Yes, wait for calm air ${suffix}`,
        })
      ).status,
    ).toBe(201);
    const page = await clients.rep1!.fetch(`/digs/${fx.digId}`);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain(RECOMMENDATION);
    expect(html).toContain(`Will the side-dress wait for the wind? ${suffix}`);
    expect(html).toContain("acknowledged this recommendation");
  });

  it("lets the region's supervisor read but not answer", async () => {
    expect((await clients.supervisor!.fetch(path())).status).toBe(200);
    expect((await clients.supervisor!.json(path(), "POST", { kind: "comment", body: "noted" })).status).toBe(
      403,
    );
    expect((await clients.supervisor!.json(path(), "POST", { kind: "acknowledged" })).status).toBe(403);
  });
});
