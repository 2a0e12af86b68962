import { kml } from "@tmcw/togeojson";
import { DOMParser } from "@xmldom/xmldom";
import {
  type GeoJsonPolygon,
  geometryArea,
  type LonLat,
  openRing,
  polygonCentroid,
  ringAreaSquareMeters,
} from "./area";

// A field boundary from a GeoJSON or KML file: exactly one polygon, in WGS 84 longitude/latitude,
// every ring closed with at least 4 positions, no ring crossing itself, and some area. Pure: the route
// handler, the field page's action and the tests call it with the file's text.

export const BOUNDARY_FORMATS = ["geojson", "kml"] as const;
export type BoundaryFormat = (typeof BOUNDARY_FORMATS)[number];

/** Most positions accepted over all rings of one boundary (a surveyed field has a few hundred). */
export const MAX_BOUNDARY_POSITIONS = 5000;
/** Largest boundary accepted, acres: bigger is a wrong file or swapped coordinates, not a field. */
export const MAX_BOUNDARY_ACRES = 20_000;

export type BoundaryErrorCode =
  | "empty"
  | "invalidJson"
  | "notGeoJson"
  | "invalidXml"
  | "notKml"
  | "noPolygon"
  | "manyPolygons"
  | "tooManyPositions"
  | "badPosition"
  | "outOfRange"
  | "tooFewPositions"
  | "notClosed"
  | "selfIntersecting"
  | "zeroArea"
  | "tooLarge";

export interface BoundaryError {
  code: BoundaryErrorCode;
  /** Values for the message: ring is 0 for the outer boundary, n for the n-th hole; position is 1-based. */
  values: Record<string, string | number>;
  /** The message in English (the API's answer); the page translates `code` instead. */
  message: string;
}

export interface ImportedBoundary {
  polygon: GeoJsonPolygon;
  areaAcres: number;
  areaHectares: number;
  centroid: { lat: number; lon: number };
}

export type BoundaryImport =
  | { ok: true; boundary: ImportedBoundary }
  | { ok: false; errors: BoundaryError[] };

const ringName = (ring: number) => (ring === 0 ? "the outer boundary" : `hole ${ring}`);

function error(code: BoundaryErrorCode, values: Record<string, string | number> = {}): BoundaryError {
  const ring = typeof values.ring === "number" ? ringName(values.ring) : "";
  const messages: Record<BoundaryErrorCode, string> = {
    empty: "The file is empty.",
    invalidJson: "The file is not valid JSON, so it cannot be read as GeoJSON.",
    notGeoJson:
      "The file is JSON but not GeoJSON: expected a Feature, FeatureCollection, Polygon or MultiPolygon.",
    invalidXml: `The file is not valid XML, so it cannot be read as KML (${values.detail ?? "parse error"}).`,
    notKml: "The file is XML but not KML: there is no <kml> element.",
    noPolygon: `The file holds no polygon${values.found ? ` (it holds ${values.found})` : ""}: a boundary must be a Polygon or MultiPolygon.`,
    manyPolygons: `The file holds ${values.count} polygons; a field boundary is one polygon. Keep only this field's outline and try again.`,
    tooManyPositions: `The boundary has more than ${MAX_BOUNDARY_POSITIONS} positions; simplify it and try again.`,
    badPosition: `Position ${values.position} of ${ring} is not a pair of numbers [longitude, latitude].`,
    outOfRange: `Position ${values.position} of ${ring} is outside WGS 84 ranges (longitude −180 to 180, latitude −90 to 90): check that the file uses longitude, latitude in degrees.`,
    tooFewPositions: `${capitalize(ring)} has ${values.count} positions; a closed ring needs at least 4 (3 corners and the first repeated).`,
    notClosed: `${capitalize(ring)} is not closed: its last position must repeat its first.`,
    selfIntersecting: `${capitalize(ring)} crosses itself; redraw it so its edges do not cross.`,
    zeroArea: "The boundary encloses no area.",
    tooLarge: `The boundary encloses ${values.acres} acres, more than ${MAX_BOUNDARY_ACRES.toLocaleString("en-US")}: check that it is this field's outline in longitude, latitude.`,
  };
  return { code, values, message: messages[code] };
}

function capitalize(s: string) {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

const fail = (...errors: BoundaryError[]): BoundaryImport => ({ ok: false, errors });

/** Parses a GeoJSON or KML file's text into one validated boundary, or the reasons it was refused. */
export function importBoundary(format: BoundaryFormat, text: string): BoundaryImport {
  if (text.trim() === "") return fail(error("empty"));
  const found = format === "kml" ? geometriesOfKml(text) : geometriesOfGeoJson(text);
  if (!found.ok) return fail(found.error);
  return boundaryOfGeometries(found.geometries);
}

/** Validates a boundary given as a GeoJSON geometry object (e.g. drawn on the map). */
export function boundaryOfGeometry(geometry: unknown): BoundaryImport {
  return boundaryOfGeometries(collectGeometries(geometry));
}

type Found = { ok: true; geometries: unknown[] } | { ok: false; error: BoundaryError };

function geometriesOfGeoJson(text: string): Found {
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch {
    return { ok: false, error: error("invalidJson") };
  }
  const type = (value as { type?: unknown } | null)?.type;
  const known = [
    "Feature",
    "FeatureCollection",
    "GeometryCollection",
    "Polygon",
    "MultiPolygon",
    "Point",
    "MultiPoint",
    "LineString",
    "MultiLineString",
  ];
  if (typeof type !== "string" || !known.includes(type)) return { ok: false, error: error("notGeoJson") };
  return { ok: true, geometries: collectGeometries(value) };
}

function geometriesOfKml(text: string): Found {
  const problems: string[] = [];
  let doc: ReturnType<DOMParser["parseFromString"]>;
  try {
    doc = new DOMParser({
      onError: (level, msg) => {
        if (level !== "warning") problems.push(msg);
      },
    }).parseFromString(text, "text/xml");
  } catch (err) {
    const detail = err instanceof Error ? err.message.split("\n")[0] : "parse error";
    return { ok: false, error: error("invalidXml", { detail: detail ?? "parse error" }) };
  }
  if (problems.length > 0) {
    return { ok: false, error: error("invalidXml", { detail: problems[0]!.split("\n")[0]! }) };
  }
  if (doc.getElementsByTagName("kml").length === 0) return { ok: false, error: error("notKml") };
  // togeojson reads any DOM Document; xmldom's is one without the browser's type.
  const collection = kml(doc as unknown as Parameters<typeof kml>[0]);
  return { ok: true, geometries: collectGeometries(collection) };
}

// Every geometry in a GeoJSON value, with collections and multi-geometries opened.
function collectGeometries(value: unknown): unknown[] {
  const v = value as { type?: unknown; features?: unknown; geometry?: unknown; geometries?: unknown } | null;
  if (!v || typeof v !== "object") return [];
  switch (v.type) {
    case "FeatureCollection":
      return Array.isArray(v.features) ? v.features.flatMap(collectGeometries) : [];
    case "Feature":
      return collectGeometries(v.geometry);
    case "GeometryCollection":
      return Array.isArray(v.geometries) ? v.geometries.flatMap(collectGeometries) : [];
    case "MultiPolygon": {
      const coords = (v as { coordinates?: unknown }).coordinates;
      return Array.isArray(coords) ? coords.map((c) => ({ type: "Polygon", coordinates: c })) : [v];
    }
    default:
      return [v];
  }
}

function boundaryOfGeometries(geometries: unknown[]): BoundaryImport {
  const typeOf = (g: unknown) => String((g as { type?: unknown }).type ?? "unknown");
  const polygons = geometries.filter((g) => typeOf(g) === "Polygon");
  if (polygons.length === 0) {
    const found = [...new Set(geometries.map(typeOf))].join(", ");
    return fail(error("noPolygon", found ? { found } : {}));
  }
  if (polygons.length > 1) return fail(error("manyPolygons", { count: polygons.length }));
  return validatePolygon((polygons[0] as { coordinates?: unknown }).coordinates);
}

function validatePolygon(coordinates: unknown): BoundaryImport {
  if (!Array.isArray(coordinates) || coordinates.length === 0) return fail(error("noPolygon"));
  const total = coordinates.reduce((n: number, r) => n + (Array.isArray(r) ? r.length : 0), 0);
  if (total > MAX_BOUNDARY_POSITIONS) return fail(error("tooManyPositions"));
  const errors: BoundaryError[] = [];
  const rings: LonLat[][] = [];
  coordinates.forEach((raw, ring) => {
    if (!Array.isArray(raw)) {
      errors.push(error("badPosition", { ring, position: 1 }));
      return;
    }
    const positions: LonLat[] = [];
    for (const [i, p] of raw.entries()) {
      const position = i + 1;
      if (!Array.isArray(p) || p.length < 2 || !Number.isFinite(p[0]) || !Number.isFinite(p[1])) {
        errors.push(error("badPosition", { ring, position }));
        return;
      }
      const [lon, lat] = p as [number, number];
      if (lon < -180 || lon > 180 || lat < -90 || lat > 90) {
        errors.push(error("outOfRange", { ring, position }));
        return;
      }
      positions.push([lon, lat]);
    }
    if (positions.length < 4) {
      errors.push(error("tooFewPositions", { ring, count: positions.length }));
      return;
    }
    const first = positions[0]!;
    const last = positions[positions.length - 1]!;
    if (first[0] !== last[0] || first[1] !== last[1]) {
      errors.push(error("notClosed", { ring }));
      return;
    }
    if (selfIntersects(positions)) {
      errors.push(error("selfIntersecting", { ring }));
      return;
    }
    rings.push(positions);
  });
  if (errors.length > 0) return fail(...errors);
  const [outer, ...holes] = rings;
  if (!outer || ringAreaSquareMeters(outer) === 0) return fail(error("zeroArea"));
  // RFC 7946: exterior ring counter-clockwise, holes clockwise.
  const polygon: GeoJsonPolygon = {
    type: "Polygon",
    coordinates: [wind(outer, true), ...holes.map((h) => wind(h, false))],
  };
  const area = geometryArea(polygon);
  if (area.acres <= 0 || !Number.isFinite(area.acres)) return fail(error("zeroArea"));
  if (area.acres > MAX_BOUNDARY_ACRES) return fail(error("tooLarge", { acres: Math.round(area.acres) }));
  return {
    ok: true,
    boundary: {
      polygon,
      areaAcres: area.acres,
      areaHectares: area.hectares,
      centroid: polygonCentroid(polygon),
    },
  };
}

// Signed area in plain lon/lat (shoelace): positive when counter-clockwise.
function signedArea(ring: readonly LonLat[]): number {
  let sum = 0;
  for (let i = 0; i < ring.length - 1; i++) {
    const [x0, y0] = ring[i]!;
    const [x1, y1] = ring[i + 1]!;
    sum += x0 * y1 - x1 * y0;
  }
  return sum / 2;
}

function wind(ring: LonLat[], counterClockwise: boolean): LonLat[] {
  return signedArea(ring) > 0 === counterClockwise ? ring : [...ring].reverse();
}

function orientation(a: LonLat, b: LonLat, c: LonLat): number {
  const v = (b[1] - a[1]) * (c[0] - b[0]) - (b[0] - a[0]) * (c[1] - b[1]);
  return v > 0 ? 1 : v < 0 ? -1 : 0;
}

function onSegment(a: LonLat, b: LonLat, p: LonLat): boolean {
  return (
    Math.min(a[0], b[0]) <= p[0] &&
    p[0] <= Math.max(a[0], b[0]) &&
    Math.min(a[1], b[1]) <= p[1] &&
    p[1] <= Math.max(a[1], b[1])
  );
}

function segmentsIntersect(p1: LonLat, p2: LonLat, q1: LonLat, q2: LonLat): boolean {
  const o1 = orientation(p1, p2, q1);
  const o2 = orientation(p1, p2, q2);
  const o3 = orientation(q1, q2, p1);
  const o4 = orientation(q1, q2, p2);
  if (o1 !== o2 && o3 !== o4) return true;
  return (
    (o1 === 0 && onSegment(p1, p2, q1)) ||
    (o2 === 0 && onSegment(p1, p2, q2)) ||
    (o3 === 0 && onSegment(q1, q2, p1)) ||
    (o4 === 0 && onSegment(q1, q2, p2))
  );
}

// Whether two non-adjacent edges of the closed ring touch or cross (O(n²); rings are capped above).
function selfIntersects(ring: readonly LonLat[]): boolean {
  const pts = openRing(ring);
  const n = pts.length;
  if (n < 4) return false;
  for (let i = 0; i < n; i++) {
    const a1 = pts[i]!;
    const a2 = pts[(i + 1) % n]!;
    for (let j = i + 2; j < n; j++) {
      if (i === 0 && j === n - 1) continue; // the closing edge is adjacent to the first
      if (segmentsIntersect(a1, a2, pts[j]!, pts[(j + 1) % n]!)) return true;
    }
  }
  return false;
}
