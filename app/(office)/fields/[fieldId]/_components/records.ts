import {
  type AppliedPass,
  auditPlacement,
  type Finding,
  type NitrogenBudget,
  nitrogenBudget,
  type PassProduct,
  type Severity,
} from "@/lib/agronomy";
import type { FertilizerPass, Planting, Product } from "@/db/schema";

// The field page's computations from stored records: the placement audit of each pass (as the dig
// assessment builds it, lib/digs/assessment.ts) and the nitrogen budget (as the calculator calls it).

export type AuditStatus = "ok" | "caution" | "exceeds";

export interface PassAudit {
  /** The planting whose row spacing and soil the audit used; null when the field has none. */
  plantingId: string | null;
  /** True when the pass is for the whole field and the newest planting stood in. */
  plantingAssumed: boolean;
  status: AuditStatus | null;
  findings: Finding[];
  /** Why there is no audit (an input the core refused), else null. */
  error: string | null;
}

const STATUS_OF: Record<Severity, AuditStatus> = {
  info: "ok",
  caution: "caution",
  warning: "exceeds",
  critical: "exceeds",
};

/** The worst finding decides: notes only → ok, a caution → caution, a warning or critical → exceeds. */
export function auditStatus(findings: readonly Finding[]): AuditStatus {
  const order: AuditStatus[] = ["ok", "caution", "exceeds"];
  return findings.reduce<AuditStatus>((worst, f) => {
    const s = STATUS_OF[f.severity];
    return order.indexOf(s) > order.indexOf(worst) ? s : worst;
  }, "ok");
}

export function passProduct(p: Product): PassProduct {
  return {
    name: p.name,
    n: p.gradeN,
    p2o5: p.gradeP2o5,
    k2o: p.gradeK2o,
    s: p.gradeS,
    lbPerGal: p.lbPerGal,
    saltIndex: p.saltIndex,
    containsUrea: p.containsUrea,
    containsThiosulfate: p.containsThiosulfate,
  };
}

/**
 * The placement audit of one pass as planned (no dig measurements): its planting's row spacing and
 * soil, or the newest planting's for a whole-field pass. `plantings` are newest first.
 */
export function auditPass(
  pass: FertilizerPass,
  product: Product | undefined,
  plantings: readonly Planting[],
): PassAudit {
  const own = pass.plantingId ? plantings.find((p) => p.id === pass.plantingId) : undefined;
  const planting = own ?? plantings[0];
  const base = { plantingId: planting?.id ?? null, plantingAssumed: !own && planting !== undefined };
  if (!planting || !product) return { ...base, status: null, findings: [], error: null };
  try {
    const findings = auditPlacement({
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
    });
    return { ...base, status: auditStatus(findings), findings, error: null };
  } catch (err) {
    if (err instanceof RangeError || err instanceof TypeError) {
      return { ...base, status: null, findings: [], error: err.message };
    }
    throw err;
  }
}

export interface BudgetInputs {
  crop: "grain" | "silage";
  /** bu/acre for grain, tons/acre for silage. */
  goal: number;
  soilPpm: number | null;
  soilDepthFt: number;
  waterPpm: number | null;
  waterAcreIn: number | null;
  previousLbN: number | null;
}

export const BUDGET_LIMITS = {
  grain: { min: 0, max: 600 },
  silage: { min: 0, max: 80 },
  soilPpm: { min: 0, max: 200 },
  soilDepthFt: { min: 0.25, max: 6 },
  waterPpm: { min: 0, max: 200 },
  waterAcreIn: { min: 0, max: 80 },
  previousLbN: { min: 0, max: 300 },
} as const;

/** Yield goals the panel starts from until the user enters the field's own (user inputs, not advice). */
export const DEFAULT_GOALS = { grain: 200, silage: 30 } as const;

export type BudgetField = "goal" | "soilPpm" | "soilDepthFt" | "waterPpm" | "waterAcreIn" | "previousLbN";

/** The budget's inputs from the page's search parameters; an entry out of range is named, not used. */
export function budgetInputsFrom(params: Record<string, string | string[] | undefined>): {
  inputs: BudgetInputs;
  raw: Record<BudgetField | "crop", string>;
  invalid: BudgetField[];
} {
  const get = (k: string) => {
    const v = params[k];
    return (Array.isArray(v) ? v[0] : v)?.trim() ?? "";
  };
  const crop = get("crop") === "silage" ? "silage" : "grain";
  const invalid: BudgetField[] = [];
  const num = (k: BudgetField, limits: { min: number; max: number }): number | null => {
    const text = get(k);
    if (text === "") return null;
    const n = Number(text);
    if (!Number.isFinite(n) || n < limits.min || n > limits.max) {
      invalid.push(k);
      return null;
    }
    return n;
  };
  const raw = {
    crop,
    goal: get("goal"),
    soilPpm: get("soilPpm"),
    soilDepthFt: get("soilDepthFt"),
    waterPpm: get("waterPpm"),
    waterAcreIn: get("waterAcreIn"),
    previousLbN: get("previousLbN"),
  };
  const inputs: BudgetInputs = {
    crop,
    goal: num("goal", BUDGET_LIMITS[crop]) ?? DEFAULT_GOALS[crop],
    soilPpm: num("soilPpm", BUDGET_LIMITS.soilPpm),
    soilDepthFt: num("soilDepthFt", BUDGET_LIMITS.soilDepthFt) ?? 1,
    waterPpm: num("waterPpm", BUDGET_LIMITS.waterPpm),
    waterAcreIn: num("waterAcreIn", BUDGET_LIMITS.waterAcreIn),
    previousLbN: num("previousLbN", BUDGET_LIMITS.previousLbN),
  };
  return { inputs, raw, invalid };
}

/**
 * The field's nitrogen budget: the need from the yield goal less soil nitrate, irrigation-water
 * nitrate and previous-crop credits and the N of every recorded pass (grade × rate). Passes whose N
 * cannot be computed (a gal/acre rate for a product with no density) are returned apart.
 */
export function fieldNitrogenBudget(
  inputs: BudgetInputs,
  passes: readonly { label: string; pass: FertilizerPass; product: Product | undefined }[],
): { budget: NitrogenBudget | null; skipped: string[]; error: string | null } {
  const skipped: string[] = [];
  const applied: AppliedPass[] = [];
  for (const { label, pass, product } of passes) {
    if (!product || (pass.rateUnit === "gal/ac" && product.lbPerGal === null)) {
      skipped.push(label);
      continue;
    }
    applied.push({ label, product: passProduct(product), rate: pass.rate, rateUnit: pass.rateUnit });
  }
  try {
    const budget = nitrogenBudget({
      yieldGoal:
        inputs.crop === "grain"
          ? { crop: "grain", bushelsPerAcre: inputs.goal }
          : { crop: "silage", tonsPerAcre: inputs.goal },
      soilNitrate: inputs.soilPpm !== null ? [{ no3nPpm: inputs.soilPpm, depthFt: inputs.soilDepthFt }] : [],
      irrigationWater:
        inputs.waterPpm !== null && inputs.waterAcreIn !== null
          ? { no3nPpm: inputs.waterPpm, acreInches: inputs.waterAcreIn }
          : null,
      previousCropCreditLbN: inputs.previousLbN ?? undefined,
      appliedPasses: applied,
    });
    return { budget, skipped, error: null };
  } catch (err) {
    if (err instanceof RangeError || err instanceof TypeError) {
      return { budget: null, skipped, error: err.message };
    }
    throw err;
  }
}
