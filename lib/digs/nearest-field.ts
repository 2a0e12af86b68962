// "Nearest to me": the field the rep is standing in, from the phone's position. Pure and isomorphic.

export interface FieldPlace {
  id: string;
  /** GeoJSON Polygon or MultiPolygon ([lon, lat] positions), or anything else (ignored). */
  boundary: unknown;
  centroidLat: number | null;
  centroidLon: number | null;
}

export interface NearestField {
  id: string;
  /** True when the point is inside the field's boundary. */
  inside: boolean;
  /** Distance to the field's centroid, metres (great-circle). */
  distanceM: number | null;
}

type Ring = [number, number][];

function isRing(x: unknown): x is Ring {
  return (
    Array.isArray(x) &&
    x.every((p) => Array.isArray(p) && typeof p[0] === "number" && typeof p[1] === "number")
  );
}

/** The polygons of a GeoJSON Polygon or MultiPolygon, each as [outer, ...holes]; [] for anything else. */
function polygonsOf(boundary: unknown): Ring[][] {
  const g = boundary as { type?: unknown; coordinates?: unknown } | null;
  if (!g || typeof g !== "object" || !Array.isArray(g.coordinates)) return [];
  const polygons = g.type === "Polygon" ? [g.coordinates] : g.type === "MultiPolygon" ? g.coordinates : [];
  return polygons.filter((rings): rings is Ring[] => Array.isArray(rings) && rings.every(isRing));
}

/** Even-odd ray casting on [lon, lat]; fields are small enough for a flat test. */
function inRing(ring: Ring, lon: number, lat: number): boolean {
  let inside = false;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const [xi, yi] = ring[i]!;
    const [xj, yj] = ring[j]!;
    if (yi > lat !== yj > lat && lon < ((xj - xi) * (lat - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

export function pointInBoundary(boundary: unknown, lat: number, lon: number): boolean {
  return polygonsOf(boundary).some(
    ([outer, ...holes]) =>
      outer !== undefined && inRing(outer, lon, lat) && !holes.some((h) => inRing(h, lon, lat)),
  );
}

/** Mean Earth radius, metres (IUGG mean radius R1 = 6,371,008.8 m; 6,371 km is the usual rounding). */
const EARTH_RADIUS_M = 6_371_000;

/** Great-circle (haversine) distance between two points in degrees, metres. */
export function distanceMeters(lat1: number, lon1: number, lat2: number, lon2: number): number {
  const rad = (d: number) => (d * Math.PI) / 180;
  const a =
    Math.sin(rad(lat2 - lat1) / 2) ** 2 +
    Math.cos(rad(lat1)) * Math.cos(rad(lat2)) * Math.sin(rad(lon2 - lon1) / 2) ** 2;
  return 2 * EARTH_RADIUS_M * Math.asin(Math.min(1, Math.sqrt(a)));
}

/**
 * The field containing the point (the one with the nearest centroid when boundaries overlap), else the
 * field with the nearest centroid; null when no field has a boundary or a centroid.
 */
export function nearestField(fields: readonly FieldPlace[], lat: number, lon: number): NearestField | null {
  const ranked = fields
    .map((f) => ({
      id: f.id,
      inside: pointInBoundary(f.boundary, lat, lon),
      distanceM:
        f.centroidLat !== null && f.centroidLon !== null
          ? distanceMeters(lat, lon, f.centroidLat, f.centroidLon)
          : null,
    }))
    .filter((f) => f.inside || f.distanceM !== null)
    .sort(
      (a, b) =>
        Number(b.inside) - Number(a.inside) ||
        (a.distanceM ?? Number.POSITIVE_INFINITY) - (b.distanceM ?? Number.POSITIVE_INFINITY),
    );
  return ranked[0] ?? null;
}
