import "server-only";
import { findAccountAccess } from "@/db/queries/access";
import {
  findReportField,
  listReportDigs,
  listReportPasses,
  listReportPhotos,
  listReportPlantings,
  listReportPlants,
  listStationWeather,
  type ReportField,
} from "@/db/queries/reports";
import {
  auditPlacement,
  type BandOffsets,
  type Finding,
  type Placement,
  type RateUnit,
  type SoilTexture,
  type Severity,
  stageOnDate,
} from "@/lib/agronomy";
import { type AccountAccess, type Actor, can } from "@/lib/auth/permissions";
import { digDay, siteLeafCollars, stageOfCollars } from "@/lib/digs/assessment";
import { getObjectBytes } from "@/lib/storage/s3";

// Everything the field report shows, gathered for one field the actor may read. The page, the PDF
// and the e-mailed copy are all drawn from this one object, so they say the same thing.

export interface ReportPlanting {
  id: string;
  hybrid: string;
  plantedOn: string;
  /** Seeds per acre. */
  seedingRate: number;
  seedingDepthIn: number;
  rowSpacingIn: number;
  soilTexture: SoilTexture;
  /** Predicted leaf stage from the field's recorded temperatures, through `throughDate`. */
  stageNow: { stage: string; gddF: number; throughDate: string; complete: boolean } | null;
}

export interface ReportDig {
  id: string;
  /** YYYY-MM-DD (UTC date of the stored dig time). */
  day: string;
  repName: string | null;
  hybrid: string | null;
  /** Median leaf stage of the dug plants; null when no plant was recorded. */
  leafStage: string | null;
  plantCount: number;
  /** Site root development index, 0–100. */
  rootIndex: number | null;
  flags: { severity: Severity; message: string }[];
  flaggedByRep: boolean;
}

export interface HybridRootIndex {
  hybrid: string;
  /** Scored plants. */
  n: number;
  mean: number;
  min: number;
  max: number;
}

export interface ReportPlacement {
  passId: string;
  appliedOn: string;
  productName: string;
  rate: number;
  rateUnit: RateUnit;
  placement: Placement;
  /** The planting the pass was audited against (a whole-field pass is audited against each). */
  hybrid: string;
  /** The dig whose measured band offsets were checked, when there was one. */
  measuredOn: string | null;
  measured: BandOffsets | null;
  findings: Finding[];
  /** Why the pass could not be audited (an entry out of the core's range). */
  error: string | null;
}

export interface ReportRecommendation {
  digId: string;
  day: string;
  repName: string | null;
  text: string;
}

export interface ReportPhoto {
  id: string;
  sha256: string;
  contentType: string;
  caption: string | null;
  day: string;
  objectKey: string;
  isIllustration: boolean;
}

export interface FieldReport {
  field: ReportField;
  access: AccountAccess;
  generatedAt: Date;
  plantings: ReportPlanting[];
  digs: ReportDig[];
  rootIndexByHybrid: HybridRootIndex[];
  placement: ReportPlacement[];
  recommendations: ReportRecommendation[];
  photos: ReportPhoto[];
  /** Density and salt-index sources of the products used, as stored in the catalog. */
  productSources: string[];
}

const round1 = (x: number) => Math.round(x * 10) / 10;
const mean = (xs: readonly number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
const round2 = (x: number) => Math.round(x * 100) / 100;

/** One decimal, as every table of the report prints the root index. */
export function formatIndex(x: number | null): string {
  return x === null ? "" : round1(x).toFixed(1);
}

function flagsOf(assessment: unknown): ReportDig["flags"] {
  const flags = (assessment as { flags?: unknown } | null)?.flags;
  if (!Array.isArray(flags)) return [];
  return flags.flatMap((f) =>
    f && typeof f === "object" && typeof f.message === "string" && typeof f.severity === "string"
      ? [{ severity: f.severity as Severity, message: f.message as string }]
      : [],
  );
}

function stageNowOf(
  plantedOn: string,
  weather: readonly { date: string; maxF: number; minF: number }[],
  today: string,
): ReportPlanting["stageNow"] {
  const last = weather.at(-1)?.date;
  if (!last || last <= plantedOn) return null;
  const through = last < today ? last : today;
  try {
    const s = stageOnDate(weather, plantedOn, through);
    return { stage: s.stage, gddF: Math.round(s.gddF), throughDate: through, complete: s.complete };
  } catch {
    // A record the core refuses leaves the stage unknown; the rest of the report still stands.
    return null;
  }
}

/**
 * The report for a field the actor may read; undefined when there is no such live field or it belongs
 * to a farm the actor may not see (the caller answers 404). With `withPhotoBytes` the JPEG and PNG
 * photos' bytes are read from the bucket for the PDF (a missing object is left out of the map).
 */
export async function gatherFieldReport(actor: Actor, fieldId: string): Promise<FieldReport | undefined> {
  const field = await findReportField(fieldId);
  const access = field && (await findAccountAccess(actor, field.accountId));
  if (!field || !access || !can(actor, "read", { kind: "field", access })) return undefined;

  const [plantingRows, passes, digRows, plantRows, photoRows] = await Promise.all([
    listReportPlantings(fieldId),
    listReportPasses(fieldId),
    listReportDigs(fieldId),
    listReportPlants(fieldId),
    listReportPhotos(fieldId),
  ]);
  const generatedAt = new Date();
  const today = generatedAt.toISOString().slice(0, 10);
  const firstPlanted = plantingRows[0]?.plantedOn;
  const weather =
    field.weatherStationId && firstPlanted
      ? await listStationWeather(field.weatherStationId, firstPlanted)
      : [];

  const plantings: ReportPlanting[] = plantingRows.map((p) => ({
    ...p,
    stageNow: stageNowOf(p.plantedOn, weather, today),
  }));
  const hybridOf = new Map(plantings.map((p) => [p.id, p.hybrid]));

  const plantsByDig = new Map<string, typeof plantRows>();
  for (const plant of plantRows) {
    const list = plantsByDig.get(plant.digSiteId) ?? [];
    list.push(plant);
    plantsByDig.set(plant.digSiteId, list);
  }

  const digs: ReportDig[] = digRows.map((d) => {
    const plants = plantsByDig.get(d.id) ?? [];
    let leafStage: string | null = null;
    try {
      leafStage = plants.length > 0 ? stageOfCollars(siteLeafCollars(plants)) : null;
    } catch {
      leafStage = plants[0]?.leafStage ?? null;
    }
    return {
      id: d.id,
      day: digDay(d.dugAt.toISOString()),
      repName: d.repName,
      hybrid: d.hybrid,
      leafStage,
      plantCount: plants.length,
      rootIndex: d.rootIndex,
      flags: flagsOf(d.assessment),
      flaggedByRep: d.flaggedByRep,
    };
  });

  // Root index by hybrid over the scored plants of every dig.
  const byHybrid = new Map<string, number[]>();
  for (const d of digRows) {
    const hybrid = d.hybrid;
    if (!hybrid) continue;
    for (const p of plantsByDig.get(d.id) ?? []) {
      if (p.rootIndex === null) continue;
      const list = byHybrid.get(hybrid) ?? [];
      list.push(p.rootIndex);
      byHybrid.set(hybrid, list);
    }
  }
  const rootIndexByHybrid: HybridRootIndex[] = [...byHybrid]
    .sort(([a], [b]) => a.localeCompare(b))
    .map(([hybrid, xs]) => ({
      hybrid,
      n: xs.length,
      mean: round1(mean(xs)),
      min: round1(Math.min(...xs)),
      max: round1(Math.max(...xs)),
    }));

  // The audit of each pass against its planting (a whole-field pass against each planting), with the
  // band offsets measured in the latest dig of that planting on or after the pass, as a dig records them.
  const placement: ReportPlacement[] = passes.flatMap((pass) => {
    const targets = pass.plantingId ? plantings.filter((p) => p.id === pass.plantingId) : plantings;
    return targets.map((planting) => {
      const banded = pass.placement === "band_2x2" || pass.placement === "side_dress";
      let measured: BandOffsets | null = null;
      let measuredOn: string | null = null;
      if (banded) {
        for (const d of [...digRows].reverse()) {
          if (d.plantingId !== planting.id) continue;
          const day = digDay(d.dugAt.toISOString());
          if (day < pass.appliedOn) continue;
          const bands = (plantsByDig.get(d.id) ?? []).flatMap((p) =>
            p.bandBesideIn !== null && p.bandBelowIn !== null
              ? [[p.bandBesideIn, p.bandBelowIn] as const]
              : [],
          );
          if (bands.length === 0) continue;
          measured = {
            besideIn: round2(mean(bands.map((b) => b[0]))),
            belowIn: round2(mean(bands.map((b) => b[1]))),
          };
          measuredOn = day;
          break;
        }
      }
      const base = {
        passId: pass.id,
        appliedOn: pass.appliedOn,
        productName: pass.productName,
        rate: pass.rate,
        rateUnit: pass.rateUnit,
        placement: pass.placement,
        hybrid: hybridOf.get(planting.id) ?? "",
        measuredOn,
        measured,
      };
      try {
        const findings = auditPlacement({
          placement: pass.placement,
          product: {
            name: pass.productName,
            n: pass.n,
            p2o5: pass.p2o5,
            k2o: pass.k2o,
            s: pass.s,
            lbPerGal: pass.lbPerGal,
            saltIndex: pass.saltIndex,
            containsUrea: pass.containsUrea,
            containsThiosulfate: pass.containsThiosulfate,
          },
          rate: pass.rate,
          rateUnit: pass.rateUnit,
          rowSpacingIn: planting.rowSpacingIn,
          soil: planting.soilTexture,
          intended:
            pass.intendedBesideIn !== null && pass.intendedBelowIn !== null
              ? { besideIn: pass.intendedBesideIn, belowIn: pass.intendedBelowIn }
              : null,
          measured,
        });
        return { ...base, findings, error: null };
      } catch (err) {
        if (!(err instanceof RangeError || err instanceof TypeError)) throw err;
        return { ...base, findings: [], error: err.message };
      }
    });
  });

  const productSources = [
    ...new Set(
      passes.flatMap((p) => [
        ...(p.lbPerGal !== null && p.densitySource ? [`${p.productName}: density — ${p.densitySource}`] : []),
        ...(p.saltIndex !== null && p.saltIndexSource
          ? [`${p.productName}: salt index — ${p.saltIndexSource}`]
          : []),
      ]),
    ),
  ];

  const recommendations: ReportRecommendation[] = digRows.flatMap((d) =>
    d.recommendation?.trim()
      ? [
          {
            digId: d.id,
            day: digDay(d.dugAt.toISOString()),
            repName: d.repName,
            text: d.recommendation.trim(),
          },
        ]
      : [],
  );

  const photos: ReportPhoto[] = photoRows.map((p) => ({
    id: p.id,
    sha256: p.sha256,
    contentType: p.contentType,
    caption: p.caption,
    day: digDay(p.dugAt.toISOString()),
    objectKey: p.objectKey,
    isIllustration: p.isIllustration,
  }));

  return {
    field,
    access,
    generatedAt,
    plantings,
    digs,
    rootIndexByHybrid,
    placement,
    recommendations,
    photos,
    productSources,
  };
}

export const EMBEDDABLE_PHOTO_TYPES = ["image/jpeg", "image/png"] as const;
/** Photos embedded in one PDF at most, so a report stays a size an inbox accepts. */
export const MAX_EMBEDDED_PHOTOS = 12;

/** The bytes of the report's embeddable photos (JPEG and PNG, not illustrations), by photo id. */
export async function loadPhotoBytes(report: FieldReport): Promise<Map<string, Uint8Array>> {
  const wanted = report.photos
    .filter((p) => !p.isIllustration && (EMBEDDABLE_PHOTO_TYPES as readonly string[]).includes(p.contentType))
    .slice(0, MAX_EMBEDDED_PHOTOS);
  const loaded = await Promise.all(
    wanted.map(async (p) => {
      try {
        return [p.id, await getObjectBytes(p.objectKey)] as const;
      } catch (err) {
        console.warn(`[reports] photo ${p.id} could not be read from the bucket:`, err);
        return null;
      }
    }),
  );
  return new Map(loaded.filter((x) => x !== null));
}
