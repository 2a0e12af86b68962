import { describe, expect, it } from "vitest";
import { gddPanelData } from "@/app/(office)/fields/[fieldId]/_panels/gdd-data";
import { compareHybrids } from "@/app/(office)/fields/[fieldId]/_panels/hybrid-stats";
import { addDays, type DailyTemperature } from "@/lib/agronomy";
import { SRC } from "./agronomy/sources";

// The field page panels' figures: the GDD panel matches the field app's Today screen and the
// published stage thresholds; the hybrid comparison groups digs and words Welch's result.

const field = {
  id: "00000000-0000-4000-8000-000000000001",
  accountId: "00000000-0000-4000-8000-000000000002",
  name: "Test strip",
  firstIrrigationOn: null,
  weatherStationId: "00000000-0000-4000-8000-000000000003",
};

// 80/55 °F every day: 17.5 GDD a day (Purdue worked value).
function warmDays(first: string, count: number): DailyTemperature[] {
  return Array.from({ length: count }, (_, i) => ({ date: addDays(first, i), maxF: 80, minF: 55 }));
}

describe("gddPanelData", () => {
  it(`predicts the stage and the V1–V6 window from 17.5 GDD a day — ${SRC.purdueHeatUnits}; ${SRC.purdueLeafStage}`, () => {
    const plantings = [
      { id: "p1", hybrid: "Strip A 104-day", plantedOn: "2026-04-20" },
      { id: "p2", hybrid: "Strip B 108-day", plantedOn: "2026-04-20" },
    ];
    // 20 days after planting: 20 × 17.5 = 350 GDD → VE at 120, + 82 per collar → V2 (284) not V3 (366).
    const data = gddPanelData(field, plantings, warmDays("2026-04-01", 40), "2026-05-10");
    expect(data.kind).toBe("curve");
    if (data.kind !== "curve") return;
    expect(data.window.stage).toBe("V2");
    expect(data.window.gddF).toBeCloseTo(350, 9);
    // V1 at 120 + 82 = 202 GDD: day 12 (210); V7 at 120 + 7 × 82 = 694: day 40 (700), so the window
    // closes the day before.
    expect(data.v1GddF).toBe(202);
    expect(data.v7GddF).toBe(694);
    expect(data.window.opensOn?.date).toBe("2026-05-02");
    expect(data.window.closesOn?.date).toBe(addDays("2026-05-30", -1));
    expect(data.series).toHaveLength(1);
    expect(data.series[0]?.hybrids).toEqual(["Strip A 104-day", "Strip B 108-day"]);
    const today = data.series[0]?.points.find((p) => p.date === "2026-05-10");
    expect(today).toEqual({ date: "2026-05-10", cumulativeGddF: 350, projected: false });
    // Weather ends May 10; later days are projected at the last two weeks' mean, 17.5.
    const later = data.series[0]?.points.find((p) => p.date === "2026-05-20");
    expect(later?.projected).toBe(true);
    expect(later?.cumulativeGddF).toBeCloseTo(525, 9);
  });

  it("says what is missing: no planting, a planting still to come, no weather", () => {
    expect(gddPanelData(field, [], warmDays("2026-04-01", 5), "2026-05-10").kind).toBe("noPlanting");
    const later = [{ id: "p", hybrid: "H", plantedOn: "2026-06-01" }];
    expect(gddPanelData(field, later, warmDays("2026-04-01", 5), "2026-05-10")).toEqual({
      kind: "notPlantedYet",
      plantedOn: "2026-06-01",
    });
    const now = [{ id: "p", hybrid: "H", plantedOn: "2026-05-01" }];
    expect(gddPanelData(field, now, [], "2026-05-10").kind).toBe("noWeather");
  });
});

describe("compareHybrids", () => {
  it("asks for two hybrids with two digs each", () => {
    expect(
      compareHybrids([
        { hybrid: "A", rootIndex: 70 },
        { hybrid: "A", rootIndex: 72 },
        { hybrid: "B", rootIndex: 60 },
        { hybrid: null, rootIndex: 50 },
        { hybrid: null, rootIndex: 55 },
      ]),
    ).toEqual({ kind: "needMore", hybridsWithReplicates: 1 });
  });

  it("Student's sleep data: Welch p = 0.0794 is not clear at 5 % — R documentation example, from memory", () => {
    const a = [0.7, -1.6, -0.2, -1.2, -0.1, 3.4, 3.7, 0.8, 0.0, 2.0];
    const b = [1.9, 0.8, 1.1, 0.1, -0.1, 4.4, 5.5, 1.6, 4.6, 3.4];
    const result = compareHybrids([
      ...a.map((rootIndex) => ({ hybrid: "A", rootIndex })),
      ...b.map((rootIndex) => ({ hybrid: "B", rootIndex })),
    ]);
    expect(result.kind).toBe("compared");
    if (result.kind !== "compared") return;
    expect(result.summaries.map((s) => [s.hybrid, s.n])).toEqual([
      ["A", 10],
      ["B", 10],
    ]);
    expect(result.summaries[0]?.mean).toBeCloseTo(0.75, 9);
    expect(result.summaries[1]?.mean).toBeCloseTo(2.33, 9);
    const [pair] = result.pairs;
    expect(pair?.welch?.t).toBeCloseTo(-1.8608, 3);
    expect(pair?.welch?.df).toBeCloseTo(17.776, 2);
    expect(pair?.welch?.p).toBeCloseTo(0.0794, 3);
    expect(pair?.clear).toBe(false);
    expect(result.smallN).toBe(false);
  });

  // A wide gap with small spread gives p far below 0.05, and equal values give zero variance, for which
  // Welch's t is undefined (its definition; common practice, no source).
  it("a wide gap with little spread is clear; pairs of three hybrids; identical values cannot be tested", () => {
    const result = compareHybrids([
      { hybrid: "A", rootIndex: 80 },
      { hybrid: "A", rootIndex: 82 },
      { hybrid: "A", rootIndex: 81 },
      { hybrid: "B", rootIndex: 50 },
      { hybrid: "B", rootIndex: 52 },
      { hybrid: "B", rootIndex: 51 },
      { hybrid: "C", rootIndex: 60 },
      { hybrid: "C", rootIndex: 60 },
    ]);
    expect(result.kind).toBe("compared");
    if (result.kind !== "compared") return;
    expect(result.pairs.map((p) => [p.a, p.b, p.clear])).toEqual([
      ["A", "B", true],
      ["A", "C", true],
      ["B", "C", true],
    ]);
    expect(result.pairs[0]?.difference).toBeCloseTo(30, 9);
    expect(result.smallN).toBe(true);
    const flat = compareHybrids([
      { hybrid: "A", rootIndex: 60 },
      { hybrid: "A", rootIndex: 60 },
      { hybrid: "B", rootIndex: 60 },
      { hybrid: "B", rootIndex: 60 },
    ]);
    expect(flat.kind === "compared" && flat.pairs[0]).toMatchObject({ welch: null, clear: false });
  });
});
