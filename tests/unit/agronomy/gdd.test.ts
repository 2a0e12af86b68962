import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { accumulateGdd, dailyGdd, gddSincePlanting, MAX_DAILY_GDD_F } from "@/lib/agronomy";
import { SRC } from "./sources";

describe("dailyGdd", () => {
  it(`80/55 °F gives 17.5 GDD — ${SRC.purdueHeatUnits}`, () => {
    expect(dailyGdd(80, 55)).toBeCloseTo(17.5, 10);
  });

  it(`70/50 °F gives 10 GDD — ${SRC.iowaStateAgron541}`, () => {
    expect(dailyGdd(70, 50, "F")).toBeCloseTo(10, 10);
  });

  it(`the daily maximum is 36 GDD — ${SRC.iowaStateAgron541}`, () => {
    expect(MAX_DAILY_GDD_F).toBe(36);
    expect(dailyGdd(86, 86)).toBeCloseTo(36, 10);
    expect(dailyGdd(104, 95)).toBeCloseTo(36, 10);
  });

  it(`90/55 °F gives 20.5 by the method — arithmetic on ${SRC.purdueHeatUnits}`, () => {
    expect(dailyGdd(90, 55)).toBeCloseTo(20.5, 10);
  });

  describe(`caps at both ends — ${SRC.purdueHeatUnits}`, () => {
    it("Tmax above 86 is set to 86: 95/60 → (86 + 60)/2 − 50 = 23", () => {
      expect(dailyGdd(95, 60)).toBeCloseTo(23, 10);
    });
    it("Tmin below 50 is set to 50: 80/40 → (80 + 50)/2 − 50 = 15", () => {
      expect(dailyGdd(80, 40)).toBeCloseTo(15, 10);
    });
    it("Tmax below 50 is set to 50: a cold day gives 0", () => {
      expect(dailyGdd(45, 30)).toBe(0);
    });
    it("Tmin above 86 is set to 86: 100/90 gives 36", () => {
      expect(dailyGdd(100, 90)).toBeCloseTo(36, 10);
    });
  });

  it(`°C form uses 30/10: 30/10 °C gives 10 °C-GDD and 25/15 °C gives 10 — ${SRC.amsGlossary}`, () => {
    expect(dailyGdd(30, 10, "C")).toBeCloseTo(10, 10);
    expect(dailyGdd(25, 15, "C")).toBeCloseTo(10, 10);
    expect(dailyGdd(40, 35, "C")).toBeCloseTo(20, 10);
    expect(dailyGdd(5, -3, "C")).toBe(0);
  });

  it(`1 °C-GDD = 1.8 °F-GDD: 25/15 °C (77/59 °F) gives 10 °C-GDD and 18 °F-GDD — ${SRC.amsGlossary}`, () => {
    expect(dailyGdd(77, 59, "F")).toBeCloseTo(18, 10);
    expect(dailyGdd(77, 59, "F") / dailyGdd(25, 15, "C")).toBeCloseTo(1.8, 10);
  });

  it(`property: °F-GDD = 1.8 × °C-GDD for the same day — ${SRC.amsGlossary}`, () => {
    fc.assert(
      fc.property(
        fc.double({ min: -40, max: 50, noNaN: true }),
        fc.double({ min: -40, max: 50, noNaN: true }),
        (x, y) => {
          const [lo, hi] = x <= y ? [x, y] : [y, x];
          const f = dailyGdd(hi * 1.8 + 32, lo * 1.8 + 32, "F");
          expect(f).toBeCloseTo(1.8 * dailyGdd(hi, lo, "C"), 8);
        },
      ),
    );
  });

  it(`property: a day always gives 0 to 36 °F-GDD — ${SRC.iowaStateAgron541}`, () => {
    fc.assert(
      fc.property(
        fc.double({ min: -100, max: 150, noNaN: true }),
        fc.double({ min: -100, max: 150, noNaN: true }),
        (x, y) => {
          const g = dailyGdd(Math.max(x, y), Math.min(x, y));
          expect(g).toBeGreaterThanOrEqual(0);
          expect(g).toBeLessThanOrEqual(36);
        },
      ),
    );
  });

  it("refuses Tmin above Tmax with a RangeError naming minTemp", () => {
    expect(() => dailyGdd(60, 70)).toThrow(RangeError);
    expect(() => dailyGdd(60, 70)).toThrow(/minTemp must be at most maxTemp/);
  });

  it("refuses NaN, Infinity, absurd temperatures and unknown units, naming the argument and range", () => {
    expect(() => dailyGdd(Number.NaN, 50)).toThrow(/maxTemp must be a finite number from -100 to 150 °F/);
    expect(() => dailyGdd(80, Number.NaN)).toThrow(/minTemp/);
    expect(() => dailyGdd(Number.POSITIVE_INFINITY, 50)).toThrow(RangeError);
    expect(() => dailyGdd(500, 50)).toThrow(RangeError);
    expect(() => dailyGdd(80, 50, "K" as "F")).toThrow(/unit must be one of 'F', 'C'/);
  });
});

const day = (date: string, maxF: number, minF: number) => ({ date, maxF, minF });

describe("accumulateGdd", () => {
  it(`sorts by date and keeps a running total — arithmetic on ${SRC.purdueHeatUnits}`, () => {
    const out = accumulateGdd([
      day("2025-05-03", 70, 50),
      day("2025-05-01", 80, 55),
      day("2025-05-02", 45, 30),
    ]);
    expect(out.map((d) => d.date)).toEqual(["2025-05-01", "2025-05-02", "2025-05-03"]);
    expect(out.map((d) => d.gddF)).toEqual([17.5, 0, 10]);
    expect(out.map((d) => d.cumulativeGddF)).toEqual([17.5, 17.5, 27.5]);
  });

  it("refuses duplicate dates, impossible dates and a record with min above max", () => {
    expect(() => accumulateGdd([day("2025-05-01", 80, 55), day("2025-05-01", 70, 50)])).toThrow(
      /records\[1\]\.date/,
    );
    expect(() => accumulateGdd([day("2025-02-30", 80, 55)])).toThrow(RangeError);
    expect(() => accumulateGdd([day("5/1/2025", 80, 55)])).toThrow(/YYYY-MM-DD/);
    expect(() => accumulateGdd([day("2025-05-01", 80, 55), day("2025-05-02", 50, 60)])).toThrow(
      /records\[1\]\.minF/,
    );
    expect(() => accumulateGdd([day("2025-05-01", Number.NaN, 55)])).toThrow(/records\[0\]\.maxF/);
  });

  it(`property: accumulation is monotonic non-decreasing and each step is 0–36 — ${SRC.iowaStateAgron541}`, () => {
    const temps = fc
      .tuple(fc.integer({ min: 20, max: 110 }), fc.integer({ min: 0, max: 40 }))
      .map(([max, spread]) => ({ maxF: max, minF: max - spread }));
    fc.assert(
      fc.property(fc.array(temps, { maxLength: 60 }), (list) => {
        const records = list.map((t, i) => ({ date: dateAfter("2025-04-01", i), ...t }));
        const out = accumulateGdd(records);
        let previous = 0;
        for (const d of out) {
          expect(d.gddF).toBeGreaterThanOrEqual(0);
          expect(d.gddF).toBeLessThanOrEqual(36);
          expect(d.cumulativeGddF).toBeGreaterThanOrEqual(previous);
          previous = d.cumulativeGddF;
        }
      }),
    );
  });
});

function dateAfter(iso: string, days: number): string {
  const d = new Date(`${iso}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

describe("gddSincePlanting", () => {
  const records = [
    day("2025-05-01", 80, 55), // 17.5
    day("2025-05-02", 70, 50), // 10
    day("2025-05-03", 90, 60), // 23
    day("2025-05-05", 86, 86), // 36
  ];

  it("planting day counts zero (our convention): GDD on the planting date is 0", () => {
    const r = gddSincePlanting(records, "2025-05-01", "2025-05-01");
    expect(r.gddF).toBe(0);
    expect(r.observedDays).toBe(0);
    expect(r.complete).toBe(true);
  });

  it(`sums the days after planting through the date — arithmetic on ${SRC.purdueHeatUnits}`, () => {
    const r = gddSincePlanting(records, "2025-05-01", "2025-05-03");
    expect(r.gddF).toBeCloseTo(33, 10);
    expect(r).toMatchObject({
      observedDays: 2,
      projectedDays: 0,
      missingDays: 0,
      projected: false,
      complete: true,
    });
  });

  it("a day with no record and no normal counts 0 and makes the result incomplete", () => {
    const r = gddSincePlanting(records, "2025-05-01", "2025-05-05");
    expect(r.gddF).toBeCloseTo(69, 10);
    expect(r).toMatchObject({ observedDays: 3, missingDays: 1, complete: false, projected: false });
  });

  it("normalGddPerDay fills days without records and marks the result projected", () => {
    const r = gddSincePlanting(records, "2025-05-01", "2025-05-08", { normalGddPerDay: 15 });
    // 10 + 23 + 15 (May 4) + 36 + 3 × 15 (May 6–8)
    expect(r.gddF).toBeCloseTo(129, 10);
    expect(r).toMatchObject({
      observedDays: 3,
      projectedDays: 4,
      missingDays: 0,
      projected: true,
      complete: true,
    });
  });

  it("refuses a date before planting and a normal outside 0–36", () => {
    expect(() => gddSincePlanting(records, "2025-05-03", "2025-05-01")).toThrow(/onDate must be on or after/);
    expect(() => gddSincePlanting(records, "2025-05-01", "2025-05-09", { normalGddPerDay: 40 })).toThrow(
      /normalGddPerDay must be a finite number from 0 to 36/,
    );
  });
});
