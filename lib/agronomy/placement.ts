import {
  nutrientsPer100FtOfRow,
  nutrientsPerAcre,
  type ProductGrade,
  type RateUnit,
  SOIL_TEXTURES,
  type SoilTexture,
  saltLoad,
  seedbedUtilizationPercent,
  seedPlacedCheck,
} from "./fertilizer";
import { argumentError, checkNumber, checkOneOf } from "./validate";

export type Placement = "seed_placed" | "band_2x2" | "side_dress" | "broadcast";
export const PLACEMENTS = [
  "seed_placed",
  "band_2x2",
  "side_dress",
  "broadcast",
] as const satisfies readonly Placement[];

export type Severity = "info" | "caution" | "warning" | "critical";
export const SEVERITIES = ["info", "caution", "warning", "critical"] as const satisfies readonly Severity[];

/** A named value with its unit, shown beside a finding. */
export interface Quantity {
  value: number;
  unit: string;
}

export interface Finding {
  code: string;
  severity: Severity;
  /** Plain-English reason. */
  message: string;
  numbers: Record<string, Quantity>;
}

/**
 * Where a band sits relative to the seed: inches beside the seed row (horizontal) and inches below
 * the seed (vertical; negative when above it).
 */
export interface BandOffsets {
  besideIn: number;
  belowIn: number;
}

export interface PassProduct extends ProductGrade {
  name?: string;
  saltIndex?: number | null;
  containsUrea?: boolean;
  containsThiosulfate?: boolean;
}

export interface FertilizerPass {
  /** Optional label carried into messages, e.g. "starter pass". */
  label?: string;
  placement: Placement;
  product: PassProduct;
  rate: number;
  rateUnit: RateUnit;
  rowSpacingIn: number;
  soil: SoilTexture;
  /** Offsets the pass was set up for; 2x2 defaults to 2 in beside and 2 in below. */
  intended?: BandOffsets | null;
  /** Offsets found in a dig. */
  measured?: BandOffsets | null;
  /** Width of a seed-placed spread in the seed row, inches, for seedbed utilization. */
  spreadWidthIn?: number | null;
}

/** 2x2: 2 in beside and 2 in below the seed (Ruiz Diaz, K-State Agronomy eUpdate, starter fertilizer). */
export const DEFAULT_2X2_OFFSETS: BandOffsets = { besideIn: 2, belowIn: 2 };

export interface PlacementAuditOptions {
  /** Largest accepted difference between measured and intended offset, inches; default 1 (common practice, no source). */
  shiftToleranceIn?: number;
  /** A band this close to the seed or row, inches, is a burn risk; default 1 (common practice, no source). */
  burnDistanceIn?: number;
  /** Closest a side-dress band should be beside the row, inches; default 4 (common practice, no source). */
  sideDressMinBesideIn?: number;
  /** Share of the seed-placed limit above which a pass is called close to it, %; default 80 (our judgement). */
  nearLimitPercent?: number;
}

const DEFAULT_OPTIONS = {
  shiftToleranceIn: 1,
  burnDistanceIn: 1,
  sideDressMinBesideIn: 4,
  nearLimitPercent: 80,
} as const;

const inches = (value: number): Quantity => ({ value, unit: "in" });
const lbPerAcre = (value: number): Quantity => ({ value, unit: "lb/acre" });
const fmt = (x: number) => String(Math.round(x * 100) / 100);

function checkOffsets(name: string, offsets: BandOffsets | null | undefined): BandOffsets | null {
  if (offsets == null) return null;
  if (typeof offsets !== "object") throw argumentError(name, "{ besideIn, belowIn } in inches", offsets);
  return {
    besideIn: checkNumber(`${name}.besideIn`, offsets.besideIn, { min: 0, max: 60, unit: "in" }),
    belowIn: checkNumber(`${name}.belowIn`, offsets.belowIn, { min: -12, max: 24, unit: "in" }),
  };
}

/** Straight-line distance from the seed to a band, inches. */
export function bandDistanceFromSeedIn(offsets: BandOffsets): number {
  return Math.hypot(offsets.besideIn, offsets.belowIn);
}

/**
 * Checks one fertilizer pass against its placement rules and returns the findings, most severe first.
 * - seed-placed: N + K2O over the K-State limit for row spacing and soil (warning; critical above 1.5×
 *   the limit, our judgement), urea or UAN (critical, ammonia injury), thiosulfate (critical); close to
 *   the limit is a caution; seedbed utilization and salt load are reported as info when known;
 * - 2x2: a band measured (or set up) within `burnDistanceIn` of the seed is a burn risk (critical);
 * - side-dress: a band closer than `sideDressMinBesideIn` beside the row (warning; critical within
 *   `burnDistanceIn`);
 * - 2x2 and side-dress: measured offset differing from the intended one by more than
 *   `shiftToleranceIn` on either axis is a shifted knife (warning), with both values and the difference.
 */
export function auditPlacement(pass: FertilizerPass, options: PlacementAuditOptions = {}): Finding[] {
  const placement = checkOneOf("placement", pass.placement, PLACEMENTS);
  checkOneOf("soil", pass.soil, SOIL_TEXTURES);
  const tolerance = checkNumber(
    "shiftToleranceIn",
    options.shiftToleranceIn ?? DEFAULT_OPTIONS.shiftToleranceIn,
    {
      min: 0,
      max: 12,
      unit: "in",
    },
  );
  const burn = checkNumber("burnDistanceIn", options.burnDistanceIn ?? DEFAULT_OPTIONS.burnDistanceIn, {
    min: 0,
    max: 6,
    unit: "in",
  });
  const sideDressMin = checkNumber(
    "sideDressMinBesideIn",
    options.sideDressMinBesideIn ?? DEFAULT_OPTIONS.sideDressMinBesideIn,
    { min: 0, max: 30, unit: "in" },
  );
  const nearLimit = checkNumber(
    "nearLimitPercent",
    options.nearLimitPercent ?? DEFAULT_OPTIONS.nearLimitPercent,
    {
      min: 0,
      max: 100,
      unit: "%",
    },
  );
  const product = pass.product;
  const perAcre = nutrientsPerAcre(product, pass.rate, pass.rateUnit);
  const name = product.name ?? `${fmt(product.n)}-${fmt(product.p2o5)}-${fmt(product.k2o)}`;
  const label = pass.label ? `${pass.label} (${name})` : name;
  const measured = checkOffsets("measured", pass.measured);
  const intended =
    checkOffsets("intended", pass.intended) ?? (placement === "band_2x2" ? DEFAULT_2X2_OFFSETS : null);
  const findings: Finding[] = [];

  if (placement === "seed_placed") {
    const check = seedPlacedCheck({
      n: perAcre.n,
      k2o: perAcre.k2o,
      rowSpacingIn: pass.rowSpacingIn,
      soil: pass.soil,
      urea: product.containsUrea,
      thiosulfate: product.containsThiosulfate,
    });
    const total = perAcre.n + perAcre.k2o;
    const numbers = {
      nPlusK2o: lbPerAcre(total),
      limit: lbPerAcre(check.limitLbPerAcre),
      rowSpacing: inches(pass.rowSpacingIn),
    };
    const limitReason = check.reasons[0] ?? "";
    if (total > check.limitLbPerAcre + 1e-9) {
      findings.push({
        code: "seed_placed_over_limit",
        severity: total > 1.5 * check.limitLbPerAcre ? "critical" : "warning",
        message: `Seed-placed ${label}: ${limitReason}`,
        numbers,
      });
    } else if (total >= (nearLimit / 100) * check.limitLbPerAcre && total > 0) {
      findings.push({
        code: "seed_placed_near_limit",
        severity: "caution",
        message: `Seed-placed ${label}: ${limitReason} That is at least ${nearLimit} % of the limit (our judgement).`,
        numbers,
      });
    } else {
      findings.push({
        code: "seed_placed_within_limit",
        severity: "info",
        message: `Seed-placed ${label}: ${limitReason}`,
        numbers,
      });
    }
    if (product.containsUrea) {
      findings.push({
        code: "seed_placed_urea",
        severity: "critical",
        message: `Seed-placed ${label} contains urea (urea or UAN): it releases ammonia that injures seed and seedlings.`,
        numbers: { n: lbPerAcre(perAcre.n) },
      });
    }
    if (product.containsThiosulfate) {
      findings.push({
        code: "seed_placed_thiosulfate",
        severity: "critical",
        message: `Seed-placed ${label} contains thiosulfate, which does not belong with the seed.`,
        numbers: { s: lbPerAcre(perAcre.s) },
      });
    }
    if (pass.spreadWidthIn != null) {
      const sbu = seedbedUtilizationPercent(pass.spreadWidthIn, pass.rowSpacingIn);
      findings.push({
        code: "seedbed_utilization",
        severity: "info",
        message: `Seedbed utilization ${fmt(sbu)} %: a ${fmt(pass.spreadWidthIn)}-in spread in ${fmt(pass.rowSpacingIn)}-in rows.`,
        numbers: {
          sbu: { value: sbu, unit: "%" },
          spreadWidth: inches(pass.spreadWidthIn),
          rowSpacing: inches(pass.rowSpacingIn),
        },
      });
    }
    const salt = saltLoad(product, pass.rate, pass.rateUnit, pass.rowSpacingIn);
    if (salt) {
      findings.push({
        code: "salt_load",
        severity: "info",
        message: `Salt load with the seed: about ${fmt(salt.sodiumNitrateEquivalentLbPerAcre)} lb/acre of sodium-nitrate equivalent (salt index ${fmt(salt.saltIndex)}).`,
        numbers: {
          saltIndex: { value: salt.saltIndex, unit: "relative to sodium nitrate = 100" },
          saltLoad: lbPerAcre(salt.sodiumNitrateEquivalentLbPerAcre),
        },
      });
    }
  }

  if (placement === "band_2x2") {
    const per100 = nutrientsPer100FtOfRow(product, pass.rate, pass.rateUnit, pass.rowSpacingIn);
    findings.push({
      code: "band_rate",
      severity: "info",
      message: `2x2 ${label}: ${fmt(per100.n)} lb N per 100 ft of row (${fmt(perAcre.n)} lb N/acre).`,
      numbers: { n: lbPerAcre(perAcre.n), nPer100Ft: { value: per100.n, unit: "lb/100 ft of row" } },
    });
    if (intended && bandDistanceFromSeedIn(intended) <= burn) {
      findings.push({
        code: "band_planned_near_seed",
        severity: "warning",
        message: `2x2 ${label} is set up ${fmt(bandDistanceFromSeedIn(intended))} in from the seed, within ${fmt(burn)} in: a burn risk.`,
        numbers: { intendedDistance: inches(bandDistanceFromSeedIn(intended)), burnDistance: inches(burn) },
      });
    }
    if (measured && bandDistanceFromSeedIn(measured) <= burn) {
      findings.push({
        code: "band_near_seed",
        severity: "critical",
        message: `2x2 ${label} was found ${fmt(bandDistanceFromSeedIn(measured))} in from the seed, within ${fmt(burn)} in: a burn risk.`,
        numbers: {
          measuredBeside: inches(measured.besideIn),
          measuredBelow: inches(measured.belowIn),
          measuredDistance: inches(bandDistanceFromSeedIn(measured)),
          burnDistance: inches(burn),
        },
      });
    }
  }

  if (placement === "side_dress") {
    const where = measured ?? intended;
    if (where && where.besideIn < sideDressMin) {
      const critical = where.besideIn <= burn;
      findings.push({
        code: "side_dress_near_row",
        severity: critical ? "critical" : "warning",
        message:
          `Side-dress ${label} ${measured ? "was found" : "is set up"} ${fmt(where.besideIn)} in beside the row, ` +
          `closer than ${fmt(sideDressMin)} in${critical ? `, within ${fmt(burn)} in: a burn risk` : ""}.`,
        numbers: {
          beside: inches(where.besideIn),
          minimumBeside: inches(sideDressMin),
          burnDistance: inches(burn),
        },
      });
    }
  }

  if ((placement === "band_2x2" || placement === "side_dress") && measured && intended) {
    const besideDiff = measured.besideIn - intended.besideIn;
    const belowDiff = measured.belowIn - intended.belowIn;
    const shifted = [
      Math.abs(besideDiff) > tolerance + 1e-9
        ? `${fmt(Math.abs(besideDiff))} in ${besideDiff > 0 ? "farther from" : "closer to"} the row`
        : null,
      Math.abs(belowDiff) > tolerance + 1e-9
        ? `${fmt(Math.abs(belowDiff))} in ${belowDiff > 0 ? "deeper" : "shallower"}`
        : null,
    ].filter((s): s is string => s !== null);
    if (shifted.length > 0) {
      findings.push({
        code: "shifted_knife",
        severity: "warning",
        message:
          `Shifted knife on ${label}: found ${fmt(measured.besideIn)} in beside and ${fmt(measured.belowIn)} in below, ` +
          `set up for ${fmt(intended.besideIn)} and ${fmt(intended.belowIn)}: ${shifted.join(" and ")} ` +
          `than intended (tolerance ${fmt(tolerance)} in).`,
        numbers: {
          intendedBeside: inches(intended.besideIn),
          measuredBeside: inches(measured.besideIn),
          differenceBeside: inches(besideDiff),
          intendedBelow: inches(intended.belowIn),
          measuredBelow: inches(measured.belowIn),
          differenceBelow: inches(belowDiff),
          tolerance: inches(tolerance),
        },
      });
    }
  }

  return sortFindings(findings);
}

/** Findings most severe first; order within a severity is kept. */
export function sortFindings<T extends { severity: Severity }>(findings: readonly T[]): T[] {
  return [...findings].sort((a, b) => SEVERITIES.indexOf(b.severity) - SEVERITIES.indexOf(a.severity));
}
