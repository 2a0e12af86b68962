// Boundary import through PUT /api/fields/:id/boundary: GeoJSON and KML files are validated, the area
// is computed on the server (checked against @turf/area) and saved with the centroid under a new
// version; refused files change nothing; another farm's field is 404 and a grower's write 403.
import { randomUUID } from "node:crypto";
import turfArea from "@turf/area";
import type { Kysely } from "kysely";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { Database } from "@/db/schema";
import { testEnv } from "../helpers/env";
import { type ApiClient, signedInAs } from "../helpers/session";

let db: Kysely<Database>;
let rep1: ApiClient;
const fieldIds: { alder: string; cottonwood: string } = { alder: randomUUID(), cottonwood: randomUUID() };

// An invented quarter-mile field with a bent east edge, [lon, lat], counter-clockwise.
const RING: [number, number][] = [
  [-120.4012, 36.9021],
  [-120.3967, 36.9019],
  [-120.3961, 36.9042],
  [-120.3969, 36.9058],
  [-120.4014, 36.9057],
  [-120.4012, 36.9021],
];
const SQUARE_METERS_PER_ACRE = 4046.8564224;
const expectedAcres = turfArea({ type: "Polygon", coordinates: [RING] }) / SQUARE_METERS_PER_ACRE;

const put = (client: ApiClient, id: string, format: string, text: string) =>
  client.json(`/api/fields/${id}/boundary`, "PUT", { format, text });

async function stored(id: string) {
  return db
    .selectFrom("field")
    .select(["boundary", "areaAcres", "centroidLat", "centroidLon", "version", "fieldVersions"])
    .where("id", "=", id)
    .executeTakeFirstOrThrow();
}

beforeAll(async () => {
  db = createDb(testEnv.databaseUrl);
  const account = async (name: string) =>
    (await db.selectFrom("account").select("id").where("name", "=", name).executeTakeFirstOrThrow()).id;
  await db
    .insertInto("field")
    .values([
      {
        id: fieldIds.alder,
        accountId: await account("Alder Creek Farms"),
        name: `Boundary test ${fieldIds.alder}`,
      },
      {
        id: fieldIds.cottonwood,
        accountId: await account("Cottonwood Bend Dairy"),
        name: `Boundary test ${fieldIds.cottonwood}`,
      },
    ])
    .execute();
  rep1 = await signedInAs("rep1");
});

afterAll(async () => {
  await db.deleteFrom("field").where("id", "in", Object.values(fieldIds)).execute();
  await db.destroy();
});

describe("PUT /api/fields/:id/boundary", () => {
  it("saves a GeoJSON Feature's polygon with its area and centroid under a new version", async () => {
    const before = await stored(fieldIds.alder);
    const feature = {
      type: "Feature",
      properties: { name: "east block" },
      geometry: { type: "Polygon", coordinates: [RING] },
    };
    const res = await put(rep1, fieldIds.alder, "geojson", JSON.stringify(feature));
    expect(res.status).toBe(200);
    const body = (await res.json()) as { areaAcres: number; areaHectares: number };
    expect(Math.abs(body.areaAcres - expectedAcres) / expectedAcres).toBeLessThan(0.005);
    expect(body.areaHectares).toBeCloseTo(body.areaAcres * 0.40468564224, 6);
    const after = await stored(fieldIds.alder);
    expect(after.boundary).toEqual({ type: "Polygon", coordinates: [RING] });
    expect(Math.abs(after.areaAcres! - expectedAcres) / expectedAcres).toBeLessThan(0.005);
    expect(after.centroidLat).toBeGreaterThan(36.9019);
    expect(after.centroidLat).toBeLessThan(36.9058);
    expect(after.centroidLon).toBeGreaterThan(-120.4014);
    expect(after.centroidLon).toBeLessThan(-120.3961);
    expect(after.version).toBeGreaterThan(before.version);
    expect((after.fieldVersions as Record<string, number>).boundary).toBe(after.version);
  });

  it("saves a KML placemark's polygon (clockwise in the file) with the same area", async () => {
    const coords = [...RING]
      .reverse()
      .map(([lon, lat]) => `${lon},${lat},0`)
      .join("\n");
    const kml = `<?xml version="1.0" encoding="UTF-8"?>
<kml xmlns="http://www.opengis.net/kml/2.2"><Document><Placemark><name>East block</name>
<Polygon><outerBoundaryIs><LinearRing><coordinates>${coords}</coordinates></LinearRing></outerBoundaryIs></Polygon>
</Placemark></Document></kml>`;
    // A different field first, so the save is a real change.
    await db
      .updateTable("field")
      .set({ boundary: null, areaAcres: null })
      .where("id", "=", fieldIds.alder)
      .execute();
    const res = await put(rep1, fieldIds.alder, "kml", kml);
    expect(res.status).toBe(200);
    const after = await stored(fieldIds.alder);
    expect(Math.abs(after.areaAcres! - expectedAcres) / expectedAcres).toBeLessThan(0.005);
    // Stored counter-clockwise (RFC 7946), as the GeoJSON ring above.
    expect(after.boundary).toEqual({ type: "Polygon", coordinates: [RING] });
  });

  it("refuses bad files with their reasons and changes nothing", async () => {
    const before = await stored(fieldIds.alder);
    const open = RING.slice(0, -1);
    const cases: [string, string, RegExp][] = [
      ["geojson", "{ nope", /not valid JSON/],
      ["geojson", JSON.stringify({ type: "LineString", coordinates: RING }), /no polygon/],
      ["geojson", JSON.stringify({ type: "Polygon", coordinates: [open] }), /not closed/],
      [
        "geojson",
        JSON.stringify({ type: "Polygon", coordinates: [RING.map(([lon, lat]) => [lat, lon])] }),
        /outside WGS 84/,
      ],
      [
        "geojson",
        JSON.stringify({
          type: "FeatureCollection",
          features: [1, 2].map(() => ({
            type: "Feature",
            properties: {},
            geometry: { type: "Polygon", coordinates: [RING] },
          })),
        }),
        /2 polygons/,
      ],
      ["kml", "<kml><Document><Placemark>", /not valid XML/],
      ["kml", "<gpx version='1.1'></gpx>", /not KML/],
    ];
    for (const [format, text, message] of cases) {
      const res = await put(rep1, fieldIds.alder, format, text);
      expect(res.status, text).toBe(422);
      const body = (await res.json()) as { issues: { message: string }[] };
      expect(body.issues.map((i) => i.message).join(" "), text).toMatch(message);
    }
    const badFormat = await put(rep1, fieldIds.alder, "shapefile", "x");
    expect(badFormat.status).toBe(422);
    expect(await stored(fieldIds.alder)).toEqual(before);
  });

  it("answers 404 for another farm's field or a bad id, and 403 to the grower", async () => {
    const text = JSON.stringify({ type: "Polygon", coordinates: [RING] });
    const before = await stored(fieldIds.cottonwood);
    expect((await put(rep1, fieldIds.cottonwood, "geojson", text)).status).toBe(404);
    expect((await put(rep1, "not-a-uuid", "geojson", text)).status).toBe(404);
    const grower1 = await signedInAs("grower1");
    const refused = await put(grower1, fieldIds.alder, "geojson", text);
    expect(refused.status).toBe(403);
    expect(await stored(fieldIds.cottonwood)).toEqual(before);
  });

  it("shows the field page to its readers only: another farm's field and a bad id are 404", async () => {
    expect((await rep1.fetch(`/fields/${fieldIds.cottonwood}`)).status).toBe(404);
    expect((await rep1.fetch("/fields/not-a-uuid")).status).toBe(404);
    const own = await rep1.fetch(`/fields/${fieldIds.alder}`);
    expect(own.status).toBe(200);
    // The catalog travels to the browser whole, so look for the forms' inputs, not their labels.
    const ownHtml = await own.text();
    expect(ownHtml).toContain('type="file"');
    expect(ownHtml).not.toContain("You can read this field&#x27;s records.");
    const grower1 = await signedInAs("grower1");
    const readOnly = await grower1.fetch(`/fields/${fieldIds.alder}`);
    expect(readOnly.status).toBe(200);
    const html = await readOnly.text();
    expect(html).toContain(`Boundary test ${fieldIds.alder}`);
    // The read-only notice as rendered HTML (the catalog's copy is unescaped JSON).
    expect(html).toContain("You can read this field&#x27;s records.");
    expect(html).not.toContain('type="file"');
    expect(html).not.toContain('name="hybrid"');
  });
});
