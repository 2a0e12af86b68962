import "server-only";

// Small geometry for the demo fields: a local grid in feet (x east, y north) laid on the sphere, the
// area of a lon/lat ring and its centroid.

/** Radius of the sphere with the WGS 84 ellipsoid's surface area (authalic radius), metres. */
export const AUTHALIC_RADIUS_M = 6_371_007.2;
/** One international foot, metres (exact by definition). */
const M_PER_FT = 0.3048;
/** One international acre, square metres (exact: 43,560 ft² × 0.3048²). */
export const SQUARE_METERS_PER_ACRE = 4046.8564224;

/** A [longitude, latitude] pair in degrees, GeoJSON order. */
export type LonLat = [number, number];

export interface GeoJsonPolygon {
  type: "Polygon";
  coordinates: LonLat[][];
}

export interface GridOrigin {
  lat: number;
  lon: number;
}

const rad = (deg: number) => (deg * Math.PI) / 180;
const deg = (r: number) => (r * 180) / Math.PI;

/**
 * A point `xFt` east and `yFt` north of the origin, on the sphere. The east–west scale is taken at the
 * origin's latitude: over the few miles of the demo valley that is off by well under 0.1 %.
 */
export function gridToLonLat(origin: GridOrigin, xFt: number, yFt: number): LonLat {
  const lat = origin.lat + deg((yFt * M_PER_FT) / AUTHALIC_RADIUS_M);
  const lon = origin.lon + deg((xFt * M_PER_FT) / (AUTHALIC_RADIUS_M * Math.cos(rad(origin.lat))));
  return [Math.round(lon * 1e7) / 1e7, Math.round(lat * 1e7) / 1e7];
}

/**
 * A GeoJSON polygon from grid corners in feet, listed counter-clockwise (RFC 7946 exterior ring); the
 * ring is closed by repeating the first corner.
 */
export function gridPolygon(
  origin: GridOrigin,
  cornersFt: readonly (readonly [number, number])[],
): GeoJsonPolygon {
  const ring = cornersFt.map(([x, y]) => gridToLonLat(origin, x, y));
  ring.push([...ring[0]!] as LonLat);
  return { type: "Polygon", coordinates: [ring] };
}

/**
 * Area of a closed lon/lat ring on the sphere, square metres: |R²/2 · Σ (λ[i+1] − λ[i−1]) · sin φ[i]|
 * (Chamberlain and Duquette, "Some Algorithms for Polygons on a Sphere", JPL Publication 07-03, 2007).
 * On the authalic sphere this matches the ellipsoidal area of a field-sized polygon to a small
 * fraction of a percent, ample for acres.
 */
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

/** Area of a GeoJSON polygon (exterior ring less holes), acres. */
export function polygonAreaAcres(polygon: GeoJsonPolygon): number {
  const [outer, ...holes] = polygon.coordinates;
  if (!outer) return 0;
  const m2 = ringAreaSquareMeters(outer) - holes.reduce((sum, h) => sum + ringAreaSquareMeters(h), 0);
  return m2 / SQUARE_METERS_PER_ACRE;
}

/**
 * Area-weighted centroid of the exterior ring, computed on a flat projection about the ring's first
 * corner (exact enough for a field a mile across), as { lat, lon } in degrees.
 */
export function polygonCentroid(polygon: GeoJsonPolygon): { lat: number; lon: number } {
  const pts = openRing(polygon.coordinates[0] ?? []);
  const first = pts[0];
  if (!first) throw new Error("polygon has no corners");
  const k = Math.cos(rad(first[1]));
  const xy = pts.map(([lon, lat]) => [(lon - first[0]) * k, lat - first[1]] as const);
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
  return { lat: first[1] + cy / (3 * twiceArea), lon: first[0] + cx / (3 * twiceArea) / k };
}

/** Whether (x, y) lies inside the polygon given by its corners (even–odd rule, any units). */
export function insideCorners(
  corners: readonly (readonly [number, number])[],
  x: number,
  y: number,
): boolean {
  let inside = false;
  for (let i = 0, j = corners.length - 1; i < corners.length; j = i++) {
    const [xi, yi] = corners[i]!;
    const [xj, yj] = corners[j]!;
    if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

function openRing(ring: readonly LonLat[]): LonLat[] {
  const last = ring[ring.length - 1];
  const first = ring[0];
  const closed = ring.length > 1 && first && last && first[0] === last[0] && first[1] === last[1];
  return closed ? ring.slice(0, -1) : [...ring];
}
