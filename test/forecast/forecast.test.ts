import { mean, sampleStandardDeviation } from "simple-statistics";
import { describe, expect, it } from "vitest";
import type { CurveFile, CurvePoint } from "../../src/curve/curveFile.js";
import { FitError, UsageError } from "../../src/errors.js";
import { forecastCurve, quantileSorted, resolveForecastOptions } from "../../src/forecast/forecast.js";
import { RandomStream } from "../../src/random.js";

const sizes = [25, 50, 100, 200, 400, 800];
/** A known accuracy curve, pow3 with a = 0.92, b = 1.5, c = 0.55. */
const accuracyTruth = (n: number): number => 0.92 - 1.5 * Math.pow(n, -0.55);

function curveOf(points: CurvePoint[], overrides: Partial<CurveFile> = {}): CurveFile {
  return {
    kind: "headroom-curve",
    version: 1,
    metric: "accuracy",
    higherIsBetter: true,
    metricRange: [0, 1],
    rows: 1000,
    folds: 5,
    repeats: 5,
    points,
    ...overrides,
  };
}

/**
 * Scores in repeat-major order (score r·folds + f is repeat r, fold f): truth, plus a per-repeat
 * shift shared by every size (the same splits), plus fold noise shrinking with size.
 */
function noisyPoints(
  truth: (n: number) => number,
  seed: number,
  { repeats = 5, folds = 5, shift = 0.01, noise = 0.03 } = {},
): CurvePoint[] {
  const random = new RandomStream(seed);
  const shifts = Array.from({ length: repeats }, () => shift * random.normal());
  return sizes.map((trainingSize) => {
    const scores: number[] = [];
    for (let r = 0; r < repeats; r++) {
      for (let f = 0; f < folds; f++) {
        scores.push(truth(trainingSize) + shifts[r] + noise * random.normal() * Math.sqrt(100 / trainingSize));
      }
    }
    return { trainingSize, scores };
  });
}

function exactPoints(truth: (n: number) => number, fits = 25): CurvePoint[] {
  return sizes.map((trainingSize) => ({ trainingSize, scores: Array(fits).fill(truth(trainingSize)) }));
}

describe("forecastCurve on exact pow3 points", () => {
  const forecast = forecastCurve(curveOf(exactPoints(accuracyTruth)));

  it("projects to rows × [1, 1.5, 2, 3, 5] by default, sorted", () => {
    expect(forecast.projections.map((p) => p.trainingSize)).toEqual([1000, 1500, 2000, 3000, 5000]);
  });

  it("recovers the true curve: the projection at 5× rows equals the truth to 1e-6", () => {
    const atFive = forecast.projections[4];
    expect(Math.abs(atFive.expected - accuracyTruth(5000))).toBeLessThan(1e-6);
    expect(forecast.parameters.a).toBeCloseTo(0.92, 6);
    expect(forecast.parameters.b).toBeCloseTo(1.5, 5);
    expect(forecast.parameters.c).toBeCloseTo(0.55, 6);
  });

  it("gives a degenerate interval: every bootstrap refit sees the same means", () => {
    for (const projection of forecast.projections) {
      expect(projection.draws).toHaveLength(200);
      expect(projection.upper - projection.lower).toBeLessThan(1e-9);
      expect(Math.abs(projection.expected - projection.lower)).toBeLessThan(1e-9);
    }
  });

  it("summarises the measured points (mean, standard deviation, fits)", () => {
    expect(forecast.measured.map((m) => m.trainingSize)).toEqual(sizes);
    expect(forecast.measured.every((m) => m.standardDeviation === 0 && m.fits === 25)).toBe(true);
    expect(forecast.largestMeasuredSize).toBe(800);
    expect(forecast.family).toBe("pow3");
    expect(forecast.kind).toBe("headroom-forecast");
    expect(forecast.rows).toBe(1000);
    expect(forecast.metricRange).toEqual([0, 1]);
  });

  it("draws a band of 40 log-spaced sizes from the smallest measured size to the largest projection", () => {
    expect(forecast.band).toHaveLength(40);
    expect(forecast.band[0].trainingSize).toBe(25);
    expect(forecast.band[39].trainingSize).toBe(5000);
    const ratios = forecast.band.slice(1).map((b, k) => b.trainingSize / forecast.band[k].trainingSize);
    for (const ratio of ratios) expect(ratio).toBeCloseTo(Math.pow(5000 / 25, 1 / 39), 10);
    for (const point of forecast.band) {
      expect(Math.abs(point.expected - accuracyTruth(point.trainingSize))).toBeLessThan(1e-6);
    }
  });
});

describe("forecastCurve on noisy points from a known pow3", () => {
  const curve = curveOf(noisyPoints(accuracyTruth, 11));
  const forecast = forecastCurve(curve);

  it("summarises each size with the sample mean and standard deviation (simple-statistics)", () => {
    forecast.measured.forEach((summary, i) => {
      expect(summary.mean).toBeCloseTo(mean(curve.points[i].scores), 14);
      expect(summary.standardDeviation).toBeCloseTo(sampleStandardDeviation(curve.points[i].scores), 14);
    });
  });

  it("has an 80% interval at 3× rows that contains the truth, with finite draws", () => {
    const atThree = forecast.projections.find((p) => p.trainingSize === 3000)!;
    expect(atThree.level).toBe(0.8);
    expect(atThree.lower).toBeLessThanOrEqual(accuracyTruth(3000));
    expect(atThree.upper).toBeGreaterThanOrEqual(accuracyTruth(3000));
    expect(atThree.upper - atThree.lower).toBeGreaterThan(0.001);
    for (const projection of forecast.projections) {
      expect(projection.draws).toHaveLength(200);
      expect(projection.draws.every(Number.isFinite)).toBe(true);
      // lower and upper are the 10% and 90% quantiles (type 7) of the draws.
      const sorted = projection.draws.slice().sort((p, q) => p - q);
      expect(projection.lower).toBe(quantileSorted(sorted, 0.1));
      expect(projection.upper).toBe(quantileSorted(sorted, 0.9));
    }
  });

  it("covers the truth at 3× rows in most of 30 synthetic data sets", () => {
    // Percentile bootstrap over 5 repeats undercovers a little: on these 30 data sets, with 60 draws
    // each, 22 of 30 (0.73) intervals covered the truth during development, for a nominal 0.8. A
    // broken bootstrap (draws not varying, or not centred) covers far less. Threshold 0.5.
    let covered = 0;
    const dataSets = 30;
    for (let d = 0; d < dataSets; d++) {
      const projection = forecastCurve(curveOf(noisyPoints(accuracyTruth, 100 + d)), { draws: 60, at: [3000] })
        .projections[0];
      if (projection.lower <= accuracyTruth(3000) && accuracyTruth(3000) <= projection.upper) covered++;
    }
    expect(covered / dataSets).toBeGreaterThanOrEqual(0.5);
  });
});

describe("forecastCurve bootstrap resamples whole repeats", () => {
  // Each repeat adds one constant shift at every size and nothing else, so a refit is exactly
  // pow3(truth) + (mean of the drawn shifts): draw j must carry the same shift at every size.
  const shifts = [-0.02, -0.005, 0, 0.01, 0.03];
  const points = sizes.map((trainingSize) => ({
    trainingSize,
    scores: shifts.flatMap((s) => Array(5).fill(accuracyTruth(trainingSize) + s)),
  }));
  const forecast = forecastCurve(curveOf(points), { at: [1000, 5000] });

  it("draw j of every projection comes from the same resample", () => {
    const [near, far] = forecast.projections;
    near.draws.forEach((draw, j) => {
      const shiftNear = draw - accuracyTruth(1000);
      const shiftFar = far.draws[j] - accuracyTruth(5000);
      expect(Math.abs(shiftNear - shiftFar)).toBeLessThan(1e-6);
      // The shift is a mean of 5 drawn repeat shifts: a multiple of 0.001 here.
      expect(Math.abs(shiftNear * 5000 - Math.round(shiftNear * 5000))).toBeLessThan(1e-3);
    });
  });

  it("spreads the draws like the bootstrap mean of the repeat shifts", () => {
    // Standard deviation of the bootstrap mean of R values: sqrt(Σ(s − s̄)²/R) / sqrt(R).
    const shiftMean = mean(shifts);
    const expectedSd = Math.sqrt(shifts.reduce((s, v) => s + (v - shiftMean) ** 2, 0) / 5) / Math.sqrt(5);
    const drawSd = sampleStandardDeviation(forecast.projections[0].draws);
    // 200 draws estimate a standard deviation to about ±5% (1/sqrt(2·200)); allow 20%.
    expect(Math.abs(drawSd / expectedSd - 1)).toBeLessThan(0.2);
  });

  it("gives the same forecast when the repeats are given by repeatOfScore instead of folds", () => {
    const withLabels = points.map((p) => ({ ...p, repeatOfScore: p.scores.map((_, s) => Math.floor(s / 5)) }));
    const other = forecastCurve(curveOf(withLabels, { folds: undefined }), { at: [1000, 5000] });
    expect(other).toEqual(forecast);
  });
});

describe("forecastCurve orientation and bounds", () => {
  it("projects a lower-is-better curve (log loss) downward", () => {
    const logLoss = (n: number) => 0.3 + 2 * Math.pow(n, -0.5);
    const curve = curveOf(noisyPoints(logLoss, 5, { shift: 0.005, noise: 0.02 }), {
      metric: "log loss",
      higherIsBetter: false,
      metricRange: [0, Infinity],
    });
    const forecast = forecastCurve(curve);
    const largestMeasuredMean = forecast.measured[forecast.measured.length - 1].mean;
    const expected = forecast.projections.map((p) => p.expected);
    expect(expected[0]).toBeLessThan(largestMeasuredMean);
    for (let k = 1; k < expected.length; k++) expect(expected[k]).toBeLessThan(expected[k - 1]);
    // The asymptote in score units lies below every projection and near the truth 0.3.
    expect(forecast.parameters.a).toBeLessThan(expected[expected.length - 1]);
    expect(forecast.parameters.a).toBeGreaterThan(0.2);
    expect(forecast.parameters.a).toBeLessThan(0.4);
    const atThree = forecast.projections.find((p) => p.trainingSize === 3000)!;
    expect(atThree.lower).toBeLessThanOrEqual(logLoss(3000));
    expect(atThree.upper).toBeGreaterThanOrEqual(logLoss(3000));
    expect(forecast.warnings.some((w) => w.includes("does not improve"))).toBe(false);
  });

  it("keeps every expected value, bound, draw and band point of an accuracy forecast inside [0, 1]", () => {
    // A curve close to 1 with noise large enough that some scores are clipped at 1.
    const nearPerfect = (n: number) => 1 - 0.6 * Math.pow(n, -0.35);
    const points = noisyPoints(nearPerfect, 9, { shift: 0.02, noise: 0.05 }).map((p) => ({
      ...p,
      scores: p.scores.map((s) => Math.min(1, s)),
    }));
    const forecast = forecastCurve(curveOf(points), { at: [1000, 10_000, 100_000] });
    const values = [
      ...forecast.projections.flatMap((p) => [p.expected, p.lower, p.upper, ...p.draws]),
      ...forecast.band.flatMap((b) => [b.expected, b.lower, b.upper]),
    ];
    expect(values.every((v) => v >= 0 && v <= 1)).toBe(true);
    expect(forecast.parameters.a).toBeLessThanOrEqual(1);
  });
});

describe("forecastCurve determinism", () => {
  const curve = curveOf(noisyPoints(accuracyTruth, 21));

  it("gives identical output for the same seed", () => {
    expect(forecastCurve(curve, { seed: 42 })).toEqual(forecastCurve(curve, { seed: 42 }));
  });

  it("gives different draws for a different seed, and records the seed", () => {
    const first = forecastCurve(curve, { seed: 1 });
    const second = forecastCurve(curve, { seed: 2 });
    expect(first.seed).toBe(1);
    expect(second.seed).toBe(2);
    expect(first.projections[0].draws).not.toEqual(second.projections[0].draws);
    expect(first.projections[0].expected).toBe(second.projections[0].expected);
  });

  it("runs 200 bootstrap refits in well under a second", () => {
    // Budget 1 s on a 2-core machine (measured ~0.1–0.3 s); the assertion allows 2 s for a loaded CI
    // machine.
    const started = performance.now();
    forecastCurve(curve, { draws: 200 });
    expect(performance.now() - started).toBeLessThan(2000);
  });
});

describe("forecastCurve warnings", () => {
  const warningsOf = (curve: CurveFile, at?: number[]) => forecastCurve(curve, { at, draws: 50 }).warnings;

  it("warns about fewer than 4 training sizes", () => {
    const points = exactPoints(accuracyTruth).slice(0, 3);
    expect(warningsOf(curveOf(points), [200])).toEqual([expect.stringMatching(/^Only 3 training sizes/)]);
  });

  it("warns when the scores do not improve with training size", () => {
    const points = exactPoints((n) => 0.9 - 0.01 * Math.log(n));
    expect(warningsOf(curveOf(points), [1000]).some((w) => w.includes("does not improve"))).toBe(true);
  });

  it("warns about extrapolating beyond 5× the largest measured size, and not below it", () => {
    const curve = curveOf(exactPoints(accuracyTruth));
    expect(warningsOf(curve).some((w) => /6\.3 times the largest measured/.test(w))).toBe(true);
    expect(warningsOf(curve, [4000])).toEqual([]);
  });

  it("warns about fewer than 3 repeats", () => {
    const points = noisyPoints(accuracyTruth, 3, { repeats: 2 });
    expect(warningsOf(curveOf(points, { repeats: 2 }), [1000])).toEqual([
      expect.stringMatching(/^Only 2 repeats at some training size/),
    ]);
  });

  it("warns when the repeat of each score is unknown and resamples single scores", () => {
    const curve = curveOf(noisyPoints(accuracyTruth, 4), { folds: undefined });
    const forecast = forecastCurve(curve, { at: [1000], draws: 50 });
    expect(forecast.warnings).toEqual([expect.stringMatching(/does not say which repeat/)]);
    expect(forecast.projections[0].upper).toBeGreaterThan(forecast.projections[0].lower);
  });
});

describe("forecastCurve input checks", () => {
  it.each([
    {
      name: "two training sizes",
      points: exactPoints(accuracyTruth).slice(0, 2),
      message: /2 distinct training sizes; at least 3/,
    },
    {
      name: "a NaN score",
      points: exactPoints(accuracyTruth).map((p, i) => (i === 2 ? { ...p, scores: [0.5, NaN] } : p)),
      message: /score 1 at training size 100 is NaN/,
    },
    {
      name: "a duplicated training size",
      points: [...exactPoints(accuracyTruth), { trainingSize: 100, scores: [0.7] }],
      message: /both have training size 100/,
    },
    {
      name: "a size with no scores",
      points: exactPoints(accuracyTruth).map((p, i) => (i === 0 ? { ...p, scores: [] } : p)),
      message: /training size 25 has no scores/,
    },
    {
      name: "repeatOfScore of the wrong length",
      points: exactPoints(accuracyTruth).map((p, i) => (i === 0 ? { ...p, repeatOfScore: [0] } : p)),
      message: /25 scores but 1 repeatOfScore entries/,
    },
  ])("throws FitError for $name", ({ points, message }) => {
    expect(() => forecastCurve(curveOf(points))).toThrow(FitError);
    expect(() => forecastCurve(curveOf(points))).toThrow(message);
  });

  it.each([
    { options: { level: 1 }, message: /level must be between 0 and 1/ },
    { options: { draws: 0 }, message: /draws must be an integer/ },
    { options: { seed: 1.5 }, message: /seed must be an integer/ },
    { options: { at: [1000, -5] }, message: /projection size -5 is not a positive number/ },
  ])("throws UsageError for options $options", ({ options, message }) => {
    const curve = curveOf(exactPoints(accuracyTruth));
    expect(() => forecastCurve(curve, options)).toThrow(UsageError);
    expect(() => forecastCurve(curve, options)).toThrow(message);
  });

  it("projects to multiples of the largest measured size when rows are unknown", () => {
    const resolved = resolveForecastOptions(curveOf(exactPoints(accuracyTruth), { rows: 0 }));
    expect(resolved.at).toEqual([800, 1200, 1600, 2400, 4000]);
  });

  it("sorts and de-duplicates the projection sizes it is given", () => {
    const forecast = forecastCurve(curveOf(exactPoints(accuracyTruth)), { at: [3000, 1000, 2000, 1000], draws: 20 });
    expect(forecast.projections.map((p) => p.trainingSize)).toEqual([1000, 2000, 3000]);
  });
});
