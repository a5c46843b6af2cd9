/**
 * Summary statistics (src/numerics/statistics.ts) against simple-statistics 7.12 (an independent
 * implementation, with compensated summation: agreement to 1e-12 relative), and the edge cases.
 */
import { mean as referenceMean, sampleVariance as referenceVariance } from "simple-statistics";
import { describe, expect, it } from "vitest";
import { mean, sampleVariance } from "../../src/numerics/statistics.js";

const samples = [
  [0.81, 0.79, 0.84, 0.8, 0.83],
  [1e6 + 0.1, 1e6 + 0.2, 1e6 + 0.3],
  [-3, 4.5, 12, 0, 7.25, -1e-3],
];

describe("summary statistics", () => {
  it.each(samples)("agree with simple-statistics on sample %#", (...values) => {
    expect(mean(values)).toBeCloseTo(referenceMean(values), 9);
    const variance = sampleVariance(values)!;
    expect(Math.abs(variance - referenceVariance(values))).toBeLessThanOrEqual(1e-12 * Math.max(1, variance) + 1e-9);
  });

  it("give 0 for the mean of nothing and no variance below two values", () => {
    expect(mean([])).toBe(0);
    expect(sampleVariance([])).toBeNull();
    expect(sampleVariance([3])).toBeNull();
    expect(sampleVariance([2, 4])).toBe(2);
  });
});
