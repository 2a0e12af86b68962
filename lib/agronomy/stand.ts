import { SQUARE_FEET_PER_ACRE } from "./units";
import { argumentError, checkNumber, type NumberRule } from "./validate";

/** Row spacings the stand and fertilizer functions accept, inches (above 0 to 120). */
export const ROW_SPACING_RULE: NumberRule = { min: 0, minExclusive: true, max: 120, unit: "in" };

/**
 * Feet of one row that make 1/1000 acre: 43.56 ft² ÷ (row spacing in ft) = 522.72 ÷ row spacing in
 * inches (University of Tennessee Extension crops blog, 2011; NC State IPM "Evaluating Crop Stand").
 * @param rowSpacingIn row spacing, inches
 * @returns row length, feet (30 in → 17.42 ft, "17 ft 5 in")
 */
export function rowLengthForThousandthAcre(rowSpacingIn: number): number {
  checkNumber("rowSpacingIn", rowSpacingIn, ROW_SPACING_RULE);
  return SQUARE_FEET_PER_ACRE / 1000 / (rowSpacingIn / 12);
}

/**
 * Plants per acre from a count along a length of row: count × 43,560 ÷ (row length ft × row spacing ft).
 * @param plantCount plants counted (0 plants is 0 plants/acre)
 * @param rowLengthFt length of row counted, feet
 * @param rowSpacingIn row spacing, inches
 * @returns plants/acre
 */
export function plantsPerAcre(plantCount: number, rowLengthFt: number, rowSpacingIn: number): number {
  checkNumber("plantCount", plantCount, { min: 0, max: 100_000 });
  checkNumber("rowLengthFt", rowLengthFt, { min: 0, minExclusive: true, max: 5280, unit: "ft" });
  checkNumber("rowSpacingIn", rowSpacingIn, ROW_SPACING_RULE);
  return (plantCount * SQUARE_FEET_PER_ACRE) / (rowLengthFt * (rowSpacingIn / 12));
}

export interface StandSummary {
  /** Plants/acre from each count. */
  perCount: number[];
  /** Mean of perCount, plants/acre. */
  meanPlantsPerAcre: number;
  /** Mean as % of the target population, or null without a target. */
  percentOfTarget: number | null;
}

/** Stand from several counts of the same row length (plants/acre each, their mean, % of target). */
export function summarizeStand(
  counts: readonly number[],
  rowLengthFt: number,
  rowSpacingIn: number,
  targetPlantsPerAcre?: number,
): StandSummary {
  if (!Array.isArray(counts) || counts.length === 0)
    throw argumentError("counts", "a non-empty array", counts);
  const perCount = counts.map((c) => plantsPerAcre(c, rowLengthFt, rowSpacingIn));
  const meanPlantsPerAcre = perCount.reduce((a, b) => a + b, 0) / perCount.length;
  const target =
    targetPlantsPerAcre === undefined
      ? null
      : checkNumber("targetPlantsPerAcre", targetPlantsPerAcre, { min: 0, minExclusive: true, max: 200_000 });
  return {
    perCount,
    meanPlantsPerAcre,
    percentOfTarget: target === null ? null : (meanPlantsPerAcre / target) * 100,
  };
}
