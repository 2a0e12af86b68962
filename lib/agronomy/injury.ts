import {
  auditPlacement,
  type FertilizerPass,
  type Finding,
  type PlacementAuditOptions,
  type Quantity,
  SEVERITIES,
  sortFindings,
} from "./placement";
import { type DugPlantRoots, type RootIndexResult, rootDevelopmentIndex, siteRootIndex } from "./roots";
import { DEFAULT_FINAL_LEAF_COUNT, leafCollarsOfStage } from "./stage";
import { argumentError, checkNumber } from "./validate";

/** A finding raised by a placement audit, with the index of the pass it came from. */
export interface AuditFinding extends Finding {
  passIndex: number;
}

/** Crown shallower than this, inches, is called shallow: the bottom of 1/2–3/4 in (Nielsen, Purdue). */
export const SHALLOW_CROWN_IN = 0.5;
/** Seeding shallower than 1 in may not set the crown at 1/2–3/4 in (Nielsen, "The Emergence Process in Corn"). */
export const MIN_SEEDING_DEPTH_IN = 1;
/** Seeding depth commonly aimed for, inches: 1.5 (common practice, no source). */
export const TARGET_SEEDING_DEPTH_IN = 1.5;

export interface InjuryFlagOptions {
  /** Site index below which roots are called behind (warning), 0–100; default 60 (our judgement). */
  lowIndexBelow?: number;
  /** Site index below which roots are called poor (critical), 0–100; default 40 (our judgement). */
  poorIndexBelow?: number;
}

export interface InjuryFlagInput {
  leafCollars: number;
  plants: readonly DugPlantRoots[];
  /** Findings of the placement audits for the passes on this field. */
  auditFindings?: readonly Finding[];
  /** Seeding depth measured in the dig, inches. */
  seedingDepthIn?: number | null;
  /** Site root development index, 0–100. */
  siteIndex?: number | null;
}

const PLACEMENT_PROBLEM_CODES = new Set([
  "seed_placed_over_limit",
  "seed_placed_urea",
  "seed_placed_thiosulfate",
  "band_near_seed",
  "band_planned_near_seed",
  "side_dress_near_row",
  "shifted_knife",
]);

const plantsQty = (value: number): Quantity => ({ value, unit: "plants" });
const fmt = (x: number) => String(Math.round(x * 100) / 100);

/**
 * Injury flags a dig raises, most severe first, each with its reason and numbers:
 * - every placement finding of caution or worse (seed-placed over the limit or unsuitable, band near
 *   the seed, side-dress near the row, shifted knife);
 * - root_burn_seen: burn seen on roots (critical when on half the plants or more, else warning), and
 *   burn_with_placement_problem (critical) when burn goes with a placement finding;
 * - shallow_crown: mean crown depth under 1/2 in (warning), or some plants under it (caution);
 * - shallow_seeding: under 1 in (warning), under 1.5 in (caution);
 * - mesocotyl_damage: damaged or severed mesocotyls before V6, while the seedling still depends on them;
 * - root_injury: moderate or severe seminal or nodal injury;
 * - low_root_index: site index under 60 (warning) or 40 (critical).
 */
export function injuryFlags(input: InjuryFlagInput, options: InjuryFlagOptions = {}): Finding[] {
  const collars = checkNumber("leafCollars", input.leafCollars, { min: 0, max: 26 });
  if (!Array.isArray(input.plants)) throw argumentError("plants", "an array of dug plants", input.plants);
  const lowBelow = checkNumber("lowIndexBelow", options.lowIndexBelow ?? 60, { min: 0, max: 100 });
  const poorBelow = checkNumber("poorIndexBelow", options.poorIndexBelow ?? 40, { min: 0, max: lowBelow });
  const plants = input.plants;
  const dug = plants.length;
  const flags: Finding[] = [];

  const placementProblems = (input.auditFindings ?? []).filter(
    (f) => SEVERITIES.indexOf(f.severity) >= SEVERITIES.indexOf("caution"),
  );
  flags.push(...placementProblems);

  const burnt = plants.filter((p) => p.burnSeen).length;
  if (burnt > 0) {
    const share = (burnt / dug) * 100;
    flags.push({
      code: "root_burn_seen",
      severity: share >= 50 ? "critical" : "warning",
      message: `Fertilizer burn seen on the roots of ${burnt} of ${dug} plants.`,
      numbers: {
        plantsWithBurn: plantsQty(burnt),
        plantsDug: plantsQty(dug),
        share: { value: share, unit: "%" },
      },
    });
    const causes = placementProblems.filter((f) => PLACEMENT_PROBLEM_CODES.has(f.code));
    if (causes.length > 0) {
      flags.push({
        code: "burn_with_placement_problem",
        severity: "critical",
        message: `Burn on roots goes with a placement problem (${[...new Set(causes.map((c) => c.code))].join(", ")}): the fertilizer pass is the likely cause.`,
        numbers: {
          plantsWithBurn: plantsQty(burnt),
          placementFindings: { value: causes.length, unit: "findings" },
        },
      });
    }
  }

  if (dug > 0) {
    const depths = plants.map((p) =>
      checkNumber("plants[].crownDepthIn", p.crownDepthIn, { min: 0, max: 6, unit: "in" }),
    );
    const mean = depths.reduce((a, b) => a + b, 0) / dug;
    const shallow = depths.filter((d) => d < SHALLOW_CROWN_IN).length;
    if (mean < SHALLOW_CROWN_IN || shallow > 0) {
      flags.push({
        code: "shallow_crown",
        severity: mean < SHALLOW_CROWN_IN ? "warning" : "caution",
        message:
          `Crown depth averages ${fmt(mean)} in; ${shallow} of ${dug} plants have the crown shallower than ` +
          `${SHALLOW_CROWN_IN} in (it normally forms about 1/2–3/4 in deep), which risks poor nodal rooting.`,
        numbers: {
          meanCrownDepth: { value: mean, unit: "in" },
          shallowPlants: plantsQty(shallow),
          plantsDug: plantsQty(dug),
          shallowBelow: { value: SHALLOW_CROWN_IN, unit: "in" },
        },
      });
    }
  }

  if (input.seedingDepthIn != null) {
    const depth = checkNumber("seedingDepthIn", input.seedingDepthIn, { min: 0, max: 6, unit: "in" });
    if (depth < TARGET_SEEDING_DEPTH_IN) {
      const tooShallow = depth < MIN_SEEDING_DEPTH_IN;
      flags.push({
        code: "shallow_seeding",
        severity: tooShallow ? "warning" : "caution",
        message: tooShallow
          ? `Seed found ${fmt(depth)} in deep, shallower than 1 in: the crown may form near the surface.`
          : `Seed found ${fmt(depth)} in deep, shallower than the usual ${TARGET_SEEDING_DEPTH_IN} in.`,
        numbers: {
          seedingDepth: { value: depth, unit: "in" },
          threshold: { value: tooShallow ? MIN_SEEDING_DEPTH_IN : TARGET_SEEDING_DEPTH_IN, unit: "in" },
        },
      });
    }
  }

  const mesocotylHurt = plants.filter((p) => p.mesocotyl === "damaged" || p.mesocotyl === "severed").length;
  if (mesocotylHurt > 0 && collars < 6) {
    flags.push({
      code: "mesocotyl_damage",
      severity: "warning",
      message: `Mesocotyl damaged or severed on ${mesocotylHurt} of ${dug} plants before V6, while the seedling still depends on it.`,
      numbers: {
        plants: plantsQty(mesocotylHurt),
        plantsDug: plantsQty(dug),
        leafCollars: { value: collars, unit: "collars" },
      },
    });
  }

  const severe = plants.filter((p) => p.seminalInjury === "severe" || p.nodalInjury === "severe").length;
  const moderate = plants.filter(
    (p) => p.seminalInjury === "moderate" || p.nodalInjury === "moderate",
  ).length;
  if (severe > 0 || moderate > 0) {
    flags.push({
      code: "root_injury",
      severity: severe > 0 ? "warning" : "caution",
      message: `Root injury: ${severe} plants severe and ${moderate} moderate (seminal or nodal) of ${dug} dug.`,
      numbers: {
        severePlants: plantsQty(severe),
        moderatePlants: plantsQty(moderate),
        plantsDug: plantsQty(dug),
      },
    });
  }

  if (input.siteIndex != null) {
    const index = checkNumber("siteIndex", input.siteIndex, { min: 0, max: 100 });
    if (index < lowBelow) {
      flags.push({
        code: "low_root_index",
        severity: index < poorBelow ? "critical" : "warning",
        message: `Site root index ${fmt(index)} is below ${index < poorBelow ? poorBelow : lowBelow} for the leaf stage.`,
        numbers: {
          siteIndex: { value: index, unit: "index (0–100)" },
          threshold: { value: index < poorBelow ? poorBelow : lowBelow, unit: "index (0–100)" },
        },
      });
    }
  }

  return sortFindings(flags);
}

export interface ReviewOptions {
  /** A site index below this sends the dig for review, 0–100; default 50 (our judgement). */
  reviewIndexBelow?: number;
  /** This many warnings or more send the dig for review; default 2 (our judgement). */
  warningsForReview?: number;
}

/**
 * Whether a dig goes to a supervisor, and why: any critical flag, `warningsForReview` warnings or more,
 * or a site index below `reviewIndexBelow`.
 */
export function shouldFlagForSupervisor(
  flags: readonly Finding[],
  siteIndex: number | null,
  options: ReviewOptions = {},
): { flag: boolean; reason: string; reasons: string[] } {
  const indexBelow = checkNumber("reviewIndexBelow", options.reviewIndexBelow ?? 50, { min: 0, max: 100 });
  const warningsNeeded = checkNumber("warningsForReview", options.warningsForReview ?? 2, {
    min: 1,
    max: 100,
    integer: true,
  });
  const reasons: string[] = [];
  const critical = flags.filter((f) => f.severity === "critical");
  const warnings = flags.filter((f) => f.severity === "warning");
  if (critical.length > 0) {
    reasons.push(
      `${critical.length} critical flag(s): ${[...new Set(critical.map((f) => f.code))].join(", ")}.`,
    );
  }
  if (warnings.length >= warningsNeeded) {
    reasons.push(`${warnings.length} warnings (review from ${warningsNeeded}).`);
  }
  if (siteIndex !== null) {
    checkNumber("siteIndex", siteIndex, { min: 0, max: 100 });
    if (siteIndex < indexBelow) reasons.push(`Site root index ${fmt(siteIndex)} is below ${indexBelow}.`);
  }
  const flag = reasons.length > 0;
  return {
    flag,
    reason: flag
      ? reasons.join(" ")
      : `No critical flag, fewer than ${warningsNeeded} warnings and site index not below ${indexBelow}.`,
    reasons,
  };
}

export interface AssessDigInput {
  /** Leaf stage of the dig site: a stage name ('VE', 'V4', 'VT') or visible leaf collars. */
  stage: string | number;
  finalLeafCount?: number;
  plants: readonly DugPlantRoots[];
  /** Fertilizer passes on the field, audited with any offsets measured in this dig. */
  passes?: readonly FertilizerPass[];
  seedingDepthIn?: number | null;
  auditOptions?: PlacementAuditOptions;
  flagOptions?: InjuryFlagOptions;
  reviewOptions?: ReviewOptions;
}

export interface DigAssessment {
  leafCollars: number;
  /** Per-plant root development index and its components. */
  plants: RootIndexResult[];
  /** Mean of the plants' indices, 0–100. */
  siteIndex: number;
  /** Placement findings of every pass, most severe first. */
  audit: AuditFinding[];
  flags: Finding[];
  flagForReview: { flag: boolean; reason: string; reasons: string[] };
}

/**
 * Everything a dig tells us, in one pure call used unchanged on the phone (offline) and on the server:
 * each plant's root development index, the site index, the placement audit of each pass, the injury
 * flags and whether the dig goes to a supervisor.
 */
export function assessDig(input: AssessDigInput): DigAssessment {
  const finalLeafCount = input.finalLeafCount ?? DEFAULT_FINAL_LEAF_COUNT;
  const leafCollars =
    typeof input.stage === "number"
      ? checkNumber("stage", input.stage, { min: 0, max: finalLeafCount, unit: "leaf collars" })
      : leafCollarsOfStage(input.stage, finalLeafCount);
  // The site index checks every plant first, so a bad entry is named by its position.
  const site = siteRootIndex(input.plants, leafCollars);
  const plants = input.plants.map((p) => rootDevelopmentIndex(p, leafCollars));
  const audit = sortFindings(
    (input.passes ?? []).flatMap((pass, passIndex) =>
      auditPlacement(pass, input.auditOptions).map((f) => ({ ...f, passIndex })),
    ),
  );
  const flags = injuryFlags(
    {
      leafCollars,
      plants: input.plants,
      auditFindings: audit,
      seedingDepthIn: input.seedingDepthIn,
      siteIndex: site.siteIndex,
    },
    input.flagOptions,
  );
  return {
    leafCollars,
    plants,
    siteIndex: site.siteIndex,
    audit,
    flags,
    flagForReview: shouldFlagForSupervisor(flags, site.siteIndex, input.reviewOptions),
  };
}
