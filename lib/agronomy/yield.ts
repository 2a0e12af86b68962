import { checkNumber } from "./validate";

/**
 * Kernels per bushel divided by 1000, the yield-component "kernel factor": 90 for average kernels,
 * about 80 for large and 100 for small kernels (common practice, no source).
 */
export const DEFAULT_KERNEL_FACTOR = 90;

/**
 * Grain yield by the yield-component method: ears per 1/1000 acre × kernel rows per ear × kernels per
 * row ÷ kernel factor.
 * @param input.earsPerThousandthAcre harvestable ears in 1/1000 acre of row (see rowLengthForThousandthAcre)
 * @param input.kernelRows average kernel rows per ear
 * @param input.kernelsPerRow average kernels per row
 * @param input.kernelFactor thousands of kernels per bushel, 50–150; default 90
 * @returns bu/acre (at the moisture the factor assumes)
 */
export function grainYieldEstimate(input: {
  earsPerThousandthAcre: number;
  kernelRows: number;
  kernelsPerRow: number;
  kernelFactor?: number;
}): number {
  const ears = checkNumber("earsPerThousandthAcre", input.earsPerThousandthAcre, { min: 0, max: 100 });
  const rows = checkNumber("kernelRows", input.kernelRows, { min: 0, max: 30 });
  const kernels = checkNumber("kernelsPerRow", input.kernelsPerRow, { min: 0, max: 80 });
  const factor = checkNumber("kernelFactor", input.kernelFactor ?? DEFAULT_KERNEL_FACTOR, {
    min: 50,
    max: 150,
  });
  return (ears * rows * kernels) / factor;
}
