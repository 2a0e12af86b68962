import { ROW_SPACING_RULE } from "./stand";
import { SQUARE_FEET_PER_ACRE } from "./units";
import { argumentError, checkNumber, checkOneOf } from "./validate";

export type RateUnit = "lb/ac" | "gal/ac";
export const RATE_UNITS = ["lb/ac", "gal/ac"] as const satisfies readonly RateUnit[];

export type SoilTexture = "coarse" | "medium" | "fine";
export const SOIL_TEXTURES = ["coarse", "medium", "fine"] as const satisfies readonly SoilTexture[];

/** A product's grade (% by weight) and, for liquids, density (lb/gal). */
export interface ProductGrade {
  n: number;
  p2o5: number;
  k2o: number;
  s?: number | null;
  lbPerGal?: number | null;
}

/** Pounds of each nutrient (N, P2O5, K2O, S). */
export interface Nutrients {
  n: number;
  p2o5: number;
  k2o: number;
  s: number;
}

const GRADE_RULE = { min: 0, max: 100, unit: "%" };

function checkGrade(product: ProductGrade): Nutrients {
  if (typeof product !== "object" || product === null)
    throw argumentError("product", "a product grade", product);
  return {
    n: checkNumber("product.n", product.n, GRADE_RULE),
    p2o5: checkNumber("product.p2o5", product.p2o5, GRADE_RULE),
    k2o: checkNumber("product.k2o", product.k2o, GRADE_RULE),
    s: checkNumber("product.s", product.s ?? 0, GRADE_RULE),
  };
}

/**
 * Pounds of product per acre. A gal/acre rate needs the product's density.
 * @param rate lb/acre (0–10,000) or gal/acre (0–1,000)
 * @returns lb product/acre
 */
export function productLbPerAcre(product: ProductGrade, rate: number, rateUnit: RateUnit): number {
  const unit = checkOneOf("rateUnit", rateUnit, RATE_UNITS);
  if (unit === "lb/ac") return checkNumber("rate", rate, { min: 0, max: 10_000, unit: "lb/ac" });
  checkNumber("rate", rate, { min: 0, max: 1000, unit: "gal/ac" });
  const density = checkNumber("product.lbPerGal", product.lbPerGal, {
    min: 0,
    minExclusive: true,
    max: 30,
    unit: "lb/gal (required for a gal/ac rate)",
  });
  return rate * density;
}

/**
 * Nutrients applied per acre: lb product/acre × grade % ÷ 100.
 * @param product grade in % (and lbPerGal for a gal/ac rate)
 * @returns lb/acre of N, P2O5, K2O and S
 */
export function nutrientsPerAcre(product: ProductGrade, rate: number, rateUnit: RateUnit): Nutrients {
  const grade = checkGrade(product);
  const lb = productLbPerAcre(product, rate, rateUnit);
  return {
    n: (lb * grade.n) / 100,
    p2o5: (lb * grade.p2o5) / 100,
    k2o: (lb * grade.k2o) / 100,
    s: (lb * grade.s) / 100,
  };
}

/** Feet of row in one acre: 43,560 ÷ (row spacing in ft), e.g. 17,424 ft at 30 in. */
export function rowFeetPerAcre(rowSpacingIn: number): number {
  checkNumber("rowSpacingIn", rowSpacingIn, ROW_SPACING_RULE);
  return SQUARE_FEET_PER_ACRE / (rowSpacingIn / 12);
}

/**
 * Nutrients per 100 ft of row for a banded pass (one band per row): lb/acre × 100 ÷ feet of row per acre.
 * @returns lb per 100 ft of row of N, P2O5, K2O and S
 */
export function nutrientsPer100FtOfRow(
  product: ProductGrade,
  rate: number,
  rateUnit: RateUnit,
  rowSpacingIn: number,
): Nutrients {
  const perAcre = nutrientsPerAcre(product, rate, rateUnit);
  const factor = 100 / rowFeetPerAcre(rowSpacingIn);
  return {
    n: perAcre.n * factor,
    p2o5: perAcre.p2o5 * factor,
    k2o: perAcre.k2o * factor,
    s: perAcre.s * factor,
  };
}

/**
 * Partial salt index: salt index per unit (1 %) of N + P2O5 + K2O, arithmetic on the salt index
 * (relative to sodium nitrate = 100). Null when the salt index is unknown or there is no N, P2O5 or K2O.
 */
export function partialSaltIndex(product: ProductGrade & { saltIndex?: number | null }): number | null {
  const grade = checkGrade(product);
  if (product.saltIndex == null) return null;
  const saltIndex = checkNumber("product.saltIndex", product.saltIndex, { min: 0, max: 300 });
  const units = grade.n + grade.p2o5 + grade.k2o;
  return units > 0 ? saltIndex / units : null;
}

export interface SaltLoad {
  lbProductPerAcre: number;
  saltIndex: number;
  /**
   * lb product/acre × salt index ÷ 100: pounds of sodium nitrate with the same salt effect, lb/acre.
   * Our convention, arithmetic on the definition of the salt index (sodium nitrate = 100).
   */
  sodiumNitrateEquivalentLbPerAcre: number;
  /** The same per 100 ft of row, when a row spacing was given. */
  sodiumNitrateEquivalentLbPer100Ft: number | null;
}

/** Salt load of a pass, or null when the product's salt index is unknown. */
export function saltLoad(
  product: ProductGrade & { saltIndex?: number | null },
  rate: number,
  rateUnit: RateUnit,
  rowSpacingIn?: number,
): SaltLoad | null {
  checkGrade(product);
  const lb = productLbPerAcre(product, rate, rateUnit);
  if (product.saltIndex == null) return null;
  const saltIndex = checkNumber("product.saltIndex", product.saltIndex, { min: 0, max: 300 });
  const perAcre = (lb * saltIndex) / 100;
  return {
    lbProductPerAcre: lb,
    saltIndex,
    sodiumNitrateEquivalentLbPerAcre: perAcre,
    sodiumNitrateEquivalentLbPer100Ft:
      rowSpacingIn === undefined ? null : (perAcre * 100) / rowFeetPerAcre(rowSpacingIn),
  };
}

/**
 * Seedbed utilization: width of the fertilizer spread in the seed row ÷ row spacing × 100
 * (Manitoba Agriculture, "Guidelines for Safely Applying Fertilizer with Seed").
 * @param spreadWidthIn width of the spread, inches (at most the row spacing)
 * @returns SBU, %
 */
export function seedbedUtilizationPercent(spreadWidthIn: number, rowSpacingIn: number): number {
  checkNumber("rowSpacingIn", rowSpacingIn, ROW_SPACING_RULE);
  checkNumber("spreadWidthIn", spreadWidthIn, { min: 0, max: rowSpacingIn, unit: "in (the row spacing)" });
  return (spreadWidthIn / rowSpacingIn) * 100;
}

/**
 * Maximum N + K2O with the seed for corn, lb/acre, no urea or UAN (Ruiz Diaz, "Starter fertilizer for
 * corn: N placement and rate", K-State Agronomy eUpdate): sandy (coarse) soils / medium-to-fine soils.
 */
export const K_STATE_SEED_PLACED_LIMITS = [
  { rowSpacingIn: 20, coarse: 8, mediumFine: 12 },
  { rowSpacingIn: 30, coarse: 6, mediumFine: 8 },
  { rowSpacingIn: 40, coarse: 4, mediumFine: 6 },
] as const;

/** Row spacings seedPlacedCheck accepts, inches; outside 20–40 the limit is extrapolated (our rule). */
export const SEED_PLACED_ROW_SPACING = { min: 7.5, max: 60 } as const;

export interface SeedPlacedLimit {
  limitLbPerAcre: number;
  basis: "published" | "interpolated" | "extrapolated";
  note: string;
}

/**
 * The seed-placed N + K2O limit for a row spacing and soil. At 20, 30 and 40 in it is the K-State
 * figure. Our rule elsewhere works in rate per foot of row, which is proportional to limit × row
 * spacing (lb·in/acre): between 20 and 40 in it is interpolated in a straight line between the two
 * nearest K-State rows; from 7.5 to 20 in and from 40 to 60 in the nearest K-State row's figure is held;
 * the limit is that figure ÷ row spacing. For medium and fine soils every K-State row gives 240 lb·in/acre
 * (8 × 30 = 12 × 20 = 6 × 40), so the rule is limit = 8 × 30 ÷ row spacing; for sandy soils (160, 180,
 * 160) it bends at 30 in. The limit is continuous in row spacing and exact at 20, 30 and 40 in.
 */
export function seedPlacedLimit(rowSpacingIn: number, soil: SoilTexture): SeedPlacedLimit {
  const spacing = checkNumber("rowSpacingIn", rowSpacingIn, { ...SEED_PLACED_ROW_SPACING, unit: "in" });
  const texture = checkOneOf("soil", soil, SOIL_TEXTURES);
  const pick = (row: (typeof K_STATE_SEED_PLACED_LIMITS)[number]) =>
    texture === "coarse" ? row.coarse : row.mediumFine;
  const [r20, r30, r40] = K_STATE_SEED_PLACED_LIMITS;
  const soilText = texture === "coarse" ? "sandy (coarse)" : "medium-to-fine";
  const exact = K_STATE_SEED_PLACED_LIMITS.find((r) => r.rowSpacingIn === spacing);
  if (exact) {
    return {
      limitLbPerAcre: pick(exact),
      basis: "published",
      note: `K-State limit for ${spacing}-in rows on ${soilText} soils.`,
    };
  }
  if (spacing < r20.rowSpacingIn || spacing > r40.rowSpacingIn) {
    const edge = spacing < r20.rowSpacingIn ? r20 : r40;
    return {
      limitLbPerAcre: (pick(edge) * edge.rowSpacingIn) / spacing,
      basis: "extrapolated",
      note:
        `Our rule: ${spacing}-in rows are outside K-State's 20–40 in, so the ${edge.rowSpacingIn}-in ` +
        `limit on ${soilText} soils is scaled to the same pounds per foot of row.`,
    };
  }
  const [low, high] = spacing < r30.rowSpacingIn ? [r20, r30] : [r30, r40];
  const fraction = (spacing - low.rowSpacingIn) / (high.rowSpacingIn - low.rowSpacingIn);
  const lowPerFoot = pick(low) * low.rowSpacingIn;
  const highPerFoot = pick(high) * high.rowSpacingIn;
  return {
    limitLbPerAcre: (lowPerFoot + fraction * (highPerFoot - lowPerFoot)) / spacing,
    basis: "interpolated",
    note:
      `Our rule: limit for ${spacing}-in rows on ${soilText} soils interpolated, per foot of row, between ` +
      `the K-State ${low.rowSpacingIn}- and ${high.rowSpacingIn}-in figures.`,
  };
}

export interface SeedPlacedInput {
  /** N with the seed, lb/acre. */
  n: number;
  /** K2O with the seed, lb/acre. */
  k2o: number;
  rowSpacingIn: number;
  soil: SoilTexture;
  /** Product contains urea (urea, UAN). */
  urea?: boolean;
  /** Product contains thiosulfate (ammonium or potassium thiosulfate). */
  thiosulfate?: boolean;
}

/**
 * Is a seed-placed (in-furrow) pass safe for corn? Safe when N + K2O (lb/acre) is at or below the
 * K-State limit for the row spacing and soil and the product has neither urea nor thiosulfate.
 * Row spacing 7.5–60 in (see seedPlacedLimit for spacings K-State does not list).
 * @returns safe, the limit (lb N + K2O/acre) and plain-English reasons
 */
export function seedPlacedCheck(input: SeedPlacedInput): {
  safe: boolean;
  limitLbPerAcre: number;
  reasons: string[];
} {
  const n = checkNumber("n", input.n, { min: 0, max: 1000, unit: "lb/acre" });
  const k2o = checkNumber("k2o", input.k2o, { min: 0, max: 1000, unit: "lb/acre" });
  const limit = seedPlacedLimit(input.rowSpacingIn, input.soil);
  const total = n + k2o;
  const reasons: string[] = [];
  // A tiny tolerance so 8.0000000001 from a gal/ac conversion is not called over an 8 lb limit.
  const over = total > limit.limitLbPerAcre + 1e-9;
  reasons.push(
    over
      ? `N + K2O with the seed is ${round1(total)} lb/acre, over the ${round1(limit.limitLbPerAcre)} lb/acre limit. ${limit.note}`
      : `N + K2O with the seed is ${round1(total)} lb/acre, within the ${round1(limit.limitLbPerAcre)} lb/acre limit. ${limit.note}`,
  );
  if (input.urea) {
    reasons.push(
      "Contains urea (urea or UAN): it releases ammonia that injures seed and seedlings; keep it away from the seed.",
    );
  }
  if (input.thiosulfate) {
    reasons.push("Contains thiosulfate: thiosulfate does not belong with the seed.");
  }
  return { safe: !over && !input.urea && !input.thiosulfate, limitLbPerAcre: limit.limitLbPerAcre, reasons };
}

function round1(x: number): string {
  return String(Math.round(x * 10) / 10);
}
