import {
  type AssessDigInput,
  assessDig,
  type BandOffsets,
  type DigAssessment,
  type DugPlantRoots,
  type FertilizerPass,
  type InjuryScore,
  leafCollarsOfStage,
  type MesocotylCondition,
  type PassProduct,
  type Placement,
  type RateUnit,
  type SoilTexture,
} from "@/lib/agronomy";

// How a recorded dig (site, dug plants, the planting, its fertilizer passes and the catalog) becomes
// the agronomy core's input. Isomorphic and pure: the phone runs it for the live summary, the demo seed
// and the server (when a pushed dig is recomputed) for the stored assessment, so all three agree.

/** The site as recorded; dugAt is ISO 8601, its date part (in the recorded offset) is the dig's day. */
export interface AssessmentSite {
  fieldId: string;
  plantingId: string | null;
  dugAt: string;
}

/** A dug plant as recorded (the sync payload's shape); missing measurements are null. */
export interface AssessmentPlant {
  leafStage: string;
  seedingDepthIn: number | null;
  crownDepthIn: number | null;
  mesocotyl: MesocotylCondition | null;
  seminalScore: number | null;
  nodalWhorls: number | null;
  nodalCount: number | null;
  longestNodalIn: number | null;
  seminalInjury: InjuryScore;
  nodalInjury: InjuryScore;
  findings: readonly string[];
  bandBesideIn: number | null;
  bandBelowIn: number | null;
}

// The measurements of a stored dug plant (a database row, a Dexie row) that the assessment reads.
export function assessmentPlantOf(row: AssessmentPlant): AssessmentPlant {
  return {
    leafStage: row.leafStage,
    seedingDepthIn: row.seedingDepthIn,
    crownDepthIn: row.crownDepthIn,
    mesocotyl: row.mesocotyl,
    seminalScore: row.seminalScore,
    nodalWhorls: row.nodalWhorls,
    nodalCount: row.nodalCount,
    longestNodalIn: row.longestNodalIn,
    seminalInjury: row.seminalInjury,
    nodalInjury: row.nodalInjury,
    findings: row.findings,
    bandBesideIn: row.bandBesideIn,
    bandBelowIn: row.bandBelowIn,
  };
}

export interface AssessmentPlanting {
  id: string;
  /** Row spacing, inches. */
  rowSpacingIn: number;
  soilTexture: SoilTexture;
}

export interface AssessmentPass {
  fieldId: string;
  plantingId: string | null;
  productId: string;
  /** ISO date (YYYY-MM-DD). */
  appliedOn: string;
  rate: number;
  rateUnit: RateUnit;
  placement: Placement;
  /** Offsets the pass was set up for, inches. */
  intendedBesideIn: number | null;
  intendedBelowIn: number | null;
}

export interface AssessmentProduct {
  id: string;
  name: string;
  /** Grade, % by weight. */
  n: number;
  p2o5: number;
  k2o: number;
  s: number;
  /** Density, lb/gal; null for dry products. */
  lbPerGal: number | null;
  saltIndex: number | null;
  containsUrea: boolean;
  containsThiosulfate: boolean;
}

/** Root measurements the index needs; a plant missing any of them is not scored. */
export const SCORED_MEASUREMENTS = [
  "seminalScore",
  "nodalWhorls",
  "nodalCount",
  "longestNodalIn",
  "crownDepthIn",
  "mesocotyl",
] as const satisfies readonly (keyof AssessmentPlant)[];
export type ScoredMeasurement = (typeof SCORED_MEASUREMENTS)[number];

export function missingMeasurements(plant: AssessmentPlant): ScoredMeasurement[] {
  return SCORED_MEASUREMENTS.filter((k) => plant[k] === null || plant[k] === undefined);
}

const round = (x: number, digits: number) => {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
};
const mean = (xs: readonly number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;

/** The dig's day (YYYY-MM-DD) as the rep saw the clock: the date part of dugAt in its own offset. */
export function digDay(dugAt: string): string {
  const day = /^(\d{4}-\d{2}-\d{2})T/.exec(dugAt)?.[1];
  if (!day) throw new RangeError(`dugAt must be an ISO date and time; got ${JSON.stringify(dugAt)}.`);
  return day;
}

/** Median of the plants' leaf collars (the lower middle for an even count): the site's stage. */
export function siteLeafCollars(plants: readonly Pick<AssessmentPlant, "leafStage">[]): number {
  const sorted = plants.map((p) => leafCollarsOfStage(p.leafStage)).sort((a, b) => a - b);
  return sorted[Math.floor((sorted.length - 1) / 2)] ?? 0;
}

export const stageOfCollars = (collars: number) => (collars === 0 ? "VE" : `V${collars}`);

function roots(p: AssessmentPlant): DugPlantRoots {
  return {
    seminalRootScore: p.seminalScore!,
    nodalWhorls: p.nodalWhorls!,
    nodalRootCount: p.nodalCount!,
    longestNodalRootIn: p.longestNodalIn!,
    crownDepthIn: p.crownDepthIn!,
    mesocotyl: p.mesocotyl!,
    seminalInjury: p.seminalInjury,
    nodalInjury: p.nodalInjury,
    burnSeen: p.findings.includes("band_burn"),
  };
}

function passProduct(p: AssessmentProduct): PassProduct {
  return {
    name: p.name,
    n: p.n,
    p2o5: p.p2o5,
    k2o: p.k2o,
    s: p.s,
    lbPerGal: p.lbPerGal,
    saltIndex: p.saltIndex,
    containsUrea: p.containsUrea,
    containsThiosulfate: p.containsThiosulfate,
  };
}

/**
 * The agronomy core's input for a dig:
 * - stage: the median of the plants' leaf stages (all plants);
 * - plants: those with every root measurement (SCORED_MEASUREMENTS), in order;
 * - passes: the field's passes for this planting or for the whole field applied on or before the dig's
 *   day, with the product from the catalog (a pass whose product is unknown is left out), the planting's
 *   row spacing (in) and soil; each 2x2 or side-dress pass carries the band offsets measured in the dig
 *   (the mean over plants with both offsets, in, 2 decimals). No planting: no pass can be audited;
 * - seedingDepthIn: the mean measured seeding depth, in, 2 decimals (null when none was measured).
 * Throws a RangeError when no plant can be scored (the core needs at least one).
 */
export function assessmentInputFor(
  site: AssessmentSite,
  plants: readonly AssessmentPlant[],
  planting: AssessmentPlanting | null,
  passes: readonly AssessmentPass[],
  products: readonly AssessmentProduct[],
): AssessDigInput {
  const scored = plants.filter((p) => missingMeasurements(p).length === 0);
  if (scored.length === 0) {
    throw new RangeError("No dug plant has every root measurement the index needs.");
  }
  const day = digDay(site.dugAt);
  const bands = plants.flatMap((p) =>
    p.bandBesideIn !== null && p.bandBelowIn !== null
      ? [{ beside: p.bandBesideIn, below: p.bandBelowIn }]
      : [],
  );
  const measured: BandOffsets | null =
    bands.length > 0
      ? {
          besideIn: round(mean(bands.map((b) => b.beside)), 2),
          belowIn: round(mean(bands.map((b) => b.below)), 2),
        }
      : null;
  const productById = new Map(products.map((p) => [p.id, p]));
  const audited: FertilizerPass[] = planting
    ? passes.flatMap((pass) => {
        if (pass.fieldId !== site.fieldId) return [];
        if (pass.plantingId !== null && pass.plantingId !== planting.id) return [];
        if (pass.appliedOn > day) return [];
        const product = productById.get(pass.productId);
        if (!product) return [];
        const banded = pass.placement === "band_2x2" || pass.placement === "side_dress";
        return [
          {
            placement: pass.placement,
            product: passProduct(product),
            rate: pass.rate,
            rateUnit: pass.rateUnit,
            rowSpacingIn: planting.rowSpacingIn,
            soil: planting.soilTexture,
            intended:
              pass.intendedBesideIn !== null && pass.intendedBelowIn !== null
                ? { besideIn: pass.intendedBesideIn, belowIn: pass.intendedBelowIn }
                : null,
            measured: banded ? measured : null,
          },
        ];
      })
    : [];
  const depths = plants.flatMap((p) => (p.seedingDepthIn === null ? [] : [p.seedingDepthIn]));
  return {
    stage: stageOfCollars(siteLeafCollars(plants)),
    plants: scored.map(roots),
    passes: audited,
    seedingDepthIn: depths.length > 0 ? round(mean(depths), 2) : null,
  };
}

export interface LocalDigAssessment {
  /** The core's assessment, or null when no plant can be scored yet or an entry is out of its range. */
  assessment: DigAssessment | null;
  /** Index into the given plants of each plant in assessment.plants. */
  scoredPlants: number[];
  /** Plants left out, with the measurements still to enter. */
  unscoredPlants: { index: number; missing: ScoredMeasurement[] }[];
  /** Why there is no assessment when a plant could be scored (an entry the core refused). */
  error: string | null;
}

/**
 * The assessment the phone shows while the rep enters a dig (offline, from the local records). Never
 * throws for incomplete or out-of-range entries: the reason is returned for the summary to show.
 */
export function assessLocalDig(
  site: AssessmentSite,
  plants: readonly AssessmentPlant[],
  planting: AssessmentPlanting | null,
  passes: readonly AssessmentPass[],
  products: readonly AssessmentProduct[],
): LocalDigAssessment {
  const scoredPlants: number[] = [];
  const unscoredPlants: LocalDigAssessment["unscoredPlants"] = [];
  plants.forEach((p, index) => {
    const missing = missingMeasurements(p);
    if (missing.length === 0) scoredPlants.push(index);
    else unscoredPlants.push({ index, missing });
  });
  if (scoredPlants.length === 0) return { assessment: null, scoredPlants, unscoredPlants, error: null };
  try {
    const input = assessmentInputFor(site, plants, planting, passes, products);
    return { assessment: assessDig(input), scoredPlants, unscoredPlants, error: null };
  } catch (err) {
    if (err instanceof RangeError) {
      return { assessment: null, scoredPlants, unscoredPlants, error: err.message };
    }
    throw err;
  }
}
