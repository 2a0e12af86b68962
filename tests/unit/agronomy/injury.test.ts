import { describe, expect, it } from "vitest";
import {
  assessDig,
  type DugPlantRoots,
  type FertilizerPass,
  type Finding,
  findProduct,
  injuryFlags,
  shouldFlagForSupervisor,
} from "@/lib/agronomy";
import { SRC } from "./sources";

const plant: DugPlantRoots = {
  seminalRootScore: 5,
  nodalWhorls: 2,
  nodalRootCount: 12,
  longestNodalRootIn: 7,
  crownDepthIn: 0.75,
  mesocotyl: "healthy",
  seminalInjury: "none",
  nodalInjury: "none",
};

const finding = (code: string, severity: Finding["severity"]): Finding => ({
  code,
  severity,
  message: code,
  numbers: {},
});
const flagCodes = (flags: Finding[]) => flags.map((f) => f.code);

describe("injuryFlags", () => {
  it("a clean dig raises no flags", () => {
    expect(injuryFlags({ leafCollars: 4, plants: [plant, plant], seedingDepthIn: 2, siteIndex: 95 })).toEqual(
      [],
    );
  });

  it("burn on half the plants or more is critical, fewer is a warning, with the counts", () => {
    const burnt = { ...plant, burnSeen: true };
    const half = injuryFlags({ leafCollars: 4, plants: [burnt, plant] });
    expect(half[0]).toMatchObject({ code: "root_burn_seen", severity: "critical" });
    expect(half[0]?.numbers.plantsWithBurn?.value).toBe(1);
    const few = injuryFlags({ leafCollars: 4, plants: [burnt, plant, plant] });
    expect(few[0]).toMatchObject({ code: "root_burn_seen", severity: "warning" });
  });

  it("burn with a shifted knife or band near the seed points at the pass (critical)", () => {
    const flags = injuryFlags({
      leafCollars: 4,
      plants: [{ ...plant, burnSeen: true }, plant, plant],
      auditFindings: [finding("shifted_knife", "warning"), finding("band_rate", "info")],
    });
    expect(flagCodes(flags)).toEqual(["burn_with_placement_problem", "shifted_knife", "root_burn_seen"]);
  });

  it("info audit findings are not flags; caution and worse are", () => {
    const flags = injuryFlags({
      leafCollars: 4,
      plants: [plant],
      auditFindings: [
        finding("seed_placed_within_limit", "info"),
        finding("seed_placed_near_limit", "caution"),
      ],
    });
    expect(flagCodes(flags)).toEqual(["seed_placed_near_limit"]);
  });

  it(`crown shallower than 1/2 in — ${SRC.purdueEmergence}`, () => {
    const shallow = injuryFlags({
      leafCollars: 4,
      plants: [
        { ...plant, crownDepthIn: 0.25 },
        { ...plant, crownDepthIn: 0.5 },
      ],
    });
    expect(shallow[0]).toMatchObject({ code: "shallow_crown", severity: "warning" });
    expect(shallow[0]?.numbers.meanCrownDepth?.value).toBeCloseTo(0.375, 10);
    const one = injuryFlags({ leafCollars: 4, plants: [{ ...plant, crownDepthIn: 0.4 }, plant, plant] });
    expect(one[0]).toMatchObject({ code: "shallow_crown", severity: "caution" });
  });

  it(`seeding under 1 in is a warning (${SRC.purdueEmergence}); under 1.5 in a caution (${SRC.commonPractice})`, () => {
    expect(injuryFlags({ leafCollars: 4, plants: [plant], seedingDepthIn: 0.75 })[0]).toMatchObject({
      code: "shallow_seeding",
      severity: "warning",
    });
    expect(injuryFlags({ leafCollars: 4, plants: [plant], seedingDepthIn: 1.25 })[0]).toMatchObject({
      code: "shallow_seeding",
      severity: "caution",
    });
    expect(injuryFlags({ leafCollars: 4, plants: [plant], seedingDepthIn: 1.5 })).toEqual([]);
  });

  it(`a damaged mesocotyl is flagged before V6, not after — ${SRC.iowaStateRoots}`, () => {
    const hurt = { ...plant, mesocotyl: "severed" as const };
    expect(flagCodes(injuryFlags({ leafCollars: 3, plants: [hurt] }))).toContain("mesocotyl_damage");
    expect(flagCodes(injuryFlags({ leafCollars: 7, plants: [hurt] }))).not.toContain("mesocotyl_damage");
  });

  it(`low site index: below 60 warning, below 40 critical — ${SRC.ourRubric}`, () => {
    expect(injuryFlags({ leafCollars: 4, plants: [plant], siteIndex: 55 })[0]).toMatchObject({
      code: "low_root_index",
      severity: "warning",
    });
    expect(injuryFlags({ leafCollars: 4, plants: [plant], siteIndex: 35 })[0]).toMatchObject({
      code: "low_root_index",
      severity: "critical",
    });
    expect(injuryFlags({ leafCollars: 4, plants: [plant], siteIndex: 60 })).toEqual([]);
  });

  it("severe root injury is a warning, moderate a caution", () => {
    expect(injuryFlags({ leafCollars: 4, plants: [{ ...plant, nodalInjury: "severe" }] })[0]?.severity).toBe(
      "warning",
    );
    expect(
      injuryFlags({ leafCollars: 4, plants: [{ ...plant, seminalInjury: "moderate" }] })[0]?.severity,
    ).toBe("caution");
  });
});

describe("shouldFlagForSupervisor", () => {
  it("any critical flag sends the dig for review, with the reason", () => {
    const r = shouldFlagForSupervisor([finding("band_near_seed", "critical")], 90);
    expect(r.flag).toBe(true);
    expect(r.reason).toMatch(/critical.*band_near_seed/);
  });

  it("one warning does not; two do", () => {
    expect(shouldFlagForSupervisor([finding("a", "warning")], 90).flag).toBe(false);
    expect(shouldFlagForSupervisor([finding("a", "warning"), finding("b", "warning")], 90).flag).toBe(true);
  });

  it("a site index below 50 does, and the threshold is a parameter", () => {
    expect(shouldFlagForSupervisor([], 45)).toMatchObject({ flag: true });
    expect(shouldFlagForSupervisor([], 45, { reviewIndexBelow: 40 }).flag).toBe(false);
    expect(shouldFlagForSupervisor([], null).flag).toBe(false);
    expect(shouldFlagForSupervisor([], 80).reason).toMatch(/No critical flag/);
  });

  it("refuses an index outside 0–100", () => {
    expect(() => shouldFlagForSupervisor([], 120)).toThrow(/siteIndex must be a finite number from 0 to 100/);
  });
});

describe("assessDig", () => {
  const uan = findProduct("uan-32");
  if (!uan) throw new Error("missing UAN-32");
  const pass: FertilizerPass = {
    placement: "band_2x2",
    product: uan,
    rate: 10,
    rateUnit: "gal/ac",
    rowSpacingIn: 30,
    soil: "medium",
    measured: { besideIn: 0.5, belowIn: 0.5 },
  };

  it(`runs the whole dig: per-plant index, site index, audit, flags and review — ${SRC.ourRubric}; ${SRC.kStateStarter}`, () => {
    const r = assessDig({
      stage: "V4",
      plants: [{ ...plant, burnSeen: true }, plant],
      passes: [pass],
      seedingDepthIn: 2,
    });
    expect(r.leafCollars).toBe(4);
    expect(r.plants).toHaveLength(2);
    expect(r.siteIndex).toBeCloseTo((r.plants[0]!.index + r.plants[1]!.index) / 2, 1);
    expect(r.audit[0]).toMatchObject({ code: "band_near_seed", severity: "critical", passIndex: 0 });
    expect(flagCodes(r.flags)).toEqual(
      expect.arrayContaining([
        "band_near_seed",
        "shifted_knife",
        "root_burn_seen",
        "burn_with_placement_problem",
      ]),
    );
    expect(r.flagForReview.flag).toBe(true);
  });

  it("a clean dig with a good 2x2 is not sent for review", () => {
    const r = assessDig({
      stage: 4,
      plants: [plant, plant],
      passes: [{ ...pass, measured: { besideIn: 2, belowIn: 2 } }],
      seedingDepthIn: 2,
    });
    expect(r.flags).toEqual([]);
    expect(r.flagForReview.flag).toBe(false);
    expect(r.audit.map((f) => f.code)).toEqual(["band_rate"]);
  });

  it("refuses an unknown stage and names a bad plant", () => {
    expect(() => assessDig({ stage: "R1", plants: [plant] })).toThrow(/stage must be/);
    expect(() => assessDig({ stage: "V4", plants: [plant, { ...plant, crownDepthIn: Number.NaN }] })).toThrow(
      /plants\[1\]\.crownDepthIn/,
    );
  });
});
