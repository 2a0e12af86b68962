import { addDays, dayToIsoDate, isoDateToDay } from "./dates";
import {
  checkNormalGdd,
  type DailyTemperature,
  gddSincePlanting,
  indexDailyGdd,
  type ProjectionOptions,
} from "./gdd";
import { argumentError, checkNumber } from "./validate";

// Nielsen, "Predict Leaf Stage Development in Corn Using Thermal Time", Purdue Extension, 2019:
// planting to VE 100–120 GDD, VE to V10 one leaf collar per 82 GDD, V10 to VT about one per 50 GDD.
// Iowa State (Abendroth et al., PMR 1009, 2011) uses 84 and 56: pass them as options to use those.
/** Default GDD (°F) from planting to VE: the top of Nielsen's 100–120 range (Purdue 2019). */
export const DEFAULT_GDD_TO_EMERGENCE = 120;
/** GDD (°F) per leaf collar from VE to V10 (Nielsen, Purdue 2019). */
export const DEFAULT_GDD_PER_LEAF_TO_V10 = 82;
/** GDD (°F) per leaf collar from V10 to VT, "about" (Nielsen, Purdue 2019). */
export const DEFAULT_GDD_PER_LEAF_AFTER_V10 = 50;
/**
 * Total leaves of the hybrid; VT is reached with its last leaf collar. 18 is a common leaf count for
 * Corn Belt hybrids (memory; hybrids range roughly 16–22): pass the hybrid's own count when known.
 */
export const DEFAULT_FINAL_LEAF_COUNT = 18;

export interface LeafStageOptions {
  /** GDD (°F) from planting to VE, 100–120 (Nielsen, Purdue 2019); default 120. */
  gddToEmergence?: number;
  /** GDD (°F) per leaf collar VE→V10; default 82 (Purdue), 84 in Iowa State PMR 1009. */
  gddPerLeafToV10?: number;
  /** GDD (°F) per leaf collar V10→VT; default 50 (Purdue), 56 in Iowa State PMR 1009. */
  gddPerLeafAfterV10?: number;
  /** Total leaves of the hybrid, 12–26; default 18. */
  finalLeafCount?: number;
}

interface StageModel {
  ve: number;
  early: number;
  late: number;
  finalLeaves: number;
}

function resolveModel(options: LeafStageOptions): StageModel {
  return {
    ve: checkNumber("gddToEmergence", options.gddToEmergence ?? DEFAULT_GDD_TO_EMERGENCE, {
      min: 100,
      max: 120,
      unit: "°F-GDD",
    }),
    early: checkNumber("gddPerLeafToV10", options.gddPerLeafToV10 ?? DEFAULT_GDD_PER_LEAF_TO_V10, {
      min: 60,
      max: 110,
      unit: "°F-GDD",
    }),
    late: checkNumber("gddPerLeafAfterV10", options.gddPerLeafAfterV10 ?? DEFAULT_GDD_PER_LEAF_AFTER_V10, {
      min: 35,
      max: 80,
      unit: "°F-GDD",
    }),
    finalLeaves: checkNumber("finalLeafCount", options.finalLeafCount ?? DEFAULT_FINAL_LEAF_COUNT, {
      min: 12,
      max: 26,
      integer: true,
    }),
  };
}

function gddAtCollars(model: StageModel, collars: number): number {
  if (collars <= 10) return model.ve + collars * model.early;
  return model.ve + 10 * model.early + (collars - 10) * model.late;
}

export interface LeafStagePrediction {
  /** 'planted' before VE, then 'VE', 'V1', 'V2', … and 'VT'. */
  stage: string;
  /** Visible leaf collars; 0 at planted and VE, the final leaf count at VT. */
  leafCollars: number;
  /** GDD since planting the prediction was made from, °F-GDD. */
  gddF: number;
  /**
   * True once VT is reached. VT is the last vegetative stage; more GDD keeps the prediction at VT
   * because reproductive (R) stages are not modelled here.
   */
  atOrPastVT: boolean;
}

/**
 * Leaf stage from GDD (°F) since planting, with the stage model as options (see LeafStageOptions).
 * Collars are whole: a stage is reached when its GDD is reached, not rounded.
 */
export function predictLeafStage(
  gddSincePlantingF: number,
  options: LeafStageOptions = {},
): LeafStagePrediction {
  const gdd = checkNumber("gddSincePlantingF", gddSincePlantingF, { min: 0, max: 10_000, unit: "°F-GDD" });
  const model = resolveModel(options);
  // The small epsilon keeps a sum of daily values that lands on a threshold from rounding just below it.
  if (gdd + 1e-9 < model.ve) return { stage: "planted", leafCollars: 0, gddF: gdd, atOrPastVT: false };
  const after = gdd - model.ve + 1e-9;
  const toV10 = 10 * model.early;
  const collars =
    after < toV10 ? Math.floor(after / model.early) : 10 + Math.floor((after - toV10) / model.late);
  if (collars >= model.finalLeaves) {
    return { stage: "VT", leafCollars: model.finalLeaves, gddF: gdd, atOrPastVT: true };
  }
  return { stage: collars === 0 ? "VE" : `V${collars}`, leafCollars: collars, gddF: gdd, atOrPastVT: false };
}

/**
 * Leaf stage from GDD (°F) since planting by Nielsen (Purdue 2019): 'planted' before 120 GDD, VE at
 * 120, one collar per 82 GDD to V10, one per 50 GDD after, VT at the 18th collar and VT from then on.
 */
export function leafStageFromGdd(gddSincePlantingF: number): { stage: string; leafCollars: number } {
  const { stage, leafCollars } = predictLeafStage(gddSincePlantingF);
  return { stage, leafCollars };
}

/**
 * Leaf collars of a stage name: 'planted' and 'VE' → 0, 'V7' → 7, 'VT' → the final leaf count.
 * Case-insensitive; anything else is a RangeError.
 */
export function leafCollarsOfStage(stage: string, finalLeafCount = DEFAULT_FINAL_LEAF_COUNT): number {
  checkNumber("finalLeafCount", finalLeafCount, { min: 12, max: 26, integer: true });
  const s = typeof stage === "string" ? stage.trim().toUpperCase() : "";
  if (s === "PLANTED" || s === "VE") return 0;
  if (s === "VT") return finalLeafCount;
  const match = /^V(\d{1,2})$/.exec(s);
  const n = match?.[1] === undefined ? Number.NaN : Number(match[1]);
  if (!(n >= 1 && n < finalLeafCount)) {
    throw argumentError("stage", `'planted', 'VE', 'V1' … 'V${finalLeafCount - 1}' or 'VT'`, stage);
  }
  return n;
}

/** GDD (°F) since planting at which a stage is reached ('planted' → 0). */
export function gddForLeafStage(stage: string, options: LeafStageOptions = {}): number {
  const model = resolveModel(options);
  if (typeof stage === "string" && stage.trim().toLowerCase() === "planted") return 0;
  return gddAtCollars(model, leafCollarsOfStage(stage, model.finalLeaves));
}

export interface StageOnDate extends LeafStagePrediction {
  /** True when any day came from normalGddPerDay. */
  projected: boolean;
  /** False when days without records or a normal counted 0, so the stage may be behind. */
  complete: boolean;
}

/** Predicted leaf stage of a field on a date, from its daily temperatures (°F) since planting. */
export function stageOnDate(
  records: readonly DailyTemperature[],
  plantingDate: string,
  onDate: string,
  options: LeafStageOptions & ProjectionOptions = {},
): StageOnDate {
  const accumulated = gddSincePlanting(records, plantingDate, onDate, options);
  return {
    ...predictLeafStage(accumulated.gddF, options),
    projected: accumulated.projected,
    complete: accumulated.complete,
  };
}

export interface StageDate {
  /** First ISO date on which the stage's GDD is reached. */
  date: string;
  /** GDD since planting on that date, °F-GDD. */
  gddF: number;
  /** True when normal GDD filled any day up to that date. */
  projected: boolean;
  /** False when days without records or a normal counted 0 on the way. */
  complete: boolean;
}

/**
 * The date a field is expected to reach a stage, walking day by day from planting (the planting day
 * counts 0). Days after the last record use normalGddPerDay when given (the date is then projected);
 * without it the result is null when the records end before the stage. Gives up after `maxDays`
 * (default 366) and returns null.
 */
export function dateForLeafStage(
  records: readonly DailyTemperature[],
  plantingDate: string,
  stage: string,
  options: LeafStageOptions & ProjectionOptions & { maxDays?: number } = {},
): StageDate | null {
  const target = gddForLeafStage(stage, options);
  const start = isoDateToDay("plantingDate", plantingDate);
  const normal = checkNormalGdd(options.normalGddPerDay);
  const maxDays = checkNumber("maxDays", options.maxDays ?? 366, { min: 1, max: 3660, integer: true });
  if (target === 0) return { date: plantingDate, gddF: 0, projected: false, complete: true };
  const { byDay, lastDay } = indexDailyGdd(records);
  let total = 0;
  let projected = false;
  let complete = true;
  for (let day = start + 1; day <= start + maxDays; day++) {
    const observed = byDay.get(day);
    if (observed !== undefined) {
      total += observed;
    } else if (lastDay !== null && day < lastDay) {
      complete = false;
    } else if (normal !== undefined) {
      total += normal;
      projected = true;
    } else {
      return null;
    }
    // Same epsilon as predictLeafStage so the two always agree on the day.
    if (total + 1e-9 >= target) return { date: dayToIsoDate(day), gddF: total, projected, complete };
  }
  return null;
}

/** Leaf stages of the root dig window: V1 to V6 (Iowa State, "Corn Root Development"). */
export const ROOT_DIG_WINDOW = { firstCollars: 1, lastCollars: 6 } as const;

export interface DigWindowInput extends LeafStageOptions, ProjectionOptions {
  records: readonly DailyTemperature[];
  plantingDate: string;
  /** ISO date the question is asked for, usually today. */
  date: string;
  /** ISO date of the first irrigation, or null/undefined when none is recorded. */
  firstIrrigationDate?: string | null;
}

export interface DigWindow {
  /** Where the field stands against the V1–V6 window on `date`. */
  position: "before" | "in" | "after";
  stage: string;
  leafCollars: number;
  gddF: number;
  /** First day at V1, or null when it cannot be reached with the data (and no normal). */
  opensOn: StageDate | null;
  /** Last day before V7, or null when V7 cannot be reached with the data (and no normal). */
  closesOn: StageDate | null;
  /** True when the first irrigation is on or before `date`. */
  irrigated: boolean;
  /** In the window and not yet irrigated: the best time to dig. */
  digNow: boolean;
  /** True when any figure used normalGddPerDay. */
  projected: boolean;
  complete: boolean;
  reason: string;
}

/**
 * Whether a field is before, in or after the V1–V6 root window on a date, when the window opens and
 * closes, and whether its first irrigation has happened (roots are dug before the first irrigation).
 */
export function digWindow(input: DigWindowInput): DigWindow {
  const today = isoDateToDay("date", input.date);
  const irrigationDay =
    input.firstIrrigationDate == null ? null : isoDateToDay("firstIrrigationDate", input.firstIrrigationDate);
  const now = stageOnDate(input.records, input.plantingDate, input.date, input);
  const opensOn = dateForLeafStage(
    input.records,
    input.plantingDate,
    `V${ROOT_DIG_WINDOW.firstCollars}`,
    input,
  );
  const v7 = dateForLeafStage(
    input.records,
    input.plantingDate,
    `V${ROOT_DIG_WINDOW.lastCollars + 1}`,
    input,
  );
  const closesOn = v7 === null ? null : { ...v7, date: addDays(v7.date, -1) };
  const position =
    now.leafCollars < ROOT_DIG_WINDOW.firstCollars
      ? "before"
      : now.leafCollars <= ROOT_DIG_WINDOW.lastCollars
        ? "in"
        : "after";
  const irrigated = irrigationDay !== null && irrigationDay <= today;
  const digNow = position === "in" && !irrigated;
  const projected = now.projected || Boolean(opensOn?.projected) || Boolean(closesOn?.projected);
  const stageText = `${now.stage} (${now.gddF.toFixed(0)} GDD °F since planting${now.projected ? ", projected" : ""})`;
  const reason =
    position === "before"
      ? `Field is at ${stageText}, before the V1–V6 root window.`
      : position === "after"
        ? `Field is at ${stageText}, past the V1–V6 root window.`
        : irrigated
          ? `Field is at ${stageText}, in the V1–V6 root window, but the first irrigation has happened.`
          : `Field is at ${stageText}, in the V1–V6 root window and not yet irrigated: dig now.`;
  return {
    position,
    stage: now.stage,
    leafCollars: now.leafCollars,
    gddF: now.gddF,
    opensOn,
    closesOn,
    irrigated,
    digNow,
    projected,
    complete: now.complete,
    reason,
  };
}
