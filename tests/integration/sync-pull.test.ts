// The pull route over HTTP: scope per role, the exact response shape, deltas by cursor, tombstones,
// resets, refusals, and the proof that two overlapping writers committing never make a pull skip a
// row (shared/SYNC.md, fault 11). Fixture rows are created under the demo accounts and a fixture
// account in Upper Mesa, and removed afterwards.
import { createHash, randomUUID } from "node:crypto";
import type { ControlledTransaction, Kysely } from "kysely";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import { nextVersion } from "@/db/queries/versioning";
import type { Database } from "@/db/schema";
import { DEMO_USERS } from "@/db/seed/demo-users";
import {
  PROTOCOL_VERSION,
  type PullResponse,
  pulledAccountSchema,
  pulledDigSiteSchema,
  pulledDugPlantSchema,
  pulledFertilizerPassSchema,
  pulledFieldSchema,
  pulledPhotoSchema,
  pulledPlantingSchema,
  pulledProductSchema,
  pulledWeatherDaySchema,
  pullResponseSchema,
  SCHEMA_VERSION,
} from "@/sync/protocol";
import { CURSOR_MAX_AGE_MS, decodeCursor, encodeCursor } from "@/sync/server/pull";
import { testEnv } from "../helpers/env";
import { ApiClient, signedInAs } from "../helpers/session";

const suffix = randomUUID().slice(0, 8);
const tag = (label: string) => `Pull ${label} ${suffix}`;

let db: Kysely<Database>;
const ROLES = ["admin", "supervisor", "rep1", "rep2", "grower1"] as const;
type RoleKey = (typeof ROLES)[number];
const clients = {} as Record<RoleKey, ApiClient>;
// One device (client group) per signed-in user.
const groups = {} as Record<RoleKey, string>;

const fx = {
  sandhollow: "",
  upperMesa: "",
  users: {} as Record<string, string>,
  accounts: {} as Record<"alder" | "bellweather" | "cottonwood" | "mesa", string>,
  stations: {} as Record<"alder" | "cottonwood", string>,
  activeProduct: "",
  inactiveProduct: "",
  alder: {} as FarmRows,
  bellweather: {} as FarmRows,
  cottonwood: {} as FarmRows,
  mesa: {} as FarmRows,
  alderSecondField: "",
  alderDeletedField: "",
  unconfirmedPhoto: "",
  deletedDig: {} as FarmRows,
  svgPhoto: "",
  stressFields: [] as string[],
};

interface FarmRows {
  fieldId: string;
  plantingId: string;
  passId: string;
  digSiteId: string;
  plantId: string;
  photoId: string;
}

const userId = (key: string) => fx.users[DEMO_USERS.find((u) => u.key === key)!.email]!;
const sha = (s: string) => createHash("sha256").update(s).digest("hex");

async function insertField(
  accountId: string,
  name: string,
  stationId: string | null = null,
  deleted = false,
) {
  const id = randomUUID();
  await db
    .insertInto("field")
    .values({
      id,
      accountId,
      name,
      areaAcres: 80,
      soilTexture: "medium",
      weatherStationId: stationId,
      deletedAt: deleted ? new Date() : null,
    })
    .execute();
  return id;
}

async function insertPhoto(
  digSiteId: string,
  dugPlantId: string | null,
  label: string,
  confirmed: boolean,
  type = "image/jpeg",
) {
  const id = randomUUID();
  const hash = sha(`${label}-${id}`);
  await db
    .insertInto("photo")
    .values({
      id,
      digSiteId,
      dugPlantId,
      sha256: hash,
      byteSize: 180_000,
      contentType: type,
      width: 2048,
      height: 1536,
      caption: label,
      capturedAt: new Date("2026-05-14T16:30:00Z"),
      objectKey: `photos/${hash}`,
      confirmedAt: confirmed ? new Date("2026-05-14T18:00:00Z") : null,
    })
    .execute();
  return id;
}

async function createFarmRows(
  accountId: string,
  label: string,
  stationId: string | null,
  repId: string | null,
) {
  const fieldId = await insertField(accountId, tag(`${label} field`), stationId);
  const plantingId = randomUUID();
  await db
    .insertInto("planting")
    .values({
      id: plantingId,
      fieldId,
      accountId,
      hybrid: "pull 108-day",
      plantedOn: "2026-04-22",
      seedingRate: 34_000,
      seedingDepthIn: 2,
      rowSpacingIn: 30,
      soilTexture: "medium",
    })
    .execute();
  const passId = randomUUID();
  await db
    .insertInto("fertilizerPass")
    .values({
      id: passId,
      fieldId,
      plantingId,
      accountId,
      productId: fx.activeProduct,
      appliedOn: "2026-04-22",
      rate: 5,
      rateUnit: "gal/ac",
      placement: "seed_placed",
    })
    .execute();
  const digSiteId = randomUUID();
  await db
    .insertInto("digSite")
    .values({
      id: digSiteId,
      fieldId,
      plantingId,
      accountId,
      repId,
      dugAt: new Date("2026-05-14T16:20:00Z"),
      soilMoisture: "moist",
      soilTempF: 57,
      notes: tag(label),
    })
    .execute();
  const plantId = randomUUID();
  await db
    .insertInto("dugPlant")
    .values({ id: plantId, digSiteId, leafStage: "V3", findings: ["band_burn"], seminalInjury: "moderate" })
    .execute();
  const photoId = await insertPhoto(digSiteId, plantId, tag(`${label} photo`), true);
  return { fieldId, plantingId, passId, digSiteId, plantId, photoId };
}

const pullBody = (clientGroupId: string, cursor: string | null = null) => ({
  protocolVersion: PROTOCOL_VERSION,
  schemaVersion: SCHEMA_VERSION,
  clientGroupId,
  cursor,
});

// Every row has exactly the keys of its protocol schema: nothing missing, nothing extra.
const ROW_SCHEMAS = {
  accounts: pulledAccountSchema,
  fields: pulledFieldSchema,
  plantings: pulledPlantingSchema,
  fertilizerPasses: pulledFertilizerPassSchema,
  products: pulledProductSchema,
  weather: pulledWeatherDaySchema,
  digSites: pulledDigSiteSchema,
  dugPlants: pulledDugPlantSchema,
  photos: pulledPhotoSchema,
} as const;

function expectExactShape(body: Record<string, unknown>) {
  expect(Object.keys(body).sort()).toEqual(Object.keys(pullResponseSchema.shape).sort());
  const changes = body.changes as Record<string, Record<string, unknown>[]>;
  expect(Object.keys(changes).sort()).toEqual(Object.keys(ROW_SCHEMAS).sort());
  for (const [kind, schema] of Object.entries(ROW_SCHEMAS)) {
    const want = Object.keys(schema.shape).sort();
    for (const row of changes[kind]!) expect(Object.keys(row).sort(), kind).toEqual(want);
  }
}

async function pullOk(who: RoleKey, cursor: string | null = null): Promise<PullResponse> {
  const res = await clients[who].json("/api/sync/pull", "POST", pullBody(groups[who], cursor));
  expect(res.status).toBe(200);
  expect(res.headers.get("content-type")).toContain("application/json");
  expect(res.headers.get("cache-control")).toBe("no-store");
  const body = (await res.json()) as Record<string, unknown>;
  expectExactShape(body);
  return pullResponseSchema.parse(body);
}

const ids = (rows: { id: string }[]) => new Set(rows.map((r) => r.id));
const allLive = (p: PullResponse) =>
  [
    p.changes.fields,
    p.changes.plantings,
    p.changes.fertilizerPasses,
    p.changes.digSites,
    p.changes.dugPlants,
    p.changes.photos,
  ].every((rows) => rows.every((r) => !r.deleted));

beforeAll(async () => {
  db = createDb(testEnv.databaseUrl, 5);
  for (const u of await db.selectFrom("appUser").select(["id", "email"]).execute()) fx.users[u.email] = u.id;
  const regions = await db.selectFrom("region").select(["id", "name"]).execute();
  fx.sandhollow = regions.find((r) => r.name === "Sandhollow Valley")!.id;
  fx.upperMesa = regions.find((r) => r.name === "Upper Mesa")!.id;
  const accountId = async (name: string) =>
    (await db.selectFrom("account").select("id").where("name", "=", name).executeTakeFirstOrThrow()).id;
  fx.accounts.alder = await accountId("Alder Creek Farms");
  fx.accounts.bellweather = await accountId("Bellweather Ranch");
  fx.accounts.cottonwood = await accountId("Cottonwood Bend Dairy");
  fx.accounts.mesa = (
    await db
      .insertInto("account")
      .values({ regionId: fx.upperMesa, name: tag("Mesa Farm"), locality: "Mesa top" })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;

  const station = async (label: string) =>
    (
      await db
        .insertInto("weatherStation")
        .values({ regionId: fx.sandhollow, name: tag(`${label} station`), latitude: 41.1, longitude: -101.7 })
        .returning("id")
        .executeTakeFirstOrThrow()
    ).id;
  fx.stations.alder = await station("alder");
  fx.stations.cottonwood = await station("cottonwood");
  for (const [stationId, days] of [
    [fx.stations.alder, ["2026-05-01", "2026-05-02", "2026-05-03"]],
    [fx.stations.cottonwood, ["2026-05-01"]],
  ] as const) {
    await db
      .insertInto("weatherDaily")
      .values(days.map((day, i) => ({ stationId, day, maxF: 70 + i, minF: 45 + i, source: "fixture" })))
      .execute();
  }

  const product = async (label: string, active: boolean) =>
    (
      await db
        .insertInto("product")
        .values({
          name: `pull ammonium polyphosphate 10-34-0 ${label} ${suffix}`,
          chemistry: "ammonium polyphosphate solution",
          form: "liquid",
          gradeN: 10,
          gradeP2o5: 34,
          gradeK2o: 0,
          lbPerGal: 11.65,
          densitySource: "pull fixture",
          active,
        })
        .returning("id")
        .executeTakeFirstOrThrow()
    ).id;
  fx.activeProduct = await product("active", true);
  fx.inactiveProduct = await product("retired", false);

  fx.alder = await createFarmRows(fx.accounts.alder, "Alder", fx.stations.alder, userId("rep1"));
  fx.bellweather = await createFarmRows(fx.accounts.bellweather, "Bellweather", null, userId("rep1"));
  fx.cottonwood = await createFarmRows(
    fx.accounts.cottonwood,
    "Cottonwood",
    fx.stations.cottonwood,
    userId("rep2"),
  );
  fx.mesa = await createFarmRows(fx.accounts.mesa, "Mesa", null, null);
  fx.alderSecondField = await insertField(fx.accounts.alder, tag("Alder second field"));
  fx.alderDeletedField = await insertField(fx.accounts.alder, tag("Alder deleted field"), null, true);
  fx.deletedDig = await createFarmRows(fx.accounts.alder, "Alder deleted dig", null, userId("rep1"));
  await db
    .updateTable("digSite")
    .set({ deletedAt: new Date() })
    .where("id", "=", fx.deletedDig.digSiteId)
    .execute();
  fx.unconfirmedPhoto = await insertPhoto(fx.alder.digSiteId, null, tag("unconfirmed"), false);
  fx.svgPhoto = await insertPhoto(fx.alder.digSiteId, null, tag("svg"), true, "image/svg+xml");
  for (let i = 0; i < 6; i++) fx.stressFields.push(await insertField(fx.accounts.alder, tag(`stress ${i}`)));

  for (const key of ROLES) {
    clients[key] = await signedInAs(key);
    groups[key] = randomUUID();
  }
});

afterAll(async () => {
  const farms = [fx.alder, fx.bellweather, fx.cottonwood, fx.mesa, fx.deletedDig].filter((f) => f.fieldId);
  const fieldIds = [
    ...farms.map((f) => f.fieldId),
    fx.alderSecondField,
    fx.alderDeletedField,
    ...fx.stressFields,
  ].filter(Boolean);
  if (fieldIds.length) {
    const digs = db.selectFrom("digSite").select("id").where("fieldId", "in", fieldIds);
    await db.deleteFrom("photo").where("digSiteId", "in", digs).execute();
    await db.deleteFrom("dugPlant").where("digSiteId", "in", digs).execute();
    await db.deleteFrom("digSite").where("fieldId", "in", fieldIds).execute();
    await db.deleteFrom("fertilizerPass").where("fieldId", "in", fieldIds).execute();
    await db.deleteFrom("planting").where("fieldId", "in", fieldIds).execute();
    await db.deleteFrom("field").where("id", "in", fieldIds).execute();
  }
  await db.deleteFrom("weatherStation").where("name", "like", `Pull % ${suffix} station`).execute();
  await db.deleteFrom("product").where("name", "like", `pull % ${suffix}`).execute();
  await db.deleteFrom("account").where("name", "=", tag("Mesa Farm")).execute();
  const groupIds = Object.values(groups).filter(Boolean);
  if (groupIds.length) await db.deleteFrom("syncClientGroup").where("id", "in", groupIds).execute();
  await db.destroy();
});

describe("first pull: what each role may see", () => {
  it("rep1 gets Alder Creek and Bellweather data only, the active catalog and their stations' weather", async () => {
    const p = await pullOk("rep1");
    expect(p.reset).toBe(false);
    expect(p.lastMutationIds).toEqual({});
    expect(p.rejections).toEqual([]);
    const mine = new Set([fx.accounts.alder, fx.accounts.bellweather]);
    expect(p.changes.accounts.map((a) => a.name).sort()).toEqual(["Alder Creek Farms", "Bellweather Ranch"]);
    for (const rows of [p.changes.fields, p.changes.plantings, p.changes.digSites]) {
      for (const r of rows) expect(mine.has(r.accountId)).toBe(true);
    }
    const fieldIds = ids(p.changes.fields);
    for (const farm of [fx.alder, fx.bellweather]) {
      expect(fieldIds.has(farm.fieldId)).toBe(true);
      expect(ids(p.changes.plantings).has(farm.plantingId)).toBe(true);
      expect(ids(p.changes.fertilizerPasses).has(farm.passId)).toBe(true);
      expect(ids(p.changes.digSites).has(farm.digSiteId)).toBe(true);
      expect(ids(p.changes.dugPlants).has(farm.plantId)).toBe(true);
      expect(ids(p.changes.photos).has(farm.photoId)).toBe(true);
    }
    for (const farm of [fx.cottonwood, fx.mesa]) {
      const all = JSON.stringify(p.changes);
      for (const id of Object.values(farm)) expect(all).not.toContain(id);
    }
    for (const pass of p.changes.fertilizerPasses) expect(fieldIds.has(pass.fieldId)).toBe(true);
    const digIds = ids(p.changes.digSites);
    for (const plant of p.changes.dugPlants) expect(digIds.has(plant.digSiteId)).toBe(true);
    for (const photo of p.changes.photos) {
      expect(digIds.has(photo.digSiteId)).toBe(true);
      expect(photo.confirmedAt).not.toBeNull();
    }
    const photoIds = ids(p.changes.photos);
    expect(photoIds.has(fx.unconfirmedPhoto)).toBe(false);
    expect(photoIds.has(fx.svgPhoto)).toBe(false);
    // A first pull carries live rows only: no tombstones.
    expect(fieldIds.has(fx.alderDeletedField)).toBe(false);
    // Nor the plants and photos of a deleted dig.
    expect(ids(p.changes.digSites).has(fx.deletedDig.digSiteId)).toBe(false);
    expect(ids(p.changes.dugPlants).has(fx.deletedDig.plantId)).toBe(false);
    expect(ids(p.changes.photos).has(fx.deletedDig.photoId)).toBe(false);
    expect(allLive(p)).toBe(true);
    const alderPlant = p.changes.dugPlants.find((r) => r.id === fx.alder.plantId)!;
    expect(alderPlant).toMatchObject({ leafStage: "V3", findings: ["band_burn"], seminalInjury: "moderate" });
    expect(p.changes.digSites.find((r) => r.id === fx.alder.digSiteId)).toMatchObject({
      dugAt: "2026-05-14T16:20:00.000Z",
      soilTempF: 57,
      repId: userId("rep1"),
    });

    const active = await db.selectFrom("product").select("id").where("active", "=", true).execute();
    expect(ids(p.changes.products)).toEqual(ids(active));
    expect(ids(p.changes.products).has(fx.inactiveProduct)).toBe(false);
    const stationIds = new Set(p.changes.weather.map((w) => w.stationId));
    expect(stationIds.has(fx.stations.alder)).toBe(true);
    expect(stationIds.has(fx.stations.cottonwood)).toBe(false);
    const usedStations = new Set(p.changes.fields.map((f) => f.weatherStationId));
    for (const s of stationIds) expect(usedStations.has(s)).toBe(true);
    expect(p.changes.weather.filter((w) => w.stationId === fx.stations.alder)).toEqual([
      { stationId: fx.stations.alder, day: "2026-05-01", maxF: 70, minF: 45 },
      { stationId: fx.stations.alder, day: "2026-05-02", maxF: 71, minF: 46 },
      { stationId: fx.stations.alder, day: "2026-05-03", maxF: 72, minF: 47 },
    ]);
  });

  it("grower1 gets only their own farm", async () => {
    const p = await pullOk("grower1");
    expect(p.changes.accounts.map((a) => a.id)).toEqual([fx.accounts.alder]);
    for (const rows of [p.changes.fields, p.changes.plantings, p.changes.digSites]) {
      for (const r of rows) expect(r.accountId).toBe(fx.accounts.alder);
    }
    expect(ids(p.changes.digSites).has(fx.alder.digSiteId)).toBe(true);
    expect(ids(p.changes.fields).has(fx.bellweather.fieldId)).toBe(false);
    expect(ids(p.changes.photos).has(fx.bellweather.photoId)).toBe(false);
  });

  it("the supervisor gets every account of their region and nothing of another", async () => {
    const p = await pullOk("supervisor");
    const regionAccounts = await db
      .selectFrom("account")
      .select("id")
      .where("regionId", "=", fx.sandhollow)
      .execute();
    expect(ids(p.changes.accounts)).toEqual(ids(regionAccounts));
    for (const farm of [fx.alder, fx.bellweather, fx.cottonwood]) {
      expect(ids(p.changes.digSites).has(farm.digSiteId)).toBe(true);
      expect(ids(p.changes.photos).has(farm.photoId)).toBe(true);
    }
    expect(JSON.stringify(p.changes)).not.toContain(fx.mesa.fieldId);
    expect(ids(p.changes.accounts).has(fx.accounts.mesa)).toBe(false);
    expect(new Set(p.changes.weather.map((w) => w.stationId)).has(fx.stations.cottonwood)).toBe(true);
  });

  it("the admin also gets the other region", async () => {
    const p = await pullOk("admin");
    expect(ids(p.changes.accounts).has(fx.accounts.mesa)).toBe(true);
    expect(ids(p.changes.digSites).has(fx.mesa.digSiteId)).toBe(true);
  });
});

describe("refusals", () => {
  it("answers a request without a session 401 JSON", async () => {
    const res = await new ApiClient().json("/api/sync/pull", "POST", pullBody(randomUUID()));
    expect(res.status).toBe(401);
    expect(res.headers.get("content-type")).toContain("application/json");
    expect((await res.json()).error).toEqual(expect.any(String));
  });

  it("answers a bad body 422 with the issues", async () => {
    const res = await clients.rep1.json("/api/sync/pull", "POST", {
      protocolVersion: PROTOCOL_VERSION,
      schemaVersion: SCHEMA_VERSION,
      clientGroupId: "not-a-uuid",
      cursor: 7,
      extra: true,
    });
    expect(res.status).toBe(422);
    const body = await res.json();
    const paths = (body.issues as { path: string }[]).map((i) => i.path);
    expect(paths).toEqual(expect.arrayContaining(["clientGroupId", "cursor"]));
  });

  it("refuses an unsupported protocol or schema version with a clear message, and accepts the previous schema", async () => {
    const old = await clients.rep1.json("/api/sync/pull", "POST", {
      ...pullBody(groups.rep1),
      protocolVersion: PROTOCOL_VERSION - 1,
    });
    expect(old.status).toBe(409);
    expect((await old.json()).error).toMatch(/too old to sync.*kept/);
    const newer = await clients.rep1.json("/api/sync/pull", "POST", {
      ...pullBody(groups.rep1),
      schemaVersion: SCHEMA_VERSION + 1,
    });
    expect(newer.status).toBe(409);
    expect((await newer.json()).error).toMatch(/newer than the server/);
    const previous = await clients.rep1.json("/api/sync/pull", "POST", {
      ...pullBody(groups.rep1),
      schemaVersion: SCHEMA_VERSION - 1,
    });
    expect(previous.status).toBe(200);
  });

  it("refuses another user's client group 403 and ties a new group to its first user", async () => {
    await pullOk("rep1");
    const res = await clients.rep2.json("/api/sync/pull", "POST", pullBody(groups.rep1));
    expect(res.status).toBe(403);
    expect(res.headers.get("cache-control")).toBe("no-store");
    const group = await db
      .selectFrom("syncClientGroup")
      .select("userId")
      .where("id", "=", groups.rep1)
      .executeTakeFirstOrThrow();
    expect(group.userId).toBe(userId("rep1"));
  });

  it("returns the group's last mutation ids and refused mutations", async () => {
    const clientA = randomUUID();
    const clientB = randomUUID();
    const other = randomUUID();
    await pullOk("rep2");
    await db
      .insertInto("syncClient")
      .values([
        { id: clientA, clientGroupId: groups.rep1, lastMutationId: 7 },
        { id: clientB, clientGroupId: groups.rep1, lastMutationId: 2 },
        { id: other, clientGroupId: groups.rep2, lastMutationId: 9 },
      ])
      .execute();
    await db
      .insertInto("syncMutationResult")
      .values([
        {
          clientId: clientA,
          mutationId: 6,
          name: "dugPlant.put",
          status: "rejected",
          reason: "No such dig.",
        },
        { clientId: clientA, mutationId: 7, name: "digSite.put", status: "applied", reason: null },
        { clientId: other, mutationId: 9, name: "photo.put", status: "rejected", reason: "Not yours." },
      ])
      .execute();
    const p = await pullOk("rep1");
    expect(p.lastMutationIds).toEqual({ [clientA]: 7, [clientB]: 2 });
    expect(p.rejections).toEqual([
      { clientId: clientA, mutationId: 6, name: "dugPlant.put", reason: "No such dig." },
    ]);
  });
});

describe("deltas", () => {
  it("after a field edit, the next pull carries exactly that field (plus the full lists)", async () => {
    const first = await pullOk("rep1");
    const res = await clients.rep1.json(`/api/fields/${fx.alderSecondField}`, "PATCH", {
      name: tag("Alder renamed"),
    });
    expect(res.status).toBe(200);
    const version = (await res.json()).field.version as number;

    const delta = await pullOk("rep1", first.cursor);
    expect(delta.reset).toBe(false);
    expect(delta.changes.fields).toEqual([
      expect.objectContaining({
        id: fx.alderSecondField,
        name: tag("Alder renamed"),
        version,
        deleted: false,
      }),
    ]);
    for (const kind of ["plantings", "fertilizerPasses", "digSites", "dugPlants", "photos"] as const) {
      expect(delta.changes[kind], kind).toEqual([]);
    }
    // Accounts, catalog and weather have no per-region version: they come in full every time.
    expect(ids(delta.changes.accounts)).toEqual(ids(first.changes.accounts));
    expect(ids(delta.changes.products)).toEqual(ids(first.changes.products));
    expect(delta.changes.weather).toEqual(first.changes.weather);
    expect(decodeCursor(delta.cursor)!.r[fx.sandhollow]).toBe(version);

    // Nothing changed since: an empty delta, and the cursor stays.
    const again = await pullOk("rep1", delta.cursor);
    expect(again.changes.fields).toEqual([]);
    expect(decodeCursor(again.cursor)!.r).toEqual(decodeCursor(delta.cursor)!.r);
  });

  it("a change on another rep's farm does not reach rep1's delta", async () => {
    const first = await pullOk("rep1");
    const res = await clients.rep2.json(`/api/fields/${fx.cottonwood.fieldId}`, "PATCH", {
      name: tag("Cottonwood renamed"),
    });
    expect(res.status).toBe(200);
    const delta = await pullOk("rep1", first.cursor);
    expect(JSON.stringify(delta.changes)).not.toContain(fx.cottonwood.fieldId);
    const supervisorFirst = await pullOk("supervisor");
    expect(supervisorFirst.changes.fields.find((f) => f.id === fx.cottonwood.fieldId)?.name).toBe(
      tag("Cottonwood renamed"),
    );
  });

  it("a soft-deleted row arrives as a tombstone on a delta pull and is absent from a first pull", async () => {
    const first = await pullOk("rep1");
    await db.transaction().execute(async (trx) => {
      const version = await nextVersion(trx, fx.sandhollow);
      await trx
        .updateTable("planting")
        .set({ deletedAt: new Date(), version })
        .where("id", "=", fx.bellweather.plantingId)
        .execute();
    });
    const delta = await pullOk("rep1", first.cursor);
    expect(delta.changes.plantings).toEqual([
      expect.objectContaining({ id: fx.bellweather.plantingId, deleted: true }),
    ]);
    const fresh = await pullOk("rep1");
    expect(ids(fresh.changes.plantings).has(fx.bellweather.plantingId)).toBe(false);
  });
});

describe("resets", () => {
  it("a cursor that cannot be read, or belongs to another user, gets reset: true with a full snapshot", async () => {
    for (const cursor of ["not a cursor", encodeCursor({ f: 1, u: "x", s: "y", t: Date.now(), r: {} })]) {
      const p = await pullOk("rep1", cursor);
      expect(p.reset).toBe(true);
      expect(ids(p.changes.fields).has(fx.alder.fieldId)).toBe(true);
      expect(allLive(p)).toBe(true);
    }
    const rep2 = await pullOk("rep2");
    const p = await pullOk("rep1", rep2.cursor);
    expect(p.reset).toBe(true);
    expect(ids(p.changes.accounts)).toEqual(new Set([fx.accounts.alder, fx.accounts.bellweather]));
  });

  it("a cursor older than the tombstone retention gets a reset; a younger one does not", async () => {
    const current = decodeCursor((await pullOk("rep1")).cursor)!;
    const aged = (ms: number) => encodeCursor({ ...current, t: Date.now() - ms });
    expect((await pullOk("rep1", aged(CURSOR_MAX_AGE_MS - 3_600_000))).reset).toBe(false);
    const old = await pullOk("rep1", aged(CURSOR_MAX_AGE_MS + 3_600_000));
    expect(old.reset).toBe(true);
    expect(ids(old.changes.digSites).has(fx.alder.digSiteId)).toBe(true);
  });

  it("a change of scope (a farm added to the rep) resets, so the new farm's older rows arrive", async () => {
    const before = await pullOk("rep1");
    await db
      .insertInto("accountRep")
      .values({ accountId: fx.accounts.mesa, userId: userId("rep1") })
      .execute();
    try {
      const p = await pullOk("rep1", before.cursor);
      expect(p.reset).toBe(true);
      expect(ids(p.changes.digSites).has(fx.mesa.digSiteId)).toBe(true);
      expect(ids(p.changes.accounts).has(fx.accounts.mesa)).toBe(true);
    } finally {
      await db
        .deleteFrom("accountRep")
        .where("accountId", "=", fx.accounts.mesa)
        .where("userId", "=", userId("rep1"))
        .execute();
    }
  });
});

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function setName(trx: ControlledTransaction<Database>, id: string, name: string, version?: number) {
  await trx
    .updateTable("field")
    .set(version === undefined ? { name } : { name, version })
    .where("id", "=", id)
    .execute();
}

describe("overlapping writers (SYNC.md fault 11)", () => {
  it("two transactions taking versions for one region commit in version order, and the pulls between skip nothing", async () => {
    const [a, b] = [fx.stressFields[0]!, fx.stressFields[1]!];
    const c0 = (await pullOk("rep1")).cursor;
    const base = decodeCursor(c0)!.r[fx.sandhollow]!;

    // T1 takes the smaller version and writes field A; T2 writes field B first, then asks for its version.
    const t1 = await db.startTransaction().execute();
    const t2 = await db.startTransaction().execute();
    try {
      const v1 = await nextVersion(t1, fx.sandhollow);
      expect(v1).toBe(base + 1);
      await setName(t1, a, tag("ooo A"), v1);
      await setName(t2, b, tag("ooo B"));
      let t2Version: number | null = null;
      const v2Promise = nextVersion(t2, fx.sandhollow).then((v) => {
        t2Version = v;
        return v;
      });
      // T2, the writer of the larger version, cannot even obtain it while T1 is open, so it cannot
      // commit before T1: the smaller version can never commit last.
      await sleep(400);
      expect(t2Version).toBeNull();

      const mid = await pullOk("rep1", c0);
      expect(ids(mid.changes.fields).has(a)).toBe(false);
      expect(ids(mid.changes.fields).has(b)).toBe(false);
      expect(decodeCursor(mid.cursor)!.r[fx.sandhollow]).toBe(base);

      await t1.commit().execute();
      const v2 = await v2Promise;
      expect(v2).toBe(v1 + 1);
      await setName(t2, b, tag("ooo B"), v2);

      const afterT1 = await pullOk("rep1", mid.cursor);
      expect(afterT1.changes.fields).toEqual([expect.objectContaining({ id: a, version: v1 })]);
      expect(decodeCursor(afterT1.cursor)!.r[fx.sandhollow]).toBe(v1);

      await t2.commit().execute();
      const afterT2 = await pullOk("rep1", afterT1.cursor);
      expect(afterT2.changes.fields).toEqual([expect.objectContaining({ id: b, version: v2 })]);
      expect(decodeCursor(afterT2.cursor)!.r[fx.sandhollow]).toBe(v2);

      // The chain of deltas saw both rows, as does one delta from the first cursor.
      const once = await pullOk("rep1", c0);
      expect(once.changes.fields.map((f) => f.id).sort()).toEqual([a, b].sort());
    } finally {
      if (!t1.isCommitted && !t1.isRolledBack) await t1.rollback().execute();
      if (!t2.isCommitted && !t2.isRolledBack) await t2.rollback().execute();
    }
  });

  it("a version taken by a writer that rolls back is handed out again, so no gap is left for a pull to miss", async () => {
    const [a, b] = [fx.stressFields[2]!, fx.stressFields[3]!];
    const c0 = (await pullOk("rep1")).cursor;
    const base = decodeCursor(c0)!.r[fx.sandhollow]!;
    const t1 = await db.startTransaction().execute();
    const t2 = await db.startTransaction().execute();
    try {
      await setName(t1, a, tag("rolled back"), await nextVersion(t1, fx.sandhollow));
      const v2Promise = nextVersion(t2, fx.sandhollow);
      await sleep(200);
      await t1.rollback().execute();
      const v2 = await v2Promise;
      expect(v2).toBe(base + 1);
      await setName(t2, b, tag("after rollback"), v2);
      await t2.commit().execute();
      const p = await pullOk("rep1", c0);
      expect(p.changes.fields).toEqual([
        expect.objectContaining({ id: b, name: tag("after rollback"), version: v2 }),
      ]);
    } finally {
      if (!t1.isCommitted && !t1.isRolledBack) await t1.rollback().execute();
      if (!t2.isCommitted && !t2.isRolledBack) await t2.rollback().execute();
    }
  });

  it("under concurrent edits and pulls, chained deltas end with every field as stored and the cursor never goes back", async () => {
    const fields = fx.stressFields;
    let cursor = (await pullOk("rep1")).cursor;
    const seen = new Map<string, { name: string; version: number }>();
    const regionVersions: number[] = [];
    let writing = true;

    const writers = (async () => {
      const edits = [];
      for (let round = 0; round < 5; round++) {
        for (const [i, id] of fields.entries()) {
          edits.push(
            clients.rep1
              .json(`/api/fields/${id}`, "PATCH", { name: tag(`stress ${i} round ${round}`) })
              .then((r) => expect(r.status).toBe(200)),
          );
        }
        await Promise.all(edits.splice(0));
      }
      writing = false;
    })();
    const puller = (async () => {
      while (writing) {
        const p = await pullOk("rep1", cursor);
        for (const f of p.changes.fields) seen.set(f.id, { name: f.name, version: f.version });
        regionVersions.push(decodeCursor(p.cursor)!.r[fx.sandhollow]!);
        cursor = p.cursor;
      }
    })();
    await Promise.all([writers, puller]);
    const last = await pullOk("rep1", cursor);
    for (const f of last.changes.fields) seen.set(f.id, { name: f.name, version: f.version });
    regionVersions.push(decodeCursor(last.cursor)!.r[fx.sandhollow]!);

    const stored = await db
      .selectFrom("field")
      .select(["id", "name", "version"])
      .where("id", "in", fields)
      .execute();
    for (const row of stored) expect(seen.get(row.id)).toEqual({ name: row.name, version: row.version });
    expect(regionVersions).toEqual([...regionVersions].sort((x, y) => x - y));
  });
});
