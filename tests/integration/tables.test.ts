// The office tables of accounts, fields and digs through their JSON routes (the same queries as the
// pages): sorting both ways, filters, pagination totals, the actor's scope, and bad parameters
// falling back to defaults. A fixture account served by rep1 holds 30 digs on 3 fields.
import { randomUUID } from "node:crypto";
import type { Kysely } from "kysely";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { Database } from "@/db/schema";
import { DEMO_USERS } from "@/db/seed/demo-users";
import { testEnv } from "../helpers/env";
import { type ApiClient, signedInAs } from "../helpers/session";

const suffix = randomUUID().slice(0, 8);
const ACCOUNT_NAME = `Tables Fixture Farm ${suffix}`;
const DIGS = 30;
let db: Kysely<Database>;
const fx = { accountId: "", alderId: "", fieldIds: [] as string[], digIds: [] as string[] };
const clients: Record<string, ApiClient> = {};

interface DigRow {
  id: string;
  accountId: string;
  fieldId: string;
  fieldName: string;
  rootIndex: number | null;
  dugAt: string;
  hybrid: string | null;
  flaggedByRep: boolean;
  leafCollars: number | null;
  flagCount: number;
}
interface TableBody<R> {
  rows: R[];
  total: number;
  sort: string;
  dir: string;
  page: number;
  pageSize: number;
  issues: { param: string }[];
}

async function table<R = DigRow>(who: string, path: string): Promise<TableBody<R>> {
  const res = await clients[who]!.fetch(path);
  expect(res.status, path).toBe(200);
  return (await res.json()) as TableBody<R>;
}

beforeAll(async () => {
  db = createDb(testEnv.databaseUrl, 2);
  const region = await db
    .selectFrom("region")
    .select("id")
    .where("name", "=", "Sandhollow Valley")
    .executeTakeFirstOrThrow();
  const rep1 = await db
    .selectFrom("appUser")
    .select("id")
    .where("email", "=", DEMO_USERS.find((u) => u.key === "rep1")!.email)
    .executeTakeFirstOrThrow();
  fx.alderId = (
    await db
      .selectFrom("account")
      .select("id")
      .where("name", "=", "Alder Creek Farms")
      .executeTakeFirstOrThrow()
  ).id;
  fx.accountId = (
    await db
      .insertInto("account")
      .values({ regionId: region.id, name: ACCOUNT_NAME, locality: "Fixture Flats" })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
  await db.insertInto("accountRep").values({ accountId: fx.accountId, userId: rep1.id }).execute();
  const hybrids = ["TT-101", "TT-102", "TT-101"];
  const plantingIds: string[] = [];
  for (const [i, name] of ["Alpha", "Bravo", "Charlie"].entries()) {
    const fieldId = randomUUID();
    const plantingId = randomUUID();
    fx.fieldIds.push(fieldId);
    plantingIds.push(plantingId);
    await db
      .insertInto("field")
      .values({ id: fieldId, accountId: fx.accountId, name: `${name} ${suffix}`, areaAcres: 40 + i * 20 })
      .execute();
    await db
      .insertInto("planting")
      .values({
        id: plantingId,
        fieldId,
        accountId: fx.accountId,
        hybrid: hybrids[i]!,
        plantedOn: `2031-04-${10 + i}`,
        seedingRate: 34_000,
        seedingDepthIn: 2,
        rowSpacingIn: 30,
        soilTexture: "medium",
      })
      .execute();
  }
  // Dig k: on day 1 + k of May 2031, field k % 3, root index 10 + 2k (null for k = 5), flagged when
  // k % 4 = 0.
  const rows = Array.from({ length: DIGS }, (_, k) => {
    const id = randomUUID();
    fx.digIds.push(id);
    const day = String(1 + k).padStart(2, "0");
    return {
      id,
      fieldId: fx.fieldIds[k % 3]!,
      plantingId: plantingIds[k % 3]!,
      accountId: fx.accountId,
      repId: rep1.id,
      dugAt: new Date(`2031-05-${day}T16:00:00Z`),
      rootIndex: k === 5 ? null : 10 + 2 * k,
      flaggedByRep: k % 4 === 0,
      assessment: JSON.stringify({ leafCollars: 1 + (k % 4), flags: k % 2 ? [{ code: "x" }] : [] }),
    };
  });
  await db.insertInto("digSite").values(rows).execute();
  for (const who of ["rep1", "rep2", "grower1", "supervisor"]) clients[who] = await signedInAs(who);
});

afterAll(async () => {
  await db.deleteFrom("digSite").where("accountId", "=", fx.accountId).execute();
  await db.deleteFrom("planting").where("accountId", "=", fx.accountId).execute();
  await db.deleteFrom("field").where("accountId", "=", fx.accountId).execute();
  await db.deleteFrom("accountRep").where("accountId", "=", fx.accountId).execute();
  await db.deleteFrom("account").where("id", "=", fx.accountId).execute();
  await db.destroy();
});

describe("digs table", () => {
  const base = () => `/api/tables/digs?accountId=${fx.accountId}`;

  it("sorts by root index both ways, with missing indexes last", async () => {
    const asc = await table("rep1", `${base()}&sort=rootIndex&dir=asc&pageSize=50`);
    const desc = await table("rep1", `${base()}&sort=rootIndex&dir=desc&pageSize=50`);
    expect(asc.total).toBe(DIGS);
    const ascIdx = asc.rows.map((r) => r.rootIndex);
    expect(ascIdx.slice(0, -1)).toEqual([...ascIdx.slice(0, -1)].sort((a, b) => a! - b!));
    expect(ascIdx.at(-1)).toBeNull();
    expect(ascIdx[0]).toBe(10);
    const descIdx = desc.rows.map((r) => r.rootIndex);
    expect(descIdx[0]).toBe(10 + 2 * (DIGS - 1));
    expect(descIdx.at(-1)).toBeNull();
    expect(descIdx.slice(0, -1)).toEqual([...ascIdx.slice(0, -1)].reverse());
  });

  it("sorts newest first by default and by field name on request", async () => {
    const byDate = await table("rep1", base());
    expect(byDate.sort).toBe("date");
    expect(byDate.rows[0]!.dugAt).toBe("2031-05-30T16:00:00.000Z");
    const byField = await table("rep1", `${base()}&sort=field&dir=desc&pageSize=50`);
    const names = byField.rows.map((r) => r.fieldName);
    expect(names[0]).toBe(`Charlie ${suffix}`);
    expect(names.at(-1)).toBe(`Alpha ${suffix}`);
  });

  it("pages with totals: 25 then 5, no row twice", async () => {
    const p1 = await table("rep1", base());
    const p2 = await table("rep1", `${base()}&page=2`);
    expect([p1.total, p2.total]).toEqual([DIGS, DIGS]);
    expect([p1.rows.length, p2.rows.length]).toEqual([25, 5]);
    expect(new Set([...p1.rows, ...p2.rows].map((r) => r.id))).toEqual(new Set(fx.digIds));
    const p3 = await table("rep1", `${base()}&page=3`);
    expect(p3.rows).toEqual([]);
  });

  it("filters by flag, date range, field and hybrid", async () => {
    const flagged = await table("rep1", `${base()}&flagged=1`);
    expect(flagged.total).toBe(Math.ceil(DIGS / 4));
    expect(flagged.rows.every((r) => r.flaggedByRep)).toBe(true);
    const range = await table("rep1", `${base()}&from=2031-05-03&to=2031-05-07`);
    expect(range.total).toBe(5);
    const field = await table("rep1", `${base()}&fieldId=${fx.fieldIds[1]}`);
    expect(field.total).toBe(DIGS / 3);
    expect(field.rows.every((r) => r.fieldId === fx.fieldIds[1])).toBe(true);
    const hybrid = await table("rep1", `${base()}&hybrid=TT-101`);
    expect(hybrid.total).toBe((DIGS / 3) * 2);
    expect(hybrid.rows.every((r) => r.hybrid === "TT-101")).toBe(true);
  });

  it("shows each actor only their scope", async () => {
    expect((await table("rep2", base())).total).toBe(0);
    expect((await table("supervisor", base())).total).toBe(DIGS);
    const grower = await table("grower1", "/api/tables/digs?pageSize=100");
    expect(grower.total).toBeGreaterThan(0);
    expect(grower.rows.every((r) => r.accountId === fx.alderId)).toBe(true);
    expect((await table("grower1", base())).total).toBe(0);
  });

  it("ignores bad parameters, reports them and answers 200", async () => {
    const bad = await table(
      "rep1",
      `${base()}&sort=password&dir=sideways&page=-3&pageSize=7&fieldId=not-a-uuid&from=2031-02-31x&flagged=maybe`,
    );
    expect(bad).toMatchObject({ sort: "date", dir: "desc", page: 1, pageSize: 25, total: DIGS });
    expect(bad.issues.map((i) => i.param).sort()).toEqual([
      "dir",
      "fieldId",
      "flagged",
      "from",
      "page",
      "pageSize",
      "sort",
    ]);
  });

  it("refuses a signed-out caller", async () => {
    const res = await fetch(`${testEnv.appUrl}/api/tables/digs`, { redirect: "manual" });
    expect(res.status).toBe(401);
  });
});

describe("fields and accounts tables", () => {
  it("sorts fields by area both ways and counts their digs", async () => {
    type F = {
      id: string;
      name: string;
      areaAcres: number;
      digCount: number;
      flaggedCount: number;
      hybrids: string[];
    };
    const asc = await table<F>("rep1", `/api/tables/fields?accountId=${fx.accountId}&sort=area&dir=asc`);
    const desc = await table<F>("rep1", `/api/tables/fields?accountId=${fx.accountId}&sort=area&dir=desc`);
    expect(asc.rows.map((r) => r.areaAcres)).toEqual([40, 60, 80]);
    expect(desc.rows.map((r) => r.areaAcres)).toEqual([80, 60, 40]);
    expect(asc.rows.map((r) => r.digCount)).toEqual([10, 10, 10]);
    // Flagged digs are k % 4 = 0: k = 0, 12, 24 on field 0; 4, 16, 28 on 1; 8, 20 on 2.
    expect(asc.rows.map((r) => r.flaggedCount)).toEqual([3, 3, 2]);
    const hybrid = await table<F>("rep1", `/api/tables/fields?accountId=${fx.accountId}&hybrid=TT-102`);
    expect(hybrid.rows.map((r) => r.name)).toEqual([`Bravo ${suffix}`]);
    expect((await table<F>("rep2", `/api/tables/fields?accountId=${fx.accountId}`)).total).toBe(0);
  });

  it("filters accounts by name and keeps each rep to their own", async () => {
    type A = { id: string; name: string; fieldCount: number; digCount: number; reps: string[] };
    const q = encodeURIComponent(`fixture farm ${suffix}`);
    const mine = await table<A>("rep1", `/api/tables/accounts?q=${q}`);
    expect(mine.total).toBe(1);
    expect(mine.rows[0]).toMatchObject({ id: fx.accountId, fieldCount: 3, digCount: DIGS });
    expect((await table<A>("rep2", `/api/tables/accounts?q=${q}`)).total).toBe(0);
    const all = await table<A>("rep2", "/api/tables/accounts?sort=name&dir=desc");
    expect(all.rows.map((r) => r.name)).toEqual(["Dry Wash Partners", "Cottonwood Bend Dairy"]);
    const grower = await table<A>("grower1", "/api/tables/accounts");
    expect(grower.rows.map((r) => r.id)).toEqual([fx.alderId]);
  });
});

describe("the pages", () => {
  it("render the sorted table with aria-sort and fall back on bad parameters", async () => {
    const res = await clients.rep1!.fetch(`/digs?accountId=${fx.accountId}&sort=rootIndex&dir=asc`);
    expect(res.status).toBe(200);
    const html = await res.text();
    expect(html).toContain('aria-sort="ascending"');
    expect(html).toContain(`/digs/${fx.digIds[0]}`);
    expect(html).toContain("Page 1 of 2");
    const bad = await clients.rep1!.fetch("/digs?sort=%27;drop&page=zero&pageSize=9999&from=nope");
    expect(bad.status).toBe(200);
    expect(await bad.text()).toContain("were not valid and were ignored");
    const past = await clients.rep1!.fetch(`/digs?accountId=${fx.accountId}&page=9`);
    expect(past.status).toBe(307);
    expect(past.headers.get("location")).toContain(`/digs?accountId=${fx.accountId}&page=2`);
    for (const path of ["/fields?sort=nope", "/accounts?dir=up"]) {
      expect((await clients.rep1!.fetch(path)).status, path).toBe(200);
    }
  });

  it("sends a grower from /accounts to their farm", async () => {
    const res = await clients.grower1!.fetch("/accounts");
    expect(res.status).toBe(307);
    expect(res.headers.get("location")).toContain(`/accounts/${fx.alderId}`);
    expect((await clients.grower1!.fetch(`/accounts/${fx.accountId}`)).status).toBe(404);
    expect((await clients.rep1!.fetch(`/accounts/${fx.accountId}`)).status).toBe(200);
  });
});
