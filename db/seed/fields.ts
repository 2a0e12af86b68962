import "server-only";
import type { Kysely } from "kysely";
import type { Database, SoilTexture } from "../schema";
import { type GeoJsonPolygon, type GridOrigin, gridPolygon, polygonAreaAcres, polygonCentroid } from "./geo";
import { demoId, round, SEED_VERSION } from "./ids";

/**
 * South-west corner of the invented valley's survey grid. The fields are laid out in feet on a
 * section grid from here (a section is 5,280 ft square, a quarter-quarter 1,320 ft, 40 acres).
 */
export const DEMO_GRID_ORIGIN: GridOrigin = { lat: 36.86, lon: -120.345 };

export interface DemoField {
  key: string;
  account: string;
  name: string;
  /** Corners in feet east and north of DEMO_GRID_ORIGIN, counter-clockwise. */
  cornersFt: readonly (readonly [number, number])[];
  soil: SoilTexture;
  irrigation: "furrow" | "sprinkler" | "drip";
  firstIrrigationOn: string | null;
}

export const DEMO_FIELDS: readonly DemoField[] = [
  {
    key: "north-40",
    account: "Alder Creek Farms",
    name: "North 40",
    cornersFt: [
      [0, 10560],
      [1320, 10560],
      [1320, 11880],
      [0, 11880],
    ],
    soil: "coarse",
    irrigation: "sprinkler",
    firstIrrigationOn: "2026-05-28",
  },
  {
    key: "bench-80",
    account: "Alder Creek Farms",
    name: "Bench 80",
    cornersFt: [
      [1320, 10560],
      [3960, 10560],
      [3960, 11880],
      [1320, 11880],
    ],
    soil: "medium",
    irrigation: "sprinkler",
    firstIrrigationOn: "2026-06-01",
  },
  {
    key: "pivot-corner",
    account: "Alder Creek Farms",
    name: "Pivot Corner",
    // The county road cuts the north-east corner on a diagonal.
    cornersFt: [
      [5280, 9240],
      [7920, 9240],
      [7920, 10890],
      [5280, 11880],
    ],
    soil: "medium",
    irrigation: "sprinkler",
    firstIrrigationOn: "2026-05-08",
  },
  {
    key: "river-80",
    account: "Bellweather Ranch",
    name: "River 80",
    cornersFt: [
      [0, 5280],
      [2640, 5280],
      [2640, 6600],
      [0, 6600],
    ],
    soil: "fine",
    irrigation: "furrow",
    firstIrrigationOn: "2026-06-08",
  },
  {
    key: "canal-strip",
    account: "Bellweather Ranch",
    name: "Canal Strip",
    // Narrows to the east where the lateral canal angles across.
    cornersFt: [
      [2640, 5280],
      [5280, 5280],
      [5280, 5610],
      [2640, 5940],
    ],
    soil: "medium",
    irrigation: "furrow",
    firstIrrigationOn: "2026-06-03",
  },
  {
    key: "levee-60",
    account: "Bellweather Ranch",
    name: "Levee 60",
    cornersFt: [
      [2640, 6600],
      [5280, 6600],
      [5280, 7590],
      [2640, 7590],
    ],
    soil: "medium",
    irrigation: "furrow",
    firstIrrigationOn: null,
  },
  {
    key: "barn-40",
    account: "Cottonwood Bend Dairy",
    name: "Barn 40",
    cornersFt: [
      [0, 2640],
      [1320, 2640],
      [1320, 3960],
      [0, 3960],
    ],
    soil: "fine",
    irrigation: "furrow",
    firstIrrigationOn: "2026-06-05",
  },
  {
    key: "lagoon-quarter",
    account: "Cottonwood Bend Dairy",
    name: "Lagoon Quarter",
    cornersFt: [
      [1320, 0],
      [3960, 0],
      [3960, 2640],
      [1320, 2640],
    ],
    soil: "fine",
    irrigation: "furrow",
    firstIrrigationOn: "2026-06-10",
  },
  {
    key: "south-canal-100",
    account: "Cottonwood Bend Dairy",
    name: "South Canal 100",
    cornersFt: [
      [3960, 0],
      [5280, 0],
      [5280, 3300],
      [3960, 3300],
    ],
    soil: "medium",
    irrigation: "furrow",
    firstIrrigationOn: "2026-06-02",
  },
  {
    key: "wash-road-80",
    account: "Dry Wash Partners",
    name: "Wash Road 80",
    cornersFt: [
      [7920, 2640],
      [10560, 2640],
      [10560, 3960],
      [7920, 3960],
    ],
    soil: "medium",
    irrigation: "drip",
    firstIrrigationOn: "2026-05-30",
  },
  {
    key: "fan-top-40",
    account: "Dry Wash Partners",
    name: "Fan Top 40",
    cornersFt: [
      [9240, 3960],
      [10560, 3960],
      [10560, 5280],
      [9240, 5280],
    ],
    soil: "coarse",
    irrigation: "drip",
    firstIrrigationOn: null,
  },
  {
    key: "gravel-bar-20",
    account: "Dry Wash Partners",
    name: "Gravel Bar 20",
    // The wash bank trims the north-west corner.
    cornersFt: [
      [7860, 3960],
      [8580, 3960],
      [8580, 5280],
      [7860, 5180],
    ],
    soil: "coarse",
    irrigation: "sprinkler",
    firstIrrigationOn: null,
  },
];

export interface SeededField extends DemoField {
  id: string;
  accountId: string;
  repId: string;
  boundary: GeoJsonPolygon;
}

export interface AccountRef {
  id: string;
  repId: string;
}

/** Inserts the demo fields with their boundary, area (acres, from the polygon) and centroid. */
export async function seedFields(
  db: Kysely<Database>,
  accounts: ReadonlyMap<string, AccountRef>,
  stationId: string,
): Promise<SeededField[]> {
  const seeded = DEMO_FIELDS.map((f): SeededField => {
    const account = accounts.get(f.account);
    if (!account) throw new Error(`Demo field ${f.name}: no account ${f.account}`);
    return {
      ...f,
      id: demoId("field", f.key),
      accountId: account.id,
      repId: account.repId,
      boundary: gridPolygon(DEMO_GRID_ORIGIN, f.cornersFt),
    };
  });
  await db
    .insertInto("field")
    .values(
      seeded.map((f) => {
        const centroid = polygonCentroid(f.boundary);
        return {
          id: f.id,
          accountId: f.accountId,
          name: f.name,
          boundary: JSON.stringify(f.boundary),
          areaAcres: round(polygonAreaAcres(f.boundary), 2),
          centroidLat: round(centroid.lat, 7),
          centroidLon: round(centroid.lon, 7),
          irrigation: f.irrigation,
          soilTexture: f.soil,
          weatherStationId: stationId,
          firstIrrigationOn: f.firstIrrigationOn,
          version: SEED_VERSION,
          createdBy: f.repId,
          updatedBy: f.repId,
        };
      }),
    )
    .execute();
  return seeded;
}
