/**
 * Linear discriminant analysis with a shrunk within-class covariance (`--learner lda`).
 *
 * It computes what scikit-learn's `LinearDiscriminantAnalysis(solver="lsqr", shrinkage="auto")` does
 * (Duda, Hart and Stork, "Pattern Classification", 2nd ed., section 2.6.2), on the features as the
 * {@link Preprocessor} gives them (imputed, standardized, text columns one-hot encoded):
 *  - priors πₖ: the class frequencies of the training rows; class means μₖ;
 *  - a within-class covariance Σ = Σₖ πₖ Sₖ, where Sₖ is the Ledoit–Wolf estimate of class k's
 *    covariance (Ledoit and Wolf 2004, "A well-conditioned estimator for large-dimensional covariance
 *    matrices"), taken as scikit-learn takes it: the class's columns are standardized (a constant
 *    column keeps scale 1), the shrinkage δ is estimated on them, the shrunk matrix
 *    (1 − δ)·S + δ·(trace S / p)·I is formed from their empirical covariance S, and it is scaled back
 *    by the column scales. With a fixed `shrinkage` instead, Sₖ is (1 − δ)·S + δ·(trace S / p)·I on
 *    the unstandardized class columns, as scikit-learn's numeric `shrinkage`;
 *  - coefficients wₖ = Σ⁻¹ μₖ by Cholesky when the shrinkage keeps Σ safely invertible; otherwise
 *    (classes of one or two rows get no shrinkage, so a small training set can leave Σ singular) the
 *    minimum-norm least-squares solution, as scikit-learn's `scipy.linalg.lstsq` call gives; and
 *    intercepts bₖ = −½ μₖ·wₖ + log πₖ;
 *  - probabilities: the softmax of the scores wₖ·x + bₖ (for two classes this is scikit-learn's
 *    logistic of the score difference).
 * Classes absent from the training rows get probability 0; with one class present, probability 1.
 *
 * With more columns than rows (wide data), Σ is a diagonal matrix plus a matrix of rank at most n,
 * and Σ⁻¹μₖ is solved by the Woodbury identity in n dimensions instead (see {@link fitWide}).
 *
 * Written by hand because no npm package offers shrinkage discriminant analysis with probabilities;
 * the fit is one pass over the rows per class for the covariances and a p × p Cholesky solve, on raw
 * Float64Array loops.
 */
import type { RandomStream } from "../random.js";
import type { FittedModel, Learner, LearnerSettings, TrainingSet } from "./learner.js";
import {
  choleskyInPlace,
  choleskySolveInPlace,
  gramMatrix,
  linearScores,
  minimumNormSolve,
} from "../numerics/linearAlgebra.js";
import { wideEnough } from "./rowSpace.js";
import { fitPreprocessor, type Preprocessor } from "./preprocess.js";
import { checkSettingNames } from "./settings.js";
import { softmaxRows, spreadOverClasses } from "./classProbabilities.js";
import { summarizeClasses } from "./trainingChecks.js";
import { UsageError } from "../errors.js";
import { message } from "../messages.js";

export interface LdaOptions {
  /**
   * Fixed shrinkage δ in [0, 1] towards a multiple of the identity, or NaN for the Ledoit–Wolf estimate
   * from the data (scikit-learn's `shrinkage="auto"`). @default NaN (Ledoit–Wolf)
   */
  shrinkage?: number;
}

export type ResolvedLdaOptions = Required<LdaOptions>;

const name = "lda";

/**
 * Fills in the defaults of {@link LdaOptions}.
 * @throws UsageError when the shrinkage is neither NaN nor a number in [0, 1].
 */
export function resolveLdaOptions(options: LdaOptions = {}): ResolvedLdaOptions {
  const shrinkage = options.shrinkage ?? NaN;
  if (!Number.isNaN(shrinkage) && !(shrinkage >= 0 && shrinkage <= 1))
    throw new UsageError(message.shrinkageOutOfRange(name, shrinkage));
  return { shrinkage };
}

/** The shrinkage discriminant-analysis learner. Deterministic: the random stream is unused. */
export class LinearDiscriminant implements Learner {
  readonly name = name;
  readonly options: ResolvedLdaOptions;

  constructor(options: LdaOptions = {}) {
    this.options = resolveLdaOptions(options);
  }

  /** @throws UsageError on a setting other than `shrinkage` or a bad value. */
  withOptions(settings: LearnerSettings): LinearDiscriminant {
    checkSettingNames(name, settings, ["shrinkage"]);
    return new LinearDiscriminant({ ...this.options, ...settings });
  }

  /**
   * Fits the preprocessing and the discriminant on the training rows.
   * @throws DataError on a malformed training set (see {@link summarizeClasses}) or a ±Infinity feature.
   */
  fit(training: TrainingSet, _random?: RandomStream): FittedLda {
    const { present, positions } = summarizeClasses(name, training);
    const { features, rows, classCount } = training;
    const preprocessor = fitPreprocessor(features, rows, training.columns, {
      categories: training.categories,
      completeColumns: training.completeColumns,
    });
    const p = preprocessor.outputColumns;
    const classes = present.length;
    if (classes === 1)
      return new FittedLda(classCount, preprocessor, present, new Float64Array(0), new Float64Array(0));
    const x = preprocessor.transform(features, rows);
    if (wideEnough(rows, p)) {
      const wide = fitWide(x, rows, p, classes, positions, this.options.shrinkage);
      if (wide !== null) return new FittedLda(classCount, preprocessor, present, wide.coefficients, wide.intercepts);
    }

    // Rows of each class, gathered once.
    const members: Int32Array[] = [];
    const fill = new Int32Array(classes);
    const sizes = new Int32Array(classes);
    for (let i = 0; i < rows; i++) sizes[positions[i]]++;
    for (let k = 0; k < classes; k++) members.push(new Int32Array(sizes[k]));
    for (let i = 0; i < rows; i++) members[positions[i]][fill[positions[i]]++] = i;

    const means = new Float64Array(classes * p);
    const covariance = new Float64Array(p * p);
    let floor = 0; // a lower bound on the smallest eigenvalue of Σ
    for (let k = 0; k < classes; k++) {
      const block = gather(x, p, members[k]);
      const prior = sizes[k] / rows;
      const mean = columnMeans(block, sizes[k], p);
      means.set(mean, k * p);
      const shrunk = Number.isNaN(this.options.shrinkage)
        ? ledoitWolfCovariance(block, sizes[k], p)
        : fixedShrinkageCovariance(block, sizes[k], p, this.options.shrinkage);
      for (let i = 0; i < p * p; i++) covariance[i] += prior * shrunk.covariance[i];
      floor += prior * shrunk.floor;
    }
    let trace = 0;
    for (let j = 0; j < p; j++) trace += covariance[j * p + j];

    // Σ is safely invertible when the shrinkage keeps its eigenvalues above rounding (the floor above
    // ε × trace, which bounds the largest); then scikit-learn's least-squares call returns Σ⁻¹μ, which
    // Cholesky computes. Otherwise (classes of one or two rows leave no shrinkage) Σ may be singular,
    // and the minimum-norm solution, as scikit-learn's, is taken.
    const coefficients = new Float64Array(classes * p);
    const intercepts = new Float64Array(classes);
    const factor = covariance.slice();
    const positiveDefinite = floor > Number.EPSILON * trace && choleskyInPlace(factor, p);
    for (let k = 0; k < classes; k++) {
      const mean = means.subarray(k * p, (k + 1) * p);
      const w = positiveDefinite
        ? choleskySolveInPlace(factor, p, mean.slice())
        : minimumNormSolve(covariance, p, mean);
      coefficients.set(w, k * p);
      let quadratic = 0;
      for (let j = 0; j < p; j++) quadratic += mean[j] * w[j];
      intercepts[k] = -0.5 * quadratic + Math.log(sizes[k] / rows);
    }
    return new FittedLda(classCount, preprocessor, present, coefficients, intercepts);
  }
}

/** A fitted discriminant. */
export class FittedLda implements FittedModel {
  constructor(
    /** Number of classes in the whole data set: the width of the probability rows. */
    readonly classCount: number,
    /** The encoding, imputation and standardization fitted on the training rows. */
    readonly preprocessor: Preprocessor,
    /** The classes present in training, ascending; the others get probability 0. */
    readonly classes: Int32Array,
    /** Row-major `classes.length × outputColumns`: wₖ = Σ⁻¹ μₖ (scikit-learn's `coef_` before its two-class reduction). */
    readonly coefficients: Float64Array,
    /** bₖ = −½ μₖ·wₖ + log πₖ, one per present class. */
    readonly intercepts: Float64Array,
  ) {}

  /**
   * Scores wₖ·x + bₖ of the present classes, row-major `rows × classes.length`.
   * @throws DataError when the features do not hold rows × columns values or a value is ±Infinity.
   */
  decisionScores(features: Float64Array, rows: number): Float64Array {
    const x = this.preprocessor.transform(features, rows);
    const p = this.preprocessor.outputColumns;
    if (this.classes.length === 1) return new Float64Array(rows);
    return linearScores(x, rows, p, this.coefficients, this.intercepts);
  }

  /**
   * Class probabilities, row-major `rows × classCount`: the softmax of the scores.
   * @throws DataError when the features do not hold rows × columns values or a value is ±Infinity.
   */
  predictProbabilities(features: Float64Array, rows: number): Float64Array {
    const scores = this.decisionScores(features, rows);
    const classes = this.classes.length;
    return spreadOverClasses(softmaxRows(scores, rows, classes), rows, this.classes, this.classCount);
  }
}

/** The listed rows of `x` (row-major, p columns) as a new `rows.length × p` block. */
function gather(x: Float64Array, p: number, rows: Int32Array): Float64Array {
  const out = new Float64Array(rows.length * p);
  for (let i = 0; i < rows.length; i++) out.set(x.subarray(rows[i] * p, (rows[i] + 1) * p), i * p);
  return out;
}

function columnMeans(block: Float64Array, n: number, p: number): Float64Array {
  const mean = new Float64Array(p);
  for (let i = 0; i < n; i++) for (let j = 0; j < p; j++) mean[j] += block[i * p + j];
  for (let j = 0; j < p; j++) mean[j] /= n;
  return mean;
}

/** Centers the block's columns in place and returns their empirical covariance (divisor n). */
function centeredCovariance(block: Float64Array, n: number, p: number): Float64Array {
  const mean = columnMeans(block, n, p);
  for (let i = 0; i < n; i++) for (let j = 0; j < p; j++) block[i * p + j] -= mean[j];
  const s = new Float64Array(p * p);
  for (let i = 0; i < n; i++) {
    const offset = i * p;
    for (let a = 0; a < p; a++) {
      const va = block[offset + a];
      if (va === 0) continue;
      const row = a * p;
      for (let b = 0; b <= a; b++) s[row + b] += va * block[offset + b];
    }
  }
  for (let a = 0; a < p; a++) {
    for (let b = 0; b <= a; b++) {
      const v = s[a * p + b] / n;
      s[a * p + b] = v;
      s[b * p + a] = v;
    }
  }
  return s;
}

/** (1 − δ)·S + δ·(trace S / p)·I in place. */
function shrinkInPlace(s: Float64Array, p: number, shrinkage: number): Float64Array {
  let trace = 0;
  for (let j = 0; j < p; j++) trace += s[j * p + j];
  const target = (shrinkage * trace) / p;
  for (let i = 0; i < p * p; i++) s[i] *= 1 - shrinkage;
  for (let j = 0; j < p; j++) s[j * p + j] += target;
  return s;
}

/** A class's shrunk covariance and a lower bound on its smallest eigenvalue. */
interface ShrunkCovariance {
  covariance: Float64Array;
  /** δ·μ·(smallest column scale)²: the shrinkage target's share, below every eigenvalue. */
  floor: number;
}

/** scikit-learn's `_cov(X, shrinkage)` for a number: the shrunk empirical covariance. */
function fixedShrinkageCovariance(block: Float64Array, n: number, p: number, shrinkage: number): ShrunkCovariance {
  const s = centeredCovariance(block, n, p);
  let trace = 0;
  for (let j = 0; j < p; j++) trace += s[j * p + j];
  return { covariance: shrinkInPlace(s, p, shrinkage), floor: (shrinkage * trace) / p };
}

/**
 * StandardScaler on `block` in place: population variance with the two-pass rounding correction, and
 * scale 1 for a column constant by its round-off test. Returns the scales.
 */
function standardizeColumns(block: Float64Array, n: number, p: number): Float64Array {
  const eps = Number.EPSILON;
  const scale = new Float64Array(p);
  const mean = columnMeans(block, n, p);
  for (let j = 0; j < p; j++) {
    let squares = 0;
    let residualSum = 0;
    for (let i = 0; i < n; i++) {
      const d = block[i * p + j] - mean[j];
      squares += d * d;
      residualSum += d;
    }
    const variance = (squares - (residualSum * residualSum) / n) / n;
    const bound = n * eps * variance + (n * mean[j] * eps) ** 2;
    scale[j] = variance <= bound ? 1 : Math.sqrt(variance);
  }
  for (let i = 0; i < n; i++) for (let j = 0; j < p; j++) block[i * p + j] = (block[i * p + j] - mean[j]) / scale[j];
  return scale;
}

/**
 * scikit-learn's `_cov(X, "auto")`: standardize the columns (StandardScaler: population variance with
 * the two-pass rounding correction, scale 1 for a column constant by its round-off test), take the
 * Ledoit–Wolf shrunk covariance of the result (sklearn.covariance.ledoit_wolf), and scale it back.
 * Overwrites `block`.
 */
function ledoitWolfCovariance(block: Float64Array, n: number, p: number): ShrunkCovariance {
  const scale = standardizeColumns(block, n, p);

  const s = centeredCovariance(block, n, p); // also centers `block`
  let floor: number;
  if (p === 1) {
    // One column: the shrinkage changes nothing; ledoit_wolf returns the mean square about the mean.
    floor = s[0];
  } else {
    const shrinkage = ledoitWolfShrinkage(block, s, n, p);
    let trace = 0;
    for (let j = 0; j < p; j++) trace += s[j * p + j];
    shrinkInPlace(s, p, shrinkage);
    let smallestScale = Infinity;
    for (let j = 0; j < p; j++) smallestScale = Math.min(smallestScale, scale[j]);
    floor = ((shrinkage * trace) / p) * smallestScale * smallestScale;
  }
  for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) s[a * p + b] *= scale[a] * scale[b];
  return { covariance: s, floor };
}

/**
 * The Ledoit–Wolf shrinkage of centered data `x` (n × p) with empirical covariance `s`, as
 * sklearn.covariance.ledoit_wolf_shrinkage computes it:
 *   μ = trace(S)/p, δ² = ‖S − μI‖²_F / p, β² = min(δ², (Σᵢ ‖xᵢ‖⁴ / n − ‖S‖²_F) / (p·n)),
 * and the shrinkage is β² / δ² (0 when β² is 0, or when δ² is 0 and S is already μI).
 */
function ledoitWolfShrinkage(x: Float64Array, s: Float64Array, n: number, p: number): number {
  let trace = 0;
  for (let j = 0; j < p; j++) trace += s[j * p + j];
  const mu = trace / p;
  let frobenius = 0; // ‖S‖²_F: scikit-learn's delta_ after its division by n²
  for (let i = 0; i < p * p; i++) frobenius += s[i] * s[i];
  let fourth = 0; // Σᵢ (Σⱼ xᵢⱼ²)², scikit-learn's beta_ = sum(X2ᵀ X2)
  for (let i = 0; i < n; i++) {
    let r = 0;
    for (let j = 0; j < p; j++) r += x[i * p + j] * x[i * p + j];
    fourth += r * r;
  }
  let beta = (fourth / n - frobenius) / (p * n);
  const delta = (frobenius - 2 * mu * trace + p * mu * mu) / p;
  // S already a multiple of the identity: shrinking changes nothing (and would divide 0 by 0).
  if (!(delta > 0)) return 0;
  beta = Math.min(beta, delta);
  return beta === 0 ? 0 : beta / delta;
}

/**
 * The discriminant on wide data, with the same Σ and the same coefficients as the p × p path, in
 * n-dimensional work. Each class's shrunk covariance is (1 − δₖ)·CₖᵀCₖ/nₖ + diag(eₖ), where Cₖ holds
 * the class's centred rows (scaled back from its standardized columns) and eₖ is the shrinkage target
 * δₖ·μₖ·(column scale)² (or δ·trace/p for a fixed shrinkage). Hence Σ = Λ + UᵀU with Λ = Σₖ πₖ·eₖ
 * diagonal and U the n × p stack of the blocks √(πₖ(1 − δₖ)/nₖ)·Cₖ, and by the Woodbury identity
 * (Golub and Van Loan, "Matrix Computations", 4th ed., section 2.1.4)
 *     Σ⁻¹v = Λ⁻¹v − Λ⁻¹Uᵀ(I + UΛ⁻¹Uᵀ)⁻¹UΛ⁻¹v,
 * an n × n Cholesky solve. The Ledoit–Wolf shrinkage needs trace S, ‖S‖²_F and the rows' squared
 * norms, all read off the class's Gram matrix (‖YᵀY‖_F = ‖YYᵀ‖_F). Null when Σ is not safely
 * invertible (the same test as the p × p path), which then takes over.
 */
function fitWide(
  x: Float64Array,
  rows: number,
  p: number,
  classes: number,
  positions: Int32Array,
  shrinkage: number,
): { coefficients: Float64Array; intercepts: Float64Array } | null {
  const members: Int32Array[] = [];
  const sizes = new Int32Array(classes);
  for (let i = 0; i < rows; i++) sizes[positions[i]]++;
  const fill = new Int32Array(classes);
  for (let k = 0; k < classes; k++) members.push(new Int32Array(sizes[k]));
  for (let i = 0; i < rows; i++) members[positions[i]][fill[positions[i]]++] = i;

  const means = new Float64Array(classes * p);
  const lambda = new Float64Array(p);
  const u = new Float64Array(rows * p);
  let floor = 0;
  let trace = 0;
  let offset = 0;
  for (let k = 0; k < classes; k++) {
    const n = sizes[k];
    const prior = n / rows;
    const block = gather(x, p, members[k]);
    means.set(columnMeans(block, n, p), k * p);
    const shrunk = Number.isNaN(shrinkage) ? ledoitWolfWide(block, n, p) : fixedShrinkageWide(block, n, p, shrinkage);
    for (let j = 0; j < p; j++) lambda[j] += prior * shrunk.diagonal[j];
    floor += prior * shrunk.floor;
    const weight = Math.sqrt((prior * (1 - shrunk.shrinkage)) / n);
    for (let i = 0; i < n * p; i++) u[offset * p + i] = weight * block[i];
    trace += prior * (1 - shrunk.shrinkage) * shrunk.trace;
    offset += n;
  }
  for (let j = 0; j < p; j++) trace += lambda[j];
  if (!(floor > Number.EPSILON * trace)) return null;

  // V = U Λ^(−1/2); M = I + V Vᵀ.
  const v = new Float64Array(rows * p);
  const rootInverse = new Float64Array(p);
  for (let j = 0; j < p; j++) rootInverse[j] = 1 / Math.sqrt(lambda[j]);
  for (let i = 0; i < rows; i++) for (let j = 0; j < p; j++) v[i * p + j] = u[i * p + j] * rootInverse[j];
  const m = gramMatrix(v, rows, p);
  for (let i = 0; i < rows; i++) m[i * rows + i] += 1;
  if (!choleskyInPlace(m, rows)) return null;

  const coefficients = new Float64Array(classes * p);
  const intercepts = new Float64Array(classes);
  const t = new Float64Array(p);
  const q = new Float64Array(rows);
  for (let k = 0; k < classes; k++) {
    const mean = means.subarray(k * p, (k + 1) * p);
    // t = Λ^(−1/2) μ; q = (I + VVᵀ)⁻¹ V t; w = Λ^(−1/2) (t − Vᵀq).
    for (let j = 0; j < p; j++) t[j] = mean[j] * rootInverse[j];
    for (let i = 0; i < rows; i++) {
      let s = 0;
      for (let j = 0; j < p; j++) s += v[i * p + j] * t[j];
      q[i] = s;
    }
    choleskySolveInPlace(m, rows, q);
    const w = coefficients.subarray(k * p, (k + 1) * p);
    w.set(t);
    for (let i = 0; i < rows; i++) {
      const qi = q[i];
      for (let j = 0; j < p; j++) w[j] -= qi * v[i * p + j];
    }
    let quadratic = 0;
    for (let j = 0; j < p; j++) {
      w[j] *= rootInverse[j];
      quadratic += mean[j] * w[j];
    }
    intercepts[k] = -0.5 * quadratic + Math.log(sizes[k] / rows);
  }
  return { coefficients, intercepts };
}

/** A class's shrunk covariance on wide data: (1 − shrinkage)·CᵀC/n + diag(diagonal), C in the block. */
interface WideShrunkCovariance {
  shrinkage: number;
  /** The shrinkage target's diagonal, eₖ. */
  diagonal: Float64Array;
  /** trace(CᵀC/n). */
  trace: number;
  /** A lower bound on the smallest eigenvalue, as {@link ShrunkCovariance}'s. */
  floor: number;
}

/** {@link fixedShrinkageCovariance} in the wide form; centres `block` in place. */
function fixedShrinkageWide(block: Float64Array, n: number, p: number, shrinkage: number): WideShrunkCovariance {
  const mean = columnMeans(block, n, p);
  let squares = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < p; j++) {
      const d = block[i * p + j] - mean[j];
      block[i * p + j] = d;
      squares += d * d;
    }
  }
  const trace = squares / n;
  const target = (shrinkage * trace) / p;
  return { shrinkage, diagonal: new Float64Array(p).fill(target), trace, floor: target };
}

/**
 * {@link ledoitWolfCovariance} in the wide form: the same standardization, the shrinkage from the
 * class's Gram matrix, and the block left holding C (the centred standardized rows scaled back).
 */
function ledoitWolfWide(block: Float64Array, n: number, p: number): WideShrunkCovariance {
  const scale = standardizeColumns(block, n, p);
  const again = columnMeans(block, n, p);
  for (let i = 0; i < n; i++) for (let j = 0; j < p; j++) block[i * p + j] -= again[j];

  const gram = gramMatrix(block, n, p);
  let gramTrace = 0;
  let gramSquares = 0;
  let fourth = 0;
  for (let i = 0; i < n; i++) {
    const d = gram[i * n + i];
    gramTrace += d;
    fourth += d * d;
  }
  for (let i = 0; i < n * n; i++) gramSquares += gram[i] * gram[i];
  const traceS = gramTrace / n;
  const mu = traceS / p;
  const frobenius = gramSquares / (n * n);
  let beta = (fourth / n - frobenius) / (p * n);
  const delta = (frobenius - 2 * mu * traceS + p * mu * mu) / p;
  let shrinkage = 0;
  if (delta > 0) {
    beta = Math.min(beta, delta);
    shrinkage = beta === 0 ? 0 : beta / delta;
  }
  const diagonal = new Float64Array(p);
  let smallestScale = Infinity;
  let trace = 0;
  for (let j = 0; j < p; j++) {
    diagonal[j] = shrinkage * mu * scale[j] * scale[j];
    smallestScale = Math.min(smallestScale, scale[j]);
  }
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < p; j++) {
      const c = block[i * p + j] * scale[j];
      block[i * p + j] = c;
      trace += c * c;
    }
  }
  return { shrinkage, diagonal, trace: trace / n, floor: shrinkage * mu * smallestScale * smallestScale };
}
