import turfArea from "@turf/area";
import { describe, expect, it } from "vitest";
import {
  type AreaGeometry,
  geometryArea,
  geometryAreaSquareMeters,
  type LonLat,
  polygonCentroid,
  SQUARE_METERS_PER_ACRE,
} from "@/lib/geo/area";
import { importBoundary } from "@/lib/geo/import";

// Field-shaped polygons ([lon, lat], invented places): the spherical ring-area method of lib/geo/area.ts
// (Chamberlain and Duquette, JPL Publication 07-03, 2007) checked against @turf/area, an independent
// general-purpose implementation, and against one rectangle worked by hand.

const closed = (ring: LonLat[]): LonLat[] => [...ring, ring[0]!];

// A circle of `n` corners about a centre, radius in metres (a centre-pivot field).
function circle(lon: number, lat: number, radiusM: number, n: number): LonLat[] {
  const ring: LonLat[] = [];
  for (let i = 0; i < n; i++) {
    const a = (2 * Math.PI * i) / n;
    const dLat = (radiusM * Math.sin(a)) / 111_195;
    const dLon = (radiusM * Math.cos(a)) / (111_195 * Math.cos((lat * Math.PI) / 180));
    ring.push([lon + dLon, lat + dLat]);
  }
  return closed(ring);
}

const SHAPES: { name: string; geometry: AreaGeometry }[] = [
  {
    name: "an irregular valley field of about 80 acres",
    geometry: {
      type: "Polygon",
      coordinates: [
        closed([
          [-119.8123, 36.7411],
          [-119.8051, 36.7409],
          [-119.8047, 36.7452],
          [-119.8089, 36.7466],
          [-119.8126, 36.7448],
        ]),
      ],
    },
  },
  {
    name: "a 64-corner pivot circle of 400 m radius",
    geometry: { type: "Polygon", coordinates: [circle(-101.42, 41.13, 400, 64)] },
  },
  {
    name: "a quarter section with a farmstead hole",
    geometry: {
      type: "Polygon",
      coordinates: [
        closed([
          [-97.5, 44.2],
          [-97.49, 44.2],
          [-97.49, 44.2072],
          [-97.5, 44.2072],
        ]),
        closed([
          [-97.499, 44.201],
          [-97.499, 44.202],
          [-97.4975, 44.202],
          [-97.4975, 44.201],
        ]),
      ],
    },
  },
  {
    name: "a long, thin strip field (clockwise ring)",
    geometry: {
      type: "Polygon",
      coordinates: [
        closed([
          [-88.301, 40.101],
          [-88.301, 40.1032],
          [-88.2702, 40.1031],
          [-88.2702, 40.1009],
        ]),
      ],
    },
  },
  {
    name: "two fields of one farm as a MultiPolygon",
    geometry: {
      type: "MultiPolygon",
      coordinates: [
        [
          closed([
            [5.61, 52.02],
            [5.62, 52.02],
            [5.62, 52.026],
            [5.61, 52.026],
          ]),
        ],
        [circle(5.64, 52.03, 250, 48)],
      ],
    },
  },
  {
    name: "a southern-hemisphere field",
    geometry: {
      type: "Polygon",
      coordinates: [
        closed([
          [-61.201, -33.512],
          [-61.189, -33.511],
          [-61.188, -33.5205],
          [-61.2, -33.522],
        ]),
      ],
    },
  },
];

describe("geometryArea", () => {
  for (const { name, geometry } of SHAPES) {
    it(`matches @turf/area within 0.5 % for ${name}`, () => {
      const ours = geometryAreaSquareMeters(geometry);
      const turf = turfArea({ type: "Feature", properties: {}, geometry });
      expect(turf).toBeGreaterThan(10_000);
      expect(Math.abs(ours - turf) / turf).toBeLessThan(0.005);
      const { acres, hectares } = geometryArea(geometry);
      expect(acres).toBeCloseTo(turf / SQUARE_METERS_PER_ACRE, -1);
      expect(hectares).toBeCloseTo(turf / 10_000, -1);
    });
  }

  it("gives the hand-worked area of a 0.01° × 0.01° box from 40° N", () => {
    // Area of a lon/lat rectangle on a sphere: R² · Δλ · (sin φ2 − sin φ1).
    //   R = 6,371,007.2 m (authalic radius of WGS 84)       R² = 40,589,732,742,451.8 m²
    //   Δλ = 0.01° = 0.01 × π / 180 = 0.000174532925 rad
    //   sin 40.01° = 0.642921300, sin 40° = 0.642787610   difference = 0.000133690187
    //   area = 40,589,732,742,451.8 × 0.000174532925 × 0.000133690187 = 947,094 m²
    //        = 947,094 ÷ 4,046.8564224 = 234.03 acres = 94.71 ha
    const box: AreaGeometry = {
      type: "Polygon",
      coordinates: [
        closed([
          [-100, 40],
          [-99.99, 40],
          [-99.99, 40.01],
          [-100, 40.01],
        ]),
      ],
    };
    expect(geometryAreaSquareMeters(box)).toBeCloseTo(947_094, -1);
    const { acres, hectares } = geometryArea(box);
    expect(acres).toBeCloseTo(234.03, 2);
    expect(hectares).toBeCloseTo(94.71, 2);
  });

  // A symmetric shape's centroid is its centre of symmetry (plane geometry, common practice, no source).
  it("puts the centroid of a box at its middle and of a circle at its centre", () => {
    const box: AreaGeometry = {
      type: "Polygon",
      coordinates: [
        closed([
          [-100, 40],
          [-99.99, 40],
          [-99.99, 40.01],
          [-100, 40.01],
        ]),
      ],
    };
    const c = polygonCentroid(box);
    expect(c.lon).toBeCloseTo(-99.995, 5);
    expect(c.lat).toBeCloseTo(40.005, 4);
    const pivot = polygonCentroid({ type: "Polygon", coordinates: [circle(-101.42, 41.13, 400, 64)] });
    expect(pivot.lon).toBeCloseTo(-101.42, 5);
    expect(pivot.lat).toBeCloseTo(41.13, 5);
  });
});

describe("importBoundary", () => {
  const ring: LonLat[] = closed([
    [-119.8123, 36.7411],
    [-119.8051, 36.7409],
    [-119.8047, 36.7452],
    [-119.8126, 36.7448],
  ]);
  const kmlOf = (coords: string) =>
    `<?xml version="1.0" encoding="UTF-8"?><kml xmlns="http://www.opengis.net/kml/2.2"><Document><Placemark><name>West block</name><Polygon><outerBoundaryIs><LinearRing><coordinates>${coords}</coordinates></LinearRing></outerBoundaryIs></Polygon></Placemark></Document></kml>`;

  it("reads one polygon from a GeoJSON Feature and a KML file to the same area", () => {
    const json = importBoundary(
      "geojson",
      JSON.stringify({ type: "Feature", properties: {}, geometry: { type: "Polygon", coordinates: [ring] } }),
    );
    const kml = importBoundary("kml", kmlOf(ring.map(([lon, lat]) => `${lon},${lat},0`).join(" ")));
    if (!json.ok || !kml.ok) throw new Error(JSON.stringify([json, kml]));
    const turf = turfArea({ type: "Polygon", coordinates: [ring] }) / SQUARE_METERS_PER_ACRE;
    expect(Math.abs(json.boundary.areaAcres - turf) / turf).toBeLessThan(0.005);
    expect(kml.boundary.areaAcres).toBeCloseTo(json.boundary.areaAcres, 6);
    // Stored counter-clockwise (RFC 7946) whatever the file's winding.
    expect(kml.boundary.polygon.coordinates[0]).toEqual(json.boundary.polygon.coordinates[0]);
  });

  it("refuses bad files with a reason for each", () => {
    const codes = (format: "geojson" | "kml", text: string) => {
      const r = importBoundary(format, text);
      return r.ok ? [] : r.errors.map((e) => e.code);
    };
    const polygon = (coordinates: unknown) => JSON.stringify({ type: "Polygon", coordinates });
    expect(codes("geojson", "{ not json")).toEqual(["invalidJson"]);
    expect(codes("geojson", '{"type":"Topology"}')).toEqual(["notGeoJson"]);
    expect(codes("geojson", JSON.stringify({ type: "Point", coordinates: [1, 2] }))).toEqual(["noPolygon"]);
    expect(codes("geojson", polygon([ring.slice(0, -1)]))).toEqual(["notClosed"]);
    expect(codes("geojson", polygon([[ring[0], ring[1], ring[0]]]))).toEqual(["tooFewPositions"]);
    expect(codes("geojson", polygon([ring.map(([lon, lat]) => [lat, lon])]))).toEqual(["outOfRange"]);
    expect(
      codes(
        "geojson",
        polygon([
          closed([
            [0, 0],
            [1, 1],
            [1, 0],
            [0, 1],
          ]),
        ]),
      ),
    ).toEqual(["selfIntersecting"]);
    expect(
      codes(
        "geojson",
        polygon([
          closed([
            [0, 0],
            [0.001, 0],
            [0.002, 0],
          ]),
        ]),
      ),
    ).toEqual(["zeroArea"]);
    expect(codes("geojson", JSON.stringify({ type: "MultiPolygon", coordinates: [[ring], [ring]] }))).toEqual(
      ["manyPolygons"],
    );
    expect(codes("kml", "<kml><Document>")).toEqual(["invalidXml"]);
    expect(codes("kml", "<gpx></gpx>")).toEqual(["notKml"]);
    // KML rings are closed by the reader; a ring of two positions is no polygon at all.
    expect(codes("kml", kmlOf("-119.81,36.74,0 -119.80,36.74,0"))).toEqual(["noPolygon"]);
  });
});
