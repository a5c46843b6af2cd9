/**
 * Property-based checks of `forecastCurve` (fast-check): whatever the curve, within reason, the
 * forecast is made of finite numbers, its bounds do not cross and never leave the metric's range,
 * and its draws line up across sizes.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { CurveFile } from "../../src/curve/curveFile.js";
import { FitError } from "../../src/errors.js";
import { forecastCurve } from "../../src/forecast/forecast.js";
import { RandomStream } from "../../src/random.js";

/** A random learning curve: rising, flat or falling, noisy, clipped to [0, 1], 3–9 sizes, 1–6 repeats. */
const curves = fc
  .record({
    sizeCount: fc.integer({ min: 3, max: 9 }),
    smallest: fc.integer({ min: 2, max: 60 }),
    growth: fc.double({ min: 1.2, max: 2.5, noNaN: true }),
    asymptote: fc.double({ min: 0.3, max: 1.05, noNaN: true }),
    gap: fc.double({ min: -0.3, max: 0.8, noNaN: true }),
    exponent: fc.double({ min: 0.05, max: 1.5, noNaN: true }),
    repeats: fc.integer({ min: 1, max: 6 }),
    folds: fc.integer({ min: 2, max: 5 }),
    noise: fc.double({ min: 0, max: 0.15, noNaN: true }),
    shift: fc.double({ min: 0, max: 0.05, noNaN: true }),
    seed: fc.integer({ min: 0, max: 1_000_000 }),
    knownFolds: fc.boolean(),
  })
  .map((c): CurveFile => {
    const random = new RandomStream(c.seed);
    const shifts = Array.from({ length: c.repeats }, () => c.shift * random.normal());
    const points = Array.from({ length: c.sizeCount }, (_, i) => {
      const trainingSize = Math.round(c.smallest * Math.pow(c.growth, i)) + i;
      const truth = c.asymptote - c.gap * Math.pow(trainingSize / c.smallest, -c.exponent);
      const scores: number[] = [];
      for (let r = 0; r < c.repeats; r++) {
        for (let f = 0; f < c.folds; f++) {
          scores.push(Math.min(1, Math.max(0, truth + shifts[r] + c.noise * random.normal())));
        }
      }
      return { trainingSize, scores };
    });
    const largest = points[points.length - 1].trainingSize;
    return {
      kind: "headroom-curve",
      version: 1,
      metric: "accuracy",
      higherIsBetter: true,
      metricRange: [0, 1],
      rows: Math.round(largest * 1.25),
      ...(c.knownFolds ? { folds: c.folds } : {}),
      repeats: c.repeats,
      points,
    };
  });

describe("forecastCurve on random curves (property-based)", () => {
  it("gives finite numbers, uncrossed bounds inside [0, 1], and aligned draws — or a FitError", () => {
    fc.assert(
      fc.property(
        curves,
        fc.integer({ min: 1, max: 40 }),
        fc.double({ min: 0.5, max: 0.95, noNaN: true }),
        (curve, testSize, level) => {
          const largest = curve.points[curve.points.length - 1].trainingSize;
          let forecast;
          try {
            forecast = forecastCurve(curve, {
              at: [largest, 3 * largest, 30 * largest],
              draws: 24,
              level,
              testSize,
              target: 0.9,
            });
          } catch (error) {
            expect(error).toBeInstanceOf(FitError);
            return;
          }
          const inRange = (v: number) => Number.isFinite(v) && v >= 0 && v <= 1;
          for (const p of forecast.projections) {
            expect([p.expected, p.lower, p.upper, p.singleModelLower!, p.singleModelUpper!].every(inRange)).toBe(true);
            expect(p.lower).toBeLessThanOrEqual(p.expected);
            expect(p.expected).toBeLessThanOrEqual(p.upper);
            expect(p.singleModelLower!).toBeLessThanOrEqual(p.lower);
            expect(p.upper).toBeLessThanOrEqual(p.singleModelUpper!);
            expect(p.draws.every(inRange)).toBe(true);
            expect(p.draws).toHaveLength(forecast.projections[0].draws.length);
          }
          for (const b of forecast.band) {
            expect([b.expected, b.lower, b.upper].every(inRange)).toBe(true);
            expect(b.lower).toBeLessThanOrEqual(b.upper);
          }
          const weights = Object.values(forecast.familyWeights!);
          expect(weights.every((w) => w >= 0 && w <= 1)).toBe(true);
          expect(weights.reduce((s, w) => s + w, 0)).toBeCloseTo(1, 9);
          expect(Number.isFinite(forecast.sampleStandardDeviation)).toBe(true);
          const answer = forecast.targetSize!;
          for (const size of [answer.expected, answer.withConfidence]) {
            expect(size === null || (Number.isInteger(size) && size >= 1)).toBe(true);
          }
          expect(JSON.stringify(forecast)).not.toMatch(/NaN|null,"lower"|Infinity/);
        },
      ),
      { numRuns: 60, seed: 20261201 },
    );
  });
});
