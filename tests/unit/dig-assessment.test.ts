import { describe, expect, it } from "vitest";
import { assessDig, findProduct, rootDevelopmentIndex } from "@/lib/agronomy";
import {
  type AssessmentPass,
  type AssessmentPlant,
  type AssessmentProduct,
  assessLocalDig,
  assessmentInputFor,
  digDay,
  siteLeafCollars,
} from "@/lib/digs/assessment";
import { SRC } from "./agronomy/sources";

const FIELD = "11111111-1111-4111-8111-111111111111";
const OTHER_FIELD = "22222222-2222-4222-8222-222222222222";
const PLANTING = "33333333-3333-4333-8333-333333333333";
const OTHER_PLANTING = "44444444-4444-4444-8444-444444444444";
const APP_ID = "55555555-5555-4555-8555-555555555555";

function catalog(slug: string, id: string): AssessmentProduct {
  const p = findProduct(slug);
  if (!p) throw new Error(`missing product ${slug}`);
  return { ...p, id };
}
// Ammonium polyphosphate 10-34-0 at 11.65 lb/gal (VCE SPES-199NP).
const app = catalog("ammonium-polyphosphate-10-34-0", APP_ID);

const site = { fieldId: FIELD, plantingId: PLANTING, dugAt: "2026-05-01T10:30:00-07:00" };
const planting = { id: PLANTING, rowSpacingIn: 30, soilTexture: "coarse" as const };

const healthy: AssessmentPlant = {
  leafStage: "V3",
  seedingDepthIn: 1.75,
  crownDepthIn: 0.75,
  mesocotyl: "healthy",
  seminalScore: 5,
  nodalWhorls: 2,
  nodalCount: 9,
  longestNodalIn: 5,
  seminalInjury: "none",
  nodalInjury: "none",
  findings: [],
  bandBesideIn: null,
  bandBelowIn: null,
};

const pass = (over: Partial<AssessmentPass>): AssessmentPass => ({
  fieldId: FIELD,
  plantingId: PLANTING,
  productId: APP_ID,
  appliedOn: "2026-04-06",
  rate: 7,
  rateUnit: "gal/ac",
  placement: "seed_placed",
  intendedBesideIn: null,
  intendedBelowIn: null,
  ...over,
});

describe("assessmentInputFor", () => {
  it(`7 gal/ac of 10-34-0 with the seed in 30-in rows on sandy soil is audited against the 6 lb N + K2O limit — ${SRC.kStateStarter}; density ${SRC.vceDensity}`, () => {
    const input = assessmentInputFor(site, [healthy], planting, [pass({})], [app]);
    expect(input.passes).toHaveLength(1);
    expect(input.passes?.[0]).toMatchObject({
      rowSpacingIn: 30,
      soil: "coarse",
      rate: 7,
      rateUnit: "gal/ac",
    });
    const result = assessDig(input);
    const over = result.audit.find((f) => f.code === "seed_placed_over_limit");
    expect(over?.numbers.limit).toEqual({ value: 6, unit: "lb/acre" });
    // 7 gal × 11.65 lb/gal × 10 % N = 8.155 lb N, no K2O (arith).
    expect(over?.numbers.nPlusK2o?.value).toBeCloseTo(8.155, 6);
  });

  it("the site's stage is the median of the plants' leaf stages, the lower middle for an even count (our rule)", () => {
    const at = (leafStage: string) => ({ ...healthy, leafStage });
    expect(siteLeafCollars([at("V2"), at("V4"), at("V3")])).toBe(3);
    expect(siteLeafCollars([at("V2"), at("V5")])).toBe(2);
    expect(siteLeafCollars([at("VE")])).toBe(0);
    expect(assessmentInputFor(site, [at("V4"), at("V2"), at("V5")], planting, [], []).stage).toBe("V4");
    expect(assessmentInputFor(site, [at("VE")], planting, [], []).stage).toBe("VE");
  });

  it("takes the passes of this field for this planting or the whole field, applied on or before the dig's day", () => {
    const passes = [
      pass({ appliedOn: "2026-05-01", rate: 1 }), // the dig's day: counted
      pass({ appliedOn: "2026-05-02", rate: 2 }), // after the dig
      pass({ plantingId: null, rate: 3 }), // whole field
      pass({ plantingId: OTHER_PLANTING, rate: 4 }), // the other hybrid strip
      pass({ fieldId: OTHER_FIELD, rate: 5 }),
      pass({ productId: "66666666-6666-4666-8666-666666666666", rate: 6 }), // not in the catalog
    ];
    const input = assessmentInputFor(site, [healthy], planting, passes, [app]);
    expect(input.passes?.map((p) => p.rate)).toEqual([1, 3]);
  });

  it("the dig's day is the date in the offset it was recorded with, not UTC", () => {
    expect(digDay("2026-05-01T23:30:00-07:00")).toBe("2026-05-01");
    const late = { ...site, dugAt: "2026-05-01T23:30:00-07:00" };
    const input = assessmentInputFor(late, [healthy], planting, [pass({ appliedOn: "2026-05-02" })], [app]);
    expect(input.passes).toEqual([]);
    expect(() => digDay("yesterday")).toThrow(RangeError);
  });

  it("without a planting no pass can be audited (no row spacing or soil)", () => {
    expect(
      assessmentInputFor({ ...site, plantingId: null }, [healthy], null, [pass({})], [app]).passes,
    ).toEqual([]);
  });

  it(`measured band offsets (mean of plants with both) go to 2x2 and side-dress passes only; 2 in × 2 in is the intended 2x2 — ${SRC.kStateStarter}`, () => {
    const plants = [
      { ...healthy, bandBesideIn: 0.5, bandBelowIn: 2 },
      { ...healthy, bandBesideIn: 0.75, bandBelowIn: 2.5 },
      { ...healthy, bandBesideIn: 3, bandBelowIn: null }, // one offset only: left out of the mean
      healthy,
    ];
    const passes = [
      pass({ placement: "band_2x2", rate: 5, intendedBesideIn: 2, intendedBelowIn: 2 }),
      pass({ placement: "seed_placed", rate: 3 }),
    ];
    const input = assessmentInputFor(site, plants, planting, passes, [app]);
    expect(input.passes?.[0]?.measured).toEqual({ besideIn: 0.63, belowIn: 2.25 }); // (0.5+0.75)/2 = 0.625 → 0.63
    expect(input.passes?.[0]?.intended).toEqual({ besideIn: 2, belowIn: 2 });
    expect(input.passes?.[1]?.measured).toBeNull();
    // Found 0.63 in beside against 2 in intended: more than the 1 in tolerance (common practice, no source).
    const codes = assessDig(input).audit.map((f) => f.code);
    expect(codes).toContain("shifted_knife");
  });

  it("seeding depth is the mean of the measured plants, 2 decimals; null when none measured", () => {
    const plants = [
      { ...healthy, seedingDepthIn: 1 },
      { ...healthy, seedingDepthIn: 1.5 },
      { ...healthy, seedingDepthIn: null },
    ];
    expect(assessmentInputFor(site, plants, planting, [], []).seedingDepthIn).toBe(1.25);
    expect(
      assessmentInputFor(site, [{ ...healthy, seedingDepthIn: null }], planting, [], []).seedingDepthIn,
    ).toBeNull();
  });

  it("maps each recorded measurement to the root index's input, burn from the band_burn finding", () => {
    const recorded: AssessmentPlant = {
      ...healthy,
      leafStage: "V4",
      seminalScore: 3,
      nodalWhorls: 1,
      nodalCount: 6,
      longestNodalIn: 4,
      crownDepthIn: 0.4,
      mesocotyl: "discolored",
      seminalInjury: "moderate",
      nodalInjury: "slight",
      findings: ["band_burn", "insect_feeding"],
    };
    const input = assessmentInputFor(site, [recorded], planting, [], []);
    expect(input.plants).toEqual([
      {
        seminalRootScore: 3,
        nodalWhorls: 1,
        nodalRootCount: 6,
        longestNodalRootIn: 4,
        crownDepthIn: 0.4,
        mesocotyl: "discolored",
        seminalInjury: "moderate",
        nodalInjury: "slight",
        burnSeen: true,
      },
    ]);
  });

  it("leaves out plants missing a root measurement and refuses a dig with none to score", () => {
    const partial = { ...healthy, nodalCount: null };
    expect(assessmentInputFor(site, [healthy, partial], planting, [], []).plants).toHaveLength(1);
    expect(() => assessmentInputFor(site, [partial], planting, [], [])).toThrow(RangeError);
  });
});

describe("assessLocalDig", () => {
  it(`burn on the roots with seed-placed starter over the limit is critical and sent for review — ${SRC.kStateStarter}; review rule ${SRC.ourRule}`, () => {
    const burnt = { ...healthy, findings: ["band_burn"], seminalInjury: "moderate" as const };
    const local = assessLocalDig(site, [burnt, burnt, healthy], planting, [pass({})], [app]);
    expect(local.error).toBeNull();
    const codes = local.assessment?.flags.map((f) => f.code);
    expect(codes).toContain("seed_placed_over_limit");
    expect(codes).toContain("root_burn_seen");
    expect(codes).toContain("burn_with_placement_problem");
    expect(local.assessment?.flagForReview.flag).toBe(true);
    expect(local.assessment?.flags[0]?.severity).toBe("critical");
  });

  it("a healthy dig with no passes raises no flag and is not sent for review (our rubric)", () => {
    const local = assessLocalDig(site, [healthy, healthy], planting, [], []);
    expect(local.assessment?.flags).toEqual([]);
    expect(local.assessment?.flagForReview.flag).toBe(false);
  });

  it(`each scored plant's index is the core's root development index at the site's stage — ${SRC.ourRubric}`, () => {
    const weak = { ...healthy, seminalScore: 2, seminalInjury: "severe" as const };
    const partial = { ...healthy, crownDepthIn: null, mesocotyl: null };
    const local = assessLocalDig(site, [healthy, partial, weak], planting, [], []);
    expect(local.scoredPlants).toEqual([0, 2]);
    expect(local.unscoredPlants).toEqual([{ index: 1, missing: ["crownDepthIn", "mesocotyl"] }]);
    const input = assessmentInputFor(site, [healthy, weak], planting, [], []);
    const expected = input.plants.map((p) => rootDevelopmentIndex(p, 3).index);
    expect(local.assessment?.plants.map((p) => p.index)).toEqual(expected);
    expect(expected[0]).toBeGreaterThan(expected[1]!);
    // Site index: mean of the plant indices, one decimal (arith).
    expect(local.assessment?.siteIndex).toBeCloseTo(
      Math.round(((expected[0]! + expected[1]!) / 2) * 10) / 10,
      6,
    );
  });

  it("has no assessment and no error until a plant can be scored", () => {
    const local = assessLocalDig(site, [{ ...healthy, seminalScore: null }], planting, [], []);
    expect(local).toMatchObject({ assessment: null, error: null, scoredPlants: [] });
    expect(assessLocalDig(site, [], planting, [], []).assessment).toBeNull();
  });

  it("returns the core's refusal as a message instead of throwing", () => {
    const local = assessLocalDig(site, [{ ...healthy, crownDepthIn: 9 }], planting, [], []);
    expect(local.assessment).toBeNull();
    expect(local.error).toMatch(/crownDepthIn/);
  });
});
