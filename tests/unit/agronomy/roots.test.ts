import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  crownDepthScore,
  type DugPlantRoots,
  expectedNodalRoots,
  INJURY_SCORES,
  MESOCOTYL_CONDITIONS,
  rootDevelopmentIndex,
  rootIndexWeights,
  siteRootIndex,
} from "@/lib/agronomy";
import { SRC } from "./sources";

// A plant that meets every expectation of the rubric at V6 (our rubric, no source).
const healthyV6: DugPlantRoots = {
  seminalRootScore: 5,
  nodalWhorls: 3,
  nodalRootCount: 18,
  longestNodalRootIn: 11,
  crownDepthIn: 0.75,
  mesocotyl: "healthy",
  seminalInjury: "none",
  nodalInjury: "none",
};

describe("expected nodal roots for the leaf stage", () => {
  it(`nothing before V1; roots from V1 — ${SRC.iowaStateRoots}; counts ${SRC.ourRubric}`, () => {
    expect(expectedNodalRoots(0)).toEqual({ whorls: 0, roots: 0, longestIn: 0 });
    expect(expectedNodalRoots(1)).toEqual({ whorls: 1, roots: 3, longestIn: 1 });
    expect(expectedNodalRoots(6)).toEqual({ whorls: 3, roots: 18, longestIn: 11 });
    expect(expectedNodalRoots(20)).toEqual({ whorls: 5, roots: 30, longestIn: 24 });
  });
});

describe("crownDepthScore", () => {
  it(`full marks at 3/4 in and across 1/2–1 in — ${SRC.purdueEmergence}`, () => {
    expect(crownDepthScore(0.75)).toBe(1);
    expect(crownDepthScore(0.5)).toBe(1);
    expect(crownDepthScore(1)).toBe(1);
  });

  it(`falls to 0 at the surface and to 0.5 when deep — ${SRC.ourRubric}`, () => {
    expect(crownDepthScore(0)).toBe(0);
    expect(crownDepthScore(0.25)).toBeCloseTo(0.5, 10);
    expect(crownDepthScore(2.5)).toBeCloseTo(0.5, 10);
    expect(crownDepthScore(4)).toBeCloseTo(0.5, 10);
    expect(() => crownDepthScore(-0.1)).toThrow(/crownDepthIn/);
  });
});

describe("rootIndexWeights", () => {
  it(`weight moves from seminal/mesocotyl to nodal between V1 and V6 — ${SRC.iowaStateRoots}; numbers ${SRC.ourRubric}`, () => {
    expect(rootIndexWeights(1)).toEqual({ seminal: 0.4, mesocotyl: 0.3, nodal: 0.15, crown: 0.15 });
    const v6 = rootIndexWeights(6);
    expect(v6.seminal).toBeCloseTo(0.05, 10);
    expect(v6.nodal).toBeCloseTo(0.7, 10);
    expect(rootIndexWeights(3.5).nodal).toBeCloseTo(0.425, 10);
  });

  it("property: weights always sum to 1", () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 26, noNaN: true }), (c) => {
        const w = rootIndexWeights(c);
        expect(w.seminal + w.mesocotyl + w.nodal + w.crown).toBeCloseTo(1, 12);
      }),
    );
  });
});

describe("rootDevelopmentIndex", () => {
  it(`a plant meeting every expectation scores 100 — ${SRC.ourRubric}`, () => {
    expect(rootDevelopmentIndex(healthyV6, 6).index).toBe(100);
    expect(rootDevelopmentIndex({ ...healthyV6, nodalWhorls: 5, nodalRootCount: 40 }, 6).index).toBe(100);
  });

  it(`at V6 a plant with no nodal roots loses the nodal weight (70 points) — ${SRC.iowaStateRoots}; ${SRC.ourRubric}`, () => {
    const r = rootDevelopmentIndex(
      { ...healthyV6, nodalWhorls: 0, nodalRootCount: 0, longestNodalRootIn: 0 },
      6,
    );
    expect(r.index).toBeCloseTo(30, 6);
    expect(r.components.nodal.score).toBe(0);
  });

  it("half the expected nodal development at V6 gives 65", () => {
    const r = rootDevelopmentIndex({ ...healthyV6, nodalRootCount: 9 }, 6);
    // nodal = 0.3 + 0.4 × 0.5 + 0.3 = 0.8 → 100 − 70 × 0.2 = 86
    expect(r.index).toBeCloseTo(86, 6);
  });

  it(`severe nodal injury costs more at V6 than at V1; a severed mesocotyl costs more at V2 than at V8 — ${SRC.iowaStateRoots}`, () => {
    const injured = { ...healthyV6, nodalInjury: "severe" as const };
    const lossV6 = 100 - rootDevelopmentIndex(injured, 6).index;
    const lossV1 =
      100 -
      rootDevelopmentIndex({ ...injured, nodalWhorls: 1, nodalRootCount: 3, longestNodalRootIn: 1 }, 1).index;
    expect(lossV6).toBeCloseTo(49, 6); // 0.7 × (1 − 0.3)
    expect(lossV1).toBeCloseTo(10.5, 6); // 0.15 × (1 − 0.3)
    const severed = {
      ...healthyV6,
      nodalWhorls: 5,
      nodalRootCount: 30,
      longestNodalRootIn: 24,
      mesocotyl: "severed" as const,
    };
    expect(rootDevelopmentIndex(severed, 2).index).toBeCloseTo(74, 6); // loses 0.3 × 0.8 + 0.1 × 0.2
    expect(rootDevelopmentIndex(severed, 8).index).toBeCloseTo(90, 6); // loses 0.1
  });

  it(`a crown at the surface costs the 15 crown points — ${SRC.purdueEmergence}`, () => {
    expect(rootDevelopmentIndex({ ...healthyV6, crownDepthIn: 0 }, 6).index).toBeCloseTo(85, 6);
  });

  it("before V1 nothing nodal is expected, so nodal is not held against the plant", () => {
    const ve = { ...healthyV6, nodalWhorls: 0, nodalRootCount: 0, longestNodalRootIn: 0 };
    expect(rootDevelopmentIndex(ve, 0).index).toBe(100);
  });

  it("refuses unknown categories and impossible counts, naming the field", () => {
    expect(() => rootDevelopmentIndex({ ...healthyV6, mesocotyl: "rotten" as "healthy" }, 4)).toThrow(
      /plant\.mesocotyl must be one of 'healthy', 'discolored', 'damaged', 'severed'/,
    );
    expect(() => rootDevelopmentIndex({ ...healthyV6, nodalWhorls: 2.5 }, 4)).toThrow(
      /plant\.nodalWhorls must be a whole number/,
    );
    expect(() => rootDevelopmentIndex({ ...healthyV6, seminalRootScore: 6 }, 4)).toThrow(/seminalRootScore/);
    expect(() => rootDevelopmentIndex(healthyV6, -1)).toThrow(/leafCollars/);
  });

  const plantArb = fc.record({
    seminalRootScore: fc.double({ min: 0, max: 5, noNaN: true }),
    nodalWhorls: fc.integer({ min: 0, max: 12 }),
    nodalRootCount: fc.integer({ min: 0, max: 120 }),
    longestNodalRootIn: fc.double({ min: 0, max: 60, noNaN: true }),
    crownDepthIn: fc.double({ min: 0, max: 6, noNaN: true }),
    mesocotyl: fc.constantFrom(...MESOCOTYL_CONDITIONS),
    seminalInjury: fc.constantFrom(...INJURY_SCORES),
    nodalInjury: fc.constantFrom(...INJURY_SCORES),
  });

  it("property: the index is always within 0–100", () => {
    fc.assert(
      fc.property(plantArb, fc.integer({ min: 0, max: 18 }), (plant, collars) => {
        const { index } = rootDevelopmentIndex(plant, collars);
        expect(index).toBeGreaterThanOrEqual(0);
        expect(index).toBeLessThanOrEqual(100);
      }),
    );
  });

  it("property: removing nodal injury never lowers the index", () => {
    fc.assert(
      fc.property(plantArb, fc.integer({ min: 0, max: 18 }), (plant, collars) => {
        const healed = rootDevelopmentIndex({ ...plant, nodalInjury: "none" }, collars).index;
        expect(healed).toBeGreaterThanOrEqual(rootDevelopmentIndex(plant, collars).index);
      }),
    );
  });
});

describe("siteRootIndex", () => {
  it("is the mean of the plants' indices", () => {
    const site = siteRootIndex([healthyV6, { ...healthyV6, crownDepthIn: 0 }], 6);
    expect(site.plantIndices).toEqual([100, 85]);
    expect(site.siteIndex).toBeCloseTo(92.5, 6);
    expect(site).toMatchObject({ minIndex: 85, maxIndex: 100 });
  });

  it("refuses an empty dig and names a bad plant by position", () => {
    expect(() => siteRootIndex([], 6)).toThrow(/plants must be a non-empty array/);
    expect(() => siteRootIndex([healthyV6, { ...healthyV6, nodalRootCount: -1 }], 6)).toThrow(
      /plants\[1\]\.nodalRootCount/,
    );
  });
});
