import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  bushelsToTons,
  CALIFORNIA_SOIL_LB_N_PER_PPM_FT,
  irrigationWaterNitrogen,
  nitrateToNitrateN,
  nitrogenBudget,
  nitrogenNeedFromYieldGoal,
  SILAGE_ADVISER_LB_N_PER_TON,
  soilNitrateCredit,
} from "@/lib/agronomy";
import { SRC } from "./sources";

describe("irrigation water", () => {
  it(`10 ppm NO3-N × 0.227 × 24 acre-in = 54.48 lb N/acre — arithmetic on ${SRC.ucAnrIrrigation}`, () => {
    expect(irrigationWaterNitrogen(10, 24)).toBeCloseTo(54.48, 6);
  });

  it(`44.3 ppm NO3 ÷ 4.43 = 10 ppm NO3-N — ${SRC.ucAnrIrrigation}`, () => {
    expect(nitrateToNitrateN(44.3)).toBeCloseTo(10, 10);
  });

  it(`no water or no nitrate is no credit — ${SRC.ucAnrIrrigation}`, () => {
    expect(irrigationWaterNitrogen(0, 30)).toBe(0);
    expect(irrigationWaterNitrogen(10, 0)).toBe(0);
  });

  it("refuses negative or NaN input", () => {
    expect(() => irrigationWaterNitrogen(-1, 10)).toThrow(/no3nPpm must be a finite number from 0 to 1000/);
    expect(() => irrigationWaterNitrogen(5, Number.NaN)).toThrow(/acreInches/);
  });
});

describe("soil nitrate", () => {
  it(`10 ppm NO3-N in 1 ft ≈ 40 lb N/acre with factor 4 — ${SRC.cdfaSoilNitrate}`, () => {
    expect(soilNitrateCredit(10, 1)).toBeCloseTo(40, 10);
  });

  it(`California guidance factor 3.5 gives 35 — ${SRC.cdfaSoilNitrate}`, () => {
    expect(CALIFORNIA_SOIL_LB_N_PER_PPM_FT).toBe(3.5);
    expect(soilNitrateCredit(10, 1, CALIFORNIA_SOIL_LB_N_PER_PPM_FT)).toBeCloseTo(35, 10);
    expect(soilNitrateCredit(8, 2)).toBeCloseTo(64, 10);
  });

  it("refuses an implausible factor", () => {
    expect(() => soilNitrateCredit(10, 1, 40)).toThrow(/lbNPerPpmPerFt/);
  });
});

describe("need from yield goal", () => {
  it(`200 bu/acre = 5.6 tons at 56 lb/bu — arithmetic (${SRC.commonPractice} for 56 lb/bu)`, () => {
    expect(bushelsToTons(200)).toBeCloseTo(5.6, 10);
  });

  it(`200 bu/acre grain × 24 lb N per ton = 134.4 lb N/acre — ${SRC.cdfaGrain}`, () => {
    expect(nitrogenNeedFromYieldGoal({ crop: "grain", bushelsPerAcre: 200 })).toBeCloseTo(134.4, 6);
  });

  it(`30 tons/acre silage × 7.6 lb N per ton = 228 lb N/acre — ${SRC.cdfaSilage}`, () => {
    expect(nitrogenNeedFromYieldGoal({ crop: "silage", tonsPerAcre: 30 })).toBeCloseTo(228, 6);
  });

  it(`advisers' 10 lb N per ton: about 300 lb N/acre for 30 tons — ${SRC.commonPractice}`, () => {
    expect(
      nitrogenNeedFromYieldGoal({ crop: "silage", tonsPerAcre: 30, lbNPerTon: SILAGE_ADVISER_LB_N_PER_TON }),
    ).toBeCloseTo(300, 6);
  });

  it("refuses an unknown crop and negative yields", () => {
    expect(() => nitrogenNeedFromYieldGoal({ crop: "hay" } as never)).toThrow(
      /goal\.crop must be one of 'grain', 'silage'/,
    );
    expect(() => nitrogenNeedFromYieldGoal({ crop: "grain", bushelsPerAcre: -5 })).toThrow(/bushelsPerAcre/);
  });
});

describe("nitrogenBudget", () => {
  it(`lists each line and the side-dress still needed — ${SRC.cdfaGrain}; ${SRC.cdfaSoilNitrate}; ${SRC.ucAnrIrrigation}`, () => {
    const b = nitrogenBudget({
      yieldGoal: { crop: "grain", bushelsPerAcre: 250 }, // 7 t × 24 = 168
      soilNitrate: [{ no3nPpm: 5, depthFt: 1 }], // 20
      irrigationWater: { no3nPpm: 5, acreInches: 20 }, // 22.7
      previousCropCreditLbN: 10,
      appliedPasses: [
        {
          label: "starter",
          product: { n: 10, p2o5: 34, k2o: 0, lbPerGal: 11.65 },
          rate: 5,
          rateUnit: "gal/ac",
        }, // 5.825
        { label: "preplant", lbNPerAcre: 50 },
      ],
    });
    expect(b.needLbNPerAcre).toBeCloseTo(168, 6);
    expect(b.creditsLbNPerAcre).toBeCloseTo(52.7, 6);
    expect(b.appliedLbNPerAcre).toBeCloseTo(55.825, 6);
    expect(b.sideDressNeededLbNPerAcre).toBeCloseTo(59.475, 6);
    expect(b.surplusLbNPerAcre).toBe(0);
    expect(b.lines.map((l) => l.kind)).toEqual(["need", "credit", "credit", "credit", "applied", "applied"]);
    expect(b.lines.every((l) => l.source.length > 0)).toBe(true);
  });

  it("never returns a negative side-dress: a surplus is reported instead, and the note says so", () => {
    const b = nitrogenBudget({
      yieldGoal: { crop: "silage", tonsPerAcre: 10 }, // 76
      appliedPasses: [{ label: "preplant", lbNPerAcre: 100 }],
    });
    expect(b.sideDressNeededLbNPerAcre).toBe(0);
    expect(b.surplusLbNPerAcre).toBeCloseTo(24, 6);
    expect(b.note).toMatch(/never negative/);
  });

  it("the soil factor is a parameter", () => {
    const b = nitrogenBudget({
      yieldGoal: { crop: "grain", bushelsPerAcre: 200 },
      soilNitrate: [{ no3nPpm: 10, depthFt: 1 }],
      soilLbNPerPpmPerFt: 3.5,
    });
    expect(b.creditsLbNPerAcre).toBeCloseTo(35, 10);
  });

  it("property: side-dress ≥ 0 and side-dress − surplus = need − credits − applied", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 300, noNaN: true }),
        fc.double({ min: 0, max: 50, noNaN: true }),
        fc.double({ min: 0, max: 300, noNaN: true }),
        (bu, ppm, applied) => {
          const b = nitrogenBudget({
            yieldGoal: { crop: "grain", bushelsPerAcre: bu },
            soilNitrate: [{ no3nPpm: ppm, depthFt: 1 }],
            appliedPasses: [{ label: "x", lbNPerAcre: applied }],
          });
          expect(b.sideDressNeededLbNPerAcre).toBeGreaterThanOrEqual(0);
          expect(b.surplusLbNPerAcre).toBeGreaterThanOrEqual(0);
          expect(b.sideDressNeededLbNPerAcre - b.surplusLbNPerAcre).toBeCloseTo(
            b.needLbNPerAcre - b.creditsLbNPerAcre - b.appliedLbNPerAcre,
            8,
          );
        },
      ),
    );
  });

  it("names a bad applied pass", () => {
    expect(() =>
      nitrogenBudget({
        yieldGoal: { crop: "grain", bushelsPerAcre: 200 },
        appliedPasses: [{ label: "x", lbNPerAcre: -3 }],
      }),
    ).toThrow(/appliedPasses\[0\]\.lbNPerAcre/);
  });
});
