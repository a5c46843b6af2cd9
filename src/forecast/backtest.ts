/**
 * Choosing between learning-curve families by how well they predict sizes they were not fitted to.
 *
 * A family that fits the measured points well can still extrapolate badly: in-sample fit rewards
 * flexibility, not foresight. So each family is fitted to the smaller measured sizes only and asked
 * to predict the larger ones held back (leave-future-out cross-validation, as for time series:
 * Bürkner, Gabry and Vehtari 2020, "Approximate leave-future-out cross-validation for Bayesian time
 * series models"; for learning curves, the extrapolation studies of Mohr et al. 2022, LCDB). Then:
 *
 * - Weights. Each family's weight is proportional to the inverse of its mean squared backtest error
 *   (Bates and Granger 1969, "The combination of forecasts"; Stock and Watson 2004, "Combination
 *   forecasts of output growth in a seven-country data set"), with the error floored at the noise
 *   of the held-back means, since errors below the noise cannot tell families apart. Inverse-error
 *   weights shrink toward equal weights when the errors are alike, which is known to forecast well
 *   ("the forecast combination puzzle", Smith and Wallis 2009).
 * - Extrapolation error. A backtest error e mixes the error of the family's shape with noise: the
 *   noise of the held-back mean and of the fit to the smaller sizes. The noise part is measured by
 *   repeating each backtest on bootstrap resamples of the repeats (`resampledPoints`; 30 resamples,
 *   the held-back mean taken from the same resample, so the two noises' correlation is kept): its
 *   variance v is the variance of the resampled errors. What the noise does not explain is the
 *   family's extrapolation error. It is modeled as a random walk in log training size: its
 *   variance grows in proportion to the distance L = ln(predicted size / largest fitted size), as
 *   the forecast variance of an integrated series grows with the horizon (Box and Jenkins, "Time
 *   series analysis: forecasting and control", random-walk forecasts). Its variance per unit of L is
 *   τ² = max(0, Σ(e² − v)) / Σ L over the backtest predictions. The forecast adds
 *   τ · sqrt(ln(n / largest measured size)) of normal error to the family's draws at size n; the
 *   noise itself is already in the draws, which refit bootstrap resamples too. (Error growing in
 *   proportion to L instead, τ² = Σ(e² − v) / Σ L², gave intervals that widened too fast: on
 *   generated latent-logistic curves, coverage of nominal 80% intervals rose from 87% at 3 times
 *   the pilot to 91% at 10 times, against 86–87% at every distance for the random walk.)
 *
 * Cuts. With S measured sizes, fits use the first m sizes for m = max(4, S − 3) … S − 1, and each
 * predicts every larger size (six predictions per family for the default eight sizes). A family
 * takes part only if it has fewer parameters than the smallest cut, so every backtest fit has a
 * residual degree of freedom. With 4 sizes or fewer there is no backtest: pow3 alone is fitted.
 */
import { FitError } from "../errors.js";
import { message } from "../messages.js";
import {
  curveFamilies,
  fitCurveFamily,
  orientedRange,
  pow3,
  type CurveFamily,
  type FamilyFit,
  type OrientedPoint,
} from "../fit/families.js";
import { StreamPurpose, streamFor } from "../random.js";
import type { BacktestPrediction } from "./forecastFile.js";
import type { MeasuredCurve } from "./measuredCurve.js";
import { repeatLabels, resampledPoints } from "./resampling.js";
import { mean, sampleVariance } from "../numerics/statistics.js";

/** One family as the forecast uses it. */
export interface AssessedFamily {
  family: CurveFamily;
  /** The fit to every measured size. */
  fit: FamilyFit;
  /** Weight in the combined forecast (the weights sum to 1). */
  weight: number;
  /** Root mean square backtest error in the metric's units; null when it could not be backtested. */
  backtestError: number | null;
  /**
   * τ: standard deviation of extrapolation error at one unit of ln(extrapolation ratio) (it grows as
   * the square root of that log ratio), in the metric's units.
   */
  extrapolationError: number;
}

export interface FamilyAssessment {
  families: AssessedFamily[];
  /** Every backtest prediction, in the metric's units, for the report's backtest chart. */
  predictions: BacktestPrediction[];
  /** Whether any family could be backtested (false: too few sizes, or a forced family too large). */
  backtested: boolean;
  /** Families that were tried and left out, with the reason. */
  leftOut: { family: string; reason: string }[];
  /** Sizes the smallest backtest fit uses (0 when there is no backtest). */
  firstCut: number;
}

/** Bootstrap resamples that measure the noise in the backtest errors. */
const backtestResamples = 30;

/** Smallest number of sizes a backtest fit uses, for S measured sizes (no backtest when > S − 1). */
export function firstBacktestCut(sizeCount: number): number {
  return Math.max(4, sizeCount - 3);
}

/**
 * Fits the candidate families, backtests them and weighs them (see the file comment).
 * @param forced a family the user chose (`--family`); it alone is used, backtested when it can be.
 * @param seed seeds the backtest's resamples, `StreamPurpose.backtestResample` (resample r).
 * @param spread multiplies every family's extrapolation error (the corpus calibration's).
 * @throws FitError when no candidate family can be fitted.
 */
export function assessFamilies(
  measured: MeasuredCurve,
  forced: CurveFamily | undefined,
  seed: number,
  spread = 1,
): FamilyAssessment {
  const { oriented, orientation } = measured;
  const sizeCount = oriented.length;
  const firstCut = firstBacktestCut(sizeCount);
  const canBacktest = firstCut <= sizeCount - 1;
  const candidates = forced
    ? [forced]
    : canBacktest
      ? curveFamilies.filter((f) => f.parameterNames.length < firstCut)
      : [pow3];
  const range = orientedRange(orientation);
  const clampOriented = (value: number): number =>
    range === undefined ? value : Math.min(range[1], Math.max(range[0], value));

  const labels = repeatLabels(measured);
  const resamples = canBacktest
    ? Array.from({ length: backtestResamples }, (_, r) =>
        resampledPoints(measured, labels, streamFor(seed, StreamPurpose.backtestResample, r)),
      )
    : [];

  const leftOut: { family: string; reason: string }[] = [];
  const kept: { family: CurveFamily; fit: FamilyFit; errors: BacktestErrors | null }[] = [];
  const predictions: BacktestPrediction[] = [];
  for (const family of candidates) {
    let fit: FamilyFit;
    try {
      fit = fitCurveFamily(family, oriented, orientation);
    } catch (error) {
      if (!(error instanceof FitError)) throw error;
      leftOut.push({ family: family.name, reason: error.message });
      continue;
    }
    let errors: BacktestErrors | null = null;
    if (canBacktest && family.parameterNames.length < firstCut) {
      const outcome = backtestFamily(family, measured, firstCut, clampOriented, resamples);
      if (typeof outcome === "string") {
        if (forced === undefined) {
          leftOut.push({ family: family.name, reason: outcome });
          continue;
        }
      } else {
        errors = outcome.errors;
        predictions.push(...outcome.predictions);
      }
    }
    kept.push({ family, fit, errors });
  }
  if (kept.length === 0) {
    throw new FitError(message.noFamilyFitted(leftOut));
  }

  // Weights ∝ 1 / max(MSE, noise floor); a family without a backtest (forced, or the pow3 fallback)
  // is alone and takes weight 1.
  const floor = Math.max(
    mean(kept.flatMap((k) => (k.errors ? k.errors.noise : []))),
    1e-12 * Math.max(1, ...oriented.map((p) => p.value * p.value)),
  );
  const inverse = kept.map((k) => (k.errors ? 1 / Math.max(mean(k.errors.squared), floor) : 1));
  const total = inverse.reduce((s, v) => s + v, 0);
  const families: AssessedFamily[] = kept.map((k, i) => ({
    family: k.family,
    fit: k.fit,
    weight: inverse[i] / total,
    backtestError: k.errors ? Math.sqrt(mean(k.errors.squared)) : null,
    extrapolationError: k.errors ? spread * extrapolationError(k.errors) : 0,
  }));
  return {
    families,
    predictions,
    backtested: kept.some((k) => k.errors !== null),
    leftOut,
    firstCut: canBacktest ? firstCut : 0,
  };
}

/** Squared errors, noise variances and log distances of one family's backtest predictions. */
interface BacktestErrors {
  squared: number[];
  noise: number[];
  logDistance: number[];
}

/**
 * Fits `family` to the first m sizes for each cut m and predicts every larger size; repeats each fit
 * on the bootstrap resamples for the noise variance of each error. Returns the errors in oriented
 * units and the predictions in score units, or the reason a fit failed.
 */
function backtestFamily(
  family: CurveFamily,
  measured: MeasuredCurve,
  firstCut: number,
  clampOriented: (value: number) => number,
  resamples: readonly (OrientedPoint | null)[][],
): { errors: BacktestErrors; predictions: BacktestPrediction[] } | string {
  const { oriented, orientation, sign, meanVariances } = measured;
  const errors: BacktestErrors = { squared: [], noise: [], logDistance: [] };
  const predictions: BacktestPrediction[] = [];
  for (let cut = firstCut; cut < oriented.length; cut++) {
    const fitted: OrientedPoint[] = oriented.slice(0, cut);
    let fit: FamilyFit;
    try {
      fit = fitCurveFamily(family, fitted, orientation);
    } catch (error) {
      if (!(error instanceof FitError)) throw error;
      return `backtest fit to the ${cut} smallest sizes failed: ${error.message}`;
    }
    const fittedUpTo = fitted[cut - 1].trainingSize;
    const resampledErrors = resampledBacktestErrors(
      family,
      orientation,
      fit,
      cut,
      oriented.length,
      clampOriented,
      resamples,
    );
    for (let j = cut; j < oriented.length; j++) {
      const held = oriented[j];
      const predicted = clampOriented(family.model(held.trainingSize, fit.parameters));
      if (!Number.isFinite(predicted)) return `backtest prediction at training size ${held.trainingSize} is not finite`;
      errors.squared.push((predicted - held.value) ** 2);
      errors.noise.push(sampleVariance(resampledErrors[j - cut]) ?? meanVariances[j]);
      errors.logDistance.push(Math.log(held.trainingSize / fittedUpTo));
      predictions.push({
        family: family.name,
        fittedUpTo,
        trainingSize: held.trainingSize,
        predicted: sign * predicted + 0,
        measured: sign * held.value + 0,
      });
    }
  }
  return { errors, predictions };
}

/**
 * For each held-back size j ≥ cut, the backtest errors on the resamples: the family refitted (from
 * the backtest fit's parameters) to a resample's first `cut` sizes, minus that resample's mean at j.
 * A resample whose refit fails, or that lacks a size, is skipped.
 */
function resampledBacktestErrors(
  family: CurveFamily,
  orientation: MeasuredCurve["orientation"],
  fit: FamilyFit,
  cut: number,
  sizeCount: number,
  clampOriented: (value: number) => number,
  resamples: readonly (OrientedPoint | null)[][],
): number[][] {
  const errors: number[][] = Array.from({ length: sizeCount - cut }, () => []);
  for (const resample of resamples) {
    const fitted = resample.slice(0, cut).filter((p): p is OrientedPoint => p !== null);
    if (fitted.length < family.parameterNames.length) continue;
    let refit: FamilyFit;
    try {
      refit = fitCurveFamily(family, fitted, orientation, { startsOnly: [fit.parameters] });
    } catch (error) {
      if (!(error instanceof FitError)) throw error;
      continue;
    }
    for (let j = cut; j < sizeCount; j++) {
      const held = resample[j];
      if (held === null) continue;
      const predicted = clampOriented(family.model(held.trainingSize, refit.parameters));
      if (Number.isFinite(predicted)) errors[j - cut].push(predicted - held.value);
    }
  }
  return errors;
}

/** τ = sqrt(max(0, Σ(e² − v)) / Σ L). */
function extrapolationError(errors: BacktestErrors): number {
  let excess = 0;
  let distance = 0;
  errors.squared.forEach((squared, i) => {
    excess += squared - errors.noise[i];
    distance += errors.logDistance[i];
  });
  return distance > 0 ? Math.sqrt(Math.max(0, excess) / distance) : 0;
}
