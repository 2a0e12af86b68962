import { describe, expect, it } from "vitest";
import { type DailyTemperature, gddSincePlanting } from "@/lib/agronomy";
import { gddCurve } from "@/lib/weather/gdd-curve";
import { SRC } from "./agronomy/sources";

const day = (date: string, maxF: number, minF: number): DailyTemperature => ({ date, maxF, minF });

describe("gddCurve", () => {
  // 80/55 °F → 17.5 GDD (Purdue worked value); 70/50 → 10 (Iowa State Agron 541 worked value).
  const records = [
    day("2026-05-01", 80, 55),
    day("2026-05-02", 80, 55),
    day("2026-05-03", 70, 50),
    day("2026-05-05", 80, 55),
  ];

  it(`accumulates the days after planting, the planting day counting 0 — ${SRC.purdueHeatUnits}; ${SRC.iowaStateAgron541}`, () => {
    const curve = gddCurve(records, "2026-05-01", "2026-05-03");
    expect(curve.map((p) => [p.date, p.cumulativeGddF, p.projected])).toEqual([
      ["2026-05-01", 0, false],
      ["2026-05-02", 17.5, false],
      ["2026-05-03", 27.5, false],
    ]);
  });

  // A missing day adds nothing unless a normal fills it: our stated rule (README "Method"), common
  // practice, no source.
  it("a day missing between records counts 0 without a normal; the curve stops at the last record", () => {
    const curve = gddCurve(records, "2026-05-01", "2026-05-09");
    expect(curve.map((p) => p.cumulativeGddF)).toEqual([0, 17.5, 27.5, 27.5, 45]);
    expect(curve.at(-1)?.date).toBe("2026-05-05");
  });

  it("past the last record the normal fills each day and the points are marked projected", () => {
    const curve = gddCurve(records, "2026-05-01", "2026-05-07", 12);
    expect(curve.map((p) => [p.date, p.cumulativeGddF, p.projected])).toEqual([
      ["2026-05-01", 0, false],
      ["2026-05-02", 17.5, false],
      ["2026-05-03", 27.5, false],
      ["2026-05-04", 39.5, false],
      ["2026-05-05", 57, false],
      ["2026-05-06", 69, true],
      ["2026-05-07", 81, true],
    ]);
  });

  it(`equals lib/agronomy gddSincePlanting on every day — ${SRC.purdueHeatUnits}`, () => {
    for (const normal of [undefined, 9]) {
      const curve = gddCurve(records, "2026-05-02", "2026-05-10", normal);
      for (const point of curve) {
        const expected = gddSincePlanting(records, "2026-05-02", point.date, { normalGddPerDay: normal });
        expect(point.cumulativeGddF).toBeCloseTo(expected.gddF, 10);
      }
    }
  });

  it("is empty before planting and refuses a normal above 36 GDD a day", () => {
    expect(gddCurve(records, "2026-05-03", "2026-05-01")).toEqual([]);
    expect(() => gddCurve(records, "2026-05-01", "2026-05-09", 40)).toThrow(/normalGddPerDay/);
  });
});
