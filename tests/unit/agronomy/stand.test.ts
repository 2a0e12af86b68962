import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { plantsPerAcre, rowLengthForThousandthAcre, splitFeetInches, summarizeStand } from "@/lib/agronomy";
import { SRC } from "./sources";

describe("rowLengthForThousandthAcre", () => {
  it(`30-in rows: 17.42 ft, 17 ft 5 in — ${SRC.standRowLength}`, () => {
    expect(rowLengthForThousandthAcre(30)).toBeCloseTo(17.42, 2);
    expect(splitFeetInches(rowLengthForThousandthAcre(30)).text).toBe("17 ft 5 in");
  });

  it(`15-in rows: 34.85 ft, 34 ft 10 in — ${SRC.standRowLength}`, () => {
    expect(rowLengthForThousandthAcre(15)).toBeCloseTo(34.85, 2);
    expect(splitFeetInches(rowLengthForThousandthAcre(15)).text).toBe("34 ft 10 in");
  });

  it(`equals 522.72 ÷ row spacing in inches — ${SRC.standRowLength}; ${SRC.acreDefinition}`, () => {
    expect(rowLengthForThousandthAcre(20)).toBeCloseTo(26.136, 3);
    expect(rowLengthForThousandthAcre(36)).toBeCloseTo(14.52, 3);
    expect(rowLengthForThousandthAcre(38)).toBeCloseTo(13.756, 3);
  });

  it("extreme row spacings: 120 in is accepted, 0, negative, NaN and above 120 in are RangeErrors", () => {
    expect(rowLengthForThousandthAcre(120)).toBeCloseTo(4.356, 3);
    expect(() => rowLengthForThousandthAcre(0)).toThrow(
      /rowSpacingIn must be a finite number above 0 to 120 in/,
    );
    expect(() => rowLengthForThousandthAcre(-30)).toThrow(RangeError);
    expect(() => rowLengthForThousandthAcre(121)).toThrow(RangeError);
    expect(() => rowLengthForThousandthAcre(Number.NaN)).toThrow(RangeError);
  });
});

describe("plantsPerAcre", () => {
  it(`count in 1/1000 acre × 1000: 32 plants in 17.424 ft of 30-in row = 32,000/acre — ${SRC.standRowLength}`, () => {
    expect(plantsPerAcre(32, 17.424, 30)).toBeCloseTo(32_000, 6);
  });

  it(`count × 43,560 ÷ (row ft × row spacing ft): 30 plants in 20 ft of 15-in row — ${SRC.acreDefinition}`, () => {
    expect(plantsPerAcre(30, 20, 15)).toBeCloseTo(52_272, 6);
  });

  it("0 plants is 0 plants/acre", () => {
    expect(plantsPerAcre(0, 17.42, 30)).toBe(0);
  });

  it("refuses negative counts, zero row length and bad spacing", () => {
    expect(() => plantsPerAcre(-1, 17.42, 30)).toThrow(/plantCount must be a finite number from 0/);
    expect(() => plantsPerAcre(30, 0, 30)).toThrow(/rowLengthFt/);
    expect(() => plantsPerAcre(30, 17.42, -30)).toThrow(/rowSpacingIn/);
    expect(() => plantsPerAcre(Number.NaN, 17.42, 30)).toThrow(RangeError);
  });

  it(`property: counting 1/1000 acre of row always multiplies the count by 1000 — ${SRC.standRowLength}`, () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 100 }),
        fc.double({ min: 5, max: 120, noNaN: true }),
        (count, spacing) => {
          expect(plantsPerAcre(count, rowLengthForThousandthAcre(spacing), spacing)).toBeCloseTo(
            count * 1000,
            6,
          );
        },
      ),
    );
  });
});

describe("summarizeStand", () => {
  it(`means several 1/1000-acre counts and compares with the target — ${SRC.standRowLength}`, () => {
    const s = summarizeStand([30, 32, 34], 17.424, 30, 34_000);
    expect(s.perCount.map((x) => Math.round(x))).toEqual([30_000, 32_000, 34_000]);
    expect(s.meanPlantsPerAcre).toBeCloseTo(32_000, 6);
    expect(s.percentOfTarget).toBeCloseTo((32 / 34) * 100, 6);
    expect(summarizeStand([30], 17.424, 30).percentOfTarget).toBeNull();
    expect(() => summarizeStand([], 17.424, 30)).toThrow(/counts must be a non-empty array/);
  });
});
