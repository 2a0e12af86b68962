import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  dateForLeafStage,
  digWindow,
  gddForLeafStage,
  leafCollarsOfStage,
  leafStageFromGdd,
  predictLeafStage,
  stageOnDate,
} from "@/lib/agronomy";
import { SRC } from "./sources";

describe("leafStageFromGdd", () => {
  it(`is 'planted' before VE and VE at 120 GDD (top of 100–120) — ${SRC.purdueLeafStage}`, () => {
    expect(leafStageFromGdd(0)).toEqual({ stage: "planted", leafCollars: 0 });
    expect(leafStageFromGdd(119)).toEqual({ stage: "planted", leafCollars: 0 });
    expect(leafStageFromGdd(120)).toEqual({ stage: "VE", leafCollars: 0 });
  });

  it(`adds one collar per 82 GDD to V10 — ${SRC.purdueLeafStage}`, () => {
    expect(leafStageFromGdd(201)).toEqual({ stage: "VE", leafCollars: 0 });
    expect(leafStageFromGdd(202)).toEqual({ stage: "V1", leafCollars: 1 });
    expect(leafStageFromGdd(120 + 6 * 82)).toEqual({ stage: "V6", leafCollars: 6 });
    expect(leafStageFromGdd(939)).toEqual({ stage: "V9", leafCollars: 9 });
    expect(leafStageFromGdd(940)).toEqual({ stage: "V10", leafCollars: 10 });
  });

  it(`adds about one collar per 50 GDD after V10 — ${SRC.purdueLeafStage}`, () => {
    expect(leafStageFromGdd(989)).toEqual({ stage: "V10", leafCollars: 10 });
    expect(leafStageFromGdd(990)).toEqual({ stage: "V11", leafCollars: 11 });
    expect(leafStageFromGdd(940 + 7 * 50)).toEqual({ stage: "V17", leafCollars: 17 });
  });

  it("stays at VT (18 collars by default) once the last collar is reached: R stages are not modelled", () => {
    expect(leafStageFromGdd(940 + 8 * 50)).toEqual({ stage: "VT", leafCollars: 18 });
    expect(leafStageFromGdd(4000)).toEqual({ stage: "VT", leafCollars: 18 });
    expect(predictLeafStage(4000).atOrPastVT).toBe(true);
  });

  it("refuses negative or NaN GDD", () => {
    expect(() => leafStageFromGdd(-1)).toThrow(/gddSincePlantingF must be a finite number from 0 to 10000/);
    expect(() => leafStageFromGdd(Number.NaN)).toThrow(RangeError);
  });
});

describe("predictLeafStage options", () => {
  it(`VE at 100 GDD when told (bottom of 100–120) — ${SRC.purdueLeafStage}`, () => {
    expect(predictLeafStage(100, { gddToEmergence: 100 }).stage).toBe("VE");
    expect(predictLeafStage(182, { gddToEmergence: 100 }).stage).toBe("V1");
  });

  it(`uses 84 and 56 GDD per leaf when given — ${SRC.iowaStatePmr1009}`, () => {
    const iowa = { gddPerLeafToV10: 84, gddPerLeafAfterV10: 56 };
    expect(predictLeafStage(120 + 84, iowa).stage).toBe("V1");
    expect(predictLeafStage(120 + 84 - 1, iowa).stage).toBe("VE");
    expect(predictLeafStage(120 + 840 + 56, iowa).stage).toBe("V11");
  });

  it("a 20-leaf hybrid reaches VT at 120 + 820 + 10 × 50 GDD", () => {
    expect(predictLeafStage(1439, { finalLeafCount: 20 }).stage).toBe("V19");
    expect(predictLeafStage(1440, { finalLeafCount: 20 })).toMatchObject({ stage: "VT", leafCollars: 20 });
  });

  it("refuses a planting-to-VE value outside 100–120 and a fractional leaf count", () => {
    expect(() => predictLeafStage(50, { gddToEmergence: 90 })).toThrow(
      /gddToEmergence must be a finite number from 100 to 120/,
    );
    expect(() => predictLeafStage(50, { finalLeafCount: 18.5 })).toThrow(
      /finalLeafCount must be a whole number/,
    );
  });
});

describe("leafCollarsOfStage and gddForLeafStage", () => {
  it("reads stage names", () => {
    expect(leafCollarsOfStage("planted")).toBe(0);
    expect(leafCollarsOfStage("VE")).toBe(0);
    expect(leafCollarsOfStage("v4")).toBe(4);
    expect(leafCollarsOfStage("VT")).toBe(18);
    expect(leafCollarsOfStage("VT", 20)).toBe(20);
    expect(() => leafCollarsOfStage("V0")).toThrow(RangeError);
    expect(() => leafCollarsOfStage("V18")).toThrow(/'V1' … 'V17' or 'VT'/);
    expect(() => leafCollarsOfStage("R1")).toThrow(/stage must be/);
  });

  it(`gives the GDD of a stage — ${SRC.purdueLeafStage}`, () => {
    expect(gddForLeafStage("planted")).toBe(0);
    expect(gddForLeafStage("VE")).toBe(120);
    expect(gddForLeafStage("V6")).toBe(612);
    expect(gddForLeafStage("V12")).toBe(1040);
    expect(gddForLeafStage("VT")).toBe(1340);
  });

  it("property: a stage is reached exactly at its GDD and not one GDD before", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 17 }), fc.integer({ min: 100, max: 120 }), (n, ve) => {
        const at = gddForLeafStage(`V${n}`, { gddToEmergence: ve });
        expect(predictLeafStage(at, { gddToEmergence: ve }).leafCollars).toBe(n);
        expect(predictLeafStage(at - 1, { gddToEmergence: ve }).leafCollars).toBe(n - 1);
      }),
    );
  });
});

// Every day 80/60 °F = 20 GDD (arithmetic on the 86/50 method, Purdue).
function warmDays(from: string, count: number) {
  return Array.from({ length: count }, (_, i) => {
    const d = new Date(`${from}T00:00:00Z`);
    d.setUTCDate(d.getUTCDate() + i);
    return { date: d.toISOString().slice(0, 10), maxF: 80, minF: 60 };
  });
}

describe("stageOnDate and dateForLeafStage", () => {
  const records = warmDays("2025-05-01", 60);

  it(`planting day counts 0; six 20-GDD days give VE (120) — ${SRC.purdueLeafStage}`, () => {
    expect(stageOnDate(records, "2025-05-01", "2025-05-01")).toMatchObject({ stage: "planted", gddF: 0 });
    expect(stageOnDate(records, "2025-05-01", "2025-05-06")).toMatchObject({ stage: "planted", gddF: 100 });
    expect(stageOnDate(records, "2025-05-01", "2025-05-07")).toMatchObject({
      stage: "VE",
      gddF: 120,
      projected: false,
    });
  });

  it(`V1 needs 202 GDD: the 11th day after planting — ${SRC.purdueLeafStage}`, () => {
    expect(dateForLeafStage(records, "2025-05-01", "VE")).toMatchObject({ date: "2025-05-07", gddF: 120 });
    expect(dateForLeafStage(records, "2025-05-01", "V1")).toMatchObject({
      date: "2025-05-12",
      gddF: 220,
      projected: false,
    });
    expect(dateForLeafStage(records, "2025-05-01", "planted")?.date).toBe("2025-05-01");
  });

  it("returns null when the records end before the stage and no normal is given", () => {
    expect(dateForLeafStage(warmDays("2025-05-01", 5), "2025-05-01", "V1")).toBeNull();
  });

  it("projects with normalGddPerDay past the last record and says so", () => {
    const short = warmDays("2025-05-02", 5); // 100 GDD by 2025-05-06
    const r = dateForLeafStage(short, "2025-05-01", "V1", { normalGddPerDay: 10 });
    // 100 + 10 per day from 2025-05-07: 202 reached after 11 projected days → 2025-05-17 (210)
    expect(r).toMatchObject({ date: "2025-05-17", gddF: 210, projected: true, complete: true });
    expect(stageOnDate(short, "2025-05-01", "2025-05-17", { normalGddPerDay: 10 })).toMatchObject({
      stage: "V1",
      projected: true,
    });
  });

  it("a gap inside the records counts 0 and is reported as incomplete", () => {
    const gap = warmDays("2025-05-02", 20).filter((d) => d.date !== "2025-05-03");
    const r = dateForLeafStage(gap, "2025-05-01", "VE");
    expect(r).toMatchObject({ date: "2025-05-08", complete: false });
  });
});

describe("digWindow", () => {
  const records = warmDays("2025-05-01", 60);
  const base = { records, plantingDate: "2025-05-01" };

  it(`is before the V1–V6 window at VE — ${SRC.iowaStateRoots}`, () => {
    const w = digWindow({ ...base, date: "2025-05-08" });
    expect(w).toMatchObject({ position: "before", stage: "VE", digNow: false, irrigated: false });
    expect(w.opensOn?.date).toBe("2025-05-12");
  });

  it(`is in the window from V1 to V6 and says dig now before the first irrigation — ${SRC.iowaStateRoots}`, () => {
    const w = digWindow({ ...base, date: "2025-05-20", firstIrrigationDate: "2025-06-15" });
    expect(w).toMatchObject({
      position: "in",
      stage: "V3",
      irrigated: false,
      digNow: true,
      projected: false,
    });
    // V7 at 120 + 7 × 82 = 694 GDD → 35th day (700) = 2025-06-05; last day in the window is the day before.
    expect(w.closesOn?.date).toBe("2025-06-04");
    expect(w.reason).toMatch(/dig now/);
  });

  it("in the window but after the first irrigation: not dig-now", () => {
    const w = digWindow({ ...base, date: "2025-05-20", firstIrrigationDate: "2025-05-18" });
    expect(w).toMatchObject({ position: "in", irrigated: true, digNow: false });
    expect(w.reason).toMatch(/first irrigation has happened/);
  });

  it("is after the window from V7", () => {
    expect(digWindow({ ...base, date: "2025-06-05" })).toMatchObject({ position: "after", stage: "V7" });
    expect(digWindow({ ...base, date: "2025-06-04" })).toMatchObject({ position: "in", stage: "V6" });
  });

  it("projects the window when weather runs out and a normal is given", () => {
    const w = digWindow({
      records: warmDays("2025-05-02", 3),
      plantingDate: "2025-05-01",
      date: "2025-05-04",
      normalGddPerDay: 12,
    });
    expect(w.position).toBe("before");
    expect(w.opensOn?.projected).toBe(true);
    expect(w.projected).toBe(true);
  });

  it("refuses a bad irrigation date", () => {
    expect(() => digWindow({ ...base, date: "2025-05-20", firstIrrigationDate: "June 1" })).toThrow(
      /firstIrrigationDate/,
    );
  });
});
