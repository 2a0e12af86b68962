// GET /api/map: GeoJSON of field boundaries and dig pins for the visible bounds, scoped to what the
// actor may see and narrowed by the filters. Fixture fields and digs sit in a box of open ocean no demo
// record comes near, so the demo seed never changes the counts; invalid bounds and filters are 400.
import { randomUUID } from "node:crypto";
import type { Kysely } from "kysely";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { Database, NewDigSite } from "@/db/schema";
import { isDigFeature, isFieldFeature, type MapFeatureCollection } from "@/lib/geo/map-features";
import { testEnv } from "../helpers/env";
import { type ApiClient, signedInAs } from "../helpers/session";

let db: Kysely<Database>;
const suffix = randomUUID().slice(0, 8);
// A 0.1° box far out in the Southern Ocean, shifted per run so a leftover of a killed run can't collide.
const LON0 = -140 + Math.floor(Math.random() * 200) / 10;
const LAT0 = -62;
const BBOX = `${LON0},${LAT0},${LON0 + 0.1},${LAT0 + 0.1}`;
const at = (dx: number, dy: number): [number, number] => [LON0 + dx, LAT0 + dy];

type Farm = "alder" | "bell" | "cotton" | "mesa";
const fx = {
  accounts: {} as Record<Farm, string>,
  fields: {} as Record<Farm, string>,
  plantings: { h1: randomUUID(), h2: randomUUID(), bellH1: randomUUID(), cottonH1: randomUUID() },
  digs: {
    alderV3: randomUUID(),
    alderPoor: randomUUID(),
    alderRepFlag: randomUUID(),
    alderOutside: randomUUID(),
    alderDeleted: randomUUID(),
    bell: randomUUID(),
    cottonCase: randomUUID(),
    mesa: randomUUID(),
  },
  mesaRegion: "",
};

const square = (x: number, y: number) => ({
  type: "Polygon",
  coordinates: [[at(x, y), at(x + 0.01, y), at(x + 0.01, y + 0.01), at(x, y + 0.01), at(x, y)]],
});

const assessment = (leafCollars: number, severities: string[], review: boolean) =>
  JSON.stringify({
    leafCollars,
    plants: [],
    siteIndex: 0,
    audit: [],
    flags: severities.map((severity, i) => ({ code: `fixture_${i}`, severity, message: "fixture" })),
    flagForReview: { flag: review, reason: "", reasons: [] },
  });

beforeAll(async () => {
  db = createDb(testEnv.databaseUrl);
  const account = async (name: string) =>
    (await db.selectFrom("account").select("id").where("name", "=", name).executeTakeFirstOrThrow()).id;
  fx.accounts.alder = await account("Alder Creek Farms");
  fx.accounts.bell = await account("Bellweather Ranch");
  fx.accounts.cotton = await account("Cottonwood Bend Dairy");
  fx.mesaRegion = (
    await db.selectFrom("region").select("id").where("name", "=", "Upper Mesa").executeTakeFirstOrThrow()
  ).id;
  fx.accounts.mesa = (
    await db
      .insertInto("account")
      .values({ regionId: fx.mesaRegion, name: `Map Mesa Farm ${suffix}` })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;

  const farms: Farm[] = ["alder", "bell", "cotton", "mesa"];
  for (const [i, farm] of farms.entries()) {
    fx.fields[farm] = randomUUID();
    const [lon, lat] = at(0.02 * i + 0.005, 0.005);
    await db
      .insertInto("field")
      .values({
        id: fx.fields[farm],
        accountId: fx.accounts[farm],
        name: `Map ${farm} ${suffix}`,
        boundary: JSON.stringify(square(0.02 * i, 0)),
        areaAcres: 60.04,
        centroidLat: lat,
        centroidLon: lon,
      })
      .execute();
  }
  const planting = (id: string, farm: Farm, hybrid: string) => ({
    id,
    fieldId: fx.fields[farm],
    accountId: fx.accounts[farm],
    hybrid,
    plantedOn: "2026-04-10",
    seedingRate: 34_000,
    seedingDepthIn: 2,
    rowSpacingIn: 30,
    soilTexture: "medium" as const,
  });
  await db
    .insertInto("planting")
    .values([
      planting(fx.plantings.h1, "alder", `MAP-H1-${suffix}`),
      planting(fx.plantings.h2, "alder", `MAP-H2-${suffix}`),
      planting(fx.plantings.bellH1, "bell", `MAP-H1-${suffix}`),
      planting(fx.plantings.cottonH1, "cotton", `MAP-H1-${suffix}`),
    ])
    .execute();
  const dig = (
    id: string,
    farm: Farm,
    plantingId: string | null,
    day: string,
    [lon, lat]: [number, number],
    extra: Partial<NewDigSite> = {},
  ) => ({
    id,
    fieldId: fx.fields[farm],
    accountId: fx.accounts[farm],
    plantingId,
    dugAt: `${day}T17:30:00Z`,
    latitude: lat,
    longitude: lon,
    ...extra,
  });
  await db
    .insertInto("digSite")
    .values([
      dig(fx.digs.alderV3, "alder", fx.plantings.h1, "2026-05-01", at(0.004, 0.004), {
        rootIndex: 72.36,
        assessment: assessment(3, [], false),
      }),
      dig(fx.digs.alderPoor, "alder", fx.plantings.h2, "2026-05-10", at(0.006, 0.006), {
        rootIndex: 35,
        assessment: assessment(5, ["warning", "critical"], true),
      }),
      // No assessment: the stage comes from the plants (median of V2, V3, V3).
      dig(fx.digs.alderRepFlag, "alder", null, "2026-05-05", at(0.007, 0.003), { flaggedByRep: true }),
      dig(fx.digs.alderOutside, "alder", fx.plantings.h1, "2026-05-01", at(0.004, 0.3), {
        assessment: assessment(3, [], false),
      }),
      dig(fx.digs.alderDeleted, "alder", fx.plantings.h1, "2026-05-01", at(0.005, 0.005), {
        deletedAt: new Date(),
      }),
      dig(fx.digs.bell, "bell", fx.plantings.bellH1, "2026-05-03", at(0.025, 0.004), {
        assessment: assessment(3, [], false),
        rootIndex: 64,
      }),
      dig(fx.digs.cottonCase, "cotton", fx.plantings.cottonH1, "2026-05-04", at(0.045, 0.004), {
        assessment: assessment(3, ["caution"], false),
        rootIndex: 50,
      }),
      dig(fx.digs.mesa, "mesa", null, "2026-05-04", at(0.065, 0.004)),
    ])
    .execute();
  await db
    .insertInto("dugPlant")
    .values(
      ["V2", "V3", "V3"].map((leafStage, i) => ({
        id: randomUUID(),
        digSiteId: fx.digs.alderRepFlag,
        position: i + 1,
        leafStage,
      })),
    )
    .execute();
  await db
    .insertInto("injuryCase")
    .values({
      digSiteId: fx.digs.cottonCase,
      accountId: fx.accounts.cotton,
      status: "in_review",
      severity: "warning",
    })
    .execute();
});

afterAll(async () => {
  const digIds = Object.values(fx.digs);
  await db.deleteFrom("injuryCase").where("digSiteId", "in", digIds).execute();
  await db.deleteFrom("dugPlant").where("digSiteId", "in", digIds).execute();
  await db.deleteFrom("digSite").where("id", "in", digIds).execute();
  await db.deleteFrom("planting").where("id", "in", Object.values(fx.plantings)).execute();
  await db.deleteFrom("field").where("id", "in", Object.values(fx.fields)).execute();
  await db.deleteFrom("account").where("id", "=", fx.accounts.mesa).execute();
  await db.destroy();
});

async function getMap(client: ApiClient, query = "") {
  const res = await client.fetch(`/api/map?bbox=${BBOX}${query}`);
  expect(res.status).toBe(200);
  const body = (await res.json()) as MapFeatureCollection;
  expect(body.type).toBe("FeatureCollection");
  const digs = body.features.filter(isDigFeature);
  const fields = body.features.filter(isFieldFeature);
  return { digs, fields, digIds: digs.map((d) => d.id).sort(), fieldIds: fields.map((f) => f.id).sort() };
}

const sorted = (...ids: string[]) => [...ids].sort();

describe("who sees what", () => {
  it("a grower sees only their own farm's fields and pins", async () => {
    const grower1 = await getMap(await signedInAs("grower1"));
    expect(grower1.digIds).toEqual(sorted(fx.digs.alderV3, fx.digs.alderPoor, fx.digs.alderRepFlag));
    expect(grower1.fieldIds).toEqual([fx.fields.alder]);
    const grower2 = await getMap(await signedInAs("grower2"));
    expect(grower2.digIds).toEqual([fx.digs.bell]);
    expect(grower2.fieldIds).toEqual([fx.fields.bell]);
  });

  it("a rep sees the accounts they serve, not another rep's", async () => {
    const rep1 = await getMap(await signedInAs("rep1"));
    expect(rep1.digIds).toEqual(
      sorted(fx.digs.alderV3, fx.digs.alderPoor, fx.digs.alderRepFlag, fx.digs.bell),
    );
    const rep2 = await getMap(await signedInAs("rep2"));
    expect(rep2.digIds).toEqual([fx.digs.cottonCase]);
    expect(rep2.fieldIds).toEqual([fx.fields.cotton]);
    // Asking for rep1's account by id gives nothing, not an error that confirms it exists.
    const asked = await getMap(await signedInAs("rep2"), `&accountId=${fx.accounts.alder}`);
    expect(asked.digIds).toEqual([]);
    expect(asked.fieldIds).toEqual([]);
  });

  it("a supervisor sees their region and not another; an admin sees every region", async () => {
    const supervisor = await getMap(await signedInAs("supervisor"));
    expect(supervisor.digIds).not.toContain(fx.digs.mesa);
    expect(supervisor.fieldIds).not.toContain(fx.fields.mesa);
    expect(supervisor.digIds).toHaveLength(5);
    const admin = await getMap(await signedInAs("admin"));
    expect(admin.digIds).toContain(fx.digs.mesa);
    expect(admin.digIds).toHaveLength(6);
    expect(admin.fieldIds).toHaveLength(4);
  });

  it("case status and case-flagging follow who may read the case", async () => {
    const rep2 = (await getMap(await signedInAs("rep2"))).digs[0]!;
    expect(rep2.properties.caseStatus).toBe("in_review");
    expect(rep2.properties.flagged).toBe(true);
    // grower3 owns Cottonwood Bend; the case is not shared with them yet.
    const grower3 = (await getMap(await signedInAs("grower3"))).digs[0]!;
    expect(grower3.id).toBe(fx.digs.cottonCase);
    expect(grower3.properties.caseStatus).toBeNull();
    expect(grower3.properties.flagged).toBe(false);
  });
});

describe("pins", () => {
  it("carry the dig summary, rounded coordinates and the flags summary", async () => {
    const { digs, fields } = await getMap(await signedInAs("grower1"));
    const byId = new Map(digs.map((d) => [d.id, d.properties]));
    const v3 = digs.find((d) => d.id === fx.digs.alderV3)!;
    expect(v3.geometry.type).toBe("Point");
    const [lon, lat] = v3.geometry.coordinates;
    expect(lon).toBeCloseTo(LON0 + 0.004, 6);
    expect(lat).toBeCloseTo(LAT0 + 0.004, 6);
    expect(String(lon).split(".")[1]?.length ?? 0).toBeLessThanOrEqual(6);
    expect(v3.properties).toMatchObject({
      fieldId: fx.fields.alder,
      fieldName: `Map alder ${suffix}`,
      accountName: "Alder Creek Farms",
      dugAt: "2026-05-01T17:30:00.000Z",
      hybrid: `MAP-H1-${suffix}`,
      leafStage: "V3",
      rootIndex: 72.4,
      flags: { count: 0, severity: null },
      flagged: false,
      caseStatus: null,
    });
    expect(byId.get(fx.digs.alderPoor)).toMatchObject({
      leafStage: "V5",
      flags: { count: 2, severity: "critical" },
      flagged: true,
    });
    expect(byId.get(fx.digs.alderRepFlag)).toMatchObject({
      leafStage: "V3",
      hybrid: null,
      rootIndex: null,
      flagged: true,
    });
    expect(fields[0]!.geometry.type).toBe("Polygon");
    expect(fields[0]!.properties).toMatchObject({ name: `Map alder ${suffix}`, areaAcres: 60 });
  });
});

describe("filters and bounds", () => {
  it("honour the bounds", async () => {
    const rep1 = await signedInAs("rep1");
    const wide = await rep1.fetch(`/api/map?bbox=${LON0},${LAT0},${LON0 + 0.1},${LAT0 + 0.5}`);
    const ids = ((await wide.json()) as MapFeatureCollection).features.map((f) => f.id);
    expect(ids).toContain(fx.digs.alderOutside);
    // Only the western half of the box: the alder digs (x < 0.01), not bell's (x = 0.025).
    const west = await rep1.fetch(`/api/map?bbox=${LON0},${LAT0},${LON0 + 0.01},${LAT0 + 0.1}`);
    const westIds = ((await west.json()) as MapFeatureCollection).features
      .filter(isDigFeature)
      .map((f) => f.id)
      .sort();
    expect(westIds).toEqual(sorted(fx.digs.alderV3, fx.digs.alderPoor, fx.digs.alderRepFlag));
  });

  it("narrow by date range, hybrid, stage, flagged and account", async () => {
    const admin = await signedInAs("admin");
    expect((await getMap(admin, "&from=2026-05-03&to=2026-05-05")).digIds).toEqual(
      sorted(fx.digs.alderRepFlag, fx.digs.bell, fx.digs.cottonCase, fx.digs.mesa),
    );
    expect((await getMap(admin, "&to=2026-05-01")).digIds).toEqual([fx.digs.alderV3]);
    expect((await getMap(admin, `&hybrid=map-h2-${suffix}`)).digIds).toEqual([fx.digs.alderPoor]);
    expect((await getMap(admin, "&stage=V3")).digIds).toEqual(
      sorted(fx.digs.alderV3, fx.digs.alderRepFlag, fx.digs.bell, fx.digs.cottonCase),
    );
    expect((await getMap(admin, "&stage=v5")).digIds).toEqual([fx.digs.alderPoor]);
    expect((await getMap(admin, "&flagged=1")).digIds).toEqual(
      sorted(fx.digs.alderPoor, fx.digs.alderRepFlag, fx.digs.cottonCase),
    );
    const bell = await getMap(admin, `&accountId=${fx.accounts.bell}`);
    expect(bell.digIds).toEqual([fx.digs.bell]);
    expect(bell.fieldIds).toEqual([fx.fields.bell]);
    const combined = await getMap(admin, `&accountId=${fx.accounts.alder}&flagged=1&stage=V3`);
    expect(combined.digIds).toEqual([fx.digs.alderRepFlag]);
    // The dig filters leave the field layer alone.
    expect((await getMap(admin, "&flagged=1")).fieldIds).toHaveLength(4);
  });

  it("refuse invalid bounds and filters with 400 and the issues", async () => {
    const rep1 = await signedInAs("rep1");
    const bad = [
      "",
      "?bbox=1,2,3",
      "?bbox=a,b,c,d",
      "?bbox=10,50,20,40",
      "?bbox=170,10,-170,20",
      "?bbox=-10,-95,10,10",
      "?bbox=-190,0,10,10",
      "?bbox=0,0,Infinity,1",
      "?bbox=0,0,1,NaN",
    ];
    for (const q of bad) {
      const res = await rep1.fetch(`/api/map${q}`);
      expect(res.status, q).toBe(400);
      const body = (await res.json()) as { error: string; issues: { path: string; message: string }[] };
      expect(
        body.issues.some((i) => i.path === "bbox"),
        q,
      ).toBe(true);
    }
    for (const q of [
      "&from=2026-13-01",
      "&stage=X4",
      "&flagged=yes",
      "&accountId=nope",
      "&from=2026-05-09&to=2026-05-01",
    ]) {
      const res = await rep1.fetch(`/api/map?bbox=${BBOX}${q}`);
      expect(res.status, q).toBe(400);
    }
  });

  it("answers 401 without a session", async () => {
    const res = await fetch(`${testEnv.appUrl}/api/map?bbox=${BBOX}`);
    expect(res.status).toBe(401);
  });
});
