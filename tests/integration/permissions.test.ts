// The permission matrix, through the real route handlers: every role × every kind of resource ×
// records of their own farm (or region) and of another × read and write, with the exact status.
// Fixture records are created under two demo accounts of the Sandhollow Valley region and under a
// fixture account in Upper Mesa (a region with no users), and removed afterwards.
import { randomUUID } from "node:crypto";
import { type Kysely, sql } from "kysely";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { Database } from "@/db/schema";
import { DEMO_USERS } from "@/db/seed/demo-users";
import { testEnv } from "../helpers/env";
import { ApiClient, signedInAs } from "../helpers/session";

type RoleKey = "admin" | "supervisor" | "rep1" | "grower1";
const ROLES: RoleKey[] = ["admin", "supervisor", "rep1", "grower1"];

// alder: Alder Creek Farms (rep1 serves it, grower1 owns it); cottonwood: Cottonwood Bend Dairy
// (rep2, grower3), same region; mesa: a fixture account in Upper Mesa, outside everyone's region.
type Farm = "alder" | "cottonwood" | "mesa";
const FARMS: Farm[] = ["alder", "cottonwood", "mesa"];

type RecordKind = "account" | "field" | "planting" | "fertilizerPass" | "digSite";
type Action = "read" | "write";
type Statuses = readonly [alder: number, cottonwood: number, mesa: number];
type Row = readonly [
  kind: RecordKind,
  action: Action,
  admin: Statuses,
  supervisor: Statuses,
  rep1: Statuses,
  grower1: Statuses,
];

// Expected status for [Alder Creek, Cottonwood Bend, Upper Mesa] records. Reads outside the actor's
// scope are 404 (ids of other farms reveal nothing); writes to a readable record the actor may not
// change are 403. Digs have no write route at all: they change only through sync (405).
// biome-ignore format: the matrix reads as a table
const RECORD_MATRIX: readonly Row[] = [
  //  kind             action    admin            supervisor       rep1             grower1
  ["account",        "read",  [200, 200, 200], [200, 200, 404], [200, 404, 404], [200, 404, 404]],
  ["account",        "write", [200, 200, 200], [403, 403, 404], [403, 404, 404], [403, 404, 404]],
  ["field",          "read",  [200, 200, 200], [200, 200, 404], [200, 404, 404], [200, 404, 404]],
  ["field",          "write", [200, 200, 200], [403, 403, 404], [200, 404, 404], [403, 404, 404]],
  ["planting",       "read",  [200, 200, 200], [200, 200, 404], [200, 404, 404], [200, 404, 404]],
  ["planting",       "write", [200, 200, 200], [403, 403, 404], [200, 404, 404], [403, 404, 404]],
  ["fertilizerPass", "read",  [200, 200, 200], [200, 200, 404], [200, 404, 404], [200, 404, 404]],
  ["fertilizerPass", "write", [200, 200, 200], [403, 403, 404], [200, 404, 404], [403, 404, 404]],
  ["digSite",        "read",  [200, 200, 200], [200, 200, 404], [200, 404, 404], [200, 404, 404]],
  ["digSite",        "write", [405, 405, 405], [405, 405, 405], [405, 405, 405], [405, 405, 405]],
];

// How each farm relates to each role, for the case names.
const RELATION: Record<RoleKey, Record<Farm, string>> = {
  admin: { alder: "any farm", cottonwood: "any farm", mesa: "any region" },
  supervisor: { alder: "own region", cottonwood: "own region", mesa: "other region" },
  rep1: { alder: "own farm", cottonwood: "other farm", mesa: "other region" },
  grower1: { alder: "own farm", cottonwood: "other farm", mesa: "other region" },
};

const PATH: Record<RecordKind, string> = {
  account: "/api/accounts",
  field: "/api/fields",
  planting: "/api/plantings",
  fertilizerPass: "/api/fertilizer-passes",
  digSite: "/api/dig-sites",
};

// Product, user and region are not farm records: the catalog is shared; users and regions are
// listed (read) and changed (write) by admins, and a supervisor lists the users of their own region.
type OtherCase = { name: string; method: "GET" | "POST" | "PATCH"; path: () => string; body?: () => unknown };
// biome-ignore format: the matrix reads as a table
const OTHER_MATRIX: readonly (readonly [string, OtherCase, Record<RoleKey, number>])[] = [
  ["product", { name: "read the catalog", method: "GET", path: () => "/api/products" },
    { admin: 200, supervisor: 200, rep1: 200, grower1: 200 }],
  ["product", { name: "add to the catalog", method: "POST", path: () => "/api/products", body: () => newProduct() },
    { admin: 201, supervisor: 403, rep1: 403, grower1: 403 }],
  ["user", { name: "list users", method: "GET", path: () => `/api/users?q=${suffix}` },
    { admin: 200, supervisor: 200, rep1: 403, grower1: 403 }],
  ["user", { name: "change a user of the own region", method: "PATCH", path: () => `/api/users/${fx.userOwnRegion}`,
    body: () => ({ status: "deactivated" }) },
    { admin: 200, supervisor: 403, rep1: 403, grower1: 403 }],
  ["user", { name: "change a user of another region", method: "PATCH", path: () => `/api/users/${fx.userOtherRegion}`,
    body: () => ({ status: "deactivated" }) },
    { admin: 200, supervisor: 404, rep1: 403, grower1: 403 }],
  ["region", { name: "list regions", method: "GET", path: () => "/api/regions" },
    { admin: 200, supervisor: 200, rep1: 200, grower1: 403 }],
  ["region", { name: "create a region", method: "POST", path: () => "/api/regions",
    body: () => ({ name: `Matrix Region ${suffix} ${++counter}` }) },
    { admin: 201, supervisor: 403, rep1: 403, grower1: 403 }],
];

const suffix = randomUUID().slice(0, 8);
let counter = 0;
const newProduct = () => ({
  name: `matrix urea-ammonium nitrate 32-0-0 ${suffix} ${++counter}`,
  chemistry: "urea-ammonium nitrate solution",
  form: "liquid",
  gradeN: 32,
  gradeP2o5: 0,
  gradeK2o: 0,
  lbPerGal: 11.06,
  densitySource: "matrix fixture",
  containsUrea: true,
});

interface FarmRecords {
  accountId: string;
  locality: string | null;
  fieldId: string;
  plantingId: string;
  fertilizerPassId: string;
  digSiteId: string;
}

const fx = {
  sandhollow: "",
  upperMesa: "",
  productId: "",
  deletedFieldId: "",
  userOwnRegion: "",
  userOtherRegion: "",
  farms: {} as Record<Farm, FarmRecords>,
  users: {} as Record<string, string>,
};

let db: Kysely<Database>;
const clients = {} as Record<RoleKey, ApiClient>;

async function createRecords(accountId: string, label: string, repId: string | null): Promise<FarmRecords> {
  const account = await db
    .selectFrom("account")
    .select("locality")
    .where("id", "=", accountId)
    .executeTakeFirstOrThrow();
  const fieldId = randomUUID();
  const plantingId = randomUUID();
  const fertilizerPassId = randomUUID();
  const digSiteId = randomUUID();
  await db
    .insertInto("field")
    .values({ id: fieldId, accountId, name: `Matrix ${label} ${suffix}` })
    .execute();
  await db
    .insertInto("planting")
    .values({
      id: plantingId,
      fieldId,
      accountId,
      hybrid: "matrix 104-day",
      plantedOn: "2026-04-20",
      seedingRate: 34_000,
      seedingDepthIn: 2,
      rowSpacingIn: 30,
      soilTexture: "medium",
    })
    .execute();
  await db
    .insertInto("fertilizerPass")
    .values({
      id: fertilizerPassId,
      fieldId,
      plantingId,
      accountId,
      productId: fx.productId,
      appliedOn: "2026-04-20",
      rate: 5,
      rateUnit: "gal/ac",
      placement: "seed_placed",
    })
    .execute();
  await db
    .insertInto("digSite")
    .values({ id: digSiteId, fieldId, plantingId, accountId, repId, dugAt: new Date("2026-05-12T15:00:00Z") })
    .execute();
  await db.insertInto("dugPlant").values({ id: randomUUID(), digSiteId, leafStage: "V2" }).execute();
  return { accountId, locality: account.locality, fieldId, plantingId, fertilizerPassId, digSiteId };
}

function recordId(kind: RecordKind, farm: Farm): string {
  const r = fx.farms[farm];
  return kind === "account" ? r.accountId : r[`${kind}Id`];
}

// When the row last changed, to show that a refused write left it alone.
async function stamp(kind: RecordKind, id: string): Promise<string> {
  const table = {
    account: "account",
    field: "field",
    planting: "planting",
    fertilizerPass: "fertilizer_pass",
    digSite: "dig_site",
  }[kind];
  const { rows } = await sql<{
    stamp: string;
  }>`select updated_at::text as stamp from ${sql.table(table)} where id = ${id}`.execute(db);
  return rows[0]!.stamp;
}

// A body that really changes the record (or, for a demo account, rewrites its locality unchanged so
// the demo data stays as it was).
function writeBody(kind: RecordKind, farm: Farm, role: RoleKey): Record<string, unknown> {
  const tag = `matrix ${role} ${++counter}`;
  switch (kind) {
    case "account":
      return { locality: fx.farms[farm].locality ?? tag };
    case "field":
      return { name: `Matrix field ${tag}` };
    default:
      return { notes: tag };
  }
}

beforeAll(async () => {
  db = createDb(testEnv.databaseUrl, 2);
  for (const u of await db.selectFrom("appUser").select(["id", "email"]).execute()) fx.users[u.email] = u.id;
  const userId = (key: string) => fx.users[DEMO_USERS.find((u) => u.key === key)!.email]!;
  const regions = await db.selectFrom("region").select(["id", "name"]).execute();
  fx.sandhollow = regions.find((r) => r.name === "Sandhollow Valley")!.id;
  fx.upperMesa = regions.find((r) => r.name === "Upper Mesa")!.id;
  const accountId = async (name: string) =>
    (await db.selectFrom("account").select("id").where("name", "=", name).executeTakeFirstOrThrow()).id;

  fx.productId = (
    await db
      .insertInto("product")
      .values({
        name: `matrix ammonium polyphosphate 10-34-0 ${suffix}`,
        chemistry: "ammonium polyphosphate solution",
        form: "liquid",
        gradeN: 10,
        gradeP2o5: 34,
        gradeK2o: 0,
        lbPerGal: 11.65,
        densitySource: "matrix fixture",
      })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
  const mesa = await db
    .insertInto("account")
    .values({ regionId: fx.upperMesa, name: `Matrix Mesa Farm ${suffix}`, locality: "Mesa top" })
    .returning("id")
    .executeTakeFirstOrThrow();
  fx.farms = {
    alder: await createRecords(await accountId("Alder Creek Farms"), "Alder", userId("rep1")),
    cottonwood: await createRecords(await accountId("Cottonwood Bend Dairy"), "Cottonwood", userId("rep2")),
    mesa: await createRecords(mesa.id, "Mesa", null),
  };
  fx.deletedFieldId = randomUUID();
  await db
    .insertInto("field")
    .values({
      id: fx.deletedFieldId,
      accountId: fx.farms.alder.accountId,
      name: `Matrix deleted ${suffix}`,
      deletedAt: new Date(),
    })
    .execute();
  const fixtureUser = async (label: string, regionId: string) =>
    (
      await db
        .insertInto("appUser")
        .values({
          email: `matrix-${label}-${suffix}@trenchbook.test`,
          name: `Matrix ${label} ${suffix}`,
          role: "rep",
          regionId,
          status: "active",
        })
        .returning("id")
        .executeTakeFirstOrThrow()
    ).id;
  fx.userOwnRegion = await fixtureUser("sandhollow", fx.sandhollow);
  fx.userOtherRegion = await fixtureUser("mesa", fx.upperMesa);

  for (const role of ROLES) clients[role] = await signedInAs(role);
});

afterAll(async () => {
  const farms = Object.values(fx.farms);
  const fieldIds = [...farms.map((f) => f.fieldId), fx.deletedFieldId].filter(Boolean);
  if (fieldIds.length) {
    const digs = db.selectFrom("digSite").select("id").where("fieldId", "in", fieldIds);
    await db.deleteFrom("dugPlant").where("digSiteId", "in", digs).execute();
    await db.deleteFrom("digSite").where("fieldId", "in", fieldIds).execute();
    await db.deleteFrom("fertilizerPass").where("fieldId", "in", fieldIds).execute();
    await db.deleteFrom("planting").where("fieldId", "in", fieldIds).execute();
    await db.deleteFrom("field").where("id", "in", fieldIds).execute();
  }
  await db.deleteFrom("product").where("name", "like", `matrix % ${suffix}%`).execute();
  await db.deleteFrom("account").where("name", "=", `Matrix Mesa Farm ${suffix}`).execute();
  await db.deleteFrom("appUser").where("email", "like", `matrix-%-${suffix}@trenchbook.test`).execute();
  const regions = db.selectFrom("region").select("id").where("name", "like", `Matrix Region ${suffix}%`);
  await db.deleteFrom("syncCursor").where("regionId", "in", regions).execute();
  await db.deleteFrom("region").where("name", "like", `Matrix Region ${suffix}%`).execute();
  await db.destroy();
});

describe("record permission matrix", () => {
  for (const [kind, action, ...byRole] of RECORD_MATRIX) {
    ROLES.forEach((role, r) => {
      FARMS.forEach((farm, f) => {
        const status = byRole[r]![f]!;
        it(`${role} ${action}s a ${kind} of ${farm} (${RELATION[role][farm]}) → ${status}`, async () => {
          const path = `${PATH[kind]}/${recordId(kind, farm)}`;
          if (action === "read") {
            const res = await clients[role].fetch(path);
            expect(res.status).toBe(status);
            const body = await res.json();
            if (status === 200) {
              expect(body[kind].id).toBe(recordId(kind, farm));
              if (kind === "digSite") expect(body.digSite.dugPlants).toHaveLength(1);
            } else {
              expect(body.error).toEqual(expect.any(String));
              expect(JSON.stringify(body)).not.toContain(recordId(kind, farm));
            }
            return;
          }
          const sent = writeBody(kind, farm, role);
          const before = await stamp(kind, recordId(kind, farm));
          const res = await clients[role].json(path, "PATCH", sent);
          expect(res.status).toBe(status);
          const after = await stamp(kind, recordId(kind, farm));
          if (status === 200) expect(after).not.toBe(before);
          else expect(after).toBe(before);
          if (status === 405) return;
          const body = await res.json();
          if (status === 200) expect(body[kind]).toMatchObject(sent);
          else expect(body.error).toEqual(expect.any(String));
        });
      });
    });
  }
});

describe("product, user and region permission matrix", () => {
  for (const [kind, c, byRole] of OTHER_MATRIX) {
    for (const role of ROLES) {
      const status = byRole[role];
      it(`${role}: ${kind} — ${c.name} → ${status}`, async () => {
        const res = c.body
          ? await clients[role].json(c.path(), c.method, c.body())
          : await clients[role].fetch(c.path(), { method: c.method });
        expect(res.status).toBe(status);
        expect(res.headers.get("content-type")).toContain("application/json");
        const body = await res.json();
        if (status >= 400) expect(body.error).toEqual(expect.any(String));
      });
    }
  }

  it("a supervisor lists only the users of their own region", async () => {
    const res = await clients.supervisor.fetch(`/api/users?q=${suffix}`);
    const ids = ((await res.json()).users as { id: string }[]).map((u) => u.id);
    expect(ids).toContain(fx.userOwnRegion);
    expect(ids).not.toContain(fx.userOtherRegion);
    const admin = await clients.admin.fetch(`/api/users?q=${suffix}`);
    const all = ((await admin.json()).users as { id: string }[]).map((u) => u.id);
    expect(all).toEqual(expect.arrayContaining([fx.userOwnRegion, fx.userOtherRegion]));
  });

  it("every signed-in role sees the fixture product in the catalog", async () => {
    for (const role of ROLES) {
      const body = await (await clients[role].fetch("/api/products")).json();
      expect((body.products as { id: string }[]).map((p) => p.id)).toContain(fx.productId);
    }
  });
});

describe("soft-deleted records", () => {
  it("answer 404 to read and write, even for an admin and the serving rep", async () => {
    for (const role of ["admin", "rep1"] as const) {
      expect((await clients[role].fetch(`/api/fields/${fx.deletedFieldId}`)).status).toBe(404);
      expect(
        (await clients[role].json(`/api/fields/${fx.deletedFieldId}`, "PATCH", { name: "x" })).status,
      ).toBe(404);
    }
  });
});

describe("without a session", () => {
  const routes: [string, string, () => string][] = [
    ["GET", "list accounts", () => "/api/accounts"],
    ["GET", "an account", () => `/api/accounts/${fx.farms.alder.accountId}`],
    ["PATCH", "an account", () => `/api/accounts/${fx.farms.alder.accountId}`],
    ["GET", "list fields", () => "/api/fields"],
    ["GET", "a field", () => `/api/fields/${fx.farms.alder.fieldId}`],
    ["PATCH", "a field", () => `/api/fields/${fx.farms.alder.fieldId}`],
    ["GET", "a planting", () => `/api/plantings/${fx.farms.alder.plantingId}`],
    ["PATCH", "a planting", () => `/api/plantings/${fx.farms.alder.plantingId}`],
    ["GET", "a fertilizer pass", () => `/api/fertilizer-passes/${fx.farms.alder.fertilizerPassId}`],
    ["PATCH", "a fertilizer pass", () => `/api/fertilizer-passes/${fx.farms.alder.fertilizerPassId}`],
    ["GET", "a dig site", () => `/api/dig-sites/${fx.farms.alder.digSiteId}`],
    ["GET", "the catalog", () => "/api/products"],
    ["POST", "the catalog", () => "/api/products"],
    ["GET", "users", () => "/api/users"],
    ["PATCH", "a user", () => `/api/users/${fx.userOwnRegion}`],
    ["GET", "regions", () => "/api/regions"],
    ["POST", "regions", () => "/api/regions"],
  ];
  for (const [method, what, path] of routes) {
    it(`${method} ${what} → 401 JSON, never a redirect`, async () => {
      const client = new ApiClient();
      const res =
        method === "GET"
          ? await client.fetch(path())
          : await client.json(path(), method, { name: "anything" });
      expect(res.status).toBe(401);
      expect(res.headers.get("content-type")).toContain("application/json");
      expect((await res.json()).error).toMatch(/sign in/i);
    });
  }
});

describe("list endpoints return only rows in scope", () => {
  // The expected scope, computed straight from the membership tables.
  async function scopedAccountIds(role: RoleKey): Promise<string[]> {
    const email = DEMO_USERS.find((u) => u.key === role)!.email;
    const userId = fx.users[email]!;
    let q = db.selectFrom("account").select("account.id");
    if (role === "supervisor") q = q.where("account.regionId", "=", fx.sandhollow);
    if (role === "rep1")
      q = q
        .innerJoin("accountRep", "accountRep.accountId", "account.id")
        .where("accountRep.userId", "=", userId);
    if (role === "grower1") {
      q = q
        .innerJoin("accountGrower", "accountGrower.accountId", "account.id")
        .where("accountGrower.userId", "=", userId);
    }
    return (await q.execute()).map((r) => r.id).sort();
  }

  const visible: Record<RoleKey, Farm[]> = {
    admin: ["alder", "cottonwood", "mesa"],
    supervisor: ["alder", "cottonwood"],
    rep1: ["alder"],
    grower1: ["alder"],
  };

  for (const role of ROLES) {
    it(`GET /api/accounts as ${role} lists exactly the accounts in scope`, async () => {
      const res = await clients[role].fetch("/api/accounts");
      expect(res.status).toBe(200);
      const ids = ((await res.json()).accounts as { id: string }[]).map((a) => a.id).sort();
      expect(ids).toEqual(await scopedAccountIds(role));
      for (const farm of FARMS) {
        if (visible[role].includes(farm)) expect(ids).toContain(fx.farms[farm].accountId);
        else expect(ids).not.toContain(fx.farms[farm].accountId);
      }
    });

    it(`GET /api/fields as ${role} lists exactly the live fields in scope`, async () => {
      const res = await clients[role].fetch("/api/fields");
      expect(res.status).toBe(200);
      const ids = ((await res.json()).fields as { id: string }[]).map((f) => f.id).sort();
      const accounts = await scopedAccountIds(role);
      const expected = (
        await db
          .selectFrom("field")
          .select("id")
          .where("accountId", "in", accounts)
          .where("deletedAt", "is", null)
          .execute()
      )
        .map((r) => r.id)
        .sort();
      expect(ids).toEqual(expected);
      expect(ids).not.toContain(fx.deletedFieldId);
      for (const farm of FARMS) {
        if (visible[role].includes(farm)) expect(ids).toContain(fx.farms[farm].fieldId);
        else expect(ids).not.toContain(fx.farms[farm].fieldId);
      }
    });
  }

  it("GET /api/fields?accountId= narrows to one visible account and 404s for any other", async () => {
    const alder = fx.farms.alder.accountId;
    const own = await clients.rep1.fetch(`/api/fields?accountId=${alder}`);
    expect(own.status).toBe(200);
    const fields = (await own.json()).fields as { id: string; accountId: string }[];
    expect(fields.map((f) => f.id)).toContain(fx.farms.alder.fieldId);
    expect(fields.every((f) => f.accountId === alder)).toBe(true);

    const status = async (role: RoleKey, accountId: string) =>
      (await clients[role].fetch(`/api/fields?accountId=${accountId}`)).status;
    expect(await status("rep1", fx.farms.cottonwood.accountId)).toBe(404);
    expect(await status("grower1", fx.farms.cottonwood.accountId)).toBe(404);
    expect(await status("supervisor", fx.farms.mesa.accountId)).toBe(404);
    expect(await status("supervisor", fx.farms.cottonwood.accountId)).toBe(200);
    expect(await status("admin", "not-a-uuid")).toBe(404);
    expect(await status("admin", randomUUID())).toBe(404);
  });
});
