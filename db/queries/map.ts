import "server-only";
import { sql } from "kysely";
import type { Actor } from "@/lib/auth/permissions";
import type { Bounds } from "@/lib/geo/bounds";
import {
  type CaseStatus,
  type DigFeature,
  type FieldFeature,
  type FlagSeverity,
  type LonLat,
  MAX_MAP_PINS,
  type MapFeatureCollection,
} from "@/lib/geo/map-features";
import { db } from "../client";
import { accountVisibleTo } from "./access";

export interface MapFilters {
  bounds: Bounds;
  /** First and last dig day, YYYY-MM-DD, taken as UTC days. */
  from?: string;
  to?: string;
  hybrid?: string;
  /** Leaf collars of the site's stage (VE = 0, V3 = 3). */
  stageCollars?: number;
  flaggedOnly?: boolean;
  accountId?: string;
  fieldId?: string;
}

// A field is drawn when its centroid lies within the bounds widened by this margin, degrees (about
// 5.5 km of latitude): wider than any field, so a field reaching into the view is not missed.
const FIELD_MARGIN_DEG = 0.05;

const round6 = (x: number) => Math.round(x * 1e6) / 1e6;
const SEVERITY_BY_RANK: (FlagSeverity | null)[] = ["info", "caution", "warning", "critical"];

// The site's leaf collars: the stored assessment's, else the median (lower middle) of the live plants'
// stages (VE and "planted" are 0; VT and anything unreadable are left out), as lib/digs/assessment.ts.
const stageCollars = sql<number | null>`coalesce(
  (dig_site.assessment->>'leafCollars')::int,
  (select percentile_disc(0.5) within group (order by
      case when upper(dug_plant.leaf_stage) in ('VE', 'PLANTED') then 0
           when upper(dug_plant.leaf_stage) ~ '^V[0-9]{1,2}$' then substring(upper(dug_plant.leaf_stage) from 2)::int
      end)
    from dug_plant where dug_plant.dig_site_id = dig_site.id and dug_plant.deleted_at is null))`;

const flagList = sql`case when jsonb_typeof(dig_site.assessment->'flags') = 'array'
  then dig_site.assessment->'flags' else '[]'::jsonb end`;

// See FLAGGED_RULE in lib/geo/map-features.ts; injury_case is joined only when the actor may read it.
const flagged = sql<boolean>`(dig_site.flagged_by_rep
  or coalesce((dig_site.assessment->'flagForReview'->>'flag')::boolean, false)
  or injury_case.id is not null)`;

function nextDay(day: string): Date {
  const d = new Date(`${day}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + 1);
  return d;
}

/** The dig pins the actor may see within the bounds and filters, at most MAX_MAP_PINS (+1 to tell). */
async function listDigPins(actor: Actor, f: MapFilters) {
  const { west, south, east, north } = f.bounds;
  let q = db
    .selectFrom("digSite")
    .innerJoin("field", "field.id", "digSite.fieldId")
    .innerJoin("account", "account.id", "digSite.accountId")
    .leftJoin("planting", (j) =>
      j.onRef("planting.id", "=", "digSite.plantingId").on("planting.deletedAt", "is", null),
    )
    .leftJoin("injuryCase", (j) => {
      const base = j.onRef("injuryCase.digSiteId", "=", "digSite.id").on("injuryCase.deletedAt", "is", null);
      return actor.role === "grower" ? base.on("injuryCase.sharedWithGrower", "=", true) : base;
    })
    .select([
      "digSite.id",
      "digSite.fieldId",
      "field.name as fieldName",
      "account.name as accountName",
      "digSite.dugAt",
      "digSite.latitude",
      "digSite.longitude",
      "digSite.rootIndex",
      "planting.hybrid",
      "injuryCase.status as caseStatus",
      stageCollars.as("stageCollars"),
      sql<number>`jsonb_array_length(${flagList})`.as("flagCount"),
      sql<number | null>`(select max(case f->>'severity' when 'critical' then 3 when 'warning' then 2
        when 'caution' then 1 when 'info' then 0 end) from jsonb_array_elements(${flagList}) f)`.as(
        "flagRank",
      ),
      flagged.as("flagged"),
    ])
    .where("digSite.deletedAt", "is", null)
    .where("digSite.latitude", ">=", south)
    .where("digSite.latitude", "<=", north)
    .where("digSite.longitude", ">=", west)
    .where("digSite.longitude", "<=", east)
    .where(accountVisibleTo(actor));
  if (f.accountId) q = q.where("digSite.accountId", "=", f.accountId);
  if (f.fieldId) q = q.where("digSite.fieldId", "=", f.fieldId);
  if (f.from) q = q.where("digSite.dugAt", ">=", new Date(`${f.from}T00:00:00Z`));
  if (f.to) q = q.where("digSite.dugAt", "<", nextDay(f.to));
  if (f.hybrid) q = q.where(sql`lower(planting.hybrid)`, "=", f.hybrid.toLowerCase());
  if (f.stageCollars !== undefined) q = q.where(stageCollars, "=", f.stageCollars);
  if (f.flaggedOnly) q = q.where(flagged);
  return q.limit(MAX_MAP_PINS + 1).execute();
}

/** The live fields with a boundary the actor may see, whose centroid is near the bounds. */
async function listFieldShapes(actor: Actor, f: MapFilters) {
  const { west, south, east, north } = f.bounds;
  let q = db
    .selectFrom("field")
    .innerJoin("account", "account.id", "field.accountId")
    .select([
      "field.id",
      "field.name",
      "field.accountId",
      "account.name as accountName",
      "field.areaAcres",
      "field.boundary",
    ])
    .where("field.deletedAt", "is", null)
    .where("field.boundary", "is not", null)
    .where("field.centroidLat", ">=", south - FIELD_MARGIN_DEG)
    .where("field.centroidLat", "<=", north + FIELD_MARGIN_DEG)
    .where("field.centroidLon", ">=", west - FIELD_MARGIN_DEG)
    .where("field.centroidLon", "<=", east + FIELD_MARGIN_DEG)
    .where(accountVisibleTo(actor));
  if (f.accountId) q = q.where("field.accountId", "=", f.accountId);
  if (f.fieldId) q = q.where("field.id", "=", f.fieldId);
  return q.execute();
}

function polygonOf(boundary: unknown): FieldFeature["geometry"] | null {
  const b = boundary as { type?: unknown; coordinates?: unknown } | null;
  if (b?.type !== "Polygon" || !Array.isArray(b.coordinates)) return null;
  const rings: LonLat[][] = [];
  for (const ring of b.coordinates) {
    if (!Array.isArray(ring)) return null;
    const pts: LonLat[] = [];
    for (const p of ring) {
      if (!Array.isArray(p) || typeof p[0] !== "number" || typeof p[1] !== "number") return null;
      pts.push([round6(p[0]), round6(p[1])]);
    }
    rings.push(pts);
  }
  return { type: "Polygon", coordinates: rings };
}

/**
 * The map's GeoJSON for the actor: field boundaries near the bounds (not narrowed by the dig filters)
 * and the dig pins within the bounds and filters, every row scoped by accountVisibleTo. One query per
 * layer; coordinates rounded to 6 decimals.
 */
export async function findMapFeatures(actor: Actor, filters: MapFilters): Promise<MapFeatureCollection> {
  const [fields, pins] = await Promise.all([listFieldShapes(actor, filters), listDigPins(actor, filters)]);
  const features: MapFeatureCollection["features"] = [];
  for (const f of fields) {
    const geometry = polygonOf(f.boundary);
    if (!geometry) continue;
    features.push({
      type: "Feature",
      id: f.id,
      geometry,
      properties: {
        id: f.id,
        name: f.name,
        accountId: f.accountId,
        accountName: f.accountName,
        areaAcres: f.areaAcres === null ? null : Math.round(f.areaAcres * 10) / 10,
      },
    });
  }
  const truncated = pins.length > MAX_MAP_PINS;
  for (const p of truncated ? pins.slice(0, MAX_MAP_PINS) : pins) {
    if (p.latitude === null || p.longitude === null) continue;
    const collars = p.stageCollars === null ? null : Number(p.stageCollars);
    const pin: DigFeature = {
      type: "Feature",
      id: p.id,
      geometry: { type: "Point", coordinates: [round6(p.longitude), round6(p.latitude)] },
      properties: {
        id: p.id,
        fieldId: p.fieldId,
        fieldName: p.fieldName,
        accountName: p.accountName,
        dugAt: p.dugAt.toISOString(),
        hybrid: p.hybrid,
        leafStage: collars === null ? null : collars === 0 ? "VE" : `V${collars}`,
        rootIndex: p.rootIndex === null ? null : Math.round(p.rootIndex * 10) / 10,
        flags: {
          count: Number(p.flagCount),
          severity: p.flagRank === null ? null : (SEVERITY_BY_RANK[Number(p.flagRank)] ?? null),
        },
        flagged: Boolean(p.flagged),
        caseStatus: (p.caseStatus as CaseStatus | null) ?? null,
      },
    };
    features.push(pin);
  }
  return { type: "FeatureCollection", features, truncated };
}

/** The accounts the actor may see, by name, for the map's account filter. */
export async function listMapAccounts(actor: Actor): Promise<{ id: string; name: string }[]> {
  return db
    .selectFrom("account")
    .select(["account.id", "account.name"])
    .where(accountVisibleTo(actor))
    .orderBy("account.name")
    .execute();
}
