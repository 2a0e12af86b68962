import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  findProduct,
  nutrientsPer100FtOfRow,
  nutrientsPerAcre,
  productLbPerAcre,
  rowFeetPerAcre,
  saltLoad,
  seedbedUtilizationPercent,
  seedPlacedCheck,
  seedPlacedLimit,
} from "@/lib/agronomy";
import { SRC } from "./sources";

const app = { n: 10, p2o5: 34, k2o: 0, lbPerGal: 11.65 };

describe("nutrientsPerAcre", () => {
  it(`5 gal/ac of 10-34-0 at 11.65 lb/gal = 58.25 lb: 5.825 N, 19.805 P2O5 — density ${SRC.industrySheet}; arithmetic`, () => {
    const r = nutrientsPerAcre(app, 5, "gal/ac");
    expect(r.n).toBeCloseTo(5.825, 6);
    expect(r.p2o5).toBeCloseTo(19.805, 6);
    expect(r.k2o).toBe(0);
    expect(r.s).toBe(0);
  });

  it(`10 gal/ac of UAN-28 at 10.67 lb/gal = 29.88 lb N — density ${SRC.vceDensity}; arithmetic`, () => {
    expect(nutrientsPerAcre({ n: 28, p2o5: 0, k2o: 0, lbPerGal: 10.67 }, 10, "gal/ac").n).toBeCloseTo(
      29.876,
      6,
    );
  });

  it("100 lb/ac of 18-46-0 gives 18 lb N and 46 lb P2O5; ammonium sulfate carries S", () => {
    expect(nutrientsPerAcre({ n: 18, p2o5: 46, k2o: 0 }, 100, "lb/ac")).toEqual({
      n: 18,
      p2o5: 46,
      k2o: 0,
      s: 0,
    });
    expect(nutrientsPerAcre({ n: 21, p2o5: 0, k2o: 0, s: 24 }, 50, "lb/ac").s).toBeCloseTo(12, 10);
  });

  it("keeps density a property of the product: 11.4 lb/gal gives a different answer", () => {
    expect(nutrientsPerAcre({ ...app, lbPerGal: 11.4 }, 5, "gal/ac").n).toBeCloseTo(5.7, 6);
  });

  it("refuses a grade over 100 %, a negative rate, a gal/ac rate without density and unknown units", () => {
    expect(() => nutrientsPerAcre({ n: 120, p2o5: 0, k2o: 0 }, 1, "lb/ac")).toThrow(
      /product\.n must be a finite number from 0 to 100 %/,
    );
    expect(() => nutrientsPerAcre({ n: 10, p2o5: -1, k2o: 0 }, 1, "lb/ac")).toThrow(/product\.p2o5/);
    expect(() => nutrientsPerAcre(app, -5, "gal/ac")).toThrow(
      /rate must be a finite number from 0 to 1000 gal\/ac/,
    );
    expect(() => nutrientsPerAcre({ n: 10, p2o5: 34, k2o: 0 }, 5, "gal/ac")).toThrow(/product\.lbPerGal/);
    expect(() => nutrientsPerAcre(app, 5, "L/ha" as "lb/ac")).toThrow(
      /rateUnit must be one of 'lb\/ac', 'gal\/ac'/,
    );
    expect(() => nutrientsPerAcre(app, Number.NaN, "lb/ac")).toThrow(RangeError);
  });

  it("productLbPerAcre is the rate itself for lb/ac", () => {
    expect(productLbPerAcre(app, 80, "lb/ac")).toBe(80);
  });
});

describe("per 100 ft of row", () => {
  it(`an acre of 30-in rows has 17,424 ft of row — ${SRC.standRowLength}`, () => {
    expect(rowFeetPerAcre(30)).toBeCloseTo(17_424, 6);
  });

  it("10 lb N/acre in 30-in rows is 0.0574 lb N per 100 ft of row (arithmetic)", () => {
    const r = nutrientsPer100FtOfRow({ n: 100, p2o5: 0, k2o: 0 }, 10, "lb/ac", 30);
    expect(r.n).toBeCloseTo(10 / 174.24, 8);
  });
});

describe("salt load and seedbed utilization", () => {
  it(`100 lb/ac of potassium chloride (salt index 116.3) ≈ 116.3 lb sodium-nitrate equivalent — ${SRC.rader1943}`, () => {
    const kcl = findProduct("potassium-chloride-0-0-60");
    const r = kcl ? saltLoad(kcl, 100, "lb/ac", 30) : null;
    expect(r?.sodiumNitrateEquivalentLbPerAcre).toBeCloseTo(116.3, 1);
    expect(r?.sodiumNitrateEquivalentLbPer100Ft).toBeCloseTo(116.3 / 174.24, 4);
  });

  it("salt load is null when the salt index is unknown", () => {
    expect(saltLoad(app, 5, "gal/ac")).toBeNull();
  });

  it(`SBU = spread width ÷ row spacing × 100: 1 in in 30-in rows = 3.33 % — ${SRC.manitobaSbu}`, () => {
    expect(seedbedUtilizationPercent(1, 30)).toBeCloseTo(3.33, 2);
    expect(seedbedUtilizationPercent(3, 12)).toBeCloseTo(25, 10);
    expect(() => seedbedUtilizationPercent(31, 30)).toThrow(/spreadWidthIn/);
  });
});

describe("seedPlacedCheck", () => {
  const cells: [number, "coarse" | "medium" | "fine", number][] = [
    [20, "coarse", 8],
    [20, "medium", 12],
    [20, "fine", 12],
    [30, "coarse", 6],
    [30, "medium", 8],
    [30, "fine", 8],
    [40, "coarse", 4],
    [40, "medium", 6],
    [40, "fine", 6],
  ];
  for (const [rows, soil, limit] of cells) {
    it(`${rows}-in rows, ${soil} soil: limit ${limit} lb N + K2O/acre — ${SRC.kStateStarter}`, () => {
      const atLimit = seedPlacedCheck({ n: limit / 2, k2o: limit / 2, rowSpacingIn: rows, soil });
      expect(atLimit.limitLbPerAcre).toBe(limit);
      expect(atLimit.safe).toBe(true);
      const over = seedPlacedCheck({ n: limit, k2o: 0.5, rowSpacingIn: rows, soil });
      expect(over.safe).toBe(false);
      expect(over.reasons[0]).toMatch(/over the/);
    });
  }

  it(`urea or UAN with the seed is unsafe at any rate (ammonia injury) — ${SRC.kStateStarter}`, () => {
    const r = seedPlacedCheck({ n: 2, k2o: 0, rowSpacingIn: 30, soil: "medium", urea: true });
    expect(r.safe).toBe(false);
    expect(r.reasons.join(" ")).toMatch(/ammonia/);
  });

  it(`thiosulfate with the seed is unsafe — ${SRC.kStateStarter}`, () => {
    const r = seedPlacedCheck({ n: 2, k2o: 0, rowSpacingIn: 30, soil: "fine", thiosulfate: true });
    expect(r.safe).toBe(false);
    expect(r.reasons.join(" ")).toMatch(/thiosulfate/);
  });

  it(`other spacings, medium/fine: limit = 8 × 30 ÷ row spacing — ${SRC.ourRule}, from ${SRC.kStateStarter}`, () => {
    expect(seedPlacedCheck({ n: 1, k2o: 0, rowSpacingIn: 25, soil: "medium" }).limitLbPerAcre).toBeCloseTo(
      9.6,
      10,
    );
    expect(seedPlacedCheck({ n: 1, k2o: 0, rowSpacingIn: 36, soil: "fine" }).limitLbPerAcre).toBeCloseTo(
      6.667,
      3,
    );
    expect(seedPlacedCheck({ n: 1, k2o: 0, rowSpacingIn: 15, soil: "medium" }).limitLbPerAcre).toBeCloseTo(
      16,
      10,
    );
    expect(seedPlacedCheck({ n: 1, k2o: 0, rowSpacingIn: 25, soil: "medium" }).reasons[0]).toMatch(
      /Our rule/,
    );
  });

  it(`other spacings, sandy: per-foot interpolation (25 in → 170 ÷ 25 = 6.8) and per-foot hold outside 20–40 in — ${SRC.ourRule}`, () => {
    expect(seedPlacedLimit(25, "coarse")).toMatchObject({ limitLbPerAcre: 6.8, basis: "interpolated" });
    expect(seedPlacedLimit(15, "coarse").limitLbPerAcre).toBeCloseTo(160 / 15, 10);
    expect(seedPlacedLimit(60, "coarse")).toMatchObject({ basis: "extrapolated" });
    expect(seedPlacedLimit(60, "coarse").limitLbPerAcre).toBeCloseTo(160 / 60, 10);
    expect(seedPlacedLimit(7.5, "medium").limitLbPerAcre).toBeCloseTo(32, 10);
  });

  it("property: the limit is continuous in row spacing (no jump across 20, 30 or 40 in)", () => {
    fc.assert(
      fc.property(
        fc.constantFrom(20, 30, 40),
        fc.constantFrom("coarse", "medium", "fine" as const),
        (s, soil) => {
          const at = seedPlacedLimit(s, soil).limitLbPerAcre;
          expect(seedPlacedLimit(s - 1e-7, soil).limitLbPerAcre).toBeCloseTo(at, 5);
          expect(seedPlacedLimit(s + 1e-7, soil).limitLbPerAcre).toBeCloseTo(at, 5);
        },
      ),
    );
  });

  it("refuses unknown soil, spacing outside 7.5–60 in and NaN rates", () => {
    expect(() => seedPlacedCheck({ n: 1, k2o: 1, rowSpacingIn: 30, soil: "loam" as "medium" })).toThrow(
      /soil must be one of 'coarse', 'medium', 'fine'/,
    );
    expect(() => seedPlacedCheck({ n: 1, k2o: 1, rowSpacingIn: 7, soil: "medium" })).toThrow(
      /rowSpacingIn must be a finite number from 7.5 to 60 in/,
    );
    expect(() => seedPlacedCheck({ n: 1, k2o: 1, rowSpacingIn: -30, soil: "medium" })).toThrow(RangeError);
    expect(() => seedPlacedCheck({ n: Number.NaN, k2o: 1, rowSpacingIn: 30, soil: "medium" })).toThrow(
      /^n must/,
    );
  });
});
