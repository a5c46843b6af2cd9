/**
 * The two sources of uncertainty that resampling repeats cannot see.
 *
 * 1. Which samples were collected. Every fold and repeat of the curve draws on the same data set, so
 *    the mean score at a size is one data set's luck, shared by all sizes: had the lab collected
 *    other samples, the whole curve would sit a little higher or lower. Resampling repeats only sees
 *    the noise between splits of this one data set, which is why its intervals are far too narrow.
 *    Nadeau and Bengio (2003, "Inference for the generalization error", Machine Learning 52,
 *    239–281) correct the variance of a mean over J overlapping train/test splits to
 *    (1/J + n_test/n_train) · σ², with σ² the variance of the split scores. Resampling repeats
 *    supplies about σ²/J of it; the forecast adds the rest as one normal shift shared by every size
 *    of a draw, with variance max(0, (1/J + n_test/n_train) · σ² − v) at the largest measured size
 *    (J its number of scores, σ² their variance, n_train the size, n_test the test-fold size, v the
 *    variance of its mean that resampling repeats gives).
 *
 * 2. One model on a finite test set. The projected score is the expected score of a model trained
 *    at size n. One particular model, scored on a test set of m rows, scatters around it with
 *    variance  σ²_test(m) + σ²_train(n):
 *    - σ²_test for a metric in [0, 1] is the binomial p(1 − p)/m (exact for accuracy and error rate,
 *      whose test score is a proportion of rows; an approximation, usually on the wide side, for
 *      other [0, 1] metrics such as ROC AUC: Hanley and McNeil 1982). For other metrics it is the
 *      variance of the fold scores at the largest size scaled by (test rows per fold) / m, the
 *      variance of a mean over m rows.
 *    - σ²_train, the spread between models trained on different samples of the same size, is what
 *      remains of the fold scores' variance at the largest size after the binomial part of its test
 *      folds (metrics in [0, 1] whose curve says its rows and folds; otherwise it is left out, or
 *      already inside the scaled fold variance), shrunk as 1/n beyond it (the rate for stable
 *      learners: Bousquet and Elisseeff 2002, "Stability and generalization").
 */
import type { CurveFile } from "../curve/curveFile.js";
import type { MeasuredCurve } from "./measuredCurve.js";

/** Test-fold size over training size assumed when the curve does not say (5-fold at the largest size). */
export const assumedTestToTrainingRatio = 0.25;

export interface SampleShift {
  /** Standard deviation of the shared shift, in the metric's units. */
  standardDeviation: number;
  /** Test-fold size used, in training-size units (rows, or runs); null when assumed. */
  testFoldSize: number | null;
}

/**
 * Test-fold size in the units of the training sizes (rows, or runs when the curve counts runs),
 * when the curve says its rows (or runs) and folds; else null.
 */
export function testFoldSize(curve: CurveFile): number | null {
  if (!(curve.folds !== undefined && curve.folds >= 2)) return null;
  const pool = curve.unit === "runs" ? curve.runs : curve.rows;
  if (pool === undefined || !(pool > 0) || !Number.isFinite(pool)) return null;
  return pool / curve.folds;
}

/** Test rows per fold, when the curve says its rows and folds; else null. */
export function testRowsPerFold(curve: CurveFile): number | null {
  if (!(curve.folds !== undefined && curve.folds >= 2) || !(curve.rows > 0) || !Number.isFinite(curve.rows))
    return null;
  return curve.rows / curve.folds;
}

/** The shared shift for which samples were collected (part 1 of the file comment). */
export function sampleShift(curve: CurveFile, measured: MeasuredCurve): SampleShift {
  const last = measured.summaries.length - 1;
  const summary = measured.summaries[last];
  const foldSize = testFoldSize(curve);
  const ratio = foldSize === null ? assumedTestToTrainingRatio : foldSize / summary.trainingSize;
  const variance = summary.standardDeviation ** 2;
  const corrected = (1 / summary.fits + ratio) * variance;
  return {
    standardDeviation: Math.sqrt(Math.max(0, corrected - measured.meanVariances[last])),
    testFoldSize: foldSize,
  };
}

/** Variance of one model's score on a test set around the expected score (part 2). */
export interface SingleModelSpread {
  /** Test rows m. */
  testSize: number;
  /** Variance of one model's score at size n whose expected score is `score`. */
  variance(score: number, trainingSize: number): number;
}

/** Part 2 of the file comment, for a test set of `testSize` rows. */
export function singleModelSpread(curve: CurveFile, measured: MeasuredCurve, testSize: number): SingleModelSpread {
  const last = measured.summaries[measured.summaries.length - 1];
  const foldVariance = last.standardDeviation ** 2;
  const rowsPerFold = testRowsPerFold(curve);
  const range = curve.metricRange;
  const proportion = range !== undefined && range[0] === 0 && range[1] === 1;
  if (proportion) {
    const p = Math.min(1, Math.max(0, last.mean));
    const trainingVariance = rowsPerFold === null ? 0 : Math.max(0, foldVariance - (p * (1 - p)) / rowsPerFold);
    return {
      testSize,
      variance: (score, trainingSize) => {
        const q = Math.min(1, Math.max(0, score));
        return (q * (1 - q)) / testSize + trainingVariance * Math.min(1, last.trainingSize / trainingSize);
      },
    };
  }
  const testVariance = rowsPerFold === null ? foldVariance : (foldVariance * rowsPerFold) / testSize;
  return { testSize, variance: () => testVariance };
}
