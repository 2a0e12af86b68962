import { describe, expect, it } from "vitest";
import { DEFAULT_KERNEL_FACTOR, grainYieldEstimate } from "@/lib/agronomy";
import { SRC } from "./sources";

describe("grainYieldEstimate (yield-component method)", () => {
  it(`30 ears × 16 rows × 30 kernels ÷ 90 = 160 bu/acre — arithmetic on the method; factor 90 is ${SRC.commonPractice}`, () => {
    expect(DEFAULT_KERNEL_FACTOR).toBe(90);
    expect(grainYieldEstimate({ earsPerThousandthAcre: 30, kernelRows: 16, kernelsPerRow: 30 })).toBeCloseTo(
      160,
      10,
    );
  });

  it(`large kernels (factor 80) give more, small (100) less — ${SRC.commonPractice}`, () => {
    const base = { earsPerThousandthAcre: 30, kernelRows: 16, kernelsPerRow: 30 };
    expect(grainYieldEstimate({ ...base, kernelFactor: 80 })).toBeCloseTo(180, 10);
    expect(grainYieldEstimate({ ...base, kernelFactor: 100 })).toBeCloseTo(144, 10);
  });

  it("no ears is no yield", () => {
    expect(grainYieldEstimate({ earsPerThousandthAcre: 0, kernelRows: 16, kernelsPerRow: 30 })).toBe(0);
  });

  it("refuses an out-of-range factor or negative components", () => {
    expect(() =>
      grainYieldEstimate({ earsPerThousandthAcre: 30, kernelRows: 16, kernelsPerRow: 30, kernelFactor: 40 }),
    ).toThrow(/kernelFactor must be a finite number from 50 to 150/);
    expect(() =>
      grainYieldEstimate({ earsPerThousandthAcre: -1, kernelRows: 16, kernelsPerRow: 30 }),
    ).toThrow(/earsPerThousandthAcre/);
    expect(() =>
      grainYieldEstimate({ earsPerThousandthAcre: 30, kernelRows: Number.NaN, kernelsPerRow: 30 }),
    ).toThrow(/kernelRows/);
  });
});
