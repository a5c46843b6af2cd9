/**
 * Forecast: fits learning-curve families to a measured curve, weighs them by how well they predict
 * held-back sizes, and projects the score to larger training sizes with two intervals: one for the
 * expected score of a model trained at that size, and a wider one for the score one such model
 * would show on a finite test set.
 */
import type { CurveFile } from "../curve/curveFile.js";
import { UsageError } from "../errors.js";
import { curveFamilies, findCurveFamily, type CurveFamily } from "../fit/families.js";
import { message } from "../messages.js";
import { assessFamilies, type AssessedFamily } from "./backtest.js";
import { drawCurves, drawnValue } from "./drawCurves.js";
import { expectedValue, scoreLimits, storeCurve, storeFit, type WeightedFit } from "./storedCurves.js";
import {
  calibrationFor,
  continuationFor,
  guessError,
  shippedCalibrations,
  type Continuation,
  type GainCalibration,
} from "./gainCorrection.js";
import type { BandPoint, ForecastFile, Projection } from "./forecastFile.js";
import { forecastWarnings } from "./forecastWarnings.js";
import { measuredCurve } from "./measuredCurve.js";
import { quantileSorted } from "./quantile.js";
import { sampleShift, singleModelSpread } from "./sampleUncertainty.js";
import { StreamPurpose, streamFor } from "../random.js";
import { sizesInRows } from "../curve/sizesInRows.js";
import { targetSize } from "./targetSize.js";

export { quantileSorted } from "./quantile.js";

export interface ForecastOptions {
  /**
   * Training sizes to project to.
   * @default rows × [1, 1.5, 2, 3, 5] (rounded), or the largest measured size × the same when the
   *   curve's rows are unknown
   */
  at?: number[];
  /**
   * Central probability of both intervals.
   * @default 0.8
   */
  level?: number;
  /**
   * Seed of the resampling.
   * @default 1
   */
  seed?: number;
  /**
   * Drawn curves (bootstrap refits).
   * @default 200
   */
  draws?: number;
  /**
   * Use only this family (a name from `curveFamilies`: pow3, pow4, mmf4, wbl4, exp3, ilog2, last)
   * instead of weighing them all.
   * @default all families, weighted by their backtest
   */
  family?: string;
  /** A target score: the forecast then answers at what training size it is reached. @default none */
  target?: number;
  /**
   * Probability with which the target should be reached, for the second answer.
   * @default 0.8
   */
  confidence?: number;
  /**
   * Test rows of the single-model interval: the size of the test set one model would be scored on.
   * @default the curve's rows (a test set as large as today's data set), else its largest size
   */
  testSize?: number;
  /**
   * Classes of a classification curve that does not record them (a curve read from CSV): how the
   * learned continuation counts the distance left (1 − 1/K, `guessError`). A curve.json records its
   * classes; a different number is refused.
   * @default the curve's `classNames`; none recorded: counted as for two classes
   */
  classes?: number;
  /**
   * The continuation learned from the corpus of measured curves (`gainCorrection.ts`); the corpus
   * evaluation passes one learned without the data set it forecasts; null turns it off (each family
   * extrapolates by its own formula, as with `family`).
   * @default the shipped calibration for the curve's learner (the pooled one for a learner the
   *   corpus did not measure)
   */
  calibration?: GainCalibration | null;
}

export interface ResolvedForecastOptions {
  at: number[];
  level: number;
  seed: number;
  draws: number;
  family: CurveFamily | undefined;
  target: number | undefined;
  confidence: number;
  testSize: number;
  calibration: GainCalibration | null;
  /** The factor of the distance left in the continuation (`guessError`, or 1 − 1/`classes`). */
  guessError: number;
}

/** Multiples of the data set's rows projected to by default. */
const defaultMultiples = [1, 1.5, 2, 3, 5];
/** Points of the smooth band. */
const bandPoints = 40;
/** Normal draws per drawn curve for the single-model interval. */
const singleModelDrawsPerCurve = 5;

/** The one resolver of `ForecastOptions`; throws UsageError for a bad option value. */
export function resolveForecastOptions(curve: CurveFile, options: ForecastOptions = {}): ResolvedForecastOptions {
  const level = options.level ?? 0.8;
  if (!(level > 0 && level < 1)) {
    throw new UsageError(message.betweenZeroAndOne(level), { option: "level" });
  }
  const seed = options.seed ?? 1;
  if (!Number.isSafeInteger(seed)) {
    throw new UsageError(message.seedNotInteger(seed), { option: "seed" });
  }
  const draws = options.draws ?? 200;
  if (!Number.isInteger(draws) || draws < 1 || draws > 100_000) {
    throw new UsageError(message.drawsOutOfRange(draws), { option: "draws" });
  }
  const knownRows = Number.isFinite(curve.rows) && curve.rows > 0;
  const largestMeasured = Math.max(...curve.points.map((p) => p.trainingSize));
  let at: number[];
  if (options.at !== undefined) {
    if (options.at.length === 0) throw new UsageError(message.noProjectionSizes(), { option: "at" });
    for (const size of options.at) {
      if (!(size > 0) || !Number.isFinite(size)) {
        throw new UsageError(message.projectionSizeNotPositive(size), { option: "at" });
      }
    }
    at = options.at.slice();
  } else {
    const base = knownRows ? curve.rows : largestMeasured;
    at = defaultMultiples.map((m) => Math.round(base * m));
  }
  at = [...new Set(at)].sort((p, q) => p - q);

  const family = options.family === undefined ? undefined : familyOption(options.family);
  const target = options.target;
  if (target !== undefined) {
    if (!Number.isFinite(target)) throw new UsageError(message.targetNotFinite(target), { option: "target" });
    const range = curve.metricRange;
    if (range !== undefined && !(target >= range[0] && target <= range[1])) {
      throw new UsageError(message.targetOutsideRange(target, curve.metric, range), { option: "target" });
    }
  }
  const confidence = options.confidence ?? 0.8;
  if (!(confidence > 0 && confidence < 1)) {
    throw new UsageError(message.betweenZeroAndOne(confidence), { option: "confidence" });
  }
  const testSize = options.testSize ?? (knownRows ? curve.rows : largestMeasured);
  if (!(Number.isInteger(testSize) && testSize >= 1)) {
    throw new UsageError(message.testSizeNotWhole(testSize), { option: "testSize" });
  }
  const calibration =
    family !== undefined
      ? null
      : options.calibration === undefined
        ? calibrationFor(shippedCalibrations, curve.learner)
        : options.calibration;
  const classes = options.classes;
  if (classes !== undefined) {
    if (!(Number.isInteger(classes) && classes >= 2)) {
      throw new UsageError(message.classesNotWhole(classes), { option: "classes" });
    }
    if (curve.task === "regression") throw new UsageError(message.classesOfNumericCurve(), { option: "classes" });
    const recorded = curve.classNames?.length ?? 0;
    if (recorded > 0 && recorded !== classes) {
      throw new UsageError(message.classesDiffer(classes, recorded), { option: "classes" });
    }
  }
  const factor = classes === undefined ? guessError(curve) : 1 - 1 / classes;
  return { at, level, seed, draws, family, target, confidence, testSize, calibration, guessError: factor };
}

/** The curve family named by the `family` option; throws UsageError naming the known ones. */
export function familyOption(name: string): CurveFamily {
  try {
    return findCurveFamily(name);
  } catch {
    throw new UsageError(
      message.unknownName(
        name,
        curveFamilies.map((f) => f.name),
      ),
      { option: "family" },
    );
  }
}

/**
 * Forecasts the score at larger training sizes from a measured learning curve.
 *
 * Phases:
 * 1. Validate and summarize (`measuredCurve`): at least 3 distinct training sizes with finite
 *    scores; mean, spread and fits per size; the repeat of each score; oriented values
 *    (`sign · mean`, so the curve rises) weighted by fits / variance with a floor.
 * 2. Fit and weigh the families (`assessFamilies`): each family is fitted by weighted
 *    Levenberg–Marquardt from several starts within bounds; each is backtested (fitted to the
 *    smaller sizes, asked for the larger ones) and weighted by the inverse of its mean squared
 *    backtest error; its backtest errors also set its extrapolation error per unit of log distance.
 *    `family` forces one family.
 * 3. The shift for which samples were collected (`sampleShift`, Nadeau and Bengio 2003).
 * 4. Draws (`drawCurves`): families shared out by weight; a bootstrap over repeats refits each; the
 *    shared shift and the extrapolation error are added.
 * 5. Project: the expected score is the weighted mean of the families' fits; the interval holds the
 *    central `level` of the draws (Hyndman and Fan type 7 quantiles), widened if need be to contain
 *    the expected score; the single-model interval adds to each draw the scatter of one model on a
 *    test set of `testSize` rows (`singleModelSpread`). Everything is clamped to the metric's range.
 * 6. Band: the same at 40 log-spaced sizes from the smallest measured size to the largest projection.
 * 7. The inverse question, when a target is given (`targetSize`).
 * 8. Warnings in plain words (`forecastWarnings`).
 *
 * Deterministic for a seed.
 *
 * @throws FitError when the curve has fewer than 3 distinct training sizes, a non-finite score, an
 *   empty or duplicated training size, an inconsistent `repeatOfScore`, when no family can be
 *   fitted, or when every bootstrap refit fails.
 * @throws UsageError for a bad option value.
 */
export function forecastCurve(measuredIn: CurveFile, options: ForecastOptions = {}): ForecastFile {
  // 1. Validate and summarize (a curve counted in whole runs is restated in rows first).
  const { curve, converted } = sizesInRows(measuredIn);
  const measured = measuredCurve(curve);
  const resolved = resolveForecastOptions(curve, options);
  const { sign, summaries } = measured;
  // A metric without a finite range still has a best value no score passes (R² 1, an error 0).
  const { best, range } = scoreLimits(curve);
  const clampOriented = (value: number): number =>
    range === undefined ? value : Math.min(range[1], Math.max(range[0], value));
  const scoreRange: [number, number] | undefined =
    range === undefined ? undefined : sign > 0 ? [range[0], range[1]] : [-range[1] + 0, -range[0] + 0];
  const toScore = (oriented: number): number => sign * oriented + 0;
  const smallestMeasured = summaries[0].trainingSize;
  const largestMeasured = summaries[summaries.length - 1].trainingSize;

  // 2. Fit and weigh the families.
  const calibration = resolved.calibration;
  const assessment = assessFamilies(measured, resolved.family, resolved.seed, calibration?.spread ?? 1);
  const families = assessment.families;
  const continuation: Continuation | null =
    calibration === null
      ? null
      : continuationFor(calibration, smallestMeasured, best === undefined ? null : sign * best, resolved.guessError);
  const fits: WeightedFit[] = families.map((f) => ({
    family: f.family,
    weight: f.weight,
    parameters: f.fit.parameters,
  }));
  const expectedOriented = (size: number): number => expectedValue(fits, size, largestMeasured, continuation, range);

  // 3. The shift for which samples were collected.
  const shift = sampleShift(curve, measured);

  // 4. Draws.
  const drawn = drawCurves(measured, families, shift.standardDeviation, resolved, continuation);
  const drawsAt = (size: number): number[] => drawn.curves.map((c) => drawnValue(c, size, largestMeasured, range));

  // 5. Project.
  const lowerProbability = (1 - resolved.level) / 2;
  const upperProbability = (1 + resolved.level) / 2;
  const spread = singleModelSpread(curve, measured, resolved.testSize);
  const interval = (expected: number, draws: number[]): { lower: number; upper: number } => {
    const sorted = draws.slice().sort((p, q) => p - q);
    return {
      lower: Math.min(expected, quantileSorted(sorted, lowerProbability)),
      upper: Math.max(expected, quantileSorted(sorted, upperProbability)),
    };
  };
  const projections: Projection[] = resolved.at.map((trainingSize, i) => {
    const orientedDraws = drawsAt(trainingSize);
    const draws = orientedDraws.map(toScore);
    const expected = toScore(expectedOriented(trainingSize));
    const { lower, upper } = interval(expected, draws);
    const single = interval(expected, singleModelValues(draws, trainingSize, i, spread, scoreRange, resolved.seed));
    return {
      trainingSize,
      expected,
      lower,
      upper,
      level: resolved.level,
      draws,
      extrapolationRatio: trainingSize / largestMeasured,
      singleModelLower: Math.min(single.lower, lower),
      singleModelUpper: Math.max(single.upper, upper),
    };
  });

  // 6. Band.
  const bandEnd = Math.max(largestMeasured, resolved.at[resolved.at.length - 1]);
  const band: BandPoint[] = logSpaced(smallestMeasured, bandEnd, bandPoints).map((trainingSize) => {
    const expected = toScore(expectedOriented(trainingSize));
    return { trainingSize, expected, ...interval(expected, drawsAt(trainingSize).map(toScore)) };
  });

  // 7. The inverse question.
  const answer =
    resolved.target === undefined
      ? undefined
      : targetSize(
          resolved.target,
          resolved.confidence,
          sign * resolved.target,
          expectedOriented,
          drawsAt,
          smallestMeasured,
          largestMeasured,
        );

  // 8. Warnings.
  const warnings = forecastWarnings({ curve, measured, options: resolved, assessment, drawn, shift });
  if (converted) {
    warnings.unshift(
      `The curve was measured in whole runs; its sizes are restated in samples at the mean of ${formatRowsPerRun(curve.rowsPerRun as number)} samples per run.`,
    );
  }

  const leading = leadingFamily(families);
  const forecast: ForecastFile = {
    kind: "headroom-forecast",
    version: 1,
    metric: curve.metric,
    higherIsBetter: curve.higherIsBetter,
    family: leading.family.name,
    parameters: leading.family.scoreParameters(leading.fit.parameters, measured.orientation),
    measured: summaries,
    largestMeasuredSize: largestMeasured,
    level: resolved.level,
    projections,
    band,
    warnings,
    seed: resolved.seed,
    familyWeights: Object.fromEntries(families.map((f) => [f.family.name, f.weight])),
    familyParameters: Object.fromEntries(
      families.map((f) => [f.family.name, f.family.scoreParameters(f.fit.parameters, measured.orientation)]),
    ),
    asymptote: toScore(
      clampOriented(families.reduce((s, f) => s + f.weight * f.family.asymptote(f.fit.parameters), 0)),
    ),
    extrapolationRatio: resolved.at[resolved.at.length - 1] / largestMeasured,
    sampleStandardDeviation: shift.standardDeviation,
    testSize: resolved.testSize,
    curves: { drawn: drawn.curves.map(storeCurve), fits: fits.map(storeFit) },
  };
  if (assessment.backtested) {
    forecast.backtest = {
      predictions: assessment.predictions,
      rootMeanSquareError: Object.fromEntries(
        families.filter((f) => f.backtestError !== null).map((f) => [f.family.name, f.backtestError as number]),
      ),
      extrapolationError: Object.fromEntries(
        families.filter((f) => f.backtestError !== null).map((f) => [f.family.name, f.extrapolationError]),
      ),
    };
  }
  if (answer !== undefined) forecast.targetSize = answer;
  if (continuation !== null && calibration !== null) {
    forecast.continuation = {
      ownWeight: continuation.ownWeight,
      chordWeight: continuation.chordWeight,
      slopeWeight: continuation.slopeWeight,
      headroomWeight: continuation.headroomWeight,
      spread: calibration.spread,
      gainSpread: calibration.gainSpread,
      learnedFrom: calibration.learner ?? null,
      smallestSize: continuation.smallestSize,
      best: continuation.best === null ? null : sign * continuation.best + 0,
      guessError: continuation.guessError,
      ...(continuation.reliabilitySize === null ? {} : { reliabilitySize: continuation.reliabilitySize }),
    };
  }
  if (curve.metricRange !== undefined) forecast.metricRange = curve.metricRange;
  if (Number.isFinite(curve.rows) && curve.rows > 0) forecast.rows = curve.rows;
  return forecast;
}

/** The family with the largest weight (the first listed on a tie). */
function leadingFamily(families: readonly AssessedFamily[]): AssessedFamily {
  return families.reduce((best, f) => (f.weight > best.weight ? f : best), families[0]);
}

/**
 * Values one model trained at `trainingSize` would score on the test set: each draw plus
 * `singleModelDrawsPerCurve` normal deviates with the single-model variance, clamped to the range.
 * Draw j's deviates come from the stream `StreamPurpose.singleModel` (j, projection).
 */
function singleModelValues(
  draws: readonly number[],
  trainingSize: number,
  projection: number,
  spread: ReturnType<typeof singleModelSpread>,
  range: [number, number] | undefined,
  seed: number,
): number[] {
  const values: number[] = [];
  draws.forEach((draw, j) => {
    const random = streamFor(seed, StreamPurpose.singleModel, j, projection);
    const deviation = Math.sqrt(Math.max(0, spread.variance(draw, trainingSize)));
    for (let k = 0; k < singleModelDrawsPerCurve; k++) {
      const value = draw + deviation * random.normal();
      values.push(range === undefined ? value : Math.min(range[1], Math.max(range[0], value)));
    }
  });
  return values;
}

/** `count` sizes evenly spaced in log from `from` to `to`, both ends exact. */
function logSpaced(from: number, to: number, count: number): number[] {
  if (to <= from) return [from];
  const step = Math.log(to / from) / (count - 1);
  return Array.from({ length: count }, (_, k) => (k === 0 ? from : k === count - 1 ? to : from * Math.exp(step * k)));
}

function formatRowsPerRun(rowsPerRun: number): string {
  return Number.isInteger(rowsPerRun) ? String(rowsPerRun) : rowsPerRun.toFixed(1);
}
