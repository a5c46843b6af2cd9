import { mean, sampleStandardDeviation, sampleVariance } from "simple-statistics";
import { describe, expect, it } from "vitest";
import type { CurveFile, CurvePoint } from "../../src/curve/curveFile.js";
import { FitError, UsageError } from "../../src/errors.js";
import {
  forecastCurve,
  quantileSorted,
  resolveForecastOptions,
  type ForecastOptions,
} from "../../src/forecast/forecast.js";
import { continuedGain, guessError, reliabilityOf, shippedCalibrations } from "../../src/forecast/gainCorrection.js";
import { forecastCurves, type ForecastCurves } from "../../src/forecast/storedCurves.js";
import { RandomStream } from "../../src/random.js";
import { r2 } from "../../src/curve/metrics.js";
import { foldR2Bias } from "../../src/forecast/forecastWarnings.js";

/**
 * The forecast with each family extrapolating by its own formula (no continuation learned from the
 * corpus): most checks here are of the families' fits, weights and draws, whose exact extrapolation
 * is known. The learned continuation has its own checks at the end.
 */
function familiesOnly(curve: CurveFile, options: ForecastOptions = {}): ReturnType<typeof forecastCurve> {
  return forecastCurve(curve, { calibration: null, ...options });
}

const sizes = [25, 50, 100, 200, 400, 800];
/** The default curve's eight sizes (geometric from 10 to 800). */
const eightSizes = [10, 19, 35, 66, 123, 230, 429, 800];
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
  { repeats = 5, folds = 5, shift = 0.01, noise = 0.03, at = sizes } = {},
): CurvePoint[] {
  const random = new RandomStream(seed);
  const shifts = Array.from({ length: repeats }, () => shift * random.normal());
  return at.map((trainingSize) => {
    const scores: number[] = [];
    for (let r = 0; r < repeats; r++) {
      for (let f = 0; f < folds; f++) {
        scores.push(truth(trainingSize) + shifts[r] + noise * random.normal() * Math.sqrt(100 / trainingSize));
      }
    }
    return { trainingSize, scores };
  });
}

function exactPoints(truth: (n: number) => number, fits = 25, at = sizes): CurvePoint[] {
  return at.map((trainingSize) => ({ trainingSize, scores: Array(fits).fill(truth(trainingSize)) }));
}

describe("forecastCurve on exact pow3 points", () => {
  const forecast = familiesOnly(curveOf(exactPoints(accuracyTruth)));

  it("projects to rows × [1, 1.5, 2, 3, 5] by default, sorted", () => {
    expect(forecast.projections.map((p) => p.trainingSize)).toEqual([1000, 1500, 2000, 3000, 5000]);
  });

  it("recovers the true curve: the projection at 5× rows equals the truth to 1e-6", () => {
    const atFive = forecast.projections[4];
    expect(Math.abs(atFive.expected - accuracyTruth(5000))).toBeLessThan(1e-6);
    expect(forecast.family).toBe("pow3");
    expect(forecast.parameters.a).toBeCloseTo(0.92, 6);
    expect(forecast.parameters.b).toBeCloseTo(1.5, 5);
    expect(forecast.parameters.c).toBeCloseTo(0.55, 6);
    expect(forecast.asymptote).toBeCloseTo(0.92, 5);
  });

  it("gives pow3 nearly all the weight, since it alone predicts the held-back sizes exactly", () => {
    // Six sizes: backtest fits use at least max(4, 6 − 3) = 4 sizes, so the families with fewer than
    // 4 parameters take part (pow3, exp3, ilog2, last).
    const weights = forecast.familyWeights!;
    expect(Object.keys(weights)).toEqual(["pow3", "exp3", "ilog2", "last"]);
    expect(Object.values(weights).reduce((s, w) => s + w, 0)).toBeCloseTo(1, 12);
    expect(weights.pow3).toBeGreaterThan(0.999);
    expect(forecast.backtest!.rootMeanSquareError.pow3).toBeLessThan(1e-8);
  });

  it("gives a degenerate interval: no noise, no backtest error, so every draw is the same curve", () => {
    for (const projection of forecast.projections) {
      expect(projection.draws).toHaveLength(200);
      expect(projection.upper - projection.lower).toBeLessThan(1e-6);
      expect(Math.abs(projection.expected - projection.lower)).toBeLessThan(1e-6);
    }
    expect(forecast.sampleStandardDeviation).toBe(0);
  });

  it("summarizes the measured points (mean, standard deviation, fits)", () => {
    expect(forecast.measured.map((m) => m.trainingSize)).toEqual(sizes);
    expect(forecast.measured.every((m) => m.standardDeviation === 0 && m.fits === 25)).toBe(true);
    expect(forecast.largestMeasuredSize).toBe(800);
    expect(forecast.kind).toBe("headroom-forecast");
    expect(forecast.rows).toBe(1000);
    expect(forecast.metricRange).toEqual([0, 1]);
  });

  it("records the extrapolation ratio of each projection and of the largest", () => {
    expect(forecast.projections.map((p) => p.extrapolationRatio)).toEqual([1.25, 1.875, 2.5, 3.75, 6.25]);
    expect(forecast.extrapolationRatio).toBe(6.25);
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

describe("forecastCurve backtest", () => {
  // Eight sizes, as `headroom measure` gives by default: backtest fits use the 5, 6 and 7 smallest
  // sizes (first cut max(4, 8 − 3) = 5), so each family makes 3 + 2 + 1 = 6 predictions.
  const forecast = familiesOnly(curveOf(noisyPoints(accuracyTruth, 31, { at: eightSizes })), { draws: 50 });
  const backtest = forecast.backtest!;

  it("predicts each held-back size from fits to the smaller ones, six predictions per family", () => {
    const families = Object.keys(forecast.familyWeights!);
    expect(families).toEqual(["pow3", "pow4", "mmf4", "wbl4", "exp3", "ilog2", "last"]);
    for (const family of families) {
      const predictions = backtest.predictions.filter((p) => p.family === family);
      expect(predictions.map((p) => [p.fittedUpTo, p.trainingSize])).toEqual([
        [123, 230],
        [123, 429],
        [123, 800],
        [230, 429],
        [230, 800],
        [429, 800],
      ]);
      for (const p of predictions) {
        const measured = forecast.measured.find((m) => m.trainingSize === p.trainingSize)!;
        expect(p.measured).toBe(measured.mean);
        expect(Number.isFinite(p.predicted)).toBe(true);
      }
    }
  });

  it("weighs the families by the inverse of their mean squared backtest error (noise-floored)", () => {
    const rmse = backtest.rootMeanSquareError;
    const weights = forecast.familyWeights!;
    // A family with a larger backtest error never gets a larger weight.
    for (const a of Object.keys(rmse)) {
      for (const b of Object.keys(rmse)) {
        if (rmse[a] < rmse[b]) expect(weights[a]).toBeGreaterThanOrEqual(weights[b] - 1e-12);
      }
    }
    // "last" ignores the rise of a rising curve and predicts the held-back sizes worse than pow3.
    expect(rmse.last).toBeGreaterThan(rmse.pow3);
    expect(weights.last).toBeLessThan(weights.pow3);
  });

  it("the last baseline's backtest prediction is the mean at the largest fitted size", () => {
    for (const p of backtest.predictions.filter((q) => q.family === "last")) {
      expect(p.predicted).toBeCloseTo(forecast.measured.find((m) => m.trainingSize === p.fittedUpTo)!.mean, 12);
    }
  });

  it("has no backtest with 4 sizes or fewer, and then fits pow3 alone", () => {
    const few = familiesOnly(curveOf(noisyPoints(accuracyTruth, 32).slice(0, 4)), { draws: 20, at: [1000] });
    expect(few.backtest).toBeUndefined();
    expect(few.familyWeights).toEqual({ pow3: 1 });
  });
});

describe("forecastCurve model averaging and --family", () => {
  // An exp3 curve, which saturates fast: 0.9 − 0.5·exp(−n/150).
  const exp3Truth = (n: number) => 0.9 - 0.5 * Math.exp(-n / 150);
  const curve = curveOf(exactPoints(exp3Truth, 25, eightSizes));

  it("puts the weight on exp3 when the points are an exact exp3 curve, and recovers it", () => {
    const forecast = familiesOnly(curve, { at: [2000], draws: 50 });
    expect(forecast.familyWeights!.exp3).toBeGreaterThan(0.4);
    expect(Math.abs(forecast.projections[0].expected - exp3Truth(2000))).toBeLessThan(1e-4);
  });

  it("uses only the forced family, which extrapolates worse here, with a wider interval from its backtest error", () => {
    const averaged = familiesOnly(curve, { at: [2000], draws: 50 });
    const forced = familiesOnly(curve, { at: [2000], draws: 50, family: "pow3" });
    expect(forced.family).toBe("pow3");
    expect(forced.familyWeights).toEqual({ pow3: 1 });
    expect(Object.keys(forced.backtest!.rootMeanSquareError)).toEqual(["pow3"]);
    // pow3 cannot follow exp3's fast saturation; its backtest error sets a positive extrapolation error.
    expect(Math.abs(forced.projections[0].expected - exp3Truth(2000))).toBeGreaterThan(0.005);
    expect(forced.backtest!.extrapolationError.pow3).toBeGreaterThan(0);
    const width = (f: typeof forced) => f.projections[0].upper - f.projections[0].lower;
    expect(width(forced)).toBeGreaterThan(width(averaged));
  });

  it("forces the no-gain baseline: every projection is the last measured mean", () => {
    const forecast = familiesOnly(curve, { at: [1000, 4000], draws: 20, family: "last" });
    for (const p of forecast.projections) expect(p.expected).toBe(exp3Truth(800));
  });
});

describe("forecastCurve on noisy points from a known pow3", () => {
  const curve = curveOf(noisyPoints(accuracyTruth, 11));
  const forecast = familiesOnly(curve);

  it("summarizes each size with the sample mean and standard deviation (simple-statistics)", () => {
    forecast.measured.forEach((summary, i) => {
      expect(summary.mean).toBeCloseTo(mean(curve.points[i].scores), 14);
      expect(summary.standardDeviation).toBeCloseTo(sampleStandardDeviation(curve.points[i].scores), 14);
    });
  });

  it("has an 80% interval at 3× rows that contains the truth, built from the draws' quantiles", () => {
    const atThree = forecast.projections.find((p) => p.trainingSize === 3000)!;
    expect(atThree.level).toBe(0.8);
    expect(atThree.lower).toBeLessThanOrEqual(accuracyTruth(3000));
    expect(atThree.upper).toBeGreaterThanOrEqual(accuracyTruth(3000));
    expect(atThree.upper - atThree.lower).toBeGreaterThan(0.001);
    for (const projection of forecast.projections) {
      expect(projection.draws).toHaveLength(200);
      expect(projection.draws.every(Number.isFinite)).toBe(true);
      // lower and upper are the 10% and 90% quantiles (type 7) of the draws, widened to hold the expected score.
      const sorted = projection.draws.slice().sort((p, q) => p - q);
      // (The forecast computes the probabilities as (1 ∓ level) / 2, a rounding away from 0.1 and 0.9.)
      expect(projection.lower).toBeCloseTo(Math.min(projection.expected, quantileSorted(sorted, 0.1)), 12);
      expect(projection.upper).toBeCloseTo(Math.max(projection.expected, quantileSorted(sorted, 0.9)), 12);
    }
  });

  it("widens the interval the further it extrapolates", () => {
    // Not strictly size by size (refitted curves can cross), but from 1.25 to 6.25 times the largest size.
    const widths = forecast.projections.map((p) => p.upper - p.lower);
    expect(widths[4]).toBeGreaterThan(widths[0]);
  });

  it("gives a wider single-model interval around the expected-score interval", () => {
    expect(forecast.testSize).toBe(1000);
    for (const p of forecast.projections) {
      expect(p.singleModelLower!).toBeLessThanOrEqual(p.lower);
      expect(p.singleModelUpper!).toBeGreaterThanOrEqual(p.upper);
      expect(p.singleModelUpper! - p.singleModelLower!).toBeGreaterThan(p.upper - p.lower);
    }
  });

  it("covers the truth at 3× rows in most of 30 synthetic data sets, without being uselessly wide", () => {
    // 30 data sets, 60 draws each. During development 27 of 30 (0.9) intervals covered the truth, with
    // a mean width of about 4 points. A broken interval (draws not varying, or not centered) covers far
    // less; one that ignored the data would be far wider. Thresholds: coverage ≥ 0.6, width ≤ 0.1.
    let covered = 0;
    let width = 0;
    const dataSets = 30;
    for (let d = 0; d < dataSets; d++) {
      const projection = familiesOnly(curveOf(noisyPoints(accuracyTruth, 100 + d)), { draws: 60, at: [3000] })
        .projections[0];
      if (projection.lower <= accuracyTruth(3000) && accuracyTruth(3000) <= projection.upper) covered++;
      width += (projection.upper - projection.lower) / dataSets;
    }
    expect(covered / dataSets).toBeGreaterThanOrEqual(0.6);
    expect(width).toBeLessThan(0.1);
  });
});

describe("forecastCurve uncertainty parts", () => {
  // Each repeat adds one constant shift at every size and nothing else, so every bootstrap refit of
  // pow3 is exactly pow3(truth) + (mean of the drawn shifts), and the backtest errors of pow3 are 0.
  const shifts = [-0.02, -0.005, 0, 0.01, 0.03];
  const points = sizes.map((trainingSize) => ({
    trainingSize,
    scores: shifts.flatMap((s) => Array(5).fill(accuracyTruth(trainingSize) + s)),
  }));
  // pow3 alone: its backtest errors are 0, so its draws carry no extrapolation error.
  const forecast = familiesOnly(curveOf(points), { at: [1000, 5000], family: "pow3" });

  it("draw j of every projection comes from the same curve: the same shift at every size", () => {
    const [near, far] = forecast.projections;
    near.draws.forEach((draw, j) => {
      const shiftNear = draw - accuracyTruth(1000);
      const shiftFar = far.draws[j] - accuracyTruth(5000);
      expect(Math.abs(shiftNear - shiftFar)).toBeLessThan(1e-6);
    });
  });

  it("adds the Nadeau–Bengio shift to the bootstrap: the draws' variance is their sum", () => {
    // Scores at the largest size: J = 25 fits, variance σ²; test folds of rows / folds = 200 rows
    // against 800 training rows. Nadeau and Bengio's corrected variance of the mean is
    // (1/J + 200/800)·σ²; resampling repeats supplies var(repeat means)/R of it, the shift the rest.
    const scores = points[points.length - 1].scores;
    const corrected = (1 / 25 + 200 / 800) * sampleVariance(scores);
    const repeatMeans = shifts.map((s) => accuracyTruth(800) + s);
    const resampling = sampleVariance(repeatMeans) / 5;
    expect(forecast.sampleStandardDeviation!).toBeCloseTo(Math.sqrt(corrected - resampling), 12);
    // The bootstrap mean of 5 repeats drawn with replacement has variance Σ(s − s̄)²/5 / 5.
    const shiftMean = mean(shifts);
    const bootstrapVariance = shifts.reduce((s, v) => s + (v - shiftMean) ** 2, 0) / 5 / 5;
    const expectedSd = Math.sqrt(bootstrapVariance + (corrected - resampling));
    const drawSd = sampleStandardDeviation(forecast.projections[0].draws);
    // 200 draws estimate a standard deviation to about ±5% (1/sqrt(2·200)); allow 20%.
    expect(Math.abs(drawSd / expectedSd - 1)).toBeLessThan(0.2);
  });

  it("gives the same forecast when the repeats are given by repeatOfScore, whatever the order of the scores", () => {
    // Reverse each size's scores and label them: repeatOfScore, not the position, says the repeat.
    const labeled = points.map((p) => ({
      ...p,
      scores: p.scores.slice().reverse(),
      repeatOfScore: p.scores.map((_, s) => 4 - Math.floor(s / 5)),
    }));
    const other = familiesOnly(curveOf(labeled), { at: [1000, 5000], family: "pow3" });
    // Equal up to the round-off of summing the scores in another order.
    other.projections.forEach((p, i) => {
      const q = forecast.projections[i];
      expect(p.expected).toBeCloseTo(q.expected, 12);
      expect(p.lower).toBeCloseTo(q.lower, 10);
      expect(p.upper).toBeCloseTo(q.upper, 10);
      p.draws.forEach((draw, j) => expect(draw).toBeCloseTo(q.draws[j], 10));
    });
    expect(other.sampleStandardDeviation).toBeCloseTo(forecast.sampleStandardDeviation!, 14);
  });

  it("narrows the single-model interval as the test set grows, down to the expected-score interval's scale", () => {
    const curve = curveOf(noisyPoints(accuracyTruth, 12));
    const small = familiesOnly(curve, { at: [3000], draws: 100, testSize: 20 }).projections[0];
    const large = familiesOnly(curve, { at: [3000], draws: 100, testSize: 100_000 }).projections[0];
    const half = (p: typeof small) => (p.singleModelUpper! - p.singleModelLower!) / 2;
    expect(half(small)).toBeGreaterThan(half(large));
    // With 20 test rows the binomial sd alone is sqrt(p(1 − p)/20) ≈ 0.07; a central 80% interval
    // of it spans ±1.28 sd. Allow 10% for the clamping at 1 and the simulation.
    const p = small.expected;
    expect(half(small)).toBeGreaterThan(0.9 * 1.2816 * Math.sqrt((p * (1 - p)) / 20));
    expect(small.lower).toBe(large.lower);
    expect(small.upper).toBe(large.upper);
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
    const forecast = familiesOnly(curve);
    const largestMeasuredMean = forecast.measured[forecast.measured.length - 1].mean;
    const expected = forecast.projections.map((p) => p.expected);
    expect(expected[0]).toBeLessThan(largestMeasuredMean);
    for (let k = 1; k < expected.length; k++) expect(expected[k]).toBeLessThan(expected[k - 1]);
    // The asymptote in score units lies below every projection and near the truth 0.3.
    expect(forecast.asymptote!).toBeLessThan(expected[expected.length - 1]);
    expect(forecast.asymptote!).toBeGreaterThan(0.2);
    expect(forecast.asymptote!).toBeLessThan(0.4);
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
    const forecast = familiesOnly(curveOf(points), { at: [1000, 10_000, 100_000], testSize: 10 });
    const values = [
      ...forecast.projections.flatMap((p) => [
        p.expected,
        p.lower,
        p.upper,
        p.singleModelLower!,
        p.singleModelUpper!,
        ...p.draws,
      ]),
      ...forecast.band.flatMap((b) => [b.expected, b.lower, b.upper]),
      forecast.asymptote!,
    ];
    expect(values.every((v) => v >= 0 && v <= 1)).toBe(true);
    for (const parameters of Object.values(forecast.familyParameters!)) {
      expect(Object.values(parameters).every(Number.isFinite)).toBe(true);
    }
  });
});

describe("forecastCurve: the smallest training size reaching a target", () => {
  const exact = curveOf(exactPoints(accuracyTruth));

  it("solves the expected curve for the target: n = (b / (a − target))^(1/c), rounded up", () => {
    // pow3 0.92 − 1.5·n^(−0.55) reaches 0.88 at n = (1.5 / 0.04)^(1/0.55) ≈ 727.5 (closed form).
    const forecast = familiesOnly(exact, { at: [1000], draws: 50, target: 0.88 });
    const exactSize = Math.pow(1.5 / 0.04, 1 / 0.55);
    expect(forecast.targetSize!.expected).toBe(Math.ceil(exactSize));
    // Every draw is the same curve here, so any confidence gives the same size.
    expect(forecast.targetSize!.withConfidence).toBe(Math.ceil(exactSize));
    expect(forecast.targetSize!.target).toBe(0.88);
    expect(forecast.targetSize!.confidence).toBe(0.8);
  });

  it("answers null for a target above the asymptote, and searches up to 10,000 × the largest size", () => {
    const forecast = familiesOnly(exact, { at: [1000], draws: 50, target: 0.95 });
    expect(forecast.targetSize).toEqual({
      target: 0.95,
      confidence: 0.8,
      expected: null,
      withConfidence: null,
      searchedUpTo: 8_000_000,
    });
  });

  it("answers the smallest measured size for a target already reached there", () => {
    const forecast = familiesOnly(exact, { at: [1000], draws: 50, target: 0.5 });
    expect(forecast.targetSize!.expected).toBe(25);
  });

  it("asks for more samples to reach a target with higher confidence on a noisy curve", () => {
    const curve = curveOf(noisyPoints(accuracyTruth, 13));
    const at = (confidence: number) =>
      familiesOnly(curve, { at: [1000], draws: 100, target: 0.885, confidence }).targetSize!;
    const likely = at(0.6);
    const sure = at(0.95);
    expect(likely.expected).not.toBeNull();
    expect(sure.withConfidence ?? Infinity).toBeGreaterThan(likely.withConfidence!);
    expect(sure.withConfidence ?? Infinity).toBeGreaterThan(sure.expected!);
  });

  it("reads the target in the metric's own direction for a lower-is-better metric", () => {
    const logLoss = (n: number) => 0.3 + 2 * Math.pow(n, -0.5);
    const curve = curveOf(exactPoints(logLoss), {
      metric: "log loss",
      higherIsBetter: false,
      metricRange: [0, Infinity],
    });
    // 0.3 + 2/sqrt(n) ≤ 0.35 from n = (2 / 0.05)² = 1600 on.
    expect(familiesOnly(curve, { at: [1000], draws: 20, target: 0.35 }).targetSize!.expected).toBe(1600);
  });
});

describe("forecastCurve determinism", () => {
  const curve = curveOf(noisyPoints(accuracyTruth, 21));

  it("gives identical output for the same seed", () => {
    expect(familiesOnly(curve, { seed: 42 })).toEqual(familiesOnly(curve, { seed: 42 }));
  });

  it("gives different draws for a different seed, and records the seed", () => {
    const first = familiesOnly(curve, { seed: 1 });
    const second = familiesOnly(curve, { seed: 2 });
    expect(first.seed).toBe(1);
    expect(second.seed).toBe(2);
    expect(first.projections[0].draws).not.toEqual(second.projections[0].draws);
  });

  it("forecasts a default eight-size curve with 200 draws in well under two seconds", () => {
    // Measured ~0.2–0.4 s on a loaded 2-core machine; the assertion allows 2 s.
    const eight = curveOf(noisyPoints(accuracyTruth, 22, { at: eightSizes, repeats: 10 }), { repeats: 10 });
    familiesOnly(eight, { draws: 20 });
    const started = performance.now();
    familiesOnly(eight, { draws: 200 });
    expect(performance.now() - started).toBeLessThan(2000);
  });
});

describe("forecastCurve warnings", () => {
  const warningsOf = (curve: CurveFile, at?: number[], family?: string) =>
    familiesOnly(curve, { at, draws: 50, family }).warnings;

  it("warns about fewer than 5 training sizes, and that one unchecked family was fitted", () => {
    const points = exactPoints(accuracyTruth).slice(0, 3);
    expect(warningsOf(curveOf(points), [200])).toEqual([
      expect.stringMatching(/^Only 3 training sizes .* one family was fitted unchecked/),
    ]);
  });

  it("warns when the scores get worse with training size", () => {
    const points = exactPoints((n) => 0.9 - 0.01 * Math.log(n));
    expect(warningsOf(curveOf(points), [1000]).some((w) => w.includes("does not improve: it gets worse"))).toBe(true);
  });

  it("warns when the scores do not rise beyond their noise", () => {
    const points = noisyPoints(() => 0.8, 7, { noise: 0.05 });
    expect(warningsOf(curveOf(points), [1000]).some((w) => w.includes("by more than its noise"))).toBe(true);
  });

  it("warns when the curve dips between two sizes by more than its noise", () => {
    const points = exactPoints(accuracyTruth).map((p) =>
      p.trainingSize === 200 ? { ...p, scores: p.scores.map((s) => s - 0.05) } : p,
    );
    expect(warningsOf(curveOf(points), [1000])).toEqual([
      expect.stringMatching(
        /^The curve is not monotone: the mean score gets worse from training size 100 \(0.8009\) to 200/,
      ),
    ]);
  });

  it("warns when the score is already at the metric's best value", () => {
    const points = exactPoints((n) => Math.min(1, 0.9 + n / 4000));
    expect(
      warningsOf(curveOf(points), [1000]).some((w) => w.includes("already at the metric's best possible value")),
    ).toBe(true);
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

  it("warns when the repeat of each score and the test-fold size are unknown", () => {
    const curve = curveOf(noisyPoints(accuracyTruth, 4), { folds: undefined });
    const forecast = familiesOnly(curve, { at: [1000], draws: 50 });
    expect(forecast.warnings).toEqual([
      expect.stringMatching(/does not say which repeat/),
      expect.stringMatching(/does not say how large its test folds were/),
    ]);
    expect(forecast.projections[0].upper).toBeGreaterThan(forecast.projections[0].lower);
  });

  it("warns when a forced family has too many parameters to be backtested", () => {
    const points = noisyPoints(accuracyTruth, 5).slice(0, 5);
    expect(warningsOf(curveOf(points), [1000], "pow4")).toEqual([
      expect.stringMatching(/^The pow4 family has 4 parameters, too many to check/),
    ]);
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
    expect(() => familiesOnly(curveOf(points))).toThrow(FitError);
    expect(() => familiesOnly(curveOf(points))).toThrow(message);
  });

  it.each([
    { options: { level: 1 }, message: /^level: must be between 0 and 1/ },
    { options: { draws: 0 }, message: /^draws: must be an integer/ },
    { options: { seed: 1.5 }, message: /^seed: must be an integer/ },
    { options: { at: [1000, -5] }, message: /^at: projection size -5 is not a positive number/ },
    { options: { family: "pow9" }, message: /^family: unknown name .pow9. \(known: pow3, pow4/ },
    {
      options: { target: 90 },
      message: /^target: 90 is outside the accuracy range \[0, 1\] \(give accuracy as a fraction/,
    },
    { options: { target: 0.9, confidence: 1 }, message: /^confidence: must be between 0 and 1/ },
    { options: { testSize: 0 }, message: /^testSize: must be a whole number of at least 1, not 0/ },
    { options: { testSize: 2.5 }, message: /^testSize: must be a whole number of at least 1, not 2.5/ },
  ])("throws UsageError for options $options", ({ options, message }) => {
    const curve = curveOf(exactPoints(accuracyTruth));
    expect(() => familiesOnly(curve, options)).toThrow(UsageError);
    expect(() => familiesOnly(curve, options)).toThrow(message);
  });

  it("projects to multiples of the largest measured size when rows are unknown", () => {
    const resolved = resolveForecastOptions(curveOf(exactPoints(accuracyTruth), { rows: 0 }));
    expect(resolved.at).toEqual([800, 1200, 1600, 2400, 4000]);
    expect(resolved.testSize).toBe(800);
  });

  it("sorts and de-duplicates the projection sizes it is given", () => {
    const forecast = familiesOnly(curveOf(exactPoints(accuracyTruth)), { at: [3000, 1000, 2000, 1000], draws: 20 });
    expect(forecast.projections.map((p) => p.trainingSize)).toEqual([1000, 2000, 3000]);
  });
});

describe("forecastCurve's continuation learned from the corpus (gainCorrection.ts)", () => {
  const curve = curveOf(exactPoints(accuracyTruth));
  const learned = forecastCurve(curve, { draws: 50 });
  const own = familiesOnly(curve, { draws: 50 });
  const largest = 800;

  it("follows the family up to the largest measured size, and the learned gain beyond it", () => {
    // On exact pow3 points pow3 takes nearly all the weight, so the expected score is pow3's value at
    // L plus its continued gain written out by hand: o·(m(n) − m(L)) + (c·chord + s·λ·slope +
    // h·(1 − λ)·q·(1 − m(L)))·ln(n / L), with pow3's slope per unit of ln n at L, c·b·L^(−c), in
    // closed form, and λ = L / (L + reliabilitySize). The curve names no learner, so the pooled
    // calibration applies, and no classes, so q = 1/2.
    const { ownWeight, chordWeight, slopeWeight, headroomWeight, reliabilitySize } = shippedCalibrations.pooled;
    const trust = largest / (largest + (reliabilitySize as number));
    const m = accuracyTruth;
    const smallest = 25;
    const n = 5000;
    const chord = (m(largest) - m(smallest)) / Math.log(largest / smallest);
    const slope = 0.55 * 1.5 * Math.pow(largest, -0.55); // d m / d ln n of a − b·n^(−c) at L
    const byHand =
      m(largest) +
      ownWeight * (m(n) - m(largest)) +
      (chordWeight * chord + slopeWeight * trust * slope + headroomWeight * (1 - trust) * 0.5 * (1 - m(largest))) *
        Math.log(n / largest);
    const atFive = learned.projections.find((p) => p.trainingSize === n);
    expect(atFive?.expected).toBeCloseTo(byHand, 4);
    const band = learned.band.filter((b) => b.trainingSize <= largest);
    const ownBand = own.band.filter((b) => b.trainingSize <= largest);
    band.forEach((b, i) => expect(b.expected).toBeCloseTo(ownBand[i].expected, 9));
  });

  it("writes the continuation it used into forecast.json", () => {
    expect(learned.continuation).toEqual({
      ...shippedCalibrations.pooled,
      learnedFrom: null,
      smallestSize: 25,
      best: 1,
      guessError: 0.5,
    });
    expect(own.continuation).toBeUndefined();
  });

  it("counts the distance left by 1 − 1/K for K classes (guessError), 1/2 for other curves", () => {
    expect(guessError({ task: "classification", classNames: ["a", "b"] })).toBe(0.5);
    expect(guessError({ task: "classification", classNames: ["a", "b", "c", "d"] })).toBe(0.75);
    expect(guessError({ task: "regression" })).toBe(0.5);
    expect(guessError({})).toBe(0.5);
    // With ten classes the same curve is forecast to gain more beyond L than with two: the
    // distance-left term is 0.9 / 0.5 as large, and the rest of the gain is the same.
    const n = 5000;
    const expectedAt = (classes: number): number => {
      const classNames = Array.from({ length: classes }, (_, i) => `c${i}`);
      const forecast = forecastCurve(curveOf(exactPoints(accuracyTruth), { classNames, task: "classification" }), {
        draws: 20,
        at: [n],
      });
      return forecast.projections[0].expected;
    };
    const { headroomWeight, reliabilitySize } = shippedCalibrations.pooled;
    const share = 1 - reliabilityOf(reliabilitySize, largest);
    const left = 1 - accuracyTruth(largest);
    expect(expectedAt(10) - expectedAt(2)).toBeCloseTo(
      headroomWeight * share * (0.9 - 0.5) * left * Math.log(n / largest),
      3,
    );
  });

  it("reads a forecast.json written before the factor q with the distance left whole", () => {
    const { guessError: _g, ...earlier } = learned.continuation as NonNullable<typeof learned.continuation>;
    const stored = forecastCurves({ ...learned, continuation: earlier }) as ForecastCurves;
    const now = forecastCurves(learned) as ForecastCurves;
    const { headroomWeight, reliabilitySize } = shippedCalibrations.pooled;
    const share = 1 - reliabilityOf(reliabilitySize, largest);
    const left = 1 - now.expectedAt(largest);
    expect(stored.expectedAt(5000) - now.expectedAt(5000)).toBeCloseTo(
      headroomWeight * share * 0.5 * left * Math.log(5000 / largest),
      3,
    );
  });

  it("reads a forecast.json written before the slope's reliability with the slope and the distance left whole", () => {
    const { reliabilitySize: _c, ...earlier } = learned.continuation as NonNullable<typeof learned.continuation>;
    const stored = forecastCurves({ ...learned, continuation: earlier }) as ForecastCurves;
    const now = forecastCurves(learned) as ForecastCurves;
    // The slope's part grows from s·λ·slope to s·slope, the distance left's from h·(1 − λ)·q·left to
    // h·q·left: together s·slope·(1 − λ) + h·q·left·λ more per unit of ln(n / L). pow3 takes nearly
    // all the weight on exact pow3 points, so slope and left are its own at L.
    const { slopeWeight, headroomWeight, reliabilitySize } = shippedCalibrations.pooled;
    const trust = reliabilityOf(reliabilitySize, largest);
    const slope = 0.55 * 1.5 * Math.pow(largest, -0.55);
    const left = 1 - accuracyTruth(largest);
    expect(stored.expectedAt(5000) - now.expectedAt(5000)).toBeCloseTo(
      (slopeWeight * slope * (1 - trust) + headroomWeight * 0.5 * left * trust) * Math.log(5000 / largest),
      3,
    );
    expect(trust).toBeGreaterThan(0);
    expect(trust).toBeLessThan(1);
  });

  it("uses the continuation learned from the curve's own learner where the corpus has it, else the pooled one", () => {
    for (const learner of Object.keys(shippedCalibrations.byLearner)) {
      const own = shippedCalibrations.byLearner[learner];
      const forecast = forecastCurve(curveOf(exactPoints(accuracyTruth), { learner }), { draws: 20 });
      expect(forecast.continuation).toMatchObject({
        slopeWeight: own.slopeWeight,
        spread: own.spread,
        learnedFrom: learner,
      });
    }
    const other = forecastCurve(curveOf(exactPoints(accuracyTruth), { learner: "svm" }), { draws: 20 });
    expect(other.continuation).toMatchObject({
      slopeWeight: shippedCalibrations.pooled.slopeWeight,
      learnedFrom: null,
    });
    // The per-learner weights differ from the pooled ones, or the choice would go unseen.
    expect(shippedCalibrations.byLearner.forest.slopeWeight).not.toBe(shippedCalibrations.pooled.slopeWeight);
  });

  it("widens the draws beyond L by the learned gain's own error, and only beyond L", () => {
    const calibration = { ...shippedCalibrations.pooled, gainSpread: 0 };
    const without = forecastCurve(curve, { draws: 200, calibration, at: [400, 5000] });
    const withError = forecastCurve(curve, {
      draws: 200,
      calibration: { ...calibration, gainSpread: 0.02 },
      at: [400, 5000],
    });
    const sd = (values: readonly number[]): number => {
      const m = values.reduce((a, b) => a + b, 0) / values.length;
      return Math.sqrt(values.reduce((a, b) => a + (b - m) ** 2, 0) / (values.length - 1));
    };
    // At 400 (below L = 800) the draws are the same; at 5000 they spread further: each draw's gain
    // is off by 0.02 × a normal per unit of ln(5000 / 800) = 1.83, an extra standard deviation of 0.037.
    expect(withError.projections[0].draws).toEqual(without.projections[0].draws);
    const before = sd(without.projections[1].draws);
    const after = sd(withError.projections[1].draws);
    expect(after ** 2 - before ** 2).toBeGreaterThan((0.5 * 0.02 * Math.log(5000 / 800)) ** 2);
    expect(after ** 2 - before ** 2).toBeLessThan((1.5 * 0.02 * Math.log(5000 / 800)) ** 2);
    // The expected score does not move.
    expect(withError.projections[1].expected).toBeCloseTo(without.projections[1].expected, 12);
  });

  it("is left out when a family is forced (--family)", () => {
    const forced = forecastCurve(curve, { family: "pow3", draws: 50 });
    expect(forced.continuation).toBeUndefined();
    expect(forced.projections[4].expected).toBeCloseTo(accuracyTruth(5000), 6);
  });

  it("continuedGain is zero at L and grows with ln(n / L) by the weighted chord, slope and distance left", () => {
    const continuation = {
      ownWeight: 0,
      chordWeight: 0.5,
      slopeWeight: 0.25,
      headroomWeight: 0.1,
      gainSpread: 0,
      smallestSize: 10,
      best: 1,
      guessError: 0.75,
      reliabilitySize: null,
    };
    const model = (n: number): number => 0.5 + 0.1 * Math.log(n); // chord = slope = 0.1 per unit of ln n
    expect(continuedGain(continuation, model, 100, 100)).toBeCloseTo(0, 12);
    const perLog = 0.5 * 0.1 + 0.25 * 0.1 + 0.1 * 0.75 * (1 - model(100));
    expect(continuedGain(continuation, model, 100, 100 * Math.E ** 2)).toBeCloseTo(2 * perLog, 6);
    // With r = 300 and L = 100 the slope counts a quarter (λ = 100 / 400), the distance left three
    // quarters; with L = 900, three quarters and a quarter. (A gentler curve, still below 1 at 900.)
    const shrunk = { ...continuation, reliabilitySize: 300 };
    const gentle = (n: number): number => 0.2 + 0.05 * Math.log(n); // chord = slope = 0.05
    const shrunkPerLog = 0.5 * 0.05 + 0.25 * 0.25 * 0.05 + 0.1 * 0.75 * 0.75 * (1 - gentle(100));
    expect(continuedGain(shrunk, gentle, 100, 100 * Math.E)).toBeCloseTo(shrunkPerLog, 6);
    const largerPerLog = 0.5 * 0.05 + 0.25 * 0.75 * 0.05 + 0.1 * 0.75 * 0.25 * (1 - gentle(900));
    expect(continuedGain(shrunk, gentle, 900, 900 * Math.E)).toBeCloseTo(largerPerLog, 6);
  });
});

describe("R² read on small test folds (foldR2Bias)", () => {
  it("matches a simulation: R² per fold of 10 rows reads low by 3 (1 − R²) / 10 of the value measured", () => {
    // Folds of m = 10 normal targets, predictions off by an independent normal error of variance
    // 1/2, so a large test set would score R² = 1/2. Each fold is scored as r2_score scores it,
    // around its own mean; the chi-square argument in foldR2Bias says they average
    // 1 − (1/2)·10/7 = 0.2857, and that 3 (1 − that) / 10 recovers the 0.2143 they read low.
    const random = new RandomStream(20261203, 1);
    const m = 10;
    const folds = 200000; // standard error of the mean about 0.0013
    let total = 0;
    for (let f = 0; f < folds; f++) {
      const y = Float64Array.from({ length: m }, () => random.normal());
      const predicted = y.map((v) => v + Math.SQRT1_2 * random.normal());
      total += r2.score(y, predicted);
    }
    const measured = total / folds;
    expect(measured).toBeCloseTo(1 - 0.5 * (m / (m - 3)), 2);
    expect(foldR2Bias(measured, m) as number).toBeCloseTo(0.5 - measured, 2);
    expect(foldR2Bias(0.5, 3)).toBeNull();
  });

  it("warns with the size of the bias for R² on small folds, and not for large ones", () => {
    const r2Curve = (rows: number): CurveFile =>
      curveOf(
        exactPoints((n) => 0.6 - 2 * Math.pow(n, -0.5)),
        { metric: "r2", metricRange: undefined, rows, task: "regression" },
      );
    // 50 rows in 5 folds: test folds of 10 rows; at L = 800 the curve reads 0.5293, so about
    // 3 × 0.4707 / 10 = 14 points low.
    const small = forecastCurve(r2Curve(50), { draws: 20, calibration: null });
    expect(small.warnings.join("\n")).toMatch(
      /R² on test folds of about 10 rows.*by about 14 points at the largest size/,
    );
    const large = forecastCurve(r2Curve(5000), { draws: 20, calibration: null });
    expect(large.warnings.join("\n")).not.toMatch(/R² on test folds/);
  });
});
