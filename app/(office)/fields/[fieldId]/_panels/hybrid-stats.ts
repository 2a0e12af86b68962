import { mean, sampleStandardDeviation, welchTTest } from "@/lib/agronomy";

/** Fewest digs (replicates) per hybrid for the comparison. */
export const MIN_REPLICATES = 2;
/** Below this many digs per hybrid the panel warns that the test can miss a real difference. */
export const SMALL_N = 5;
/** Significance level of the comparison: 5 %. */
export const ALPHA = 0.05;

export interface HybridSummary {
  hybrid: string;
  n: number;
  /** Mean root development index, 0–100. */
  mean: number;
  /** Sample SD (n − 1) of the root index. */
  sd: number;
}

export interface HybridPair {
  a: string;
  b: string;
  /** mean(a) − mean(b), root-index points. */
  difference: number;
  /** Welch's t, df and two-sided p; null when both hybrids have no spread (the test is undefined). */
  welch: { t: number; df: number; p: number } | null;
  clear: boolean;
}

export type HybridComparison =
  | { kind: "needMore"; hybridsWithReplicates: number }
  | { kind: "compared"; summaries: HybridSummary[]; pairs: HybridPair[]; smallN: boolean };

/**
 * Root index by hybrid, with Welch's t-test between every pair of hybrids that have at least
 * MIN_REPLICATES digs each (each dig a replicate strip). Needs two such hybrids.
 */
export function compareHybrids(
  digs: readonly { hybrid: string | null; rootIndex: number }[],
): HybridComparison {
  const byHybrid = new Map<string, number[]>();
  for (const d of digs) {
    if (d.hybrid === null) continue;
    byHybrid.set(d.hybrid, [...(byHybrid.get(d.hybrid) ?? []), d.rootIndex]);
  }
  const replicated = [...byHybrid.entries()]
    .filter(([, values]) => values.length >= MIN_REPLICATES)
    .sort((a, b) => a[0].localeCompare(b[0]));
  if (replicated.length < 2) return { kind: "needMore", hybridsWithReplicates: replicated.length };
  const summaries = replicated.map(([hybrid, values]) => ({
    hybrid,
    n: values.length,
    mean: mean(values),
    sd: sampleStandardDeviation(values),
  }));
  const pairs: HybridPair[] = [];
  for (let i = 0; i < replicated.length; i++) {
    for (let j = i + 1; j < replicated.length; j++) {
      const [a, va] = replicated[i]!;
      const [b, vb] = replicated[j]!;
      const difference = mean(va) - mean(vb);
      let welch: HybridPair["welch"] = null;
      try {
        const r = welchTTest(va, vb);
        welch = { t: r.t, df: r.df, p: r.p };
      } catch {
        welch = null;
      }
      pairs.push({ a, b, difference, welch, clear: welch !== null && welch.p < ALPHA });
    }
  }
  return { kind: "compared", summaries, pairs, smallN: summaries.some((s) => s.n < SMALL_N) };
}
