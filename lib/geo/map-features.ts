// The map API's GeoJSON (GET /api/map) as the server builds it and the map client reads it.

export type LonLat = [number, number];

export interface PolygonGeometry {
  type: "Polygon";
  coordinates: LonLat[][];
}

export type FlagSeverity = "info" | "caution" | "warning" | "critical";
export type CaseStatus = "new" | "in_review" | "decided" | "closed";

export interface FieldFeature {
  type: "Feature";
  id: string;
  geometry: PolygonGeometry;
  properties: {
    id: string;
    name: string;
    accountId: string;
    accountName: string;
    areaAcres: number | null;
  };
}

export interface DigProperties {
  id: string;
  fieldId: string;
  fieldName: string;
  accountName: string;
  /** ISO 8601 (UTC). */
  dugAt: string;
  hybrid: string | null;
  /** The site's leaf stage (VE, V1 …), the median of the dug plants' stages; null with no plants. */
  leafStage: string | null;
  /** Site root development index, 0–100; null when no plant could be scored. */
  rootIndex: number | null;
  /** Injury flags of the assessment: how many and the most severe. */
  flags: { count: number; severity: FlagSeverity | null };
  /** See FLAGGED_RULE. */
  flagged: boolean;
  /** Status of the dig's latest injury case the actor may read; null when none. */
  caseStatus: CaseStatus | null;
}

export interface DigFeature {
  type: "Feature";
  id: string;
  geometry: { type: "Point"; coordinates: LonLat };
  properties: DigProperties;
}

/** Fields are the polygons, digs the points. */
export const isDigFeature = (f: FieldFeature | DigFeature): f is DigFeature => f.geometry.type === "Point";
export const isFieldFeature = (f: FieldFeature | DigFeature): f is FieldFeature =>
  f.geometry.type === "Polygon";

export interface MapFeatureCollection {
  type: "FeatureCollection";
  features: (FieldFeature | DigFeature)[];
  /** Pins are capped at MAX_MAP_PINS per request; true when more matched. */
  truncated: boolean;
}

/** Most pins one map request returns (the map asks again for a smaller view). */
export const MAX_MAP_PINS = 20_000;

/**
 * A dig counts as flagged when the rep flagged it, when its stored assessment sends it for review
 * (a critical flag or two warnings, lib/agronomy/injury.ts), or when it has an injury case the actor
 * may read (a grower reads only cases shared with them).
 */
export const FLAGGED_RULE = "flaggedByRep OR assessment.flagForReview.flag OR an injury case";

export type IndexBand = "good" | "fair" | "poor" | "unscored";

/**
 * The band of a site root index (0–100) on the map, on the thresholds of the low_root_index flag
 * (lib/agronomy/injury.ts: under 60 a warning, under 40 critical): good ≥ 60, fair 40–60, poor < 40.
 */
export function indexBand(rootIndex: number | null): IndexBand {
  if (rootIndex === null || !Number.isFinite(rootIndex)) return "unscored";
  if (rootIndex >= 60) return "good";
  if (rootIndex >= 40) return "fair";
  return "poor";
}

export const STAGES = [
  "VE",
  "V1",
  "V2",
  "V3",
  "V4",
  "V5",
  "V6",
  "V7",
  "V8",
  "V9",
  "V10",
  "V11",
  "V12",
] as const;
