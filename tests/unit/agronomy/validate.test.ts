import { describe, expect, it } from "vitest";
import * as agronomy from "@/lib/agronomy";
import { checkNumber, checkOneOf } from "@/lib/agronomy";

describe("checkNumber / checkOneOf", () => {
  it("returns a valid value unchanged", () => {
    expect(checkNumber("x", 3, { min: 0, max: 5 })).toBe(3);
    expect(checkOneOf("soil", "fine", ["coarse", "fine"] as const)).toBe("fine");
  });

  it("names the argument and the allowed range in a RangeError", () => {
    expect(() =>
      checkNumber("rowSpacingIn", -30, { min: 0, minExclusive: true, max: 120, unit: "in" }),
    ).toThrow(new RangeError("rowSpacingIn must be a finite number above 0 to 120 in; got -30"));
    expect(() => checkNumber("n", 2.5, { min: 0, integer: true })).toThrow(
      new RangeError("n must be a whole number of at least 0; got 2.5"),
    );
    expect(() => checkNumber("p", 1, { min: 0, max: 1, minExclusive: true, maxExclusive: true })).toThrow(
      "p must be a finite number above 0 below 1; got 1",
    );
    expect(() => checkOneOf("soil", "loam", ["coarse", "medium", "fine"] as const)).toThrow(
      new RangeError(`soil must be one of 'coarse', 'medium', 'fine'; got "loam"`),
    );
  });

  it("treats NaN, Infinity, strings and undefined as non-finite", () => {
    for (const bad of [Number.NaN, Number.POSITIVE_INFINITY, "3", undefined, null]) {
      expect(() => checkNumber("x", bad)).toThrow(RangeError);
    }
  });
});

describe("public API", () => {
  it("exports the names and arities other parts of the product call", () => {
    const required: Record<string, number> = {
      dailyGdd: 3,
      leafStageFromGdd: 1,
      rowLengthForThousandthAcre: 1,
      plantsPerAcre: 3,
      nutrientsPerAcre: 3,
      seedPlacedCheck: 1,
      irrigationWaterNitrogen: 2,
      grainYieldEstimate: 1,
      assessDig: 1,
      digWindow: 1,
      auditPlacement: 2,
      nitrogenBudget: 1,
      welchTTest: 2,
      parseLengthInches: 2,
    };
    const api = agronomy as unknown as Record<string, unknown>;
    for (const [name, arity] of Object.entries(required)) {
      expect(typeof api[name], name).toBe("function");
      // Parameters with defaults do not count towards Function.length.
      expect((api[name] as (...args: unknown[]) => unknown).length, name).toBeLessThanOrEqual(arity);
    }
  });
});
