/**
 * The forecast's warnings, in plain words, for curves and settings that make a forecast unreliable:
 * too few sizes or repeats, a curve that is not monotone, flat, falling or already at the metric's
 * best value, accuracy no better than always answering the most common class (`mostCommonClass`),
 * far extrapolation, families that could not be fitted or checked, refits that failed, and R² read
 * low on small test folds (`foldR2Bias`). A difference counts as real when it exceeds twice its
 * standard error (from the variance of each size's mean that resampling repeats sees).
 */
import { formatSignificant } from "../format.js";
import type { CurveFile } from "../curve/curveFile.js";
import { mostCommonClass } from "../curve/mostCommonClass.js";
import { accuracy, r2 } from "../curve/metrics.js";
import { orientedRange } from "../fit/families.js";
import type { FamilyAssessment } from "./backtest.js";
import type { DrawnCurves } from "./drawCurves.js";
import type { ResolvedForecastOptions } from "./forecast.js";
import type { MeasuredCurve } from "./measuredCurve.js";
import { assumedTestToTrainingRatio, testRowsPerFold, type SampleShift } from "./sampleUncertainty.js";

/** Extrapolation beyond this multiple of the largest measured size draws a warning. */
export const extrapolationWarningRatio = 5;
/** Fewer measured sizes than this draw a warning (the default curve has 8). */
const fewestSizes = 5;
/** Fewer repeats than this draw a warning. */
const fewestRepeats = 3;
/** Within this fraction of the metric's range of its best value counts as at the ceiling. */
const ceilingFraction = 0.005;
/** An R² read lower than this by its small test folds (`foldR2Bias`) draws a warning. */
const r2BiasWarning = 0.01;

/**
 * How much lower than on new data an R² reads when it is scored on test folds of m rows, each
 * around its own mean (scikit-learn's `r2_score` per fold, as headroom scores it): about
 * 3 (1 − R²) / m, from the R² measured. Null for m ≤ 3.
 *
 * Why. For normally spread targets a fold's spread Σ(y − ȳ)² is σ² times a chi-square of m − 1
 * degrees of freedom, whose reciprocal has mean 1 / (m − 3), while its squared errors sum to about
 * m times the mean squared error; so 1 − R² per fold is about m / (m − 3) times the 1 − R² a model
 * scores on a large test set, and the measured value reads low by 1 − (m − 3) / m of its own
 * 1 − R². On the corpus of measured curves (fixtures/forecast-corpus, numeric targets) the pilots'
 * R² at the largest size lay below the R² of the same size on large test sets by 26, 8.7, 3.9 and
 * 3.0 points on average for test folds of 10, 20, 40 and 80 rows, where this gives 25, 9.9, 4.3
 * and 2.6 (and −0.1 against 1.6 for 160 rows).
 */
export function foldR2Bias(measuredR2: number, testRows: number): number | null {
  return testRows > 3 ? (3 * (1 - measuredR2)) / testRows : null;
}

export interface WarningInput {
  curve: CurveFile;
  measured: MeasuredCurve;
  options: ResolvedForecastOptions;
  assessment: FamilyAssessment;
  drawn: DrawnCurves;
  shift: SampleShift;
}

export function forecastWarnings(input: WarningInput): string[] {
  const { measured, options, assessment, drawn, shift } = input;
  const { summaries, oriented, units, meanVariances } = measured;
  const warnings: string[] = [];
  const count = summaries.length;
  const first = summaries[0];
  const last = summaries[count - 1];
  const noise = (i: number, j: number): number => 2 * Math.sqrt(meanVariances[i] + meanVariances[j]);

  if (count < fewestSizes) {
    warnings.push(
      `Only ${count} training sizes were measured; with fewer than ${fewestSizes} the curve families cannot be checked against held-back sizes${assessment.backtested ? "" : ", so one family was fitted unchecked and the interval leaves out the error of the curve's shape"}. Measure at least 6 sizes (8 by default).`,
    );
  }

  // Shape of the measured curve.
  const rise = oriented[count - 1].value - oriented[0].value;
  if (rise < -noise(0, count - 1)) {
    warnings.push(
      `The mean score does not improve: it gets worse from the smallest training size (${first.trainingSize}: ${formatSignificant(first.mean)}) to the largest (${last.trainingSize}: ${formatSignificant(last.mean)}); more data has not helped so far, and the forecast cannot promise a gain.`,
    );
  } else if (!(rise > noise(0, count - 1))) {
    warnings.push(
      `The mean score does not improve from the smallest training size (${first.trainingSize}: ${formatSignificant(first.mean)}) to the largest (${last.trainingSize}: ${formatSignificant(last.mean)}) by more than its noise; the curve may be flat or the scores too noisy to extrapolate.`,
    );
  } else {
    let worst = -1;
    let worstDrop = 0;
    for (let i = 0; i + 1 < count; i++) {
      const drop = oriented[i].value - oriented[i + 1].value;
      if (drop > noise(i, i + 1) && drop > worstDrop) {
        worst = i;
        worstDrop = drop;
      }
    }
    if (worst >= 0) {
      const a = summaries[worst];
      const b = summaries[worst + 1];
      warnings.push(
        `The curve is not monotone: the mean score gets worse from training size ${a.trainingSize} (${formatSignificant(a.mean)}) to ${b.trainingSize} (${formatSignificant(b.mean)}), by more than its noise; the fitted families all assume more data helps.`,
      );
    }
  }
  const range = orientedRange(measured.orientation);
  if (range !== undefined && Number.isFinite(range[1]) && Number.isFinite(range[0])) {
    const gap = range[1] - oriented[count - 1].value;
    if (gap <= Math.max(2 * Math.sqrt(meanVariances[count - 1]), ceilingFraction * (range[1] - range[0]))) {
      warnings.push(
        `The mean score at the largest training size (${last.trainingSize}: ${formatSignificant(last.mean)}) is already at the metric's best possible value (${formatSignificant(measured.sign * range[1] + 0)}) within its noise; more data has little or no room to help.`,
      );
    }
  }

  // Accuracy no better than always answering the most common class. As for the ceiling, at least
  // half a point (ceilingFraction of accuracy's range 0–1): a model that always answers that class
  // scores it exactly at every repeat (no noise), up to how the test folds happened to split the
  // classes.
  const common = input.curve.metric === accuracy.name ? mostCommonClass(input.curve) : null;
  if (common !== null) {
    const margin = Math.max(2 * Math.sqrt(meanVariances[count - 1]), ceilingFraction);
    if (!(last.mean - common.share > margin)) {
      warnings.push(
        `The mean accuracy at the largest training size (${last.trainingSize}: ${formatSignificant(last.mean)}) is not above the ${formatSignificant(common.share)} that always answering the most common class, '${common.name}', would score, by more than its noise: so far the model does no better than ignoring the features, and a forecast of its accuracy says little. Measuring balanced_accuracy or roc_auc (--metric) shows whether it tells the classes apart at all.`,
      );
    }
  }

  // Extrapolation.
  const largestProjection = options.at[options.at.length - 1];
  const ratio = largestProjection / last.trainingSize;
  if (ratio > extrapolationWarningRatio) {
    warnings.push(
      `The largest projection (${largestProjection}) is ${ratio.toFixed(1)} times the largest measured training size (${last.trainingSize}); beyond about ${extrapolationWarningRatio} times, the forecast rests mostly on the assumed shape of the curve, and its interval is wide for that reason.`,
    );
  }

  // Repeats and resampling.
  const repeatCounts = units.filter((u) => u.kind === "repeats").map((u) => u.scoresOfRepeat.size);
  if (repeatCounts.length > 0 && Math.min(...repeatCounts) < fewestRepeats) {
    const fewest = Math.min(...repeatCounts);
    warnings.push(
      `Only ${fewest} repeat${fewest === 1 ? "" : "s"} at some training size; an interval from resampling fewer than ${fewestRepeats} repeats is unreliable. Use at least ${fewestRepeats} repeats.`,
    );
  }
  const looseCounts = units.filter((u) => u.kind === "scores").map((u) => u.scores.length);
  if (looseCounts.length > 0) {
    warnings.push(
      `The curve does not say which repeat each score came from${looseCounts.length < units.length ? " at some training sizes" : ""}; the interval resamples individual scores as if they were independent.`,
    );
    if (Math.min(...looseCounts) < fewestRepeats) {
      warnings.push(
        `Only ${Math.min(...looseCounts)} score${Math.min(...looseCounts) === 1 ? "" : "s"} at some training size; an interval from fewer than ${fewestRepeats} scores is unreliable.`,
      );
    }
  }
  if (shift.testFoldSize === null && last.fits > 1) {
    warnings.push(
      `The curve does not say how large its test folds were; the widening for which samples happened to be collected assumes test folds ${Math.round(1 / assumedTestToTrainingRatio)} times smaller than the largest training size, as in 5-fold cross-validation.`,
    );
  }

  // R² on small test folds.
  const foldRows = testRowsPerFold(input.curve);
  const bias = input.curve.metric === r2.name && foldRows !== null ? foldR2Bias(last.mean, foldRows) : null;
  if (bias !== null && bias >= r2BiasWarning) {
    warnings.push(
      `The scores are R² on test folds of about ${Math.round(foldRows as number)} rows, each measured around its own fold's mean; on folds this small R² reads low, here by about ${formatSignificant(100 * bias, 2)} points at the largest size (3 × (1 − R²) / rows per fold). The curve and its forecast understate the R² a model would score on new data; fewer, larger folds lessen this.`,
    );
  }

  // Families.
  for (const { family, reason } of assessment.leftOut) {
    // A fit's error names its family already ("mmf4: no fit converged ..."); the sentence names it once.
    const why = reason.startsWith(`${family}: `) ? reason.slice(family.length + 2) : reason;
    warnings.push(`The ${family} family was left out of the forecast: ${why}.`);
  }
  if (options.family !== undefined && !assessment.backtested && count >= fewestSizes) {
    warnings.push(
      `The ${options.family.name} family has ${options.family.parameterNames.length} parameters, too many to check against held-back sizes with ${count} measured sizes; its interval leaves out the error of the curve's shape.`,
    );
  }
  if (drawn.retried > 0) {
    warnings.push(
      `${drawn.retried} of ${drawn.requested} bootstrap refits did not converge from the point fit's parameters and were refitted from the family's usual starting points.`,
    );
  }
  if (drawn.dropped > 0) {
    warnings.push(`${drawn.dropped} of ${drawn.requested} bootstrap refits failed and were left out of the interval.`);
  }
  return warnings;
}
