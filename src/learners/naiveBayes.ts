/**
 * Gaussian naive Bayes (`--learner naive-bayes`).
 *
 * It computes what scikit-learn's `GaussianNB()` does, on the features as the {@link Preprocessor}
 * gives them (imputed, standardized, text columns one-hot encoded): each class k has a prior πₖ (its
 * frequency in the training rows), and each feature, given the class, an independent normal
 * distribution with the class's mean θₖⱼ and population variance σ²ₖⱼ + ε, where the smoothing
 * ε = varSmoothing × the largest population variance of any feature over all training rows (it keeps
 * a variance that is zero within a class, e.g. a class with one row, from dividing by zero). The
 * probability of class k given x is proportional to
 *
 *     πₖ · Πⱼ N(xⱼ; θₖⱼ, σ²ₖⱼ + ε),
 *
 * computed on the log scale and normalized by log-sum-exp. When every feature is constant over the
 * training rows (scikit-learn would divide by zero) ε is varSmoothing itself, the variance of a
 * standardized column being 1. Classes absent from the training rows get probability 0.
 *
 * Written by hand because the npm package ml-naivebayes reads only the first two features (found when
 * tried); the fit is two passes over the rows on raw Float64Arrays.
 */
import type { RandomStream } from "../random.js";
import type { FittedModel, Learner, LearnerSettings, TrainingSet } from "./learner.js";
import { fitPreprocessor, type Preprocessor } from "./preprocess.js";
import { checkSettingNames, nonNegative } from "./settings.js";
import { softmaxRows, spreadOverClasses } from "./classProbabilities.js";
import { scratchDoubles, scratchRowDoubles } from "./scratch.js";
import { summarizeClasses } from "./trainingChecks.js";

export interface NaiveBayesOptions {
  /** Fraction of the largest feature variance added to every variance (scikit-learn's `var_smoothing`). @default 1e-9 */
  varSmoothing?: number;
}

export type ResolvedNaiveBayesOptions = Required<NaiveBayesOptions>;

const name = "naive-bayes";

/** Smoothing values the tuning step tries (scikit-learn users commonly search var_smoothing on a log grid). */
export const naiveBayesTuningGrid: readonly LearnerSettings[] = [
  { varSmoothing: 1e-9 },
  { varSmoothing: 1e-6 },
  { varSmoothing: 1e-3 },
  { varSmoothing: 1e-2 },
  { varSmoothing: 1e-1 },
];

/**
 * Fills in the defaults of {@link NaiveBayesOptions}.
 * @throws UsageError when varSmoothing is not a finite number of at least 0.
 */
export function resolveNaiveBayesOptions(options: NaiveBayesOptions = {}): ResolvedNaiveBayesOptions {
  return { varSmoothing: nonNegative(name, "varSmoothing", options.varSmoothing ?? 1e-9) };
}

/** The Gaussian naive Bayes learner. Deterministic: the random stream is unused. */
export class GaussianNaiveBayes implements Learner {
  readonly name = name;
  readonly options: ResolvedNaiveBayesOptions;
  readonly tuningGrid = naiveBayesTuningGrid;

  constructor(options: NaiveBayesOptions = {}) {
    this.options = resolveNaiveBayesOptions(options);
  }

  /** @throws UsageError on a setting other than `varSmoothing` or a bad value. */
  withOptions(settings: LearnerSettings): GaussianNaiveBayes {
    checkSettingNames(name, settings, ["varSmoothing"]);
    return new GaussianNaiveBayes({ ...this.options, ...settings });
  }

  /**
   * Fits the preprocessing, the priors, the class means and the variances on the training rows.
   * @throws DataError on a malformed training set (see {@link summarizeClasses}) or a ±Infinity feature.
   */
  fit(training: TrainingSet, _random?: RandomStream): FittedNaiveBayes {
    const { present, positions } = summarizeClasses(name, training);
    const { features, rows, classCount } = training;
    const preprocessor = fitPreprocessor(features, rows, training.columns, {
      categories: training.categories,
      completeColumns: training.completeColumns,
    });
    const p = preprocessor.outputColumns;
    const classes = present.length;
    // The standardized rows serve only this fit: a work array of this thread (scratch.ts).
    const x = preprocessor.transform(features, rows, scratchRowDoubles("naiveBayes.training", rows, p));

    // ε from the largest variance over all rows (numpy's var: mean, then mean squared deviation).
    // Summed row by row into one sum per column, each column's in the same order as a walk down it,
    // which on wide rows would touch a new cache line at every value.
    const columnMeans = scratchDoubles("naiveBayes.columnMeans", p).fill(0);
    const columnSquares = scratchDoubles("naiveBayes.columnSquares", p).fill(0);
    for (let i = 0; i < rows; i++) for (let j = 0; j < p; j++) columnMeans[j] += x[i * p + j];
    for (let j = 0; j < p; j++) columnMeans[j] /= rows;
    for (let i = 0; i < rows; i++) for (let j = 0; j < p; j++) columnSquares[j] += (x[i * p + j] - columnMeans[j]) ** 2;
    let largest = 0;
    for (let j = 0; j < p; j++) largest = Math.max(largest, columnSquares[j] / rows);
    const epsilon = this.options.varSmoothing * (largest > 0 ? largest : 1);

    const sizes = new Float64Array(classes);
    const means = new Float64Array(classes * p);
    const variances = new Float64Array(classes * p);
    for (let i = 0; i < rows; i++) {
      const k = positions[i];
      sizes[k]++;
      for (let j = 0; j < p; j++) means[k * p + j] += x[i * p + j];
    }
    for (let k = 0; k < classes; k++) for (let j = 0; j < p; j++) means[k * p + j] /= sizes[k];
    for (let i = 0; i < rows; i++) {
      const k = positions[i];
      for (let j = 0; j < p; j++) variances[k * p + j] += (x[i * p + j] - means[k * p + j]) ** 2;
    }
    const logPriors = new Float64Array(classes);
    for (let k = 0; k < classes; k++) {
      // Σⱼ log(2π σ²ₖⱼ) is the same for every row: folded into the class's constant.
      let logDeterminant = 0;
      for (let j = 0; j < p; j++) {
        const v = variances[k * p + j] / sizes[k] + epsilon;
        variances[k * p + j] = v;
        logDeterminant += Math.log(2 * Math.PI * v);
      }
      logPriors[k] = Math.log(sizes[k] / rows) - 0.5 * logDeterminant;
    }
    return new FittedNaiveBayes(classCount, preprocessor, present, means, variances, logPriors, epsilon);
  }
}

/** A fitted Gaussian naive Bayes model. */
export class FittedNaiveBayes implements FittedModel {
  constructor(
    /** Number of classes in the whole data set: the width of the probability rows. */
    readonly classCount: number,
    /** The encoding, imputation and standardization fitted on the training rows. */
    readonly preprocessor: Preprocessor,
    /** The classes present in training, ascending; the others get probability 0. */
    readonly classes: Int32Array,
    /** Row-major `classes.length × outputColumns`: the class means θₖⱼ (scikit-learn's `theta_`). */
    readonly means: Float64Array,
    /** Row-major `classes.length × outputColumns`: σ²ₖⱼ + ε (scikit-learn's `var_`). */
    readonly variances: Float64Array,
    /** log πₖ − ½ Σⱼ log(2π (σ²ₖⱼ + ε)), per present class. */
    readonly constants: Float64Array,
    /** The variance smoothing ε added (scikit-learn's `epsilon_`). */
    readonly epsilon: number,
  ) {}

  /**
   * The joint log-likelihoods log πₖ + Σⱼ log N(xⱼ; θₖⱼ, σ²ₖⱼ), row-major `rows × classes.length`.
   * @throws DataError when the features do not hold rows × columns values or a value is ±Infinity.
   */
  jointLogLikelihoods(features: Float64Array, rows: number): Float64Array {
    const p = this.preprocessor.outputColumns;
    const x = this.preprocessor.transform(features, rows, scratchDoubles("naiveBayes.predicted", rows * p));
    const classes = this.classes.length;
    const { means, variances, constants } = this;
    const out = new Float64Array(rows * classes);
    for (let i = 0; i < rows; i++) {
      const offset = i * p;
      for (let k = 0; k < classes; k++) {
        const w = k * p;
        let s = 0;
        for (let j = 0; j < p; j++) {
          const d = x[offset + j] - means[w + j];
          s += (d * d) / variances[w + j];
        }
        out[i * classes + k] = constants[k] - 0.5 * s;
      }
    }
    return out;
  }

  /**
   * Class probabilities, row-major `rows × classCount`.
   * @throws DataError when the features do not hold rows × columns values or a value is ±Infinity.
   */
  predictProbabilities(features: Float64Array, rows: number): Float64Array {
    const scores = this.jointLogLikelihoods(features, rows);
    const classes = this.classes.length;
    return spreadOverClasses(softmaxRows(scores, rows, classes), rows, this.classes, this.classCount);
  }
}
