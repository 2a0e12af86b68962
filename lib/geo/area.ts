// Area and centroid of GeoJSON polygons on the sphere. Pure and isomorphic: the server computes a
// field's acres from an imported or drawn boundary, the seed from its demo boundaries.
//
// Method: the area of a lon/lat ring on a sphere of radius R is |R²/2 · Σ (λ[i+1] − λ[i−1]) · sin φ[i]|,
// the line-integral form of the spherical excess (Chamberlain and Duquette, "Some Algorithms for
// Polygons on a Sphere", JPL Publication 07-03, 2007). On the authalic sphere (the sphere with the
// WGS 84 ellipsoid's surface area) it matches the ellipsoidal area of a field-sized polygon to a small
// fraction of a percent, ample for acres.

/** Radius of the sphere with the WGS 84 ellipsoid's surface area (authalic radius), metres. */
export const AUTHALIC_RADIUS_M = 6_371_007.2;
/** One international acre, square metres (exact: 43,560 ft² × 0.3048²). */
export const SQUARE_METERS_PER_ACRE = 4046.8564224;
/** One hectare, square metres (exact). */
export const SQUARE_METERS_PER_HECTARE = 10_000;

/** A [longitude, latitude] pair in degrees, GeoJSON order. */
export type LonLat = [number, number];

export interface GeoJsonPolygon {
  type: "Polygon";
  coordinates: LonLat[][];
}

export interface GeoJsonMultiPolygon {
  type: "MultiPolygon";
  coordinates: LonLat[][][];
}

export type AreaGeometry = GeoJsonPolygon | GeoJsonMultiPolygon;

const rad = (deg: number) => (deg * Math.PI) / 180;

/** The ring without its closing position (when the last position repeats the first). */
export function openRing(ring: readonly LonLat[]): LonLat[] {
  const last = ring[ring.length - 1];
  const first = ring[0];
  const closed = ring.length > 1 && first && last && first[0] === last[0] && first[1] === last[1];
  return closed ? ring.slice(0, -1) : [...ring];
}

/** Area of a lon/lat ring (closed or not) on the authalic sphere, square metres, always ≥ 0. */
export function ringAreaSquareMeters(ring: readonly LonLat[]): number {
  const pts = openRing(ring);
  const n = pts.length;
  if (n < 3) return 0;
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const prev = pts[(i + n - 1) % n]!;
    const here = pts[i]!;
    const next = pts[(i + 1) % n]!;
    sum += rad(next[0] - prev[0]) * Math.sin(rad(here[1]));
  }
  return Math.abs((sum * AUTHALIC_RADIUS_M * AUTHALIC_RADIUS_M) / 2);
}

function polygonRingsArea(rings: readonly (readonly LonLat[])[]): number {
  const [outer, ...holes] = rings;
  if (!outer) return 0;
  return ringAreaSquareMeters(outer) - holes.reduce((sum, h) => sum + ringAreaSquareMeters(h), 0);
}

/** Area of a Polygon (exterior ring less holes) or MultiPolygon (sum of its polygons), square metres. */
export function geometryAreaSquareMeters(geometry: AreaGeometry): number {
  if (geometry.type === "Polygon") return polygonRingsArea(geometry.coordinates);
  return geometry.coordinates.reduce((sum, p) => sum + polygonRingsArea(p), 0);
}

/** Area in acres and hectares. */
export function geometryArea(geometry: AreaGeometry): { acres: number; hectares: number } {
  const m2 = geometryAreaSquareMeters(geometry);
  return { acres: m2 / SQUARE_METERS_PER_ACRE, hectares: m2 / SQUARE_METERS_PER_HECTARE };
}

/** Area of a GeoJSON polygon (exterior ring less holes), acres. */
export function polygonAreaAcres(polygon: GeoJsonPolygon): number {
  return geometryArea(polygon).acres;
}

// Area-weighted centroid of one ring in a flat projection about `origin` (x scaled by cos φ0), with
// the ring's signed twice-area, both in projected degrees.
function ringMoments(ring: readonly LonLat[], origin: LonLat) {
  const pts = openRing(ring);
  const k = Math.cos(rad(origin[1]));
  const xy = pts.map(([lon, lat]) => [(lon - origin[0]) * k, lat - origin[1]] as const);
  let twiceArea = 0;
  let cx = 0;
  let cy = 0;
  for (let i = 0; i < xy.length; i++) {
    const [x0, y0] = xy[i]!;
    const [x1, y1] = xy[(i + 1) % xy.length]!;
    const cross = x0 * y1 - x1 * y0;
    twiceArea += cross;
    cx += (x0 + x1) * cross;
    cy += (y0 + y1) * cross;
  }
  return { twiceArea, cx, cy, k };
}

/**
 * Area-weighted centroid of a Polygon's exterior ring, or of a MultiPolygon's exterior rings together,
 * computed on a flat projection about the first corner (exact enough for fields a few miles across),
 * as { lat, lon } in degrees.
 */
export function polygonCentroid(geometry: AreaGeometry): { lat: number; lon: number } {
  const outers =
    geometry.type === "Polygon"
      ? [geometry.coordinates[0] ?? []]
      : geometry.coordinates.map((p) => p[0] ?? []);
  const origin = outers[0]?.[0];
  if (!origin) throw new Error("polygon has no corners");
  let area = 0;
  let cx = 0;
  let cy = 0;
  let k = 1;
  for (const ring of outers) {
    const m = ringMoments(ring, origin);
    // Each ring counts with its own orientation's sign made positive, so clockwise rings add too.
    const sign = Math.sign(m.twiceArea) || 1;
    area += sign * m.twiceArea;
    cx += sign * m.cx;
    cy += sign * m.cy;
    k = m.k;
  }
  if (area === 0) throw new Error("polygon has no area");
  return { lat: origin[1] + cy / (3 * area), lon: origin[0] + cx / (3 * area) / k };
}
