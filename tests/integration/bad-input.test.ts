// Bad input to the record routes: every rejected write answers with the right status and names the
// field at fault, and leaves the row in PostgreSQL exactly as it was (nothing half-written).
import { randomUUID } from "node:crypto";
import type { Kysely } from "kysely";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { Database } from "@/db/schema";
import { testEnv } from "../helpers/env";
import { type ApiClient, signedInAs } from "../helpers/session";

const suffix = randomUUID().slice(0, 8);
const fx = {
  accountId: "",
  regionId: "",
  fieldId: "",
  plantingId: "",
  passId: "",
  productId: "",
  rep1Id: "",
};
let db: Kysely<Database>;
let rep1: ApiClient;
let admin: ApiClient;

type Target = "field" | "planting" | "fertilizerPass" | "account";
const route = (t: Target) =>
  ({
    field: `/api/fields/${fx.fieldId}`,
    planting: `/api/plantings/${fx.plantingId}`,
    fertilizerPass: `/api/fertilizer-passes/${fx.passId}`,
    account: `/api/accounts/${fx.accountId}`,
  })[t];

function snapshot(t: Target) {
  switch (t) {
    case "field":
      return db.selectFrom("field").selectAll().where("id", "=", fx.fieldId).executeTakeFirstOrThrow();
    case "planting":
      return db.selectFrom("planting").selectAll().where("id", "=", fx.plantingId).executeTakeFirstOrThrow();
    case "fertilizerPass":
      return db
        .selectFrom("fertilizerPass")
        .selectAll()
        .where("id", "=", fx.passId)
        .executeTakeFirstOrThrow();
    case "account":
      return db.selectFrom("account").selectAll().where("id", "=", fx.accountId).executeTakeFirstOrThrow();
  }
}

const cursor = async () =>
  (
    await db
      .selectFrom("syncCursor")
      .select("version")
      .where("regionId", "=", fx.regionId)
      .executeTakeFirstOrThrow()
  ).version;

// Sends a write, checks the answer, and checks that neither the row nor the region's cursor moved.
async function expectRejected(
  t: Target,
  send: (client: ApiClient, path: string) => Promise<Response>,
  status: number,
  issuePaths: string[] = [],
) {
  const client = t === "account" ? admin : rep1;
  const before = await snapshot(t);
  const cursorBefore = await cursor();
  const res = await send(client, route(t));
  expect(res.status).toBe(status);
  expect(res.headers.get("content-type")).toContain("application/json");
  const body = (await res.json()) as { error: string; issues?: { path: string; message: string }[] };
  expect(body.error).toEqual(expect.any(String));
  if (issuePaths.length) {
    const paths = body.issues!.map((i) => i.path);
    expect(paths).toEqual(expect.arrayContaining(issuePaths));
    for (const issue of body.issues!) expect(issue.message.length).toBeGreaterThan(10);
  }
  expect(await snapshot(t)).toEqual(before);
  expect(await cursor()).toBe(cursorBefore);
  return body;
}

const patch = (body: unknown) => (client: ApiClient, path: string) => client.json(path, "PATCH", body);

beforeAll(async () => {
  db = createDb(testEnv.databaseUrl, 2);
  const account = await db
    .selectFrom("account")
    .select(["id", "regionId"])
    .where("name", "=", "Alder Creek Farms")
    .executeTakeFirstOrThrow();
  fx.accountId = account.id;
  fx.regionId = account.regionId;
  fx.rep1Id = (
    await db
      .selectFrom("appUser")
      .select("id")
      .where("email", "=", "marisol@trenchbook.test")
      .executeTakeFirstOrThrow()
  ).id;
  fx.productId = (
    await db
      .insertInto("product")
      .values({
        name: `bad-input ammonium thiosulfate 12-0-0-26S ${suffix}`,
        chemistry: "ammonium thiosulfate solution",
        form: "liquid",
        gradeN: 12,
        gradeP2o5: 0,
        gradeK2o: 0,
        gradeS: 26,
        lbPerGal: 11.1,
        densitySource: "bad-input fixture",
        containsThiosulfate: true,
      })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
  fx.fieldId = randomUUID();
  fx.plantingId = randomUUID();
  fx.passId = randomUUID();
  await db
    .insertInto("field")
    .values({ id: fx.fieldId, accountId: fx.accountId, name: `Bad input ${suffix}` })
    .execute();
  await db
    .insertInto("planting")
    .values({
      id: fx.plantingId,
      fieldId: fx.fieldId,
      accountId: fx.accountId,
      hybrid: "bad-input 102-day",
      plantedOn: "2026-04-22",
      seedingRate: 32_000,
      seedingDepthIn: 1.75,
      rowSpacingIn: 30,
      soilTexture: "coarse",
      notes: "original",
    })
    .execute();
  await db
    .insertInto("fertilizerPass")
    .values({
      id: fx.passId,
      fieldId: fx.fieldId,
      plantingId: fx.plantingId,
      accountId: fx.accountId,
      productId: fx.productId,
      appliedOn: "2026-04-22",
      rate: 4,
      rateUnit: "gal/ac",
      placement: "band_2x2",
      intendedBesideIn: 2,
      intendedBelowIn: 2,
      notes: "original",
    })
    .execute();
  [rep1, admin] = [await signedInAs("rep1"), await signedInAs("admin")];
});

afterAll(async () => {
  await db.deleteFrom("fertilizerPass").where("id", "=", fx.passId).execute();
  await db.deleteFrom("planting").where("id", "=", fx.plantingId).execute();
  await db.deleteFrom("field").where("id", "=", fx.fieldId).execute();
  await db.deleteFrom("product").where("name", "like", `bad-input % ${suffix}`).execute();
  await db.destroy();
});

describe("malformed bodies", () => {
  for (const t of ["field", "planting", "fertilizerPass", "account"] as const) {
    it(`${t}: malformed JSON → 400`, async () => {
      await expectRejected(
        t,
        (c, path) =>
          c.fetch(path, {
            method: "PATCH",
            headers: { "content-type": "application/json" },
            body: '{"notes": "x",',
          }),
        400,
      );
    });

    it(`${t}: a form post instead of JSON → 415`, async () => {
      await expectRejected(
        t,
        (c, path) =>
          c.fetch(path, {
            method: "PATCH",
            headers: { "content-type": "application/x-www-form-urlencoded" },
            body: "notes=x",
          }),
        415,
      );
    });

    it(`${t}: a declared body over 64 KB → 413`, async () => {
      await expectRejected(t, patch({ notes: "x".repeat(70 * 1024) }), 413);
    });

    it(`${t}: a streamed body over 64 KB with no declared length → 413`, async () => {
      const chunk = new TextEncoder().encode(`{"notes":"${"y".repeat(80 * 1024)}"}`);
      const stream = new ReadableStream<Uint8Array>({
        start(controller) {
          controller.enqueue(chunk);
          controller.close();
        },
      });
      await expectRejected(
        t,
        (c, path) =>
          c.fetch(path, {
            method: "PATCH",
            headers: { "content-type": "application/json" },
            body: stream,
            duplex: "half",
          } as RequestInit),
        413,
      );
    });

    it(`${t}: a JSON array, an empty object and an unknown key → 422`, async () => {
      await expectRejected(t, patch([{ notes: "x" }]), 422, [""]);
      await expectRejected(t, patch({}), 422, [""]);
      const body = await expectRejected(t, patch({ version: 999 }), 422);
      expect(JSON.stringify(body.issues)).toContain("version");
    });
  }
});

describe("values out of range or not in the list", () => {
  const cases: [Target, string, Record<string, unknown>, string[]][] = [
    ["field", "an unknown soil texture", { soilTexture: "sandy loam" }, ["soilTexture"]],
    ["field", "an unknown irrigation method", { irrigation: "flood" }, ["irrigation"]],
    [
      "field",
      "a first irrigation date that is not YYYY-MM-DD",
      { firstIrrigationOn: "05/01/2026" },
      ["firstIrrigationOn"],
    ],
    ["field", "an empty name", { name: "   " }, ["name"]],
    ["planting", "rows 6 in apart (under 7.5)", { rowSpacingIn: 6 }, ["rowSpacingIn"]],
    ["planting", "rows 61 in apart (over 60)", { rowSpacingIn: 61 }, ["rowSpacingIn"]],
    ["planting", "seed 0.25 in deep (under 0.5)", { seedingDepthIn: 0.25 }, ["seedingDepthIn"]],
    ["planting", "seed 5 in deep (over 4)", { seedingDepthIn: 5 }, ["seedingDepthIn"]],
    ["planting", "9,000 seeds/ac (under 10,000)", { seedingRate: 9000 }, ["seedingRate"]],
    ["planting", "75,000 seeds/ac (over 60,000)", { seedingRate: 75_000 }, ["seedingRate"]],
    ["planting", "a seeding rate sent as text", { seedingRate: "34000" }, ["seedingRate"]],
    ["planting", "30 February", { plantedOn: "2026-02-30" }, ["plantedOn"]],
    ["planting", "an unknown soil texture", { soilTexture: "loamy" }, ["soilTexture"]],
    // A valid change beside an invalid one: neither is written.
    [
      "planting",
      "a valid note beside a bad row spacing",
      { notes: "half", rowSpacingIn: 100 },
      ["rowSpacingIn"],
    ],
    ["fertilizerPass", "a negative rate", { rate: -1 }, ["rate"]],
    ["fertilizerPass", "a rate over 500", { rate: 501 }, ["rate"]],
    ["fertilizerPass", "an unknown rate unit", { rateUnit: "kg/ha" }, ["rateUnit"]],
    ["fertilizerPass", "an unknown placement", { placement: "in_furrow_deep" }, ["placement"]],
    ["fertilizerPass", "a band beside the seed at −1 in", { intendedBesideIn: -1 }, ["intendedBesideIn"]],
    [
      "fertilizerPass",
      "an application date with a time",
      { appliedOn: "2026-04-22T08:00:00Z" },
      ["appliedOn"],
    ],
    ["fertilizerPass", "a product id that is not a uuid", { productId: "ten-34-zero" }, ["productId"]],
    [
      "fertilizerPass",
      "a product not in the catalog",
      { productId: randomUUID(), notes: "half" },
      ["productId"],
    ],
    ["account", "an empty account name", { name: "" }, ["name"]],
    ["account", "a name of 500 characters", { name: "A".repeat(500) }, ["name"]],
  ];
  for (const [t, what, body, paths] of cases) {
    it(`${t}: ${what} → 422 naming ${paths.join(", ")}`, async () => {
      await expectRejected(t, patch(body), 422, paths);
    });
  }

  it("the message states the allowed range with its unit", async () => {
    const body = await expectRejected("planting", patch({ rowSpacingIn: 100 }), 422, ["rowSpacingIn"]);
    expect(body.issues![0]!.message).toBe("The row spacing must be from 7.5 to 60 in.");
    const rate = await expectRejected("fertilizerPass", patch({ rate: 900 }), 422, ["rate"]);
    expect(rate.issues![0]!.message).toMatch(/0 to 500 .*gal\/ac/);
  });
});

describe("product catalog input", () => {
  const product = {
    name: `bad-input urea 46-0-0 ${suffix}`,
    chemistry: "urea",
    form: "dry",
    gradeN: 46,
    gradeP2o5: 0,
    gradeK2o: 0,
    containsUrea: true,
  };
  // Rows carrying this test's product name: none until the one accepted POST.
  const count = async () =>
    (await db.selectFrom("product").select("id").where("name", "=", product.name).execute()).length;
  const post = (body: unknown) => admin.json("/api/products", "POST", body);

  const bad: [string, Record<string, unknown>, string][] = [
    ["a grade over 100 %", { ...product, gradeN: 146 }, "gradeN"],
    ["a negative grade", { ...product, gradeK2o: -1 }, "gradeK2o"],
    ["an unknown form", { ...product, form: "granular-ish" }, "form"],
    ["a liquid with no density", { ...product, form: "liquid" }, "lbPerGal"],
    ["a density with no source", { ...product, form: "liquid", lbPerGal: 10.7 }, "densitySource"],
    ["a salt index with no source", { ...product, saltIndex: 75 }, "saltIndexSource"],
    ["a source with no salt index", { ...product, saltIndexSource: "a handbook" }, "saltIndex"],
    ["urea flag as text", { ...product, containsUrea: "yes" }, "containsUrea"],
  ];
  for (const [what, body, path] of bad) {
    it(`POST /api/products with ${what} → 422 naming ${path}, nothing stored`, async () => {
      const before = await count();
      const res = await post(body);
      expect(res.status).toBe(422);
      const json = (await res.json()) as { issues: { path: string }[] };
      expect(json.issues.map((i) => i.path)).toContain(path);
      expect(await count()).toBe(before);
    });
  }

  it("POST /api/products: 415 for a form post, 400 for broken JSON, 201 then 409 for a repeated name", async () => {
    const form = await admin.fetch("/api/products", {
      method: "POST",
      headers: { "content-type": "text/plain" },
      body: JSON.stringify(product),
    });
    expect(form.status).toBe(415);
    const broken = await admin.fetch("/api/products", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: "{",
    });
    expect(broken.status).toBe(400);
    expect(await count()).toBe(0);
    const created = await post(product);
    expect(created.status).toBe(201);
    expect((await created.json()).product).toMatchObject({
      name: product.name,
      gradeN: 46,
      containsUrea: true,
    });
    const again = await post(product);
    expect(again.status).toBe(409);
    expect(await count()).toBe(1);
  });
});

describe("ids that are not uuids", () => {
  for (const path of [
    "/api/accounts",
    "/api/fields",
    "/api/plantings",
    "/api/fertilizer-passes",
    "/api/dig-sites",
  ]) {
    for (const id of ["not-a-uuid", "1", "00000000-0000-0000-0000-00000000000g", "%27%20or%201%3D1"]) {
      it(`GET ${path}/${id} → 404 JSON`, async () => {
        const res = await admin.fetch(`${path}/${id}`);
        expect(res.status).toBe(404);
        expect((await res.json()).error).toEqual(expect.any(String));
      });
    }
    if (path !== "/api/dig-sites") {
      it(`PATCH ${path}/not-a-uuid → 404 JSON`, async () => {
        const res = await admin.json(`${path}/not-a-uuid`, "PATCH", { notes: "x", name: "x" });
        expect(res.status).toBe(404);
        expect((await res.json()).error).toEqual(expect.any(String));
      });
    }
  }
});

describe("an accepted write, for contrast", () => {
  it("changes only the sent column, takes the region's next version and records it per field", async () => {
    const before = await db
      .selectFrom("planting")
      .selectAll()
      .where("id", "=", fx.plantingId)
      .executeTakeFirstOrThrow();
    const cursorBefore = await cursor();
    const res = await rep1.json(route("planting"), "PATCH", { seedingDepthIn: 2.25, notes: "original" });
    expect(res.status).toBe(200);
    const after = await db
      .selectFrom("planting")
      .selectAll()
      .where("id", "=", fx.plantingId)
      .executeTakeFirstOrThrow();
    expect(await cursor()).toBe(cursorBefore + 1);
    expect(after.version).toBe(cursorBefore + 1);
    expect(after.seedingDepthIn).toBe(2.25);
    // notes was sent unchanged, so its field version stays as it was.
    expect(after.fieldVersions).toEqual({
      ...(before.fieldVersions as object),
      seedingDepthIn: cursorBefore + 1,
    });
    expect(after.updatedBy).toBe(fx.rep1Id);
    expect(after.updatedAt.getTime()).toBeGreaterThan(before.updatedAt.getTime());
    expect((await res.json()).planting).toMatchObject({
      id: fx.plantingId,
      seedingDepthIn: 2.25,
      version: after.version,
    });

    // Sending the same values again changes nothing and takes no version.
    const again = await rep1.json(route("planting"), "PATCH", { seedingDepthIn: 2.25 });
    expect(again.status).toBe(200);
    expect(await cursor()).toBe(cursorBefore + 1);
    expect(await snapshot("planting")).toEqual(after);
  });

  it("clears optional values with null and keeps dates as YYYY-MM-DD", async () => {
    const res = await rep1.json(route("fertilizerPass"), "PATCH", {
      intendedBelowIn: null,
      appliedOn: "2026-04-23",
      notes: "",
    });
    expect(res.status).toBe(200);
    const row = await db
      .selectFrom("fertilizerPass")
      .selectAll()
      .where("id", "=", fx.passId)
      .executeTakeFirstOrThrow();
    expect(row).toMatchObject({ intendedBelowIn: null, appliedOn: "2026-04-23", notes: null });
    expect(Object.keys(row.fieldVersions as object).sort()).toEqual([
      "appliedOn",
      "intendedBelowIn",
      "notes",
    ]);
  });
});
