/**
 * The measured learning curve as the forecast sees it: the points checked and sorted, each size's
 * mean, spread and number of fits, which repeat each score came from (for resampling), the oriented
 * values with their least-squares weights, and the variance of each size's mean.
 */
import type { CurveFile, CurvePoint } from "../curve/curveFile.js";
import { FitError } from "../errors.js";
import { message } from "../messages.js";
import { orientationSign, type Orientation, type OrientedPoint } from "../fit/families.js";
import type { MeasuredSummary } from "./forecastFile.js";
import { quantileSorted } from "./quantile.js";
import { mean, sampleVariance } from "../numerics/statistics.js";

/** How the scores at one training size are resampled. */
export type ResamplingUnit =
  { kind: "repeats"; scoresOfRepeat: Map<number, number[]> } | { kind: "scores"; scores: number[] };

export interface MeasuredCurve {
  orientation: Orientation;
  /** +1 when higher is better, −1 when lower is better. */
  sign: 1 | -1;
  /** Points sorted by training size. */
  points: CurvePoint[];
  summaries: MeasuredSummary[];
  units: ResamplingUnit[];
  /** `sign · mean` with the least-squares weight of each size. */
  oriented: OrientedPoint[];
  /**
   * Variance of each size's mean from the scatter of its repeats: the variance of the repeat means
   * over the number of repeats, or of the scores over their number when repeats are unknown. It is
   * what resampling repeats sees, not yet the variance from which samples were collected.
   */
  meanVariances: number[];
}

/** A variance floor of this fraction of the median positive variance caps any point's weight. */
const varianceFloorFraction = 0.1;

/**
 * Checks and summarizes a curve.
 * @throws FitError when the curve has fewer than 3 distinct training sizes, a non-finite score, an
 *   empty or duplicated training size, an inconsistent `repeatOfScore` or a bad metric range.
 */
export function measuredCurve(curve: CurveFile): MeasuredCurve {
  const points = validatedPoints(curve);
  const orientation: Orientation = { higherIsBetter: curve.higherIsBetter, metricRange: curve.metricRange };
  const sign = orientationSign(orientation);
  const summaries = points.map((point) => summarize(point));
  const units = points.map((point) => resamplingUnit(point, curve.folds));
  const weights = sizeWeights(summaries);
  const oriented = summaries.map((summary, i) => ({
    trainingSize: summary.trainingSize,
    value: sign * summary.mean,
    weight: weights[i],
  }));
  const meanVariances = units.map((unit, i) => varianceOfMean(unit, summaries[i]));
  return { orientation, sign, points, summaries, units, oriented, meanVariances };
}

/** Checks the points and returns them sorted by training size; throws FitError. */
function validatedPoints(curve: CurveFile): CurvePoint[] {
  if (!Array.isArray(curve.points)) throw new FitError(message.curveNoPoints());
  const range = curve.metricRange;
  // An end may be infinite (log loss: [0, Infinity]); NaN or a reversed pair is an error.
  if (range !== undefined && !(range[0] < range[1])) {
    throw new FitError(message.metricRangeNotIncreasing(range));
  }

  const seen = new Map<number, number>();
  curve.points.forEach((point, index) => {
    const size = point.trainingSize;
    if (!(size > 0) || !Number.isFinite(size)) {
      throw new FitError(message.pointSizeNotPositive(index, size));
    }
    if (seen.has(size)) {
      throw new FitError(message.pointSizeTwice(seen.get(size)!, index, size));
    }
    seen.set(size, index);
    if (point.scores.length === 0) {
      throw new FitError(message.sizeWithoutScores(size));
    }
    point.scores.forEach((score, s) => {
      if (!Number.isFinite(score)) {
        throw new FitError(message.scoreNotFinite(s, size, score));
      }
    });
    if (point.repeatOfScore !== undefined) {
      if (point.repeatOfScore.length !== point.scores.length) {
        throw new FitError(message.repeatOfScoreLength(size, point.scores.length, point.repeatOfScore.length));
      }
      point.repeatOfScore.forEach((repeat, s) => {
        if (!Number.isInteger(repeat) || repeat < 0) {
          throw new FitError(message.repeatNotIndex(s, size, repeat));
        }
      });
    }
  });
  if (seen.size < 3) {
    throw new FitError(message.tooFewSizesToFit(seen.size));
  }
  return curve.points.slice().sort((p, q) => p.trainingSize - q.trainingSize);
}

/** Mean, sample standard deviation (n − 1; 0 for one fit) and number of fits at one size. */
function summarize(point: CurvePoint): MeasuredSummary {
  const fits = point.scores.length;
  const first = point.scores[0];
  if (point.scores.every((score) => score === first)) {
    // Equal scores: report them exactly (a summed-then-divided mean can be off by round-off and
    // leave a spurious variance of 1e-34 that would then set the weights).
    return { trainingSize: point.trainingSize, mean: first, standardDeviation: 0, fits };
  }
  const variance = sampleVariance(point.scores);
  return {
    trainingSize: point.trainingSize,
    mean: mean(point.scores),
    standardDeviation: variance === null ? 0 : Math.sqrt(variance),
    fits,
  };
}

/** Groups a size's scores by repeat (repeatOfScore, else folds), or leaves them ungrouped. */
function resamplingUnit(point: CurvePoint, folds: number | undefined): ResamplingUnit {
  let repeatOf: ((s: number) => number) | null = null;
  if (point.repeatOfScore !== undefined) {
    const labels = point.repeatOfScore;
    repeatOf = (s) => labels[s];
  } else if (folds !== undefined && Number.isInteger(folds) && folds > 0 && point.scores.length % folds === 0) {
    repeatOf = (s) => Math.floor(s / folds);
  }
  if (repeatOf === null) return { kind: "scores", scores: point.scores };
  const scoresOfRepeat = new Map<number, number[]>();
  point.scores.forEach((score, s) => {
    const repeat = repeatOf(s);
    const group = scoresOfRepeat.get(repeat);
    if (group === undefined) scoresOfRepeat.set(repeat, [score]);
    else group.push(score);
  });
  return { kind: "repeats", scoresOfRepeat };
}

/**
 * Weight of each size's mean: fits / max(variance, floor). The floor is a tenth of the median
 * positive variance; a size with a single fit takes the median positive variance as its variance;
 * with no positive variance at all every size gets weight ∝ fits.
 */
function sizeWeights(measured: readonly MeasuredSummary[]): number[] {
  const positive = measured
    .filter((m) => m.fits > 1 && m.standardDeviation > 0)
    .map((m) => m.standardDeviation ** 2)
    .sort((p, q) => p - q);
  if (positive.length === 0) return measured.map((m) => m.fits);
  const median = quantileSorted(positive, 0.5);
  const floor = varianceFloorFraction * median;
  return measured.map((m) => {
    const variance = m.fits > 1 ? m.standardDeviation ** 2 : median;
    return m.fits / Math.max(variance, floor);
  });
}

/** Variance of a size's mean as resampling sees it: between repeat means / repeats, else s² / fits. */
function varianceOfMean(unit: ResamplingUnit, summary: MeasuredSummary): number {
  if (unit.kind === "repeats" && unit.scoresOfRepeat.size > 1) {
    const means = [...unit.scoresOfRepeat.values()].map((scores) => mean(scores));
    return (sampleVariance(means) ?? 0) / means.length;
  }
  return summary.fits > 1 ? summary.standardDeviation ** 2 / summary.fits : 0;
}
