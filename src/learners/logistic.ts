/**
 * L2-penalized logistic regression, the default learner.
 *
 * It minimizes the objective of scikit-learn's `LogisticRegression(penalty="l2", C)`:
 *
 *     ½‖W‖² + C · Σᵢ log-loss(yᵢ, softmax(W xᵢ + b))
 *
 * over the coefficients W and the intercepts b, with the intercepts not penalized. The features are
 * first one-hot encoded (text columns), imputed and standardized by a {@link Preprocessor} fitted on
 * the training rows, so the coefficients apply to standardized features.
 *  - Two classes: one coefficient vector and one intercept for the second class against the first (as
 *    scikit-learn), fitted by Newton's method (iteratively reweighted least squares) with a dense
 *    Cholesky solve of the (columns + 1)² Hessian and step halving until the objective decreases
 *    enough (Armijo's condition; near the optimum, where that decrease is below rounding, the
 *    approximate Wolfe conditions of Hager and Zhang).
 *  - More classes: the multinomial (softmax) model with one coefficient vector and one intercept per
 *    class, all coefficients penalized, as scikit-learn's multinomial lbfgs; fitted by limited-memory
 *    BFGS (Nocedal and Wright, "Numerical Optimization", 2nd ed., algorithms 7.4 and 7.5) with ten
 *    correction pairs and a backtracking line search satisfying Armijo's condition (or the approximate
 *    Wolfe conditions, as for two classes). The intercepts are determined only up to a common
 *    constant; they are returned summing to zero, as scikit-learn's. The sums over the rows run in a
 *    small WebAssembly kernel ({@link SoftmaxLoss}), faster than plain JavaScript (`npm run bench`).
 *    The optimizer is src/numerics/lbfgs.ts.
 *  - More feature columns than rows (wide data): the same objective is minimized in the rows' own
 *    n-dimensional space ({@link rowSpace}), by L-BFGS for two classes too, and the coefficients are
 *    mapped back to the columns; the work grows with n² · p instead of p² or p³.
 *  - Both stop as scikit-learn 1.2's lbfgs does with its defaults (`tol` 1e-4 and SciPy's L-BFGS-B
 *    `factr` 1e7): when every entry of the gradient of scikit-learn's objective
 *    F = Σᵢ log-loss + ‖W‖²/(2C) is at most `tolerance` in absolute value, or when an iteration
 *    lowers F by at most `relativeDecrease` · max(|F|, 1). F is strongly convex in W with modulus
 *    1/C, so the gradient test bounds the distance to the optimal coefficients by C · ‖∇F‖ whatever
 *    the number of rows. The optimizers work with F divided by n, whose scale does not grow with n.
 *    A learning curve needs no tighter optimum than scikit-learn's own: held-out accuracy moves by far
 *    less than its sampling error when the tolerance is tightened, while the iterations grow several
 *    fold.
 *  - A warm start (`fit`'s `previous` model, from the previous training size of a (repeat, fold))
 *    starts the optimizer from that model instead of from zero.
 *  - A training subsample may lack some of the data set's classes: the model is fitted on the classes
 *    present and gives the absent ones probability 0; with one class present it predicts that class
 *    with probability 1.
 *
 * Written by hand because the npm package ml-logistic-regression fits no intercept and no penalty and
 * runs a fixed 50,000 gradient steps, while a learning curve needs hundreds of fits. Loops run on raw Float64Arrays (and the
 * multinomial sums in WebAssembly).
 */
import { DataError, FitError, UsageError } from "../errors.js";
import { message } from "../messages.js";
import type { RandomStream } from "../random.js";
import type { FittedModel, Learner, LearnerSettings, TrainingSet } from "./learner.js";
import { fitPreprocessor, type Preprocessor } from "./preprocess.js";
import {
  approximateWolfe,
  decreasedLittle,
  dot,
  gradientSize,
  minimizeLbfgs,
  type LbfgsOptions,
  type Objective,
} from "../numerics/lbfgs.js";
import { rowSpace, wideEnough } from "./rowSpace.js";
import { scratchDoubles, scratchRowDoubles, scratchRowIntegers } from "./scratch.js";
import { choleskyInPlace, choleskySolveInPlace } from "../numerics/linearAlgebra.js";
import { checkSettingNames } from "./settings.js";
import { SoftmaxLoss } from "./softmaxKernel.js";

export interface LogisticOptions {
  /** Inverse strength of the L2 penalty (scikit-learn's `C`); larger means a weaker penalty. @default 1 */
  C?: number;
  /**
   * Gradient tolerance, scikit-learn's `tol`: the fit stops when every entry of the gradient of
   * scikit-learn's objective Σ log-loss + ‖W‖²/(2C) is at most this in absolute value. @default 1e-4
   */
  tolerance?: number;
  /**
   * Relative-decrease tolerance: the fit also stops when an iteration lowers that objective F by at
   * most this times max(|F|, 1), SciPy's L-BFGS-B test (`factr` 1e7 times the double-precision machine
   * epsilon, its default, as scikit-learn's lbfgs uses). 0 turns the test off. @default 2.220446049250313e-9
   */
  relativeDecrease?: number;
  /** Most Newton or L-BFGS iterations before the fit stops unconverged. @default 1000 */
  maxIterations?: number;
}

export type ResolvedLogisticOptions = Required<LogisticOptions>;

/** SciPy's L-BFGS-B default `ftol`: `factr` = 1e7 times the double-precision machine epsilon. */
const scipyRelativeDecrease = 1e7 * Number.EPSILON;

/**
 * Fills in the defaults of {@link LogisticOptions}.
 * @throws UsageError when C or the tolerance is not a positive finite number, or maxIterations not a
 *   whole number of at least 1.
 */
export function resolveLogisticOptions(options: LogisticOptions = {}): ResolvedLogisticOptions {
  const C = options.C ?? 1;
  const tolerance = options.tolerance ?? 1e-4;
  const relativeDecrease = options.relativeDecrease ?? scipyRelativeDecrease;
  const maxIterations = options.maxIterations ?? 1000;
  if (!(Number.isFinite(C) && C > 0)) throw new UsageError(message.settingNotPositive("logistic", "C", C));
  if (!(Number.isFinite(tolerance) && tolerance > 0))
    throw new UsageError(message.settingNotPositive("logistic", "tolerance", tolerance));
  if (!(Number.isFinite(relativeDecrease) && relativeDecrease >= 0 && relativeDecrease < 1))
    throw new UsageError(message.settingNotFraction("logistic", "relativeDecrease", relativeDecrease));
  if (!(Number.isInteger(maxIterations) && maxIterations >= 1))
    throw new UsageError(message.settingNotWhole("logistic", "maxIterations", maxIterations, 1));
  return { C, tolerance, relativeDecrease, maxIterations };
}

/** The logistic-regression learner (`--learner logistic`). Deterministic: the random stream is unused. */
export class LogisticRegression implements Learner {
  readonly name = "logistic";
  readonly options: ResolvedLogisticOptions;
  /** Penalties the tuning step tries. */
  readonly tuningGrid: readonly LearnerSettings[] = [{ C: 0.01 }, { C: 0.1 }, { C: 1 }, { C: 10 }, { C: 100 }];

  constructor(options: LogisticOptions = {}) {
    this.options = resolveLogisticOptions(options);
  }

  /** @throws UsageError on a setting that is not one of {@link LogisticOptions} or a bad value. */
  withOptions(settings: LearnerSettings): LogisticRegression {
    checkSettingNames("logistic", settings, Object.keys(this.options));
    return new LogisticRegression({ ...this.options, ...settings });
  }

  /**
   * Fits the preprocessing and the model on the training rows. With `previous`, a logistic model
   * fitted on other rows of the same data (say, a smaller nested subsample) with the same classes
   * present and no text columns, the optimizer starts from that model's decision function, carried
   * over to this fit's standardization, instead of from zero (a warm start): it then needs fewer
   * iterations, and its answer differs from a cold start's only within the stopping tolerance.
   * @throws DataError when there are no rows, the features do not hold rows × columns values, a label
   *   lies outside 0 .. classCount − 1, or a feature is ±Infinity.
   */
  fit(training: TrainingSet, _random?: RandomStream, previous?: FittedModel): FittedLogistic {
    const { features, rows, columns, labels, classCount } = training;
    if (!(Number.isInteger(classCount) && classCount >= 1))
      throw new DataError(message.classCountNotWhole("logistic", classCount));
    if (labels.length !== rows) throw new DataError(message.labelCount("logistic", labels.length, rows));
    if (rows < 1) throw new DataError(message.noTrainingRows("logistic"));
    const counts = new Int32Array(classCount);
    for (let i = 0; i < rows; i++) {
      const label = labels[i];
      if (!(label >= 0 && label < classCount))
        throw new DataError(message.labelOutOfRange("logistic", i + 1, label, classCount));
      counts[label]++;
    }
    const preprocessor = fitPreprocessor(features, rows, columns, {
      categories: training.categories,
      completeColumns: training.completeColumns,
    });
    const width = preprocessor.outputColumns;
    const present: number[] = [];
    for (let k = 0; k < classCount; k++) if (counts[k] > 0) present.push(k);
    const classes = Int32Array.from(present);

    if (present.length === 1) {
      return new FittedLogistic(
        classCount,
        columns,
        preprocessor,
        classes,
        new Float64Array(0),
        new Float64Array(0),
        0,
        true,
      );
    }
    // The standardized rows and the labels are work arrays of this thread (scratch.ts): the fitters
    // read them only while they run.
    const x = preprocessor.transform(features, rows, scratchRowDoubles("logistic.training", rows, width));
    // Labels renumbered over the classes present: 0 .. present.length − 1.
    const position = new Int32Array(classCount).fill(-1);
    present.forEach((k, index) => (position[k] = index));
    const y = scratchRowIntegers("logistic.labels", rows);
    for (let i = 0; i < rows; i++) y[i] = position[labels[i]];

    let fitted: LinearFit;
    if (wideEnough(rows, width)) {
      // More columns than rows: the same fit in the rows' own space (rowSpace.ts), from zero, judged
      // by the gradient's Euclidean length (rotation-invariant, at least its largest entry). There
      // the Newton step would cost n·r² per iteration against n·r for L-BFGS's, so two classes take
      // L-BFGS too, as scikit-learn's lbfgs does.
      const space = rowSpace(x, rows, width);
      const reduced =
        present.length === 2
          ? fitBinaryLbfgs(space.features, y, rows, space.rank, this.options)
          : fitMultinomial(space.features, y, rows, space.rank, present.length, this.options, undefined, true);
      fitted = { ...reduced, coefficients: space.lift(reduced.coefficients, reduced.intercepts.length) };
    } else {
      const start = previous instanceof FittedLogistic ? warmStart(previous, preprocessor, classes) : undefined;
      fitted =
        present.length === 2
          ? fitBinary(x, y, rows, width, this.options, start)
          : fitMultinomial(x, y, rows, width, present.length, this.options, start);
    }
    return new FittedLogistic(
      classCount,
      columns,
      preprocessor,
      classes,
      fitted.coefficients,
      fitted.intercepts,
      fitted.iterations,
      fitted.converged,
    );
  }
}

/** A fitted logistic regression. */
export class FittedLogistic implements FittedModel {
  constructor(
    /** Number of classes in the whole data set: the width of the probability rows. */
    readonly classCount: number,
    /** Number of input feature columns (before the one-hot encoding of any text column). */
    readonly columns: number,
    /** The imputation and standardization fitted on the training rows. */
    readonly preprocessor: Preprocessor,
    /** The classes present in training, ascending; the others get probability 0. */
    readonly classes: Int32Array,
    /**
     * Row-major coefficients on the standardized (and one-hot encoded) features, whose count is
     * `preprocessor.outputColumns`: one row for two classes (for `classes[1]` against `classes[0]`, as
     * scikit-learn's `coef_`), `classes.length` rows for more, none for one class.
     */
    readonly coefficients: Float64Array,
    /** Intercepts, one per coefficient row (scikit-learn's `intercept_`). */
    readonly intercepts: Float64Array,
    /** Newton or L-BFGS iterations taken. */
    readonly iterations: number,
    /** Whether a stopping test (gradient or relative decrease) was met within maxIterations. */
    readonly converged: boolean,
  ) {}

  /**
   * Class probabilities, row-major `rows × classCount`: in a new array, or in the start of `target`
   * when given (see {@link FittedModel.predictProbabilities}).
   * @throws DataError when the features do not hold rows × columns values or a value is ±Infinity.
   */
  predictProbabilities(features: Float64Array, rows: number, target?: Float64Array): Float64Array {
    const { classCount, classes, coefficients, intercepts } = this;
    const columns = this.preprocessor.outputColumns;
    const out = probabilityArray(rows, classCount, target);
    const x = this.preprocessor.transform(features, rows, scratchDoubles("logistic.prediction", rows * columns));
    const present = classes.length;
    if (present === 1) {
      for (let i = 0; i < rows; i++) out[i * classCount + classes[0]] = 1;
    } else if (present === 2) {
      const negative = classes[0];
      const positive = classes[1];
      const b = intercepts[0];
      for (let i = 0; i < rows; i++) {
        let z = b;
        const offset = i * columns;
        for (let j = 0; j < columns; j++) z += coefficients[j] * x[offset + j];
        const p = sigmoid(z);
        out[i * classCount + positive] = p;
        out[i * classCount + negative] = sigmoid(-z);
      }
    } else {
      const z = new Float64Array(present);
      for (let i = 0; i < rows; i++) {
        const offset = i * columns;
        let max = -Infinity;
        for (let k = 0; k < present; k++) {
          let s = intercepts[k];
          const w = k * columns;
          for (let j = 0; j < columns; j++) s += coefficients[w + j] * x[offset + j];
          z[k] = s;
          if (s > max) max = s;
        }
        let sum = 0;
        for (let k = 0; k < present; k++) {
          z[k] = Math.exp(z[k] - max);
          sum += z[k];
        }
        for (let k = 0; k < present; k++) out[i * classCount + classes[k]] = z[k] / sum;
      }
    }
    return out;
  }
}

/**
 * Where `predictProbabilities` writes: the zeroed start of `target` when it is given and long enough,
 * else a new array.
 */
function probabilityArray(rows: number, classCount: number, target: Float64Array | undefined): Float64Array {
  const length = rows * classCount;
  if (target === undefined || !(length <= target.length)) return new Float64Array(length);
  return target.subarray(0, length).fill(0);
}

interface LinearFit {
  coefficients: Float64Array;
  intercepts: Float64Array;
  iterations: number;
  converged: boolean;
}

/**
 * The parameters, in the layout the fitters use (per coefficient row: the coefficients, then the
 * intercept), at which a new fit reproduces the decision function of `previous` on the standardized
 * features of `preprocessor`: a previous row (w, b) on features (x − m)/s becomes, on (x − m')/s',
 * the row w_j·s'_j/s_j with intercept b + Σ_j w_j·(m'_j − m_j)/s_j. Undefined (start from zero) when
 * the classes present differ, the column counts differ, or either fit one-hot encoded a text column
 * (the indicator columns of two fits need not name the same categories). Exported for its tests.
 */
export function warmStart(
  previous: FittedLogistic,
  preprocessor: Preprocessor,
  classes: Int32Array,
): Float64Array | undefined {
  const before = previous.preprocessor;
  const p = preprocessor.outputColumns;
  if (before.outputColumns !== p || before.encoder !== null || preprocessor.encoder !== null) return undefined;
  if (previous.classes.length !== classes.length || previous.classes.some((k, index) => k !== classes[index]))
    return undefined;
  const rowCount = previous.intercepts.length;
  const start = new Float64Array(rowCount * (p + 1));
  for (let r = 0; r < rowCount; r++) {
    let intercept = previous.intercepts[r];
    for (let j = 0; j < p; j++) {
      const w = previous.coefficients[r * p + j];
      start[r * (p + 1) + j] = (w * preprocessor.scales[j]) / before.scales[j];
      intercept += (w * (preprocessor.means[j] - before.means[j])) / before.scales[j];
    }
    start[r * (p + 1) + p] = intercept;
  }
  return start.every(Number.isFinite) ? start : undefined;
}

/** 1 / (1 + e^−z) without overflow. */
function sigmoid(z: number): number {
  if (z >= 0) return 1 / (1 + Math.exp(-z));
  const e = Math.exp(z);
  return e / (1 + e);
}

/** log(1 + e^z) without overflow. */
function softplus(z: number): number {
  return z > 0 ? z + Math.log1p(Math.exp(-z)) : Math.log1p(Math.exp(z));
}

/**
 * Binary model by Newton's method. Parameters θ = (w₁ .. w_p, b); the objective, divided by C·n, is
 * f(θ) = (1/n) Σ [log(1 + e^zᵢ) − yᵢ zᵢ] + λ‖w‖²/2 with zᵢ = w·xᵢ + b and λ = 1/(C·n). Its gradient is
 * (1/n) Σ (pᵢ − yᵢ) aᵢ + λ(w, 0) and its Hessian (1/n) Σ pᵢ(1 − pᵢ) aᵢ aᵢᵀ + λ diag(1, .., 1, 0), where
 * aᵢ = (xᵢ, 1) and pᵢ = σ(zᵢ). `start`, when given, is the starting θ (a warm start); otherwise 0.
 */
function fitBinary(
  x: Float64Array,
  y: Int32Array,
  n: number,
  p: number,
  options: ResolvedLogisticOptions,
  start?: Float64Array,
  euclidean = false,
): LinearFit {
  const m = p + 1;
  const lambda = 1 / (options.C * n);
  // Work arrays of this thread (scratch.ts), all written before they are read.
  const work = scratchDoubles("logistic.newton", n + 5 * m + 2 * m * m);
  let used = 0;
  const take = (length: number) => work.subarray(used, (used += length));
  const weights = take(n);
  const objective = (theta: Float64Array, gradient: Float64Array): number =>
    binaryObjective(x, y, n, p, lambda, theta, gradient, weights);

  let theta = take(m);
  if (start) theta.set(start);
  else theta.fill(0);
  let trial = take(m);
  let gradient = take(m);
  let trialGradient = take(m);
  const hessian = take(m * m);
  const step = take(m);
  const factor = take(m * m);
  const gradientBound = options.tolerance / n;
  let f = objective(theta, gradient);
  let iterations = 0;
  let converged = false;
  for (;;) {
    if (gradientSize(gradient, euclidean) <= gradientBound) {
      converged = true;
      break;
    }
    if (iterations >= options.maxIterations) break;
    iterations++;
    // Hessian: lower triangle accumulated row by row, then mirrored so it is exactly symmetric.
    hessian.fill(0);
    for (let i = 0; i < n; i++) {
      const wi = weights[i];
      if (wi !== 0) addToHessian(hessian, x, i * p, p, wi);
    }
    for (let j = 0; j < m; j++) {
      for (let k = 0; k <= j; k++) {
        const v = hessian[j * m + k] / n + (j === k && j < p ? lambda : 0);
        hessian[j * m + k] = v;
        hessian[k * m + j] = v;
      }
    }
    solveSymmetricPositive(hessian, m, gradient, step, factor);
    // Step halving along −step until Armijo's condition (or, at rounding level, the approximate Wolfe
    // conditions) holds.
    const slope = dot(gradient, step);
    let t = 1;
    let accepted = false;
    const fPrevious = f;
    for (let halving = 0; halving < 20; halving++) {
      for (let j = 0; j < m; j++) trial[j] = theta[j] - t * step[j];
      const fTrial = objective(trial, trialGradient);
      if (fTrial <= f - 1e-4 * t * slope || approximateWolfe(f, fTrial, -slope, -dot(trialGradient, step))) {
        const swapTheta = theta;
        theta = trial;
        trial = swapTheta;
        const swapGradient = gradient;
        gradient = trialGradient;
        trialGradient = swapGradient;
        f = fTrial;
        accepted = true;
        break;
      }
      t /= 2;
    }
    // No acceptable step even a millionth of a Newton step long: nothing more to gain.
    if (!accepted) {
      objective(theta, gradient);
      converged = gradientSize(gradient, euclidean) <= gradientBound;
      break;
    }
    if (
      gradientSize(gradient, euclidean) > gradientBound &&
      decreasedLittle(fPrevious, f, options.relativeDecrease, n)
    ) {
      converged = true;
      break;
    }
  }
  return {
    coefficients: theta.slice(0, p),
    intercepts: Float64Array.of(theta[p]),
    iterations,
    converged,
  };
}

/**
 * The binary model of {@link fitBinary} fitted by L-BFGS instead of Newton's method (for the
 * row-space form of wide data, where an iteration of L-BFGS is much cheaper than a Newton step),
 * from zero, with the Euclidean gradient test.
 */
function fitBinaryLbfgs(
  x: Float64Array,
  y: Int32Array,
  n: number,
  p: number,
  options: ResolvedLogisticOptions,
): LinearFit {
  const objective = new BinaryObjective(x, y, n, p, 1 / (options.C * n), scratchDoubles("logistic.weights", n));
  const result = minimizeLbfgs(objective, new Float64Array(p + 1), lbfgsOptions(options, n, true, p + 1));
  const theta = result.solution;
  return {
    coefficients: theta.slice(0, p),
    intercepts: Float64Array.of(theta[p]),
    iterations: result.iterations,
    converged: result.converged,
  };
}

/** {@link binaryObjective} as an {@link Objective} (a class, not a closure: see {@link MultinomialObjective}). */
class BinaryObjective implements Objective {
  constructor(
    private readonly x: Float64Array,
    private readonly y: Int32Array,
    private readonly n: number,
    private readonly p: number,
    private readonly lambda: number,
    private readonly weights: Float64Array,
  ) {}

  evaluate(theta: Float64Array, gradient: Float64Array): number {
    return binaryObjective(this.x, this.y, this.n, this.p, this.lambda, theta, gradient, this.weights);
  }
}

/**
 * Adds wᵢ aᵢ aᵢᵀ, for the row aᵢ = (xᵢ, 1) starting at `offset` of `x`, to the lower triangle of the
 * (p + 1)² `hessian`. A function of its own, called once per row: V8 optimizes a small function after
 * a few calls, where the loop nested in the fit's loops ran unoptimized, boxing every number, for the
 * first several fits of each thread.
 */
function addToHessian(hessian: Float64Array, x: Float64Array, offset: number, p: number, wi: number): void {
  const m = p + 1;
  for (let j = 0; j < p; j++) {
    const v = wi * x[offset + j];
    const row = j * m;
    for (let k = 0; k <= j; k++) hessian[row + k] += v * x[offset + k];
  }
  const last = p * m;
  for (let k = 0; k < p; k++) hessian[last + k] += wi * x[offset + k];
  hessian[last + p] += wi;
}

/**
 * The binary fit's objective f(θ) (see {@link fitBinary}) on the rows `x`, `y`; fills `gradient` and
 * the IRLS weights pᵢ(1 − pᵢ). A function of its own rather than a closure made by each fit, so that
 * the optimized code of one fit serves the next (a new closure per fit sent V8 back to unoptimized
 * code, boxing every number, which took a third of a small curve's time).
 */
function binaryObjective(
  x: Float64Array,
  y: Int32Array,
  n: number,
  p: number,
  lambda: number,
  theta: Float64Array,
  gradient: Float64Array,
  weights: Float64Array,
): number {
  const b = theta[p];
  let loss = 0;
  gradient.fill(0);
  for (let i = 0; i < n; i++) {
    const offset = i * p;
    let s = b;
    for (let j = 0; j < p; j++) s += theta[j] * x[offset + j];
    loss += softplus(s) - (y[i] === 1 ? s : 0);
    const prob = sigmoid(s);
    const r = prob - y[i];
    weights[i] = prob * (1 - prob);
    if (r !== 0) {
      for (let j = 0; j < p; j++) gradient[j] += r * x[offset + j];
      gradient[p] += r;
    }
  }
  let penalty = 0;
  for (let j = 0; j < p; j++) penalty += theta[j] * theta[j];
  for (let j = 0; j <= p; j++) gradient[j] /= n;
  for (let j = 0; j < p; j++) gradient[j] += lambda * theta[j];
  return loss / n + (lambda * penalty) / 2;
}

/**
 * Solves A x = b for a symmetric positive definite `m × m` matrix A (row-major, exactly symmetric) by
 * Cholesky decomposition A = L Lᵀ into `factor`. Should rounding make a pivot non-positive, it retries
 * with a small multiple of the identity added, growing tenfold each time (Levenberg's damping).
 * @throws FitError when even a damped matrix cannot be decomposed (a NaN or Infinity in A).
 */
function solveSymmetricPositive(
  a: Float64Array,
  m: number,
  b: Float64Array,
  x: Float64Array,
  factor: Float64Array,
): void {
  let largestDiagonal = 0;
  for (let j = 0; j < m; j++) largestDiagonal = Math.max(largestDiagonal, Math.abs(a[j * m + j]));
  let damping = 0;
  for (let attempt = 0; attempt < 20; attempt++) {
    factor.set(a);
    if (choleskyInPlace(factor, m, damping)) {
      x.set(b);
      choleskySolveInPlace(factor, m, x);
      return;
    }
    damping = damping === 0 ? 1e-12 * Math.max(largestDiagonal, 1e-300) : damping * 10;
  }
  throw new FitError(message.newtonStepFailed());
}

/**
 * Multinomial model by L-BFGS. Parameters, class by class: θ = (w_k,1 .. w_k,p, b_k) for k = 1 .. K.
 * The objective divided by C·n is f(θ) = (1/n) Σᵢ [log Σ_k e^{z_ik} − z_{i,yᵢ}] + λ‖W‖²/2 with
 * z_ik = w_k·xᵢ + b_k and λ = 1/(C·n); the gradient for class k is (1/n) Σᵢ (p_ik − [yᵢ = k]) (xᵢ, 1)
 * + λ(w_k, 0). The sums over the rows, nearly all the work, are {@link SoftmaxLoss}'s. `start`, when
 * given, is the starting θ (a warm start); otherwise θ starts at 0.
 */
function fitMultinomial(
  x: Float64Array,
  y: Int32Array,
  n: number,
  p: number,
  classes: number,
  options: ResolvedLogisticOptions,
  start?: Float64Array,
  euclidean = false,
): LinearFit {
  const stride = p + 1;
  const size = classes * stride;
  const objective = new MultinomialObjective(new SoftmaxLoss(x, y, n, p, classes), n, p, classes, 1 / (options.C * n));
  const result = minimizeLbfgs(objective, start ?? new Float64Array(size), lbfgsOptions(options, n, euclidean, size));
  const theta = result.solution;
  const coefficients = new Float64Array(classes * p);
  const intercepts = new Float64Array(classes);
  let interceptMean = 0;
  for (let k = 0; k < classes; k++) interceptMean += theta[k * stride + p] / classes;
  for (let k = 0; k < classes; k++) {
    coefficients.set(theta.subarray(k * stride, k * stride + p), k * p);
    intercepts[k] = theta[k * stride + p] - interceptMean;
  }
  return { coefficients, intercepts, iterations: result.iterations, converged: result.converged };
}

/**
 * The multinomial fit's objective f(θ) (see {@link fitMultinomial}): the sums are `sums`', the rest
 * here. An object of one class rather than a closure made by each fit, so that the optimizer's call
 * of it keeps one target from fit to fit (a new closure per fit sent V8's optimized code for the
 * optimizer back to unoptimized code, boxing every number, for much of each thread's first fits).
 */
class MultinomialObjective implements Objective {
  constructor(
    private readonly sums: SoftmaxLoss,
    private readonly n: number,
    private readonly p: number,
    private readonly classes: number,
    private readonly lambda: number,
  ) {}

  evaluate(theta: Float64Array, gradient: Float64Array): number {
    const { n, p, classes, lambda } = this;
    const stride = p + 1;
    const loss = this.sums.evaluate(theta, gradient);
    let penalty = 0;
    for (let k = 0; k < classes; k++) {
      const w = k * stride;
      for (let j = 0; j < p; j++) {
        const v = theta[w + j];
        penalty += v * v;
        gradient[w + j] = gradient[w + j] / n + lambda * v;
      }
      gradient[w + p] /= n;
    }
    return loss / n + (lambda * penalty) / 2;
  }
}

/**
 * The optimizer's settings for a fit on n rows: the gradient of scikit-learn's objective F = n·f at
 * most `tolerance` means f's at most tolerance / n; the relative-decrease test judges F. The vectors
 * live in a work array of this thread (scratch.ts), so the solution is read before the next fit.
 */
function lbfgsOptions(options: ResolvedLogisticOptions, n: number, euclidean: boolean, size: number): LbfgsOptions {
  const memory = 10;
  return {
    gradientTolerance: options.tolerance / n,
    euclidean,
    relativeDecrease: options.relativeDecrease,
    objectiveScale: n,
    maxIterations: options.maxIterations,
    memory,
    work: scratchDoubles("logistic.lbfgs", (7 + 2 * memory) * size),
  };
}
