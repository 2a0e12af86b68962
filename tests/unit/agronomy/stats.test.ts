import fc from "fast-check";
import * as ss from "simple-statistics";
import { describe, expect, it } from "vitest";
import {
  compareTreatments,
  logGamma,
  mean,
  meanConfidenceInterval,
  regularizedIncompleteBeta,
  sampleStandardDeviation,
  sampleVariance,
  studentTCdf,
  studentTQuantile,
  studentTTwoSidedP,
  welchTTest,
} from "@/lib/agronomy";

const sample = fc.array(fc.double({ min: -1000, max: 1000, noNaN: true }), { minLength: 2, maxLength: 40 });

describe("mean, sample variance and SD against simple-statistics", () => {
  it("property: equal to simple-statistics mean, sampleVariance and sampleStandardDeviation", () => {
    fc.assert(
      fc.property(sample, (xs) => {
        expect(mean(xs)).toBeCloseTo(ss.mean(xs), 8);
        expect(sampleVariance(xs)).toBeCloseTo(ss.sampleVariance(xs), 6);
        expect(sampleStandardDeviation(xs)).toBeCloseTo(ss.sampleStandardDeviation(xs), 8);
      }),
    );
  });

  it("textbook: 2, 4, 4, 4, 5, 5, 7, 9 has mean 5 and sample variance 32/7 (arithmetic)", () => {
    const xs = [2, 4, 4, 4, 5, 5, 7, 9];
    expect(mean(xs)).toBe(5);
    expect(sampleVariance(xs)).toBeCloseTo(32 / 7, 12);
  });

  it("refuses an empty sample, one value for variance, and NaN values by position", () => {
    expect(() => mean([])).toThrow(/values must be an array of at least 1 finite numbers/);
    expect(() => sampleVariance([1])).toThrow(RangeError);
    expect(() => mean([1, Number.NaN])).toThrow(/values\[1\]/);
  });
});

describe("Student-t CDF (regularized incomplete beta, Lentz continued fraction)", () => {
  it("logGamma matches simple-statistics gammaln and ln 4! = ln 24", () => {
    expect(logGamma(5)).toBeCloseTo(Math.log(24), 12);
    for (const x of [0.1, 0.5, 1, 2.5, 7.3, 30, 171.2]) expect(logGamma(x)).toBeCloseTo(ss.gammaln(x), 8);
  });

  it("I_x(1, 1) = x and I_x(a, 1) = x^a (closed forms, arithmetic)", () => {
    for (const x of [0, 0.1, 0.37, 0.5, 0.9, 1]) {
      expect(regularizedIncompleteBeta(x, 1, 1)).toBeCloseTo(x, 12);
      expect(regularizedIncompleteBeta(x, 3.5, 1)).toBeCloseTo(x ** 3.5, 12);
    }
  });

  it("df = 1 is the Cauchy distribution: F(t) = 1/2 + atan(t)/π (closed form)", () => {
    for (const t of [-20, -3, -1, -0.2, 0, 0.5, 1, 4, 50]) {
      expect(studentTCdf(t, 1)).toBeCloseTo(0.5 + Math.atan(t) / Math.PI, 12);
    }
  });

  it("df = 2: F(t) = 1/2 + t / (2√(t² + 2)) (closed form)", () => {
    for (const t of [-5, -1.3, 0, 0.7, 2, 9]) {
      expect(studentTCdf(t, 2)).toBeCloseTo(0.5 + t / (2 * Math.sqrt(t * t + 2)), 12);
    }
  });

  it("for very large df it tends to simple-statistics' normal CDF (a 4-decimal table)", () => {
    for (const z of [-2.5, -1, 0, 0.5, 1.96, 3]) {
      expect(studentTCdf(z, 1e7)).toBeCloseTo(ss.cumulativeStdNormalProbability(z), 3);
    }
  });

  it("t-table critical values (two-sided 95 %): df 5 → 2.571, df 10 → 2.228, df 30 → 2.042 — standard t table, from memory", () => {
    expect(studentTQuantile(0.975, 5)).toBeCloseTo(2.571, 3);
    expect(studentTQuantile(0.975, 10)).toBeCloseTo(2.228, 3);
    expect(studentTQuantile(0.975, 30)).toBeCloseTo(2.042, 3);
    expect(studentTQuantile(0.5, 7)).toBe(0);
  });

  it("property: the CDF is monotonic and the quantile inverts it", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -50, max: 50, noNaN: true }),
        fc.double({ min: 0.01, max: 50, noNaN: true }),
        fc.double({ min: 0.5, max: 200, noNaN: true }),
        (t, step, df) => {
          const f = studentTCdf(t, df);
          expect(studentTCdf(t + step, df)).toBeGreaterThanOrEqual(f);
          if (f > 1e-9 && f < 1 - 1e-9) expect(studentTCdf(studentTQuantile(f, df), df)).toBeCloseTo(f, 8);
        },
      ),
    );
  });

  it("two-sided p equals 2 × the lower tail of −|t|", () => {
    expect(studentTTwoSidedP(2.228, 10)).toBeCloseTo(0.05, 3);
    expect(studentTTwoSidedP(-1.5, 7)).toBeCloseTo(2 * studentTCdf(-1.5, 7), 12);
  });

  it("refuses df ≤ 0 and p outside (0, 1)", () => {
    expect(() => studentTCdf(1, 0)).toThrow(/df must be a finite number above 0/);
    expect(() => studentTQuantile(1, 5)).toThrow(/p must be a finite number above 0 below 1/);
  });
});

// Student's sleep data (10 + 10 patients), as used in the R documentation example t.test(extra ~ group, data = sleep).
const sleep1 = [0.7, -1.6, -0.2, -1.2, -0.1, 3.4, 3.7, 0.8, 0.0, 2.0];
const sleep2 = [1.9, 0.8, 1.1, 0.1, -0.1, 4.4, 5.5, 1.6, 4.6, 3.4];

describe("welchTTest", () => {
  it("Welch test on Student's sleep data: t = −1.8608, df = 17.776, p = 0.07939 — R documentation example, from memory", () => {
    const r = welchTTest(sleep1, sleep2);
    expect(r.t).toBeCloseTo(-1.8608, 4);
    expect(r.df).toBeCloseTo(17.776, 3);
    expect(r.p).toBeCloseTo(0.07939, 5);
    expect(r.meanDifference).toBeCloseTo(-1.58, 10);
  });

  it("property: with equal sample sizes Welch's t equals simple-statistics' pooled tTestTwoSample", () => {
    fc.assert(
      fc.property(
        fc
          .integer({ min: 2, max: 20 })
          .chain((n) =>
            fc.tuple(
              fc.array(fc.double({ min: -100, max: 100, noNaN: true }), { minLength: n, maxLength: n }),
              fc.array(fc.double({ min: -100, max: 100, noNaN: true }), { minLength: n, maxLength: n }),
            ),
          ),
        ([a, b]) => {
          fc.pre(ss.sampleVariance(a) + ss.sampleVariance(b) > 1e-6);
          expect(welchTTest(a, b).t).toBeCloseTo(ss.tTestTwoSample(a, b, 0) ?? Number.NaN, 6);
        },
      ),
    );
  });

  it("Welch–Satterthwaite df lies between min(n) − 1 and na + nb − 2", () => {
    const r = welchTTest([1, 2, 3, 4, 5, 6, 7, 8], [10, 30, 20]);
    expect(r.df).toBeGreaterThanOrEqual(2);
    expect(r.df).toBeLessThanOrEqual(9);
  });

  it("refuses samples with no spread at all and samples of one", () => {
    expect(() => welchTTest([5, 5, 5], [7, 7])).toThrow(/zero variance/);
    expect(() => welchTTest([5], [7, 8])).toThrow(/^RangeError: a must|a must be an array/);
  });
});

describe("meanConfidenceInterval and compareTreatments", () => {
  it("95 % CI of the sleep group 1 mean: 0.75 ± 2.262 × 1.789/√10 — t table df 9 = 2.262, from memory", () => {
    const ci = meanConfidenceInterval(sleep1);
    expect(ci.tCritical).toBeCloseTo(2.262, 3);
    expect(ci.mean).toBeCloseTo(0.75, 10);
    expect(ci.sd).toBeCloseTo(1.789, 3);
    expect(ci.lower).toBeCloseTo(0.75 - 2.2622 * (1.78901 / Math.sqrt(10)), 3);
    expect(ci.upper).toBeCloseTo(0.75 + 2.2622 * (1.78901 / Math.sqrt(10)), 3);
  });

  it("a 90 % interval is narrower than a 95 % one", () => {
    const w95 = meanConfidenceInterval(sleep2);
    const w90 = meanConfidenceInterval(sleep2, 0.9);
    expect(w90.upper - w90.lower).toBeLessThan(w95.upper - w95.lower);
  });

  it("compares two hybrids: summaries, Welch test and significance at 1 − level", () => {
    const c = compareTreatments([180, 185, 190, 178, 188], [200, 205, 198, 210, 202], {
      labels: ["H1", "H2"],
    });
    expect(c.a.label).toBe("H1");
    expect(c.b.mean).toBeCloseTo(203, 10);
    expect(c.welch.t).toBeLessThan(0);
    expect(c.significant).toBe(true);
    expect(compareTreatments(sleep1, sleep2).significant).toBe(false);
  });
});
