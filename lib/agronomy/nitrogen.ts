import { nutrientsPerAcre, type ProductGrade, type RateUnit } from "./fertilizer";
import { LB_PER_BUSHEL_CORN } from "./units";
import { checkNumber, checkOneOf } from "./validate";

/** lb N/acre per ppm NO3-N per acre-inch of water (University of California ANR, "Nitrogen in irrigation water"). */
export const LB_N_PER_PPM_ACRE_INCH = 0.227;
/** NO3 ÷ 4.43 = NO3-N (University of California ANR, "Nitrogen in irrigation water"). */
export const NO3_PER_NO3N = 4.43;
/** lb N/acre per ppm NO3-N per foot of soil, about 4 (about 4 million lb of soil per acre-foot; CDFA–FREP / UC Davis). */
export const DEFAULT_SOIL_LB_N_PER_PPM_FT = 4;
/** The factor California guidance uses instead, about 3.5 (CDFA–FREP / UC Davis, "Field-specific N fertilization adjustments"). */
export const CALIFORNIA_SOIL_LB_N_PER_PPM_FT = 3.5;
/** Corn grain removal, lb N per ton at 15.5 % moisture (CDFA FREP Fertilization Guidelines, corn grain). */
export const GRAIN_LB_N_PER_TON = 24;
/** Corn silage removal, lb N per ton at 70 % moisture, range 5–10 (CDFA FREP Fertilization Guidelines, corn silage). */
export const SILAGE_LB_N_PER_TON = 7.6;
/** What advisers commonly budget for silage, lb N per ton of expected yield (common practice, no source). */
export const SILAGE_ADVISER_LB_N_PER_TON = 10;

/**
 * NO3-N from a nitrate (NO3) concentration: NO3 ÷ 4.43 (UC ANR).
 * @param no3Ppm nitrate as NO3, ppm (mg/L)
 * @returns nitrate-nitrogen, ppm NO3-N
 */
export function nitrateToNitrateN(no3Ppm: number): number {
  return checkNumber("no3Ppm", no3Ppm, { min: 0, max: 5000, unit: "ppm NO3" }) / NO3_PER_NO3N;
}

/**
 * Nitrogen carried by irrigation water: ppm NO3-N × 0.227 × acre-inches (UC ANR).
 * @param no3nPpm nitrate-nitrogen in the water, ppm NO3-N
 * @param acreInches water applied, acre-inches per acre (inches)
 * @returns lb N/acre
 */
export function irrigationWaterNitrogen(no3nPpm: number, acreInches: number): number {
  checkNumber("no3nPpm", no3nPpm, { min: 0, max: 1000, unit: "ppm NO3-N" });
  checkNumber("acreInches", acreInches, { min: 0, max: 200, unit: "acre-in" });
  return no3nPpm * LB_N_PER_PPM_ACRE_INCH * acreInches;
}

/**
 * Soil nitrate credit: ppm NO3-N × factor × depth (ft). Factor about 4 (default) or 3.5 in California
 * guidance (CDFA–FREP / UC Davis).
 * @returns lb N/acre
 */
export function soilNitrateCredit(
  no3nPpm: number,
  depthFt: number,
  lbNPerPpmPerFt: number = DEFAULT_SOIL_LB_N_PER_PPM_FT,
): number {
  checkNumber("no3nPpm", no3nPpm, { min: 0, max: 1000, unit: "ppm NO3-N" });
  checkNumber("depthFt", depthFt, { min: 0, max: 10, unit: "ft" });
  checkNumber("lbNPerPpmPerFt", lbNPerPpmPerFt, { min: 2, max: 6, unit: "lb N/acre per ppm per ft" });
  return no3nPpm * lbNPerPpmPerFt * depthFt;
}

/** Bushels of corn grain (56 lb/bu at 15.5 % moisture) to short tons (2000 lb) at the same moisture. */
export function bushelsToTons(bushels: number, lbPerBushel: number = LB_PER_BUSHEL_CORN): number {
  checkNumber("bushels", bushels, { min: 0, unit: "bu" });
  checkNumber("lbPerBushel", lbPerBushel, { min: 40, max: 70, unit: "lb/bu" });
  return (bushels * lbPerBushel) / 2000;
}

export type YieldGoal =
  | { crop: "grain"; bushelsPerAcre: number; lbNPerTon?: number; lbPerBushel?: number }
  | { crop: "silage"; tonsPerAcre: number; lbNPerTon?: number };

/**
 * Nitrogen need from a yield goal. Grain: bu/acre → tons at 15.5 % moisture × 24 lb N/ton (CDFA FREP);
 * silage: tons/acre at 70 % moisture × 7.6 lb N/ton (CDFA FREP removal; pass 10 for the adviser budget).
 * @returns lb N/acre
 */
export function nitrogenNeedFromYieldGoal(goal: YieldGoal): number {
  checkOneOf("goal.crop", goal?.crop, ["grain", "silage"] as const);
  if (goal.crop === "grain") {
    const perTon = checkNumber("goal.lbNPerTon", goal.lbNPerTon ?? GRAIN_LB_N_PER_TON, { min: 5, max: 60 });
    const bu = checkNumber("goal.bushelsPerAcre", goal.bushelsPerAcre, { min: 0, max: 600, unit: "bu/acre" });
    return bushelsToTons(bu, goal.lbPerBushel) * perTon;
  }
  const perTon = checkNumber("goal.lbNPerTon", goal.lbNPerTon ?? SILAGE_LB_N_PER_TON, { min: 2, max: 20 });
  const tons = checkNumber("goal.tonsPerAcre", goal.tonsPerAcre, { min: 0, max: 80, unit: "tons/acre" });
  return tons * perTon;
}

export type AppliedPass =
  | { label: string; lbNPerAcre: number }
  | { label: string; product: ProductGrade; rate: number; rateUnit: RateUnit };

export interface NitrogenBudgetInput {
  yieldGoal: YieldGoal;
  /** Soil samples by layer: ppm NO3-N over a depth in feet. */
  soilNitrate?: readonly { no3nPpm: number; depthFt: number }[];
  /** lb N/acre per ppm per ft; default 4 (3.5 in California guidance). */
  soilLbNPerPpmPerFt?: number;
  /** Irrigation water still to be applied this season. */
  irrigationWater?: { no3nPpm: number; acreInches: number } | null;
  /** Previous-crop credit, lb N/acre (a parameter: no default figure is assumed). */
  previousCropCreditLbN?: number;
  /** Passes already applied this season. */
  appliedPasses?: readonly AppliedPass[];
}

export interface BudgetLine {
  key: string;
  kind: "need" | "credit" | "applied";
  label: string;
  /** Always positive; `kind` says which way it counts. */
  lbNPerAcre: number;
  source: string;
}

export interface NitrogenBudget {
  lines: BudgetLine[];
  needLbNPerAcre: number;
  creditsLbNPerAcre: number;
  appliedLbNPerAcre: number;
  /** need − credits − applied, never below 0. */
  sideDressNeededLbNPerAcre: number;
  /** How far credits and applied N already exceed the need (0 when they do not). */
  surplusLbNPerAcre: number;
  note: string;
}

/**
 * Nitrogen budget for a field, lb N/acre: the need from the yield goal, minus credits (soil nitrate,
 * irrigation-water nitrate, previous crop) and passes already applied, gives the side-dress still
 * needed. The side-dress figure is never negative: a surplus is reported separately.
 */
export function nitrogenBudget(input: NitrogenBudgetInput): NitrogenBudget {
  const lines: BudgetLine[] = [];
  const goal = input.yieldGoal;
  const need = nitrogenNeedFromYieldGoal(goal);
  lines.push({
    key: "need",
    kind: "need",
    label:
      goal.crop === "grain"
        ? `Need for ${goal.bushelsPerAcre} bu/acre grain`
        : `Need for ${goal.tonsPerAcre} tons/acre silage`,
    lbNPerAcre: need,
    source:
      goal.crop === "grain"
        ? "CDFA FREP Fertilization Guidelines, corn grain (lb N per ton at 15.5 % moisture)"
        : "CDFA FREP Fertilization Guidelines, corn silage (lb N per ton at 70 % moisture)",
  });
  const factor = input.soilLbNPerPpmPerFt ?? DEFAULT_SOIL_LB_N_PER_PPM_FT;
  (input.soilNitrate ?? []).forEach((layer, i) => {
    lines.push({
      key: `soil_nitrate_${i}`,
      kind: "credit",
      label: `Soil nitrate, ${layer.no3nPpm} ppm NO3-N over ${layer.depthFt} ft`,
      lbNPerAcre: soilNitrateCredit(layer.no3nPpm, layer.depthFt, factor),
      source: "CDFA–FREP / UC Davis, Field-specific N fertilization adjustments",
    });
  });
  if (input.irrigationWater) {
    const w = input.irrigationWater;
    lines.push({
      key: "irrigation_water",
      kind: "credit",
      label: `Irrigation water, ${w.no3nPpm} ppm NO3-N × ${w.acreInches} acre-in`,
      lbNPerAcre: irrigationWaterNitrogen(w.no3nPpm, w.acreInches),
      source: "University of California ANR, Nitrogen in irrigation water",
    });
  }
  if (input.previousCropCreditLbN !== undefined) {
    lines.push({
      key: "previous_crop",
      kind: "credit",
      label: "Previous crop",
      lbNPerAcre: checkNumber("previousCropCreditLbN", input.previousCropCreditLbN, {
        min: 0,
        max: 300,
        unit: "lb N/acre",
      }),
      source: "entered by the user",
    });
  }
  (input.appliedPasses ?? []).forEach((pass, i) => {
    const n =
      "lbNPerAcre" in pass
        ? checkNumber(`appliedPasses[${i}].lbNPerAcre`, pass.lbNPerAcre, {
            min: 0,
            max: 1000,
            unit: "lb N/acre",
          })
        : nutrientsPerAcre(pass.product, pass.rate, pass.rateUnit).n;
    lines.push({
      key: `applied_${i}`,
      kind: "applied",
      label: pass.label,
      lbNPerAcre: n,
      source: "lbNPerAcre" in pass ? "entered by the user" : "product grade × rate",
    });
  });
  const sum = (kind: BudgetLine["kind"]) =>
    lines.filter((l) => l.kind === kind).reduce((total, l) => total + l.lbNPerAcre, 0);
  const credits = sum("credit");
  const applied = sum("applied");
  const balance = need - credits - applied;
  const sideDress = Math.max(0, balance);
  const surplus = Math.max(0, -balance);
  return {
    lines,
    needLbNPerAcre: need,
    creditsLbNPerAcre: credits,
    appliedLbNPerAcre: applied,
    sideDressNeededLbNPerAcre: sideDress,
    surplusLbNPerAcre: surplus,
    note:
      surplus > 0
        ? `Credits and applied N exceed the need by ${Math.round(surplus)} lb N/acre: no side-dress needed (the figure is never negative).`
        : `Side-dress still needed: ${Math.round(sideDress)} lb N/acre.`,
  };
}
