/**
 * Linear support vector machine with the hinge loss (`--learner svm`).
 *
 * It computes what scikit-learn's `LinearSVC(loss="hinge", dual=True, C)` does, on the features as
 * the {@link Preprocessor} gives them (imputed, standardized, text columns one-hot encoded). As in
 * LIBLINEAR, which LinearSVC calls, the intercept is the weight of an extra constant feature equal to
 * 1 and is penalized with the other weights; each binary problem minimizes
 *
 *     ½ ‖(w, b)‖² + C · Σᵢ max(0, 1 − yᵢ (w·xᵢ + b)),   yᵢ ∈ {−1, +1},
 *
 * whose solution (w, b) is unique. It is found by dual coordinate descent with shrinking (Hsieh,
 * Chang, Lin, Keerthi and Sundararajan 2008, "A dual coordinate descent method for large-scale linear
 * SVM", algorithm 1 and section 3.2, as LIBLINEAR's `solve_l2r_l1l2_svc`): each epoch visits the
 * dual variables in an order drawn from the random stream, and the fit stops when the spread of the
 * projected gradients is at most the tolerance over all variables, or after maxIterations epochs.
 *  - Two classes present: one problem, the later class positive; its decision score is w·x + b.
 *  - More: one problem per class against the rest (LinearSVC's one-vs-rest), one score per class.
 *  - The predicted class is the one with the highest score (two classes: the later when the score is
 *    positive), as LinearSVC predicts.
 *
 * Probabilities. A hinge-loss SVM gives scores, not probabilities. For the metrics that need
 * probabilities, `predictProbabilities` maps the scores by a fixed softmax (two classes: the logistic
 * function σ(s) for the later class), which keeps the order of the scores, so accuracy and the
 * predicted classes are exactly those of the scores and ROC AUC ranks rows as the scores do. It is not
 * a calibrated mapping (Platt scaling would fit a sigmoid on held-out scores); log loss and the Brier
 * score of an SVM measure this fixed mapping and should be read with that in mind.
 * Classes absent from the training rows get probability 0; with one class present, probability 1.
 *
 * Written by hand because the npm package ml-svm fails to converge on 2000 × 60 rows × columns
 * when tried; the dual coordinate descent runs on raw Float64Arrays.
 */
import type { RandomStream } from "../random.js";
import type { FittedModel, Learner, LearnerSettings, TrainingSet } from "./learner.js";
import { gramMatrix, linearScores } from "../numerics/linearAlgebra.js";
import { wideEnough } from "./rowSpace.js";
import { fitPreprocessor, type Preprocessor } from "./preprocess.js";
import { checkSettingNames, positive, wholeNumber } from "./settings.js";
import { softmaxRows, spreadOverClasses } from "./classProbabilities.js";
import { summarizeClasses } from "./trainingChecks.js";

export interface SvmOptions {
  /** Weight of the hinge losses against the penalty (scikit-learn's `C`); larger means a weaker penalty. @default 1 */
  C?: number;
  /**
   * Stopping tolerance on the spread (largest minus smallest) of the projected gradients of the dual
   * (scikit-learn's `tol`, LIBLINEAR's `eps`). @default 1e-4
   */
  tolerance?: number;
  /** Most epochs (passes over the dual variables) per binary problem (scikit-learn's `max_iter`). @default 1000 */
  maxIterations?: number;
}

export type ResolvedSvmOptions = Required<SvmOptions>;

const name = "svm";

/** Penalties the tuning step tries. */
export const svmTuningGrid: readonly LearnerSettings[] = [{ C: 0.01 }, { C: 0.1 }, { C: 1 }, { C: 10 }, { C: 100 }];

/**
 * Fills in the defaults of {@link SvmOptions} (those of scikit-learn's LinearSVC).
 * @throws UsageError when C or the tolerance is not a positive finite number, or maxIterations not a
 *   whole number of at least 1.
 */
export function resolveSvmOptions(options: SvmOptions = {}): ResolvedSvmOptions {
  return {
    C: positive(name, "C", options.C ?? 1),
    tolerance: positive(name, "tolerance", options.tolerance ?? 1e-4),
    maxIterations: wholeNumber(name, "maxIterations", options.maxIterations ?? 1000, 1),
  };
}

/** The linear-SVM learner. The random stream orders the coordinate-descent visits. */
export class LinearSvm implements Learner {
  readonly name = name;
  readonly options: ResolvedSvmOptions;
  readonly tuningGrid = svmTuningGrid;

  constructor(options: SvmOptions = {}) {
    this.options = resolveSvmOptions(options);
  }

  /** @throws UsageError on a setting other than `C`, `tolerance`, `maxIterations` or a bad value. */
  withOptions(settings: LearnerSettings): LinearSvm {
    checkSettingNames(name, settings, ["C", "tolerance", "maxIterations"]);
    return new LinearSvm({ ...this.options, ...settings });
  }

  /**
   * Fits the preprocessing and one binary SVM per class (one in all for two classes).
   * @throws DataError on a malformed training set (see {@link summarizeClasses}) or a ±Infinity feature.
   */
  fit(training: TrainingSet, random: RandomStream): FittedSvm {
    const { present, positions } = summarizeClasses(name, training);
    const { features, rows, classCount } = training;
    const preprocessor = fitPreprocessor(features, rows, training.columns, {
      categories: training.categories,
      completeColumns: training.completeColumns,
    });
    const p = preprocessor.outputColumns;
    const classes = present.length;
    if (classes === 1)
      return new FittedSvm(classCount, preprocessor, present, new Float64Array(0), new Float64Array(0), 0, true);
    const x = preprocessor.transform(features, rows);
    const problems = classes === 2 ? 1 : classes;
    const weights = new Float64Array(problems * p);
    const intercepts = new Float64Array(problems);
    const signs = new Int8Array(rows);
    let iterations = 0;
    let converged = true;
    // Wide data: the same descent on the Gram matrix of the rows (x̃ᵢ·x̃ⱼ, the constant feature
    // included), shared by the one-vs-rest problems, so that an update costs n instead of p.
    const gram = wideEnough(rows, p) ? gramMatrix(x, rows, p).map((v) => v + 1) : null;
    for (let k = 0; k < problems; k++) {
      const positiveClass = classes === 2 ? 1 : k;
      for (let i = 0; i < rows; i++) signs[i] = positions[i] === positiveClass ? 1 : -1;
      const result =
        gram === null
          ? dualCoordinateDescent(x, rows, p, signs, this.options, random)
          : dualCoordinateDescentOnGram(x, gram, rows, p, signs, this.options, random);
      weights.set(result.weights.subarray(0, p), k * p);
      intercepts[k] = result.weights[p];
      iterations = Math.max(iterations, result.iterations);
      converged &&= result.converged;
    }
    return new FittedSvm(classCount, preprocessor, present, weights, intercepts, iterations, converged);
  }
}

/** A fitted linear SVM. */
export class FittedSvm implements FittedModel {
  constructor(
    /** Number of classes in the whole data set: the width of the probability rows. */
    readonly classCount: number,
    /** The encoding, imputation and standardization fitted on the training rows. */
    readonly preprocessor: Preprocessor,
    /** The classes present in training, ascending; the others get probability 0. */
    readonly classes: Int32Array,
    /**
     * Row-major weights on the preprocessed columns (scikit-learn's `coef_`): `1 × outputColumns` for
     * two classes (`classes[1]` positive), `classes.length × outputColumns` for more, empty for one.
     */
    readonly weights: Float64Array,
    /** Intercepts, one per weight row (scikit-learn's `intercept_`). */
    readonly intercepts: Float64Array,
    /** Most epochs any binary problem took. */
    readonly iterations: number,
    /** Whether every binary problem met the tolerance within maxIterations. */
    readonly converged: boolean,
  ) {}

  /**
   * Decision scores w·x + b (scikit-learn's `decision_function`): row-major `rows × 1` for two
   * classes, `rows × classes.length` for more, `rows × 0` for one.
   * @throws DataError when the features do not hold rows × columns values or a value is ±Infinity.
   */
  decisionScores(features: Float64Array, rows: number): Float64Array {
    const x = this.preprocessor.transform(features, rows);
    const p = this.preprocessor.outputColumns;
    return linearScores(x, rows, p, this.weights, this.intercepts);
  }

  /**
   * Scores mapped to [0, 1] by a fixed softmax (two classes: σ(score) for `classes[1]`), row-major
   * `rows × classCount`: not calibrated probabilities (see the module comment), but in the order of
   * the scores, so the most probable class is the SVM's prediction.
   * @throws DataError when the features do not hold rows × columns values or a value is ±Infinity.
   */
  predictProbabilities(features: Float64Array, rows: number): Float64Array {
    const { classes, classCount } = this;
    if (classes.length === 1) {
      this.preprocessor.transform(features, rows); // checks the rows
      const out = new Float64Array(rows * classCount);
      for (let i = 0; i < rows; i++) out[i * classCount + classes[0]] = 1;
      return out;
    }
    const scores = this.decisionScores(features, rows);
    let probabilities: Float64Array;
    if (classes.length === 2) {
      probabilities = new Float64Array(rows * 2);
      for (let i = 0; i < rows; i++) {
        probabilities[i * 2] = sigmoid(-scores[i]);
        probabilities[i * 2 + 1] = sigmoid(scores[i]);
      }
    } else {
      probabilities = softmaxRows(scores, rows, classes.length);
    }
    return spreadOverClasses(probabilities, rows, classes, classCount);
  }
}

/** 1 / (1 + e^−z) without overflow. */
function sigmoid(z: number): number {
  if (z >= 0) return 1 / (1 + Math.exp(-z));
  const e = Math.exp(z);
  return e / (1 + e);
}

/**
 * One binary hinge-loss problem by dual coordinate descent with shrinking (LIBLINEAR's
 * `solve_l2r_l1l2_svc` for the L1 loss). The dual is min ½ αᵀQα − Σα over 0 ≤ αᵢ ≤ C with
 * Qᵢⱼ = yᵢyⱼ x̃ᵢ·x̃ⱼ and x̃ = (x, 1); w̃ = Σ αᵢ yᵢ x̃ᵢ is kept up to date. Returns w̃ = (w, b).
 */
function dualCoordinateDescent(
  x: Float64Array,
  n: number,
  p: number,
  signs: Int8Array,
  options: ResolvedSvmOptions,
  random: RandomStream,
): { weights: Float64Array; iterations: number; converged: boolean } {
  const { C, tolerance, maxIterations } = options;
  const w = new Float64Array(p + 1);
  const alpha = new Float64Array(n);
  const diagonal = new Float64Array(n);
  const order = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    let s = 1; // the constant feature
    for (let j = 0; j < p; j++) s += x[i * p + j] * x[i * p + j];
    diagonal[i] = s;
    order[i] = i;
  }
  let active = n;
  let projectedMaxOld = Infinity;
  let projectedMinOld = -Infinity;
  let iterations = 0;
  let converged = false;
  while (iterations < maxIterations) {
    let projectedMax = -Infinity;
    let projectedMin = Infinity;
    for (let s = 0; s < active; s++) {
      const t = s + random.integer(active - s);
      const swap = order[s];
      order[s] = order[t];
      order[t] = swap;
    }
    for (let s = 0; s < active; s++) {
      const i = order[s];
      const y = signs[i];
      const offset = i * p;
      let margin = w[p];
      for (let j = 0; j < p; j++) margin += w[j] * x[offset + j];
      const gradient = y * margin - 1;
      let projected = 0;
      const a = alpha[i];
      if (a === 0) {
        if (gradient > projectedMaxOld) {
          // At the lower bound and likely to stay there: shrink it out of the active set.
          active--;
          order[s] = order[active];
          order[active] = i;
          s--;
          continue;
        }
        if (gradient < 0) projected = gradient;
      } else if (a === C) {
        if (gradient < projectedMinOld) {
          active--;
          order[s] = order[active];
          order[active] = i;
          s--;
          continue;
        }
        if (gradient > 0) projected = gradient;
      } else {
        projected = gradient;
      }
      if (projected > projectedMax) projectedMax = projected;
      if (projected < projectedMin) projectedMin = projected;
      if (Math.abs(projected) > 1e-12) {
        const updated = Math.min(Math.max(a - gradient / diagonal[i], 0), C);
        alpha[i] = updated;
        const d = (updated - a) * y;
        for (let j = 0; j < p; j++) w[j] += d * x[offset + j];
        w[p] += d;
      }
    }
    iterations++;
    if (projectedMax - projectedMin <= tolerance) {
      if (active === n) {
        converged = true;
        break;
      }
      // Converged on the active set: check again over all variables.
      active = n;
      projectedMaxOld = Infinity;
      projectedMinOld = -Infinity;
      continue;
    }
    projectedMaxOld = projectedMax <= 0 ? Infinity : projectedMax;
    projectedMinOld = projectedMin >= 0 ? -Infinity : projectedMin;
  }
  return { weights: w, iterations, converged };
}

/**
 * {@link dualCoordinateDescent} for wide data, on the Gram matrix `gram` of the rows with the
 * constant feature (x̃ᵢ·x̃ⱼ): the same visits, draws, shrinking and updates, with the margins w̃·x̃ᵢ
 * kept as a vector m = Σⱼ αⱼyⱼ gramⱼ (an update of αᵢ adds a multiple of row i of `gram`, n values
 * instead of p + 1). w̃ = Σ αᵢ yᵢ x̃ᵢ is formed once at the end.
 */
function dualCoordinateDescentOnGram(
  x: Float64Array,
  gram: Float64Array,
  n: number,
  p: number,
  signs: Int8Array,
  options: ResolvedSvmOptions,
  random: RandomStream,
): { weights: Float64Array; iterations: number; converged: boolean } {
  const { C, tolerance, maxIterations } = options;
  const margins = new Float64Array(n);
  const alpha = new Float64Array(n);
  const order = new Int32Array(n);
  for (let i = 0; i < n; i++) order[i] = i;
  let active = n;
  let projectedMaxOld = Infinity;
  let projectedMinOld = -Infinity;
  let iterations = 0;
  let converged = false;
  while (iterations < maxIterations) {
    let projectedMax = -Infinity;
    let projectedMin = Infinity;
    for (let s = 0; s < active; s++) {
      const t = s + random.integer(active - s);
      const swap = order[s];
      order[s] = order[t];
      order[t] = swap;
    }
    for (let s = 0; s < active; s++) {
      const i = order[s];
      const y = signs[i];
      const gradient = y * margins[i] - 1;
      let projected = 0;
      const a = alpha[i];
      if (a === 0) {
        if (gradient > projectedMaxOld) {
          active--;
          order[s] = order[active];
          order[active] = i;
          s--;
          continue;
        }
        if (gradient < 0) projected = gradient;
      } else if (a === C) {
        if (gradient < projectedMinOld) {
          active--;
          order[s] = order[active];
          order[active] = i;
          s--;
          continue;
        }
        if (gradient > 0) projected = gradient;
      } else {
        projected = gradient;
      }
      if (projected > projectedMax) projectedMax = projected;
      if (projected < projectedMin) projectedMin = projected;
      if (Math.abs(projected) > 1e-12) {
        const updated = Math.min(Math.max(a - gradient / gram[i * n + i], 0), C);
        alpha[i] = updated;
        const d = (updated - a) * y;
        const row = i * n;
        for (let j = 0; j < n; j++) margins[j] += d * gram[row + j];
      }
    }
    iterations++;
    if (projectedMax - projectedMin <= tolerance) {
      if (active === n) {
        converged = true;
        break;
      }
      active = n;
      projectedMaxOld = Infinity;
      projectedMinOld = -Infinity;
      continue;
    }
    projectedMaxOld = projectedMax <= 0 ? Infinity : projectedMax;
    projectedMinOld = projectedMin >= 0 ? -Infinity : projectedMin;
  }
  const weights = new Float64Array(p + 1);
  for (let i = 0; i < n; i++) {
    const d = alpha[i] * signs[i];
    if (d === 0) continue;
    const offset = i * p;
    for (let j = 0; j < p; j++) weights[j] += d * x[offset + j];
    weights[p] += d;
  }
  return { weights, iterations, converged };
}
