// The map's visible bounds as a `bbox=west,south,east,north` query value (WGS 84 degrees, the GeoJSON
// bbox order). Pure, for the route handler and the map client alike.

export interface Bounds {
  /** Longitude of the western edge, degrees (−180 … 180). */
  west: number;
  /** Latitude of the southern edge, degrees (−90 … 90). */
  south: number;
  /** Longitude of the eastern edge, degrees (−180 … 180). */
  east: number;
  /** Latitude of the northern edge, degrees (−90 … 90). */
  north: number;
}

export type BoundsResult = { ok: true; bounds: Bounds } | { ok: false; message: string };

const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

/**
 * Parses `west,south,east,north` in degrees. Refuses a missing value, anything but four finite
 * numbers, latitudes outside ±90, longitudes outside ±180, south ≥ north, and west ≥ east (a box
 * across the antimeridian must be sent as two boxes, one each side of it).
 */
export function parseBounds(value: string | null | undefined): BoundsResult {
  if (value === null || value === undefined || value.trim() === "") {
    return { ok: false, message: "Give the map bounds as bbox=west,south,east,north in degrees." };
  }
  const parts = value.split(",").map((p) => p.trim());
  if (parts.length !== 4) {
    return {
      ok: false,
      message: `The bounds need four numbers (west,south,east,north); got ${parts.length}.`,
    };
  }
  if (!parts.every((p) => NUMBER.test(p))) {
    return { ok: false, message: "Each bound must be a plain decimal number of degrees." };
  }
  const [west, south, east, north] = parts.map(Number) as [number, number, number, number];
  if (![west, south, east, north].every(Number.isFinite)) {
    return { ok: false, message: "Each bound must be a finite number of degrees." };
  }
  for (const [name, lat] of [
    ["south", south],
    ["north", north],
  ] as const) {
    if (lat < -90 || lat > 90) {
      return { ok: false, message: `The ${name} latitude must be between -90 and 90 degrees; got ${lat}.` };
    }
  }
  for (const [name, lon] of [
    ["west", west],
    ["east", east],
  ] as const) {
    if (lon < -180 || lon > 180) {
      return {
        ok: false,
        message: `The ${name} longitude must be between -180 and 180 degrees; got ${lon}.`,
      };
    }
  }
  if (south >= north) {
    return { ok: false, message: "The south latitude must be less than the north latitude." };
  }
  if (west >= east) {
    return {
      ok: false,
      message:
        "The west longitude must be less than the east longitude; for bounds across the antimeridian send one box each side of it.",
    };
  }
  return { ok: true, bounds: { west, south, east, north } };
}

/** The bounds as a query value, each edge rounded to 6 decimals (about 0.1 m). */
export function formatBounds(b: Bounds): string {
  const r = (x: number) => Math.round(x * 1e6) / 1e6;
  return [r(b.west), r(b.south), r(b.east), r(b.north)].join(",");
}

/**
 * Bounds a map view may ask for: longitudes clamped to ±180 (a zoomed-out view wraps past them) and
 * latitudes to ±90. A view wider than the world becomes the whole world.
 */
export function clampBounds(b: Bounds): Bounds {
  const clamp = (x: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, x));
  const wide = b.east - b.west >= 360;
  return {
    west: wide ? -180 : clamp(b.west, -180, 180),
    south: clamp(b.south, -90, 90),
    east: wide ? 180 : clamp(b.east, -180, 180),
    north: clamp(b.north, -90, 90),
  };
}
