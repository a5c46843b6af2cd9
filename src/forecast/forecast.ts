/**
 * Forecast: fits a learning-curve family to a measured curve and projects the expected score to
 * larger training sizes, with a bootstrap interval.
 */
import type { CurveFile, CurvePoint } from "../curve/curveFile.js";
import { FitError, UsageError } from "../errors.js";
import {
  fitCurveFamily,
  orientationSign,
  pow3,
  type CurveFamily,
  type FamilyFit,
  type Orientation,
  type OrientedPoint,
} from "../fit/families.js";
import { RandomStream } from "../random.js";
import type { BandPoint, ForecastFile, MeasuredSummary, Projection } from "./forecastFile.js";

export interface ForecastOptions {
  /**
   * Training sizes to project to.
   * @default rows × [1, 1.5, 2, 3, 5] (rounded), or the largest measured size × the same when the
   *   curve's rows are unknown
   */
  at?: number[];
  /**
   * Central probability of the interval.
   * @default 0.8
   */
  level?: number;
  /**
   * Seed of the bootstrap.
   * @default 1
   */
  seed?: number;
  /**
   * Bootstrap refits.
   * @default 200
   */
  draws?: number;
}

export interface ResolvedForecastOptions {
  at: number[];
  level: number;
  seed: number;
  draws: number;
}

/** Multiples of the data set's rows projected to by default. */
const defaultMultiples = [1, 1.5, 2, 3, 5];
/** Points of the smooth band. */
const bandPoints = 40;
/** Extrapolation beyond this multiple of the largest measured size draws a warning. */
const extrapolationWarningRatio = 5;
/** A variance floor of this fraction of the median positive variance caps any point's weight. */
const varianceFloorFraction = 0.1;

/** The one resolver of `ForecastOptions`; throws UsageError for a bad option value. */
export function resolveForecastOptions(curve: CurveFile, options: ForecastOptions = {}): ResolvedForecastOptions {
  const level = options.level ?? 0.8;
  if (!(level > 0 && level < 1)) {
    throw new UsageError(`forecast: level must be between 0 and 1 (exclusive), not ${level}`);
  }
  const seed = options.seed ?? 1;
  if (!Number.isSafeInteger(seed)) {
    throw new UsageError(`forecast: seed must be an integer, not ${seed}`);
  }
  const draws = options.draws ?? 200;
  if (!Number.isInteger(draws) || draws < 1 || draws > 100_000) {
    throw new UsageError(`forecast: draws must be an integer from 1 to 100000, not ${draws}`);
  }
  let at: number[];
  if (options.at !== undefined) {
    if (options.at.length === 0) throw new UsageError("forecast: no training sizes to project to");
    for (const size of options.at) {
      if (!(size > 0) || !Number.isFinite(size)) {
        throw new UsageError(`forecast: projection size ${size} is not a positive number`);
      }
    }
    at = options.at.slice();
  } else {
    const base =
      Number.isFinite(curve.rows) && curve.rows > 0 ? curve.rows : Math.max(...curve.points.map((p) => p.trainingSize));
    at = defaultMultiples.map((m) => Math.round(base * m));
  }
  at = [...new Set(at)].sort((p, q) => p - q);
  return { at, level, seed, draws };
}

/** How the scores at one training size are resampled. */
type ResamplingUnit = { kind: "repeats"; scoresOfRepeat: Map<number, number[]> } | { kind: "scores"; scores: number[] };

/**
 * Forecasts the expected score at larger training sizes from a measured learning curve.
 *
 * Phases:
 * 1. Validate and summarise: at least 3 distinct training sizes, each with finite scores; mean,
 *    standard deviation and number of fits per size; the repeat each score belongs to (from
 *    `repeatOfScore`, else `folds`: score r·folds + f is repeat r; else unknown).
 * 2. Orient and weigh: values are `sign · mean` (sign −1 when lower is better) so the curve rises;
 *    each size's weight is fits / max(variance, floor), the floor being a tenth of the median
 *    positive variance (a size with one fit takes the median variance), so a zero-variance size
 *    cannot take all the weight.
 * 3. Point fit: pow3 by weighted Levenberg–Marquardt from several starts (`fitCurveFamily`).
 * 4. Bootstrap (Efron and Tibshirani 1993, percentile method): draw j resamples whole repeats with
 *    replacement, the same repeats at every size (individual scores at a size with no repeat
 *    structure), recomputes the means, and refits with the point fit's weights. A failed refit is
 *    retried from the point fit's parameters, and dropped if that fails too.
 * 5. Project: expected score from the point fit; draw j of every projection from refit j, so draws
 *    are correlated across sizes; lower and upper are the (1 − level)/2 and (1 + level)/2
 *    quantiles (linear interpolation, Hyndman and Fan type 7) of the draws; all clamped to the
 *    metric's range.
 * 6. Band: the same at 40 log-spaced sizes from the smallest measured size to the largest
 *    projection.
 * 7. Warnings in plain English: fewer than 4 sizes, scores not improving, extrapolation beyond 5×
 *    the largest measured size, fewer than 3 repeats, failed refits.
 *
 * Deterministic for a seed: draw j uses `new RandomStream(seed, j)`.
 *
 * @throws FitError when the curve has fewer than 3 distinct training sizes, a non-finite score, an
 *   empty or duplicated training size, an inconsistent `repeatOfScore`, when the point fit fails,
 *   or when every bootstrap refit fails.
 * @throws UsageError for a bad option value.
 */
export function forecastCurve(curve: CurveFile, options: ForecastOptions = {}): ForecastFile {
  // 1. Validate and summarise.
  const points = validatedPoints(curve);
  const resolved = resolveForecastOptions(curve, options);
  const orientation: Orientation = {
    higherIsBetter: curve.higherIsBetter,
    metricRange: curve.metricRange,
  };
  const sign = orientationSign(orientation);
  const measured: MeasuredSummary[] = points.map((point) => summarise(point));
  const units = points.map((point) => resamplingUnit(point, curve.folds));

  // 2. Orient and weigh.
  const weights = sizeWeights(measured);
  const oriented: OrientedPoint[] = measured.map((summary, i) => ({
    trainingSize: summary.trainingSize,
    value: sign * summary.mean,
    weight: weights[i],
  }));

  // 3. Point fit.
  const family: CurveFamily = pow3;
  const pointFit = fitCurveFamily(family, oriented, orientation);

  // 4. Bootstrap.
  const bootstrap = bootstrapRefits(family, oriented, units, orientation, pointFit, resolved);

  // 5. Project.
  const clamp = clampToRange(curve.metricRange);
  const scoreAt = (parameters: readonly number[], size: number): number => clamp(sign * family.model(size, parameters));
  const lowerProbability = (1 - resolved.level) / 2;
  const upperProbability = (1 + resolved.level) / 2;
  const projections: Projection[] = resolved.at.map((trainingSize) => {
    const draws = bootstrap.parameters.map((parameters) => scoreAt(parameters, trainingSize));
    const sorted = draws.slice().sort((p, q) => p - q);
    return {
      trainingSize,
      expected: scoreAt(pointFit.parameters, trainingSize),
      lower: quantileSorted(sorted, lowerProbability),
      upper: quantileSorted(sorted, upperProbability),
      level: resolved.level,
      draws,
    };
  });

  // 6. Band.
  const smallestMeasured = measured[0].trainingSize;
  const largestMeasured = measured[measured.length - 1].trainingSize;
  const bandEnd = Math.max(largestMeasured, resolved.at[resolved.at.length - 1]);
  const band: BandPoint[] = logSpaced(smallestMeasured, bandEnd, bandPoints).map((trainingSize) => {
    const sorted = bootstrap.parameters.map((parameters) => scoreAt(parameters, trainingSize)).sort((p, q) => p - q);
    return {
      trainingSize,
      expected: scoreAt(pointFit.parameters, trainingSize),
      lower: quantileSorted(sorted, lowerProbability),
      upper: quantileSorted(sorted, upperProbability),
    };
  });

  // 7. Warnings.
  const warnings = forecastWarnings(measured, oriented, units, resolved, bootstrap);

  const forecast: ForecastFile = {
    kind: "headroom-forecast",
    version: 1,
    metric: curve.metric,
    higherIsBetter: curve.higherIsBetter,
    family: family.name,
    parameters: family.scoreParameters(pointFit.parameters, orientation),
    measured,
    largestMeasuredSize: largestMeasured,
    level: resolved.level,
    projections,
    band,
    warnings,
    seed: resolved.seed,
  };
  if (curve.metricRange !== undefined) forecast.metricRange = curve.metricRange;
  if (Number.isFinite(curve.rows) && curve.rows > 0) forecast.rows = curve.rows;
  return forecast;
}

/** Checks the points and returns them sorted by training size; throws FitError. */
function validatedPoints(curve: CurveFile): CurvePoint[] {
  if (!Array.isArray(curve.points)) throw new FitError("forecast: the curve has no points");
  const range = curve.metricRange;
  // An end may be infinite (log loss: [0, Infinity]); NaN or a reversed pair is an error.
  if (range !== undefined && !(range[0] < range[1])) {
    throw new FitError(`forecast: metricRange [${range.join(", ")}] is not an increasing pair of numbers`);
  }

  const seen = new Map<number, number>();
  curve.points.forEach((point, index) => {
    const size = point.trainingSize;
    if (!(size > 0) || !Number.isFinite(size)) {
      throw new FitError(`forecast: point ${index} has training size ${size}; sizes must be positive`);
    }
    if (seen.has(size)) {
      throw new FitError(
        `forecast: points ${seen.get(size)} and ${index} both have training size ${size}; merge their scores`,
      );
    }
    seen.set(size, index);
    if (point.scores.length === 0) {
      throw new FitError(`forecast: training size ${size} has no scores`);
    }
    point.scores.forEach((score, s) => {
      if (!Number.isFinite(score)) {
        throw new FitError(`forecast: score ${s} at training size ${size} is ${score}, not a finite number`);
      }
    });
    if (point.repeatOfScore !== undefined) {
      if (point.repeatOfScore.length !== point.scores.length) {
        throw new FitError(
          `forecast: training size ${size} has ${point.scores.length} scores but ${point.repeatOfScore.length} repeatOfScore entries`,
        );
      }
      point.repeatOfScore.forEach((repeat, s) => {
        if (!Number.isInteger(repeat) || repeat < 0) {
          throw new FitError(`forecast: repeatOfScore ${s} at training size ${size} is ${repeat}, not a repeat index`);
        }
      });
    }
  });
  if (seen.size < 3) {
    throw new FitError(
      `forecast: the curve has ${seen.size} distinct training size${seen.size === 1 ? "" : "s"}; at least 3 are needed to fit a curve`,
    );
  }
  return curve.points.slice().sort((p, q) => p.trainingSize - q.trainingSize);
}

/** Mean, sample standard deviation (n − 1; 0 for one fit) and number of fits at one size. */
function summarise(point: CurvePoint): MeasuredSummary {
  const fits = point.scores.length;
  const first = point.scores[0];
  if (point.scores.every((score) => score === first)) {
    // Equal scores: report them exactly (a summed-then-divided mean can be off by round-off and
    // leave a spurious variance of 1e-34 that would then set the weights).
    return { trainingSize: point.trainingSize, mean: first, standardDeviation: 0, fits };
  }
  const mean = point.scores.reduce((s, v) => s + v, 0) / fits;
  let squares = 0;
  for (const score of point.scores) squares += (score - mean) ** 2;
  return {
    trainingSize: point.trainingSize,
    mean,
    standardDeviation: fits > 1 ? Math.sqrt(squares / (fits - 1)) : 0,
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

interface BootstrapResult {
  /** Parameters of each successful refit, in draw order. */
  parameters: number[][];
  requested: number;
  /** Refits that failed from the family's starts and succeeded from the point fit's parameters. */
  retried: number;
  dropped: number;
}

/** Step 4 of `forecastCurve`: resample repeats (or scores), recompute means, refit. */
function bootstrapRefits(
  family: CurveFamily,
  oriented: readonly OrientedPoint[],
  units: readonly ResamplingUnit[],
  orientation: Orientation,
  pointFit: FamilyFit,
  options: ResolvedForecastOptions,
): BootstrapResult {
  const sign = orientationSign(orientation);
  const repeatLabels = [
    ...new Set(units.flatMap((u) => (u.kind === "repeats" ? [...u.scoresOfRepeat.keys()] : []))),
  ].sort((p, q) => p - q);
  const result: BootstrapResult = { parameters: [], requested: options.draws, retried: 0, dropped: 0 };
  for (let j = 0; j < options.draws; j++) {
    const random = new RandomStream(options.seed, j);
    const drawnRepeats = repeatLabels.map(() => repeatLabels[random.integer(repeatLabels.length)]);
    const resampled: OrientedPoint[] = [];
    units.forEach((unit, i) => {
      let sum = 0;
      let count = 0;
      if (unit.kind === "repeats") {
        for (const repeat of drawnRepeats) {
          const scores = unit.scoresOfRepeat.get(repeat);
          if (scores === undefined) continue;
          for (const score of scores) sum += score;
          count += scores.length;
        }
      } else {
        for (let s = 0; s < unit.scores.length; s++) {
          sum += unit.scores[random.integer(unit.scores.length)];
        }
        count = unit.scores.length;
      }
      // A size none of whose repeats was drawn sits this refit out.
      if (count > 0) resampled.push({ ...oriented[i], value: (sign * sum) / count });
    });
    let refit: FamilyFit | null = null;
    try {
      refit = fitCurveFamily(family, resampled, orientation);
    } catch (error) {
      if (!(error instanceof FitError)) throw error;
      try {
        refit = fitCurveFamily(family, resampled, orientation, { startsOnly: [pointFit.parameters] });
        result.retried++;
      } catch (retryError) {
        if (!(retryError instanceof FitError)) throw retryError;
      }
    }
    if (refit === null) result.dropped++;
    else result.parameters.push(refit.parameters);
  }
  if (result.parameters.length === 0) {
    throw new FitError(
      `forecast: none of the ${options.draws} bootstrap refits of ${family.name} succeeded; the interval cannot be estimated`,
    );
  }
  return result;
}

function forecastWarnings(
  measured: readonly MeasuredSummary[],
  oriented: readonly OrientedPoint[],
  units: readonly ResamplingUnit[],
  options: ResolvedForecastOptions,
  bootstrap: BootstrapResult,
): string[] {
  const warnings: string[] = [];
  const first = measured[0];
  const last = measured[measured.length - 1];
  if (measured.length < 4) {
    warnings.push(
      `Only ${measured.length} training sizes were measured; a three-parameter curve through them cannot be checked against the data. Measure at least 4 sizes.`,
    );
  }
  if (!(oriented[oriented.length - 1].value > oriented[0].value)) {
    warnings.push(
      `The mean score does not improve from the smallest training size (${first.trainingSize}: ${formatScore(first.mean)}) to the largest (${last.trainingSize}: ${formatScore(last.mean)}); the curve may be flat or the scores too noisy to extrapolate.`,
    );
  }
  const largestProjection = options.at[options.at.length - 1];
  const ratio = largestProjection / last.trainingSize;
  if (ratio > extrapolationWarningRatio) {
    warnings.push(
      `The largest projection (${largestProjection}) is ${ratio.toFixed(1)} times the largest measured training size (${last.trainingSize}); beyond about ${extrapolationWarningRatio} times, the forecast rests mostly on the assumed shape of the curve.`,
    );
  }
  const repeatCounts = units.filter((u) => u.kind === "repeats").map((u) => u.scoresOfRepeat.size);
  if (repeatCounts.length > 0 && Math.min(...repeatCounts) < 3) {
    warnings.push(
      `Only ${Math.min(...repeatCounts)} repeat${Math.min(...repeatCounts) === 1 ? "" : "s"} at some training size; an interval from resampling fewer than 3 repeats is unreliable. Use at least 3 repeats.`,
    );
  }
  const looseCounts = units.filter((u) => u.kind === "scores").map((u) => u.scores.length);
  if (looseCounts.length > 0) {
    warnings.push(
      `The curve does not say which repeat each score came from${looseCounts.length < units.length ? " at some training sizes" : ""}; the interval resamples individual scores as if they were independent.`,
    );
    if (Math.min(...looseCounts) < 3) {
      warnings.push(
        `Only ${Math.min(...looseCounts)} score${Math.min(...looseCounts) === 1 ? "" : "s"} at some training size; an interval from fewer than 3 scores is unreliable.`,
      );
    }
  }
  if (bootstrap.retried > 0) {
    warnings.push(
      `${bootstrap.retried} of ${bootstrap.requested} bootstrap refits did not converge from the usual starting points and were refitted from the point fit's parameters.`,
    );
  }
  if (bootstrap.dropped > 0) {
    warnings.push(
      `${bootstrap.dropped} of ${bootstrap.requested} bootstrap refits failed and were left out of the interval.`,
    );
  }
  return warnings;
}

function formatScore(score: number): string {
  return Number(score.toPrecision(4)).toString();
}

/** A function clamping a score into the metric's range (identity when unbounded). */
function clampToRange(range: [number, number] | undefined): (score: number) => number {
  if (range === undefined) return (score) => score;
  const [low, high] = range;
  return (score) => Math.min(high, Math.max(low, score));
}

/**
 * Quantile of sorted values by linear interpolation between order statistics (Hyndman and Fan 1996,
 * definition 7; the default of R and NumPy).
 */
export function quantileSorted(sorted: readonly number[], probability: number): number {
  const position = (sorted.length - 1) * probability;
  const below = Math.floor(position);
  const above = Math.min(below + 1, sorted.length - 1);
  return sorted[below] + (position - below) * (sorted[above] - sorted[below]);
}

/** `count` sizes evenly spaced in log from `from` to `to`, both ends exact. */
function logSpaced(from: number, to: number, count: number): number[] {
  if (to <= from) return [from];
  const step = Math.log(to / from) / (count - 1);
  return Array.from({ length: count }, (_, k) => (k === 0 ? from : k === count - 1 ? to : from * Math.exp(step * k)));
}
