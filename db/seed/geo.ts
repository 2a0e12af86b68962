import "server-only";
import { AUTHALIC_RADIUS_M, type GeoJsonPolygon, type LonLat } from "@/lib/geo/area";

// Small geometry for the demo fields: a local grid in feet (x east, y north) laid on the sphere; area
// and centroid come from lib/geo/area.ts.

/** One international foot, metres (exact by definition). */
const M_PER_FT = 0.3048;

export {
  AUTHALIC_RADIUS_M,
  type GeoJsonPolygon,
  type LonLat,
  polygonAreaAcres,
  polygonCentroid,
  ringAreaSquareMeters,
  SQUARE_METERS_PER_ACRE,
} from "@/lib/geo/area";

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
