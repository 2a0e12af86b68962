import { argumentError, checkNumber, checkOneOf } from "./validate";

export type MesocotylCondition = "healthy" | "discolored" | "damaged" | "severed";
export const MESOCOTYL_CONDITIONS = [
  "healthy",
  "discolored",
  "damaged",
  "severed",
] as const satisfies readonly MesocotylCondition[];

export type InjuryScore = "none" | "slight" | "moderate" | "severe";
export const INJURY_SCORES = [
  "none",
  "slight",
  "moderate",
  "severe",
] as const satisfies readonly InjuryScore[];

/** What is measured on one dug plant. */
export interface DugPlantRoots {
  /**
   * Seminal root score, 0–5 (our scale): 5 radicle and all lateral seminal roots white, firm and
   * branched; 4 full set, minor loss; 3 some roots lost or brown; 2 radicle and one lateral left or
   * heavy loss; 1 radicle only, discoloured; 0 no working seminal root.
   */
  seminalRootScore: number;
  /** Nodal whorls with emerged roots, 0–12. */
  nodalWhorls: number;
  /** Nodal roots counted, 0–120. */
  nodalRootCount: number;
  /** Longest nodal root, inches. */
  longestNodalRootIn: number;
  /** Crown depth below the soil surface, inches (0 = at the surface). */
  crownDepthIn: number;
  mesocotyl: MesocotylCondition;
  seminalInjury: InjuryScore;
  nodalInjury: InjuryScore;
  /** Fertilizer burn seen on roots (brown, dry, pruned tips toward a band). */
  burnSeen?: boolean;
}

/**
 * Nodal roots expected on a healthy plant at a leaf stage. Our judgement, anchored on Iowa State
 * "Corn Root Development" (nodal roots visible from about V1, carrying the plant from V6): about one
 * new whorl every two collars from V1 (cap 5), about 3 nodal roots per collar (cap 30) and a longest
 * nodal root of about 2 in per collar less 1 (cap 24 in). Before V1 nothing is expected.
 */
export function expectedNodalRoots(leafCollars: number): {
  whorls: number;
  roots: number;
  longestIn: number;
} {
  const c = checkNumber("leafCollars", leafCollars, { min: 0, max: 26 });
  if (c < 1) return { whorls: 0, roots: 0, longestIn: 0 };
  return {
    whorls: Math.min(Math.ceil(c / 2), 5),
    roots: Math.min(3 * c, 30),
    longestIn: Math.min(2 * c - 1, 24),
  };
}

/** Multiplier on a root component for an injury score (our judgement). */
export const INJURY_MULTIPLIER: Record<InjuryScore, number> = {
  none: 1,
  slight: 0.85,
  moderate: 0.6,
  severe: 0.3,
};

/** Score for the mesocotyl's condition, 0–1 (our judgement). */
export const MESOCOTYL_SCORE: Record<MesocotylCondition, number> = {
  healthy: 1,
  discolored: 0.6,
  damaged: 0.3,
  severed: 0,
};

/**
 * Crown depth score, 0–1. Full marks from 0.5 to 1.0 in: the crown forms about 1/2–3/4 in below the
 * surface (Nielsen, "The Emergence Process in Corn", Purdue Extension); 1.0 in as the top of the band is
 * our judgement. Shallower falls straight to 0 at the surface (a crown at the surface risks rootless
 * corn); deeper falls to 0.5 at 2.5 in and stays there (our judgement: unusual, not a failure).
 */
export function crownDepthScore(crownDepthIn: number): number {
  const d = checkNumber("crownDepthIn", crownDepthIn, { min: 0, max: 6, unit: "in" });
  if (d < 0.5) return d / 0.5;
  if (d <= 1) return 1;
  return Math.max(0.5, 1 - (d - 1) / 3);
}

/**
 * Component weights for a leaf stage. Seminal roots and the mesocotyl feed the seedling to about V3
 * and nodal roots carry it from V6 (Iowa State "Corn Root Development"), so weight moves linearly from
 * seminal/mesocotyl to nodal between V1 and V6 (our judgement). Weights always sum to 1.
 */
export function rootIndexWeights(leafCollars: number): {
  seminal: number;
  mesocotyl: number;
  nodal: number;
  crown: number;
} {
  const c = checkNumber("leafCollars", leafCollars, { min: 0, max: 26 });
  const t = Math.min(1, Math.max(0, (c - 1) / 5));
  return {
    seminal: 0.4 * (1 - t) + 0.05 * t,
    mesocotyl: 0.3 * (1 - t) + 0.1 * t,
    nodal: 0.15 * (1 - t) + 0.7 * t,
    crown: 0.15,
  };
}

export interface RootIndexResult {
  /** Root development index, 0–100, one decimal. */
  index: number;
  /** Each component's score (0–1) and weight. */
  components: Record<"seminal" | "mesocotyl" | "nodal" | "crown", { score: number; weight: number }>;
  expected: { whorls: number; roots: number; longestIn: number };
}

function checkPlant(plant: DugPlantRoots, name: string): DugPlantRoots {
  if (typeof plant !== "object" || plant === null)
    throw argumentError(name, "a dug plant's measurements", plant);
  return {
    seminalRootScore: checkNumber(`${name}.seminalRootScore`, plant.seminalRootScore, { min: 0, max: 5 }),
    nodalWhorls: checkNumber(`${name}.nodalWhorls`, plant.nodalWhorls, { min: 0, max: 12, integer: true }),
    nodalRootCount: checkNumber(`${name}.nodalRootCount`, plant.nodalRootCount, {
      min: 0,
      max: 120,
      integer: true,
    }),
    longestNodalRootIn: checkNumber(`${name}.longestNodalRootIn`, plant.longestNodalRootIn, {
      min: 0,
      max: 60,
      unit: "in",
    }),
    crownDepthIn: checkNumber(`${name}.crownDepthIn`, plant.crownDepthIn, { min: 0, max: 6, unit: "in" }),
    mesocotyl: checkOneOf(`${name}.mesocotyl`, plant.mesocotyl, MESOCOTYL_CONDITIONS),
    seminalInjury: checkOneOf(`${name}.seminalInjury`, plant.seminalInjury, INJURY_SCORES),
    nodalInjury: checkOneOf(`${name}.nodalInjury`, plant.nodalInjury, INJURY_SCORES),
    burnSeen: Boolean(plant.burnSeen),
  };
}

/**
 * Root development index (0–100) of one dug plant relative to its leaf stage (visible leaf collars).
 * Index = 100 × Σ weight × score over four components:
 * - seminal: seminalRootScore ÷ 5 × seminal injury multiplier;
 * - nodal: (0.3 × whorls + 0.4 × root count + 0.3 × longest root), each as observed ÷ expected for the
 *   stage capped at 1 (1 when nothing is expected yet), × nodal injury multiplier;
 * - crown: crownDepthScore;
 * - mesocotyl: MESOCOTYL_SCORE.
 * Weights (rootIndexWeights) go from seminal 0.40, mesocotyl 0.30, nodal 0.15, crown 0.15 at V1 and
 * before to 0.05, 0.10, 0.70, 0.15 at V6 and after. Injury multipliers: none 1, slight 0.85,
 * moderate 0.6, severe 0.3. Sources leaned on: Iowa State "Corn Root Development" (stage timing),
 * Nielsen, Purdue (crown depth); the scales, expectations, weights and multipliers are our judgement.
 */
export function rootDevelopmentIndex(plant: DugPlantRoots, leafCollars: number): RootIndexResult {
  return scorePlant(plant, leafCollars, "plant");
}

function scorePlant(plant: DugPlantRoots, leafCollars: number, name: string): RootIndexResult {
  const p = checkPlant(plant, name);
  const weights = rootIndexWeights(leafCollars);
  const expected = expectedNodalRoots(leafCollars);
  const ratio = (observed: number, wanted: number) => (wanted <= 0 ? 1 : Math.min(1, observed / wanted));
  const nodalRaw =
    0.3 * ratio(p.nodalWhorls, expected.whorls) +
    0.4 * ratio(p.nodalRootCount, expected.roots) +
    0.3 * ratio(p.longestNodalRootIn, expected.longestIn);
  const components = {
    seminal: {
      score: (p.seminalRootScore / 5) * INJURY_MULTIPLIER[p.seminalInjury],
      weight: weights.seminal,
    },
    mesocotyl: { score: MESOCOTYL_SCORE[p.mesocotyl], weight: weights.mesocotyl },
    nodal: { score: nodalRaw * INJURY_MULTIPLIER[p.nodalInjury], weight: weights.nodal },
    crown: { score: crownDepthScore(p.crownDepthIn), weight: weights.crown },
  };
  const total = Object.values(components).reduce((sum, c) => sum + c.score * c.weight, 0);
  const index = Math.min(100, Math.max(0, Math.round(total * 1000) / 10));
  return { index, components, expected };
}

export interface SiteRootIndex {
  /** Mean of the plants' indices, 0–100, one decimal. */
  siteIndex: number;
  plantIndices: number[];
  minIndex: number;
  maxIndex: number;
}

/** Root development index of a dig site: the mean of its dug plants' indices at the site's leaf stage. */
export function siteRootIndex(plants: readonly DugPlantRoots[], leafCollars: number): SiteRootIndex {
  if (!Array.isArray(plants) || plants.length === 0)
    throw argumentError("plants", "a non-empty array", plants);
  const plantIndices = plants.map((p, i) => scorePlant(p, leafCollars, `plants[${i}]`).index);
  const mean = plantIndices.reduce((a, b) => a + b, 0) / plantIndices.length;
  return {
    siteIndex: Math.round(mean * 10) / 10,
    plantIndices,
    minIndex: Math.min(...plantIndices),
    maxIndex: Math.max(...plantIndices),
  };
}
