import { argumentError, checkNumber } from "./validate";

function checkSample(name: string, values: readonly number[], minLength: number): readonly number[] {
  if (!Array.isArray(values) || values.length < minLength) {
    throw argumentError(name, `an array of at least ${minLength} finite numbers`, values);
  }
  values.forEach((v, i) => {
    checkNumber(`${name}[${i}]`, v);
  });
  return values;
}

/** Arithmetic mean (same unit as the values). */
export function mean(values: readonly number[]): number {
  const xs = checkSample("values", values, 1);
  return xs.reduce((a, b) => a + b, 0) / xs.length;
}

/** Sample variance, n − 1 in the denominator (unit squared). */
export function sampleVariance(values: readonly number[]): number {
  const xs = checkSample("values", values, 2);
  const m = mean(xs);
  return xs.reduce((sum, x) => sum + (x - m) ** 2, 0) / (xs.length - 1);
}

/** Sample standard deviation, n − 1 in the denominator (same unit as the values). */
export function sampleStandardDeviation(values: readonly number[]): number {
  return Math.sqrt(sampleVariance(values));
}

// Lanczos approximation, g = 7, nine coefficients (the widely published set).
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
  12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
];

/** Natural log of the gamma function for x > 0. */
export function logGamma(x: number): number {
  checkNumber("x", x, { min: 0, minExclusive: true });
  if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - logGamma(1 - x);
  const z = x - 1;
  let sum = LANCZOS[0] ?? 0;
  for (let i = 1; i < LANCZOS.length; i++) sum += (LANCZOS[i] ?? 0) / (z + i);
  const t = z + 7.5;
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(sum);
}

/** Continued fraction for the incomplete beta function, evaluated by the modified Lentz method. */
function betaContinuedFraction(a: number, b: number, x: number): number {
  const tiny = 1e-300;
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < tiny) d = tiny;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= 1000; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const step = d * c;
    h *= step;
    if (Math.abs(step - 1) < 1e-15) break;
  }
  return h;
}

/** Regularized incomplete beta function I_x(a, b), for 0 ≤ x ≤ 1 and a, b > 0. */
export function regularizedIncompleteBeta(x: number, a: number, b: number): number {
  checkNumber("x", x, { min: 0, max: 1 });
  checkNumber("a", a, { min: 0, minExclusive: true });
  checkNumber("b", b, { min: 0, minExclusive: true });
  if (x === 0 || x === 1) return x;
  const front = Math.exp(logGamma(a + b) - logGamma(a) - logGamma(b) + a * Math.log(x) + b * Math.log(1 - x));
  // The continued fraction converges fast only on this side; use the symmetry I_x(a,b) = 1 − I_{1−x}(b,a).
  return x < (a + 1) / (a + b + 2)
    ? (front * betaContinuedFraction(a, b, x)) / a
    : 1 - (front * betaContinuedFraction(b, a, 1 - x)) / b;
}

/** Student's t cumulative distribution P(T ≤ t) with `df` degrees of freedom (df > 0, need not be whole). */
export function studentTCdf(t: number, df: number): number {
  checkNumber("df", df, { min: 0, minExclusive: true });
  if (t === Number.POSITIVE_INFINITY) return 1;
  if (t === Number.NEGATIVE_INFINITY) return 0;
  checkNumber("t", t);
  const tail = 0.5 * regularizedIncompleteBeta(df / (df + t * t), df / 2, 0.5);
  return t >= 0 ? 1 - tail : tail;
}

/** Two-sided p-value of a t statistic: P(|T| ≥ |t|). */
export function studentTTwoSidedP(t: number, df: number): number {
  checkNumber("t", t);
  checkNumber("df", df, { min: 0, minExclusive: true });
  return regularizedIncompleteBeta(df / (df + t * t), df / 2, 0.5);
}

/** Quantile of Student's t: the t with P(T ≤ t) = p, 0 < p < 1 (bisection on the CDF). */
export function studentTQuantile(p: number, df: number): number {
  checkNumber("p", p, { min: 0, max: 1, minExclusive: true, maxExclusive: true });
  checkNumber("df", df, { min: 0, minExclusive: true });
  if (p === 0.5) return 0;
  let lo = -1;
  let hi = 1;
  while (studentTCdf(lo, df) > p) lo *= 2;
  while (studentTCdf(hi, df) < p) hi *= 2;
  for (let i = 0; i < 200 && hi - lo > 1e-12 * Math.max(1, Math.abs(hi)); i++) {
    const mid = (lo + hi) / 2;
    if (studentTCdf(mid, df) < p) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

export interface SampleSummary {
  n: number;
  mean: number;
  sd: number;
  standardError: number;
  /** Confidence level of the interval, e.g. 0.95. */
  level: number;
  /** Critical t for the interval, df = n − 1. */
  tCritical: number;
  lower: number;
  upper: number;
}

/** Mean, sample SD and the t-based confidence interval of the mean (default 95 %), in the values' unit. */
export function meanConfidenceInterval(values: readonly number[], level = 0.95): SampleSummary {
  const xs = checkSample("values", values, 2);
  checkNumber("level", level, { min: 0, max: 1, minExclusive: true, maxExclusive: true });
  const m = mean(xs);
  const sd = sampleStandardDeviation(xs);
  const standardError = sd / Math.sqrt(xs.length);
  const tCritical = studentTQuantile(1 - (1 - level) / 2, xs.length - 1);
  return {
    n: xs.length,
    mean: m,
    sd,
    standardError,
    level,
    tCritical,
    lower: m - tCritical * standardError,
    upper: m + tCritical * standardError,
  };
}

export interface WelchResult {
  /** mean(a) − mean(b), in the values' unit. */
  meanDifference: number;
  standardError: number;
  t: number;
  /** Welch–Satterthwaite degrees of freedom. */
  df: number;
  /** Two-sided p-value. */
  p: number;
}

/**
 * Welch's t-test of mean(a) = mean(b) without assuming equal variances: t = (ma − mb) ÷ √(va/na + vb/nb),
 * Welch–Satterthwaite df, two-sided p. Each sample needs two values or more and the two together some
 * spread (otherwise the test is undefined and a RangeError is thrown).
 */
export function welchTTest(a: readonly number[], b: readonly number[]): WelchResult {
  checkSample("a", a, 2);
  checkSample("b", b, 2);
  const qa = sampleVariance(a) / a.length;
  const qb = sampleVariance(b) / b.length;
  const se2 = qa + qb;
  if (!(se2 > 0))
    throw argumentError("a and b", "samples with some spread (both have zero variance)", "no spread");
  const meanDifference = mean(a) - mean(b);
  const standardError = Math.sqrt(se2);
  const t = meanDifference / standardError;
  const df = se2 ** 2 / (qa ** 2 / (a.length - 1) + qb ** 2 / (b.length - 1));
  return { meanDifference, standardError, t, df, p: studentTTwoSidedP(t, df) };
}

export interface TreatmentComparison {
  a: SampleSummary & { label: string };
  b: SampleSummary & { label: string };
  welch: WelchResult;
  /** p below 1 − level. */
  significant: boolean;
}

/**
 * Compares two hybrids or treatments in a plot (yields, stand counts, root indices…): each one's
 * mean, SD and confidence interval, and Welch's t-test between them.
 */
export function compareTreatments(
  a: readonly number[],
  b: readonly number[],
  options: { labels?: [string, string]; level?: number } = {},
): TreatmentComparison {
  const level = options.level ?? 0.95;
  const [labelA, labelB] = options.labels ?? ["A", "B"];
  const welch = welchTTest(a, b);
  return {
    a: { ...meanConfidenceInterval(a, level), label: labelA },
    b: { ...meanConfidenceInterval(b, level), label: labelB },
    welch,
    significant: welch.p < 1 - level,
  };
}
