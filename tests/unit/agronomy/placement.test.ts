import { describe, expect, it } from "vitest";
import { auditPlacement, DEFAULT_2X2_OFFSETS, type FertilizerPass, findProduct } from "@/lib/agronomy";
import { SRC } from "./sources";

function product(id: string) {
  const p = findProduct(id);
  if (!p) throw new Error(`missing product ${id}`);
  return p;
}

const app = product("ammonium-polyphosphate-10-34-0");
const base = { rowSpacingIn: 30, soil: "medium" as const, rateUnit: "gal/ac" as const };
const codes = (pass: FertilizerPass, options = {}) => auditPlacement(pass, options).map((f) => f.code);

describe("auditPlacement: seed-placed", () => {
  it(`5 gal/ac of 10-34-0 (5.8 lb N) in 30-in rows on medium soil is within the 8 lb limit — ${SRC.kStateStarter}`, () => {
    const findings = auditPlacement({ ...base, placement: "seed_placed", product: app, rate: 5 });
    expect(findings.map((f) => f.code)).toEqual(["seed_placed_within_limit"]);
    expect(findings[0]?.numbers.limit).toEqual({ value: 8, unit: "lb/acre" });
    expect(findings[0]?.numbers.nPlusK2o?.value).toBeCloseTo(5.825, 6);
  });

  it(`6 gal/ac (7.0 lb N, 87 % of the limit) is a caution — ${SRC.kStateStarter}; 80 % threshold is our judgement`, () => {
    const findings = auditPlacement({ ...base, placement: "seed_placed", product: app, rate: 6 });
    expect(findings[0]).toMatchObject({ code: "seed_placed_near_limit", severity: "caution" });
  });

  it(`7 gal/ac (8.2 lb N) is over the limit: warning — ${SRC.kStateStarter}`, () => {
    const findings = auditPlacement({ ...base, placement: "seed_placed", product: app, rate: 7 });
    expect(findings[0]).toMatchObject({ code: "seed_placed_over_limit", severity: "warning" });
    expect(findings[0]?.message).toMatch(/over the 8 lb\/acre limit/);
  });

  it("more than 1.5× the limit is critical (our judgement)", () => {
    const findings = auditPlacement({ ...base, placement: "seed_placed", product: app, rate: 11 });
    expect(findings[0]).toMatchObject({ code: "seed_placed_over_limit", severity: "critical" });
  });

  it(`sandy soil lowers the limit to 6: 5.8 lb N is then near it — ${SRC.kStateStarter}`, () => {
    expect(codes({ ...base, soil: "coarse", placement: "seed_placed", product: app, rate: 5 })).toContain(
      "seed_placed_near_limit",
    );
  });

  it(`UAN with the seed is critical (ammonia injury) — ${SRC.kStateStarter}`, () => {
    const findings = auditPlacement({
      ...base,
      placement: "seed_placed",
      product: product("uan-32"),
      rate: 1,
    });
    expect(findings[0]).toMatchObject({ code: "seed_placed_urea", severity: "critical" });
    expect(findings[0]?.message).toMatch(/ammonia/);
  });

  it(`ammonium thiosulfate with the seed is critical — ${SRC.kStateStarter}`, () => {
    const findings = auditPlacement({
      ...base,
      placement: "seed_placed",
      product: product("ammonium-thiosulfate-12-0-0-26s"),
      rate: 0.5,
    });
    expect(findings.map((f) => f.code)).toContain("seed_placed_thiosulfate");
    expect(findings[0]?.severity).toBe("critical");
  });

  it(`reports seedbed utilization when the spread width is known — ${SRC.manitobaSbu}`, () => {
    const findings = auditPlacement({
      ...base,
      placement: "seed_placed",
      product: app,
      rate: 3,
      spreadWidthIn: 1.5,
    });
    const sbu = findings.find((f) => f.code === "seedbed_utilization");
    expect(sbu?.numbers.sbu?.value).toBeCloseTo(5, 10);
  });

  it(`reports salt load for a product with a salt index — ${SRC.rader1943}`, () => {
    const findings = auditPlacement({
      rowSpacingIn: 30,
      soil: "medium",
      placement: "seed_placed",
      product: product("diammonium-phosphate-18-46-0"),
      rate: 20,
      rateUnit: "lb/ac",
    });
    expect(findings.find((f) => f.code === "salt_load")?.numbers.saltLoad?.value).toBeCloseTo(6.84, 2);
  });
});

describe("auditPlacement: 2x2", () => {
  const pass: FertilizerPass = { ...base, placement: "band_2x2", product: product("uan-32"), rate: 10 };

  it(`defaults to 2 in beside and 2 in below the seed — ${SRC.kStateStarter}`, () => {
    expect(DEFAULT_2X2_OFFSETS).toEqual({ besideIn: 2, belowIn: 2 });
    expect(codes({ ...pass, measured: { besideIn: 2.5, belowIn: 1.5 } })).toEqual(["band_rate"]);
  });

  it(`a band measured within 1 in of the seed is a burn risk (critical) — tolerance ${SRC.commonPractice}`, () => {
    const findings = auditPlacement({ ...pass, measured: { besideIn: 0.5, belowIn: 0.5 } });
    expect(findings[0]).toMatchObject({ code: "band_near_seed", severity: "critical" });
    expect(findings[0]?.numbers.measuredDistance?.value).toBeCloseTo(Math.SQRT1_2, 10);
    expect(findings.map((f) => f.code)).toContain("shifted_knife");
  });

  it(`a knife 1.5 in off its intended 2 in beside is a shifted knife with both values and the difference — ${SRC.commonPractice}`, () => {
    const findings = auditPlacement({ ...pass, measured: { besideIn: 3.5, belowIn: 2 } });
    const shifted = findings.find((f) => f.code === "shifted_knife");
    expect(shifted?.severity).toBe("warning");
    expect(shifted?.numbers.intendedBeside?.value).toBe(2);
    expect(shifted?.numbers.measuredBeside?.value).toBe(3.5);
    expect(shifted?.numbers.differenceBeside?.value).toBeCloseTo(1.5, 10);
    expect(shifted?.message).toMatch(/1\.5 in farther from the row/);
  });

  it("the shift tolerance is a parameter (default 1 in)", () => {
    expect(
      codes({ ...pass, measured: { besideIn: 3.5, belowIn: 2 } }, { shiftToleranceIn: 2 }),
    ).not.toContain("shifted_knife");
    expect(codes({ ...pass, measured: { besideIn: 3, belowIn: 2 } })).not.toContain("shifted_knife");
    expect(codes({ ...pass, measured: { besideIn: 2, belowIn: 0.9 } })).toContain("shifted_knife");
  });

  it("a band set up within the burn distance is a warning before anyone digs", () => {
    expect(codes({ ...pass, intended: { besideIn: 0.5, belowIn: 0.5 } })).toContain("band_planned_near_seed");
  });
});

describe("auditPlacement: side-dress and broadcast", () => {
  const pass: FertilizerPass = { ...base, placement: "side_dress", product: product("uan-28"), rate: 20 };

  it(`a side-dress band under 4 in beside the row is a warning — ${SRC.commonPractice}`, () => {
    const findings = auditPlacement({ ...pass, intended: { besideIn: 3, belowIn: 0 } });
    expect(findings[0]).toMatchObject({ code: "side_dress_near_row", severity: "warning" });
  });

  it("found within 1 in of the row it is critical, with the shift reported too", () => {
    const findings = auditPlacement({
      ...pass,
      intended: { besideIn: 8, belowIn: 2 },
      measured: { besideIn: 0.75, belowIn: 2 },
    });
    expect(findings[0]).toMatchObject({ code: "side_dress_near_row", severity: "critical" });
    expect(findings.find((f) => f.code === "shifted_knife")?.numbers.differenceBeside?.value).toBeCloseTo(
      -7.25,
      10,
    );
  });

  it("a side-dress band well away from the row raises nothing", () => {
    expect(auditPlacement({ ...pass, intended: { besideIn: 15, belowIn: 3 } })).toEqual([]);
  });

  it("broadcast passes have no placement findings", () => {
    expect(auditPlacement({ ...base, placement: "broadcast", product: app, rate: 10 })).toEqual([]);
  });

  it("findings come most severe first", () => {
    const severities = auditPlacement({
      ...base,
      placement: "seed_placed",
      product: product("uan-32"),
      rate: 5,
      spreadWidthIn: 1,
    }).map((f) => f.severity);
    const rank = { info: 0, caution: 1, warning: 2, critical: 3 };
    for (let i = 1; i < severities.length; i++) {
      expect(rank[severities[i - 1] ?? "info"]).toBeGreaterThanOrEqual(rank[severities[i] ?? "info"]);
    }
  });

  it("refuses an unknown placement, soil or offsets", () => {
    expect(() => auditPlacement({ ...pass, placement: "foliar" as "broadcast" })).toThrow(
      /placement must be one of/,
    );
    expect(() => auditPlacement({ ...pass, soil: "clay" as "fine" })).toThrow(/soil must be one of/);
    expect(() => auditPlacement({ ...pass, measured: { besideIn: -1, belowIn: 2 } })).toThrow(
      /measured\.besideIn/,
    );
    expect(() => auditPlacement(pass, { shiftToleranceIn: -1 })).toThrow(/shiftToleranceIn/);
  });
});
