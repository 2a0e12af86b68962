import { createHash } from "node:crypto";
import { GetObjectCommand } from "@aws-sdk/client-s3";
import { type Kysely, sql } from "kysely";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { Database } from "@/db/schema";
import { DEMO_REGION } from "@/db/seed/demo-users";
import {
  type DugPlantRoots,
  leafCollarsOfStage,
  nutrientsPerAcre,
  type SoilTexture,
  seedPlacedCheck,
  siteRootIndex,
  stageOnDate,
} from "@/lib/agronomy";
import { bucket, s3 } from "@/lib/storage/s3";
import { testEnv } from "../helpers/env";

// Checks the demo scenario `npm test` seeded. Only rows written by the seed's own transaction are
// looked at (they share its timestamp, the region's created_at), so fixtures of other tests never count.

type Ring = [number, number][];

let db: Kysely<Database>;

beforeAll(() => {
  db = createDb(testEnv.databaseUrl, 2);
});

afterAll(async () => {
  await db.destroy();
});

const seededAt = () => db.selectFrom("region").select("createdAt").where("name", "=", DEMO_REGION);

// Independent of the seed's spherical formula: a flat projection about the ring's mean latitude
// (metres per degree on a sphere of the mean Earth radius, 6,371,008.8 m, IUGG) and the shoelace sum.
function planarAcres(ring: Ring): number {
  const r = 6_371_008.8;
  const lat0 = (ring.reduce((s, [, lat]) => s + lat, 0) / ring.length) * (Math.PI / 180);
  const pts = ring.map(([lon, lat]) => [
    ((lon * Math.PI) / 180) * r * Math.cos(lat0),
    ((lat * Math.PI) / 180) * r,
  ]);
  let twice = 0;
  for (let i = 0; i < pts.length - 1; i++) {
    const [x0, y0] = pts[i]!;
    const [x1, y1] = pts[i + 1]!;
    twice += x0! * y1! - x1! * y0!;
  }
  // One acre is 4,046.8564224 m² (international acre, exact).
  return Math.abs(twice) / 2 / 4046.8564224;
}

// Ray casting, even–odd rule, on lon/lat.
function inside(ring: Ring, lon: number, lat: number): boolean {
  let hit = false;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const [xi, yi] = ring[i]!;
    const [xj, yj] = ring[j]!;
    if (yi > lat !== yj > lat && lon < ((xj - xi) * (lat - yi)) / (yj - yi) + xi) hit = !hit;
  }
  return hit;
}

function outerRing(boundary: unknown): Ring {
  const polygon = boundary as { type: string; coordinates: Ring[] };
  expect(polygon.type).toBe("Polygon");
  const ring = polygon.coordinates[0]!;
  expect(ring.length).toBeGreaterThanOrEqual(4);
  expect(ring[0]).toEqual(ring[ring.length - 1]);
  return ring;
}

async function seededFields() {
  return db
    .selectFrom("field")
    .innerJoin("account", "account.id", "field.accountId")
    .innerJoin("region", "region.id", "account.regionId")
    .select([
      "field.id",
      "field.name",
      "field.accountId",
      "field.boundary",
      "field.areaAcres",
      "field.centroidLat",
      "field.centroidLon",
      "field.soilTexture",
      "field.version",
    ])
    .where("region.name", "=", DEMO_REGION)
    .where("field.createdAt", "=", seededAt())
    .execute();
}

describe("demo seed", () => {
  it("has the four demo accounts in the valley, each with seeded fields", async () => {
    const accounts = await db
      .selectFrom("account")
      .innerJoin("region", "region.id", "account.regionId")
      .select(["account.id", "account.name"])
      .where("region.name", "=", DEMO_REGION)
      .where("account.createdAt", "=", seededAt())
      .execute();
    expect(accounts.map((a) => a.name).sort()).toEqual([
      "Alder Creek Farms",
      "Bellweather Ranch",
      "Cottonwood Bend Dairy",
      "Dry Wash Partners",
    ]);
    const fields = await seededFields();
    expect(fields.length).toBeGreaterThanOrEqual(10);
    expect(fields.length).toBeLessThanOrEqual(14);
    for (const a of accounts) {
      expect(fields.filter((f) => f.accountId === a.id).length).toBeGreaterThanOrEqual(2);
    }
  });

  it("gives every field a polygon that contains its centroid, an area within 1 % of the polygon's and no overlap", async () => {
    const fields = await seededFields();
    for (const f of fields) {
      const ring = outerRing(f.boundary);
      expect(f.centroidLat, f.name).not.toBeNull();
      expect(inside(ring, f.centroidLon!, f.centroidLat!), `${f.name} contains its centroid`).toBe(true);
      const acres = planarAcres(ring);
      expect(Math.abs(f.areaAcres! - acres) / acres, `${f.name}: ${f.areaAcres} vs ${acres}`).toBeLessThan(
        0.01,
      );
      expect(acres, f.name).toBeGreaterThanOrEqual(19.5);
      expect(acres, f.name).toBeLessThanOrEqual(161);
      for (const other of fields) {
        if (other.id === f.id) continue;
        expect(inside(ring, other.centroidLon!, other.centroidLat!), `${other.name} inside ${f.name}`).toBe(
          false,
        );
      }
    }
  });

  it("keeps the weather's daily minimum at or below the maximum", async () => {
    const days = await db.selectFrom("weatherDaily").select(["day", "maxF", "minF"]).execute();
    expect(days.length).toBeGreaterThan(100);
    for (const d of days) expect(d.minF, d.day).toBeLessThanOrEqual(d.maxF);
  });

  it("places every dig inside its field, in the V1–V6 window by the station's GDD since planting", async () => {
    const fields = new Map((await seededFields()).map((f) => [f.id, f]));
    const digs = await db
      .selectFrom("digSite")
      .innerJoin("planting", "planting.id", "digSite.plantingId")
      .innerJoin("field", "field.id", "digSite.fieldId")
      .select([
        "digSite.id",
        "digSite.fieldId",
        "digSite.latitude",
        "digSite.longitude",
        "digSite.dugAt",
        "planting.plantedOn",
        "field.weatherStationId",
      ])
      .where("digSite.createdAt", "=", seededAt())
      .execute();
    expect(digs.length).toBeGreaterThanOrEqual(30);
    const weather = await db
      .selectFrom("weatherDaily")
      .select(["stationId", "day", "maxF", "minF"])
      .execute();
    for (const d of digs) {
      const field = fields.get(d.fieldId);
      expect(field, d.id).toBeDefined();
      expect(
        inside(outerRing(field!.boundary), d.longitude!, d.latitude!),
        `dig ${d.id} in ${field!.name}`,
      ).toBe(true);
      const records = weather
        .filter((w) => w.stationId === d.weatherStationId)
        .map((w) => ({ date: w.day, maxF: w.maxF, minF: w.minF }));
      // Dug in daytime in the valley (UTC−7), so the UTC calendar date is the local one.
      const stage = stageOnDate(records, d.plantedOn, d.dugAt.toISOString().slice(0, 10));
      expect(stage.complete).toBe(true);
      expect(stage.leafCollars, `dig ${d.id} at ${stage.stage}`).toBeGreaterThanOrEqual(1);
      expect(stage.leafCollars, `dig ${d.id} at ${stage.stage}`).toBeLessThanOrEqual(6);
    }
  });

  it("has a seed-placed pass over the seed-safe limit, and its digs flagged with an open injury case", async () => {
    const passes = await db
      .selectFrom("fertilizerPass")
      .innerJoin("product", "product.id", "fertilizerPass.productId")
      .innerJoin("planting", "planting.id", "fertilizerPass.plantingId")
      .select([
        "fertilizerPass.fieldId",
        "fertilizerPass.rate",
        "fertilizerPass.rateUnit",
        "product.gradeN",
        "product.gradeP2o5",
        "product.gradeK2o",
        "product.gradeS",
        "product.lbPerGal",
        "planting.id as plantingId",
        "planting.rowSpacingIn",
        "planting.soilTexture",
      ])
      .where("fertilizerPass.placement", "=", "seed_placed")
      .where("fertilizerPass.createdAt", "=", seededAt())
      .execute();
    const over = passes.filter((p) => {
      const n = nutrientsPerAcre(
        { n: p.gradeN, p2o5: p.gradeP2o5, k2o: p.gradeK2o, s: p.gradeS, lbPerGal: p.lbPerGal },
        p.rate,
        p.rateUnit,
      );
      const check = seedPlacedCheck({
        n: n.n,
        k2o: n.k2o,
        rowSpacingIn: p.rowSpacingIn,
        soil: p.soilTexture as SoilTexture,
      });
      return n.n + n.k2o > check.limitLbPerAcre;
    });
    expect(over.length).toBeGreaterThanOrEqual(1);
    const digs = await db
      .selectFrom("digSite")
      .leftJoin("injuryCase", "injuryCase.digSiteId", "digSite.id")
      .select(["digSite.id", "digSite.flaggedByRep", "injuryCase.status", "digSite.assessment"])
      .where(
        "digSite.plantingId",
        "in",
        over.map((p) => p.plantingId),
      )
      .where("digSite.createdAt", "=", seededAt())
      .execute();
    expect(digs.length).toBeGreaterThan(0);
    for (const d of digs) {
      expect(d.flaggedByRep).toBe(true);
      expect(d.status).toBe("new");
      const codes = (d.assessment as { audit: { code: string }[] }).audit.map((f) => f.code);
      expect(codes).toContain("seed_placed_over_limit");
    }
  });

  it("has a dig whose band was found more than 1 in from where the 2x2 pass was set", async () => {
    const rows = await db
      .selectFrom("dugPlant")
      .innerJoin("digSite", "digSite.id", "dugPlant.digSiteId")
      .innerJoin("fertilizerPass", (j) =>
        j
          .onRef("fertilizerPass.fieldId", "=", "digSite.fieldId")
          .on((eb) =>
            eb.or([
              eb("fertilizerPass.plantingId", "is", null),
              eb("fertilizerPass.plantingId", "=", eb.ref("digSite.plantingId")),
            ]),
          ),
      )
      .leftJoin("injuryCase", "injuryCase.digSiteId", "digSite.id")
      .select([
        "digSite.id as digId",
        "dugPlant.bandBesideIn",
        "dugPlant.bandBelowIn",
        "fertilizerPass.intendedBesideIn",
        "fertilizerPass.intendedBelowIn",
        "injuryCase.status",
      ])
      .where("fertilizerPass.placement", "=", "band_2x2")
      .where("dugPlant.bandBesideIn", "is not", null)
      .where("digSite.createdAt", "=", seededAt())
      .execute();
    const shifted = rows.filter(
      (r) =>
        Math.abs(r.bandBesideIn! - (r.intendedBesideIn ?? 2)) > 1 ||
        Math.abs(r.bandBelowIn! - (r.intendedBelowIn ?? 2)) > 1,
    );
    expect(shifted.length).toBeGreaterThan(0);
    // Most bands elsewhere sit where they were set.
    expect(shifted.length).toBeLessThan(rows.length / 2);
    for (const r of shifted) expect(r.status, r.digId).toBe("new");
  });

  it("stores each dig's root index as the agronomy core computes it from the stored plants", async () => {
    const digs = await db
      .selectFrom("digSite")
      .select(["id", "rootIndex", "assessment"])
      .where("createdAt", "=", seededAt())
      .execute();
    const plants = await db
      .selectFrom("dugPlant")
      .selectAll()
      .where("createdAt", "=", seededAt())
      .orderBy("position")
      .execute();
    for (const d of digs) {
      const mine = plants.filter((p) => p.digSiteId === d.id);
      expect(mine.length).toBeGreaterThanOrEqual(3);
      expect(mine.length).toBeLessThanOrEqual(5);
      const collars = (d.assessment as { leafCollars: number }).leafCollars;
      // The site's stage is one of its plants' stages.
      expect(mine.map((p) => leafCollarsOfStage(p.leafStage))).toContain(collars);
      const roots: DugPlantRoots[] = mine.map((p) => ({
        seminalRootScore: p.seminalScore!,
        nodalWhorls: p.nodalWhorls!,
        nodalRootCount: p.nodalCount!,
        longestNodalRootIn: p.longestNodalIn!,
        crownDepthIn: p.crownDepthIn!,
        mesocotyl: p.mesocotyl!,
        seminalInjury: p.seminalInjury,
        nodalInjury: p.nodalInjury,
        burnSeen: p.findings.includes("band_burn"),
      }));
      const site = siteRootIndex(roots, collars);
      expect(d.rootIndex, d.id).toBe(site.siteIndex);
      expect(mine.map((p) => p.rootIndex)).toEqual(site.plantIndices);
    }
  });

  it("keeps every photo's bytes in the bucket with the stored size and SHA-256, marked as an illustration", async () => {
    const photos = await db.selectFrom("photo").selectAll().where("createdAt", "=", seededAt()).execute();
    expect(photos.length).toBeGreaterThanOrEqual(10);
    for (const p of photos) {
      const object = await s3.send(new GetObjectCommand({ Bucket: bucket, Key: p.objectKey }));
      const bytes = Buffer.from(await object.Body!.transformToByteArray());
      expect(bytes.byteLength, p.objectKey).toBe(p.byteSize);
      expect(createHash("sha256").update(bytes).digest("hex")).toBe(p.sha256);
      expect(p.objectKey).toBe(`photos/${p.sha256}`);
      expect(p.confirmedAt).not.toBeNull();
      expect(p.isIllustration).toBe(true);
      expect(p.contentType).toBe("image/svg+xml");
      expect(bytes.toString("utf8")).toContain("ILLUSTRATION — not a field photo");
    }
  });

  it("writes every synced row at a version the region's cursor has reached", async () => {
    const cursor = await db
      .selectFrom("syncCursor")
      .innerJoin("region", "region.id", "syncCursor.regionId")
      .select("syncCursor.version")
      .where("region.name", "=", DEMO_REGION)
      .executeTakeFirstOrThrow();
    const tables = ["field", "planting", "fertilizer_pass", "dig_site", "dug_plant", "photo", "injury_case"];
    for (const table of tables) {
      const { rows } = await sql<{ min: number; max: number; n: number }>`
        select min(version)::int as min, max(version)::int as max, count(*)::int as n from ${sql.table(table)}
        where created_at = (select created_at from region where name = ${DEMO_REGION})`.execute(db);
      const r = rows[0]!;
      expect(r.n, table).toBeGreaterThan(0);
      expect(r.min, table).toBeGreaterThanOrEqual(1);
      expect(r.max, table).toBeLessThanOrEqual(cursor.version);
    }
  });
});
