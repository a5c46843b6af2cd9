/**
 * Weighted nonlinear least squares by the Levenberg–Marquardt method.
 *
 * Minimizes the weighted residual sum of squares
 *
 *     RSS(θ) = Σᵢ wᵢ · (model(xᵢ, θ) − yᵢ)²,   wᵢ = 1 / σᵢ²,
 *
 * over parameters θ kept inside box bounds, and reports the covariance of the estimate as
 * s² · (JᵀWJ)⁻¹ with s² = RSS / (n − p), the convention of NIST StRD and of SciPy's `curve_fit` with
 * `absolute_sigma=False`.
 *
 * Method (Levenberg 1944; Marquardt 1963; damping update of Nielsen 1999, as in Madsen, Nielsen and
 * Tingleff 2004, "Methods for non-linear least squares problems", §3.2; scaling of Moré 1978, "The
 * Levenberg–Marquardt algorithm: implementation and theory"):
 *
 * 1. Each iteration solves (JᵀWJ + λ·D) δ = −JᵀWr for the step, where D is Marquardt's diagonal
 *    scaling: the largest diagonal of JᵀWJ seen so far (Moré's rule, so the scaling never shrinks).
 *    The p×p system is solved by Cholesky after scaling it to a unit diagonal.
 * 2. Geodesic acceleration (Transtrum and Sethna 2012, "Improvements to the Levenberg–Marquardt
 *    algorithm for nonlinear least-squares minimization"): the step v gets the second-order
 *    correction a/2, and a step with 2‖a‖/‖v‖ > 0.75 is refused as too curved (λ grows instead).
 *    Without it, BoxBOD from NIST's first start runs b2 from 1 to 115 in one step and stalls on the
 *    plateau where the model is a constant; with it, every NIST start reaches the certified values.
 * 3. A step is accepted when it lowers the RSS; the gain ratio ρ (actual over predicted reduction)
 *    sets the next λ (λ·max(1/3, 1 − (2ρ − 1)³) on success, λ·ν with ν doubling on failure).
 * 4. Bounds are kept by projection: a parameter sitting on a bound whose gradient pushes it outward
 *    is held fixed for that iteration (it leaves the reduced system), and every trial point is
 *    clamped into the box.
 * 5. Convergence, tested after each Jacobian: the residuals vanish; the further reduction a full
 *    Gauss–Newton step predicts is below `relativeReduction` × RSS (a test that does not depend on
 *    how the parameters are scaled); the scaled gradient (cosine between the residual vector and
 *    each Jacobian column, as in MINPACK) is below `gradient`; or, after an accepted step, both the
 *    actual and predicted reductions are below `relativeReduction` × RSS and the step is below
 *    `relativeStep` relative to the parameters.
 *
 * Why hand-written: ml-levenberg-marquardt 5.1.0 ignores non-uniform weights (every weighting left
 * the fit at its start when tried), always runs `maxIterations` with no convergence test and returns
 * no covariance. This file has no dependency and reproduces the NIST StRD certified values
 * (test/fit/levenbergMarquardt.test.ts).
 *
 * Throws `FitError` for inconsistent input (lengths, non-finite values, bounds), for a model that is
 * not finite at the start, for a Jacobian that is not finite, and when no parameter influences the
 * model. A model that is not finite at a trial point only makes that step fail. It never returns NaN: when
 * the covariance cannot be computed (fewer points than parameters plus one, or a singular JᵀWJ) it
 * returns `covariance: null` and `standardErrors: null`.
 */
import { FitError } from "../errors.js";
import { message } from "../messages.js";
import { choleskyInPlace, choleskySolveInPlace } from "../numerics/linearAlgebra.js";

/** Smallest Cholesky pivot accepted on a matrix scaled to a unit diagonal: below it, singular to working precision. */
const unitDiagonalPivotFloor = 1e-14;

/** A model evaluated at one abscissa: `model(x, parameters)` returns the fitted y. */
export type ModelFunction = (x: number, parameters: readonly number[]) => number;

/** Partial derivatives of the model at one abscissa, one per parameter. */
export type JacobianFunction = (x: number, parameters: readonly number[]) => ArrayLike<number>;

/** Stopping thresholds; see the file comment for the tests they drive. */
export interface LeastSquaresTolerances {
  /**
   * Relative reduction of the RSS below which the fit counts as converged. The default lies below
   * machine epsilon on purpose: it is compared with the reduction a Gauss–Newton step predicts,
   * which is computed from the gradient and stays accurate far below round-off in the RSS itself
   * (1e-18 leaves the parameters about 1e-9 standard errors from the optimum). Where round-off
   * stops progress first, the fit ends with `noFurtherReduction`.
   * @default 1e-18
   */
  relativeReduction: number;
  /**
   * Relative step size below which the fit counts as converged (with a small reduction).
   * @default 1e-12
   */
  relativeStep: number;
  /**
   * Largest cosine between the residuals and any Jacobian column at convergence.
   * @default 1e-12
   */
  gradient: number;
}

export interface LeastSquaresOptions {
  model: ModelFunction;
  /** Analytic partial derivatives; central differences are used when absent. */
  jacobian?: JacobianFunction;
  x: readonly number[];
  y: readonly number[];
  /** Weight of each point, 1/σ² (non-negative). @default all 1 */
  weights?: readonly number[];
  /** Starting parameters (clamped into the bounds). */
  start: readonly number[];
  /** @default all −∞ */
  lowerBounds?: readonly number[];
  /** @default all +∞ */
  upperBounds?: readonly number[];
  /**
   * Most Jacobian evaluations (outer iterations).
   * @default 1000
   */
  maxIterations?: number;
  /**
   * Add Transtrum and Sethna's geodesic acceleration to each step and reject steps whose
   * acceleration is large against their velocity (costs one more model evaluation per trial step).
   * @default true
   */
  geodesicAcceleration?: boolean;
  tolerances?: Partial<LeastSquaresTolerances>;
}

/**
 * Why the iteration stopped: `zeroResidual` (the residuals are at round-off level: an exact fit),
 * `predictedReduction` (a Gauss–Newton step would gain less than `relativeReduction`·RSS),
 * `gradient` (the scaled gradient is below `gradient`, or every parameter is held on a bound),
 * `smallStep` (an accepted step changed the RSS and the parameters by less than the tolerances),
 * `noFurtherReduction` (no step, however damped, lowers the RSS in floating point: a minimum to
 * working precision), `maxIterations` (gave up; the only reason with `converged: false`).
 */
export type StopReason =
  "zeroResidual" | "predictedReduction" | "gradient" | "smallStep" | "noFurtherReduction" | "maxIterations";

export interface LeastSquaresResult {
  parameters: number[];
  /** Weighted residual sum of squares Σ wᵢ rᵢ² at `parameters`. */
  residualSumOfSquares: number;
  /** Outer iterations (Jacobian evaluations) used. */
  iterations: number;
  /** False only when `maxIterations` ran out first. */
  converged: boolean;
  stopReason: StopReason;
  /** s²·(JᵀWJ)⁻¹ with s² = RSS/(n − p); null when n ≤ p or JᵀWJ is singular. */
  covariance: number[][] | null;
  /** Square roots of the covariance diagonal; null with the covariance. */
  standardErrors: number[] | null;
}

interface ResolvedOptions {
  model: ModelFunction;
  jacobian: JacobianFunction | null;
  x: readonly number[];
  y: readonly number[];
  weights: Float64Array;
  start: number[];
  lowerBounds: Float64Array;
  upperBounds: Float64Array;
  maxIterations: number;
  geodesicAcceleration: boolean;
  tolerances: LeastSquaresTolerances;
}

/** The one resolver of `LeastSquaresOptions`: checks the input and fills the defaults. */
export function resolveLeastSquaresOptions(options: LeastSquaresOptions): ResolvedOptions {
  const { x, y, start } = options;
  const n = x.length;
  const p = start.length;
  if (p === 0) throw new FitError(message.lsqNoParameters());
  if (y.length !== n) {
    throw new FitError(message.lsqLengths(n, y.length));
  }
  if (n < p) {
    throw new FitError(message.lsqTooFewPoints(n, p));
  }
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(x[i]) || !Number.isFinite(y[i])) {
      throw new FitError(message.lsqPointNotFinite(i, x[i], y[i]));
    }
  }
  const weights = new Float64Array(n).fill(1);
  if (options.weights !== undefined) {
    if (options.weights.length !== n) {
      throw new FitError(message.lsqWeightCount(options.weights.length, n));
    }
    let positive = 0;
    for (let i = 0; i < n; i++) {
      const w = options.weights[i];
      if (!Number.isFinite(w) || w < 0) {
        throw new FitError(message.lsqBadWeight(i, w));
      }
      weights[i] = w;
      if (w > 0) positive++;
    }
    if (positive < p) {
      throw new FitError(message.lsqFewWeighted(positive, p));
    }
  }
  const lowerBounds = bounds(options.lowerBounds, p, -Infinity, "lowerBounds");
  const upperBounds = bounds(options.upperBounds, p, Infinity, "upperBounds");
  for (let j = 0; j < p; j++) {
    if (!Number.isFinite(start[j])) {
      throw new FitError(message.lsqBadStart(j, start[j]));
    }
    if (!(lowerBounds[j] <= upperBounds[j])) {
      throw new FitError(message.lsqBoundsCrossed(j, lowerBounds[j], upperBounds[j]));
    }
  }
  const maxIterations = options.maxIterations ?? 1000;
  if (!Number.isInteger(maxIterations) || maxIterations < 1) {
    throw new FitError(message.lsqBadIterations(maxIterations));
  }
  const tolerances: LeastSquaresTolerances = {
    relativeReduction: options.tolerances?.relativeReduction ?? 1e-18,
    relativeStep: options.tolerances?.relativeStep ?? 1e-12,
    gradient: options.tolerances?.gradient ?? 1e-12,
  };
  for (const [name, value] of Object.entries(tolerances)) {
    if (!Number.isFinite(value) || value < 0) {
      throw new FitError(message.lsqBadTolerance(name, value));
    }
  }
  return {
    model: options.model,
    jacobian: options.jacobian ?? null,
    x,
    y,
    weights,
    start: start.map((s, j) => Math.min(upperBounds[j], Math.max(lowerBounds[j], s))),
    lowerBounds,
    upperBounds,
    maxIterations,
    geodesicAcceleration: options.geodesicAcceleration ?? true,
    tolerances,
  };
}

function bounds(given: readonly number[] | undefined, p: number, fill: number, name: string): Float64Array {
  const out = new Float64Array(p).fill(fill);
  if (given === undefined) return out;
  if (given.length !== p) {
    throw new FitError(message.lsqBoundsLength(name, given.length, p));
  }
  for (let j = 0; j < p; j++) {
    if (Number.isNaN(given[j])) throw new FitError(message.lsqBoundIsNaN(name, j));
    out[j] = given[j];
  }
  return out;
}

/** Damping is abandoned (no step lowers the RSS) once λ grows past this. */
const maximumDamping = 1e16;
/** RSS at or below this fraction of Σ w y² counts as an exact fit (round-off level). */
const exactFitFraction = 1e-28;
/** Largest 2‖a‖/‖v‖ a geodesically accelerated step may have (Transtrum and Sethna's α). */
const accelerationRatio = 0.75;
/** Finite-difference step along the velocity for the second directional derivative. */
const accelerationProbe = 0.1;
/** Relative step of central differences: cube root of machine epsilon. */
const differenceStep = Math.cbrt(Number.EPSILON);

/**
 * Fits `model` to the points (x, y) by weighted Levenberg–Marquardt; see the file comment.
 *
 * @example
 * // y = a·exp(b·x) through three exact points
 * const fit = fitLeastSquares({
 *   model: (x, [a, b]) => a * Math.exp(b * x),
 *   x: [0, 1, 2], y: [2, 2 * Math.E, 2 * Math.E ** 2], start: [1, 0.5],
 * });
 * // fit.parameters ≈ [2, 1], fit.converged === true
 * @throws FitError on inconsistent input or a model that is not finite at the start.
 */
export function fitLeastSquares(options: LeastSquaresOptions): LeastSquaresResult {
  const o = resolveLeastSquaresOptions(options);
  const { model, x, y, weights, lowerBounds, upperBounds, tolerances } = o;
  const n = x.length;
  const p = o.start.length;
  const typicalScale = o.start.map((s) => (s !== 0 ? Math.abs(s) : 1));

  let theta = o.start.slice();
  const residual = new Float64Array(n);
  const trialResidual = new Float64Array(n);
  const probeResidual = new Float64Array(n);
  const jac = new Float64Array(n * p); // row-major: jac[i*p + j] = ∂model(xᵢ)/∂θⱼ
  let rss = evaluate(model, x, y, weights, theta, residual);
  if (!Number.isFinite(rss)) {
    throw new FitError(message.lsqModelNotFinite(theta));
  }
  let weightedSquaresOfY = 0;
  for (let i = 0; i < n; i++) weightedSquaresOfY += weights[i] * y[i] * y[i];
  const exactFitLevel = exactFitFraction * Math.max(weightedSquaresOfY, Number.MIN_VALUE);

  const normal = new Float64Array(p * p); // JᵀWJ
  const gradient = new Float64Array(p); // JᵀWr
  const scaling = new Float64Array(p); // Marquardt's D (largest diagonal so far)
  const free: number[] = [];
  let damping = 1e-3;
  let dampingGrowth = 2;
  let iterations = 0;
  let stopReason: StopReason = "maxIterations";

  outer: while (iterations < o.maxIterations) {
    iterations++;
    computeJacobian(o, theta, typicalScale, jac);
    normalEquations(jac, residual, weights, n, p, normal, gradient);
    let largestScale = 0;
    for (let j = 0; j < p; j++) {
      const diagonal = normal[j * p + j];
      if (!Number.isFinite(diagonal) || !Number.isFinite(gradient[j])) {
        throw new FitError(message.lsqJacobianNotFinite(theta, j));
      }
      scaling[j] = Math.max(scaling[j], diagonal);
      largestScale = Math.max(largestScale, scaling[j]);
    }
    if (largestScale === 0) {
      throw new FitError(message.lsqNoDependence(theta));
    }

    if (rss <= exactFitLevel) {
      stopReason = "zeroResidual";
      break;
    }
    // Active set: parameters on a bound whose descent direction (−gradient) points outward, and
    // parameters that have not yet influenced the model at all (zero Jacobian column so far).
    free.length = 0;
    for (let j = 0; j < p; j++) {
      const blockedBelow = theta[j] <= lowerBounds[j] && gradient[j] > 0;
      const blockedAbove = theta[j] >= upperBounds[j] && gradient[j] < 0;
      if (!blockedBelow && !blockedAbove && scaling[j] > 0) free.push(j);
    }
    if (free.length === 0) {
      stopReason = "gradient";
      break;
    }
    // Scaled gradient test (MINPACK's gtol) over the free parameters.
    let cosine = 0;
    for (const j of free) {
      const columnNorm = Math.sqrt(normal[j * p + j]);
      if (columnNorm > 0) cosine = Math.max(cosine, Math.abs(gradient[j]) / (columnNorm * Math.sqrt(rss)));
    }
    if (cosine <= tolerances.gradient) {
      stopReason = "gradient";
      break;
    }
    // Predicted reduction of a full Gauss–Newton step: gᵀ(JᵀWJ)⁻¹g over the free parameters.
    const newtonStep = solveDamped(normal, gradient, scaling, 0, free, p);
    if (newtonStep !== null) {
      let decrement = 0;
      for (let k = 0; k < free.length; k++) decrement -= gradient[free[k]] * newtonStep[k];
      if (decrement >= 0 && decrement <= tolerances.relativeReduction * rss) {
        stopReason = "predictedReduction";
        break;
      }
    }

    // Inner loop: raise the damping until a step lowers the RSS.
    for (;;) {
      let reduced = solveDamped(normal, gradient, scaling, damping, free, p);
      if (reduced !== null && o.geodesicAcceleration) {
        const acceleration = geodesicAcceleration(
          o,
          theta,
          residual,
          jac,
          reduced,
          free,
          normal,
          scaling,
          damping,
          probeResidual,
        );
        if (acceleration !== null) {
          // Transtrum–Sethna acceptance test: 2‖a‖/‖v‖ ≤ α in the scaled norm.
          let accelerationNorm = 0;
          let velocityNorm = 0;
          for (let k = 0; k < free.length; k++) {
            accelerationNorm += scaling[free[k]] * acceleration[k] ** 2;
            velocityNorm += scaling[free[k]] * reduced[k] ** 2;
          }
          if (2 * Math.sqrt(accelerationNorm) > accelerationRatio * Math.sqrt(velocityNorm)) {
            reduced = null;
          } else {
            for (let k = 0; k < free.length; k++) reduced[k] += acceleration[k] / 2;
          }
        }
      }
      if (reduced === null) {
        damping *= dampingGrowth;
        dampingGrowth *= 2;
        if (damping > maximumDamping) {
          stopReason = "noFurtherReduction";
          break outer;
        }
        continue;
      }
      const trial = theta.slice();
      for (let k = 0; k < free.length; k++) {
        const j = free[k];
        trial[j] = Math.min(upperBounds[j], Math.max(lowerBounds[j], theta[j] + reduced[k]));
      }
      const step = new Float64Array(p);
      let stepNorm = 0;
      for (let j = 0; j < p; j++) {
        step[j] = trial[j] - theta[j];
        stepNorm = Math.max(stepNorm, Math.abs(step[j]) / (Math.abs(theta[j]) + tolerances.relativeStep));
      }
      // Predicted reduction of the quadratic model: −(2gᵀδ + δᵀ(JᵀWJ)δ).
      let predicted = 0;
      for (let j = 0; j < p; j++) {
        let row = 0;
        for (let k = 0; k < p; k++) row += normal[j * p + k] * step[k];
        predicted -= step[j] * (2 * gradient[j] + row);
      }
      const trialRss = stepNorm === 0 ? rss : evaluate(model, x, y, weights, trial, trialResidual);
      const actual = rss - trialRss;
      if (Number.isFinite(trialRss) && actual > 0 && predicted > 0) {
        const ratio = actual / predicted;
        theta = trial;
        residual.set(trialResidual);
        const previousRss = rss;
        rss = trialRss;
        damping *= Math.max(1 / 3, 1 - (2 * ratio - 1) ** 3);
        dampingGrowth = 2;
        if (
          actual <= tolerances.relativeReduction * previousRss &&
          predicted <= tolerances.relativeReduction * previousRss &&
          stepNorm <= tolerances.relativeStep
        ) {
          stopReason = "smallStep";
          break outer;
        }
        break;
      }
      if (stepNorm === 0) {
        // The bounds absorb the whole step: nothing left to improve in the free parameters.
        stopReason = "noFurtherReduction";
        break outer;
      }
      damping *= dampingGrowth;
      dampingGrowth *= 2;
      if (damping > maximumDamping) {
        stopReason = "noFurtherReduction";
        break outer;
      }
    }
  }

  // Covariance from the Jacobian at the final parameters.
  computeJacobian(o, theta, typicalScale, jac);
  normalEquations(jac, residual, weights, n, p, normal, gradient);
  let covariance: number[][] | null = null;
  let standardErrors: number[] | null = null;
  let positiveWeights = 0;
  for (let i = 0; i < n; i++) if (weights[i] > 0) positiveWeights++;
  if (positiveWeights > p) {
    const inverse = invertSymmetric(normal, p);
    if (inverse !== null) {
      const variance = rss / (positiveWeights - p);
      covariance = [];
      for (let j = 0; j < p; j++) {
        covariance.push(Array.from({ length: p }, (_, k) => variance * inverse[j * p + k]));
      }
      standardErrors = covariance.map((row, j) => Math.sqrt(Math.max(0, row[j])));
    }
  }
  if (theta.some((t) => !Number.isFinite(t)) || !Number.isFinite(rss)) {
    throw new FitError(message.lsqNotFiniteResult());
  }
  return {
    parameters: theta,
    residualSumOfSquares: rss,
    iterations,
    converged: stopReason !== "maxIterations",
    stopReason,
    covariance,
    standardErrors,
  };
}

/** Fills `residual` with model − y and returns the weighted RSS (NaN or ∞ when not finite). */
function evaluate(
  model: ModelFunction,
  x: readonly number[],
  y: readonly number[],
  weights: Float64Array,
  theta: readonly number[],
  residual: Float64Array,
): number {
  let rss = 0;
  for (let i = 0; i < x.length; i++) {
    const r = model(x[i], theta) - y[i];
    residual[i] = r;
    rss += weights[i] * r * r;
  }
  return rss;
}

/**
 * Fills the row-major Jacobian: the analytic one when given, else central differences with a step
 * of ε^(1/3)·max(|θⱼ|, |startⱼ|), one-sided where a bound is closer than the step.
 */
function computeJacobian(o: ResolvedOptions, theta: number[], typicalScale: number[], jac: Float64Array): void {
  const n = o.x.length;
  const p = theta.length;
  if (o.jacobian !== null) {
    for (let i = 0; i < n; i++) {
      const row = o.jacobian(o.x[i], theta);
      if (row.length !== p) {
        throw new FitError(message.lsqJacobianLength(row.length, p));
      }
      for (let j = 0; j < p; j++) jac[i * p + j] = row[j];
    }
    return;
  }
  const shifted = theta.slice();
  for (let j = 0; j < p; j++) {
    const h = differenceStep * Math.max(Math.abs(theta[j]), typicalScale[j]);
    let up = theta[j] + h;
    let down = theta[j] - h;
    if (up > o.upperBounds[j]) up = theta[j];
    if (down < o.lowerBounds[j]) down = theta[j];
    if (up === down) {
      // The box is narrower than the step in this coordinate: the parameter is effectively fixed.
      for (let i = 0; i < n; i++) jac[i * p + j] = 0;
      continue;
    }
    for (let i = 0; i < n; i++) {
      shifted[j] = up;
      const above = o.model(o.x[i], shifted);
      shifted[j] = down;
      const below = o.model(o.x[i], shifted);
      jac[i * p + j] = (above - below) / (up - down);
    }
    shifted[j] = theta[j];
  }
}

/**
 * Geodesic acceleration (Transtrum and Sethna 2012, "Improvements to the Levenberg–Marquardt
 * algorithm for nonlinear least-squares minimization", §4): the second directional derivative of the
 * residuals along the velocity v, r_vv ≈ (2/h)·((r(θ + h·v) − r(θ))/h − J·v), gives the correction
 * a solving (JᵀWJ + λD) a = −JᵀW r_vv. Returns a over `free`, or null when the probe point leaves
 * the bounds or the model is not finite there (the plain step is then tried as it is).
 */
function geodesicAcceleration(
  o: ResolvedOptions,
  theta: readonly number[],
  residual: Float64Array,
  jac: Float64Array,
  velocity: Float64Array,
  free: readonly number[],
  normal: Float64Array,
  scaling: Float64Array,
  damping: number,
  probeResidual: Float64Array,
): Float64Array | null {
  const n = o.x.length;
  const p = theta.length;
  const h = accelerationProbe;
  const probe = theta.slice();
  const fullVelocity = new Float64Array(p);
  for (let k = 0; k < free.length; k++) {
    const j = free[k];
    fullVelocity[j] = velocity[k];
    probe[j] = theta[j] + h * velocity[k];
    if (probe[j] < o.lowerBounds[j] || probe[j] > o.upperBounds[j]) return null;
  }
  const probeRss = evaluate(o.model, o.x, o.y, o.weights, probe, probeResidual);
  if (!Number.isFinite(probeRss)) return null;
  const rightHandSide = new Float64Array(p);
  for (let i = 0; i < n; i++) {
    const w = o.weights[i];
    if (w === 0) continue;
    let directional = 0;
    for (let j = 0; j < p; j++) directional += jac[i * p + j] * fullVelocity[j];
    const secondDerivative = (2 / h) * ((probeResidual[i] - residual[i]) / h - directional);
    for (let j = 0; j < p; j++) rightHandSide[j] += w * jac[i * p + j] * secondDerivative;
  }
  return solveDamped(normal, rightHandSide, scaling, damping, free, p);
}

/** Fills JᵀWJ (p×p, row-major) and JᵀWr. */
function normalEquations(
  jac: Float64Array,
  residual: Float64Array,
  weights: Float64Array,
  n: number,
  p: number,
  normal: Float64Array,
  gradient: Float64Array,
): void {
  normal.fill(0);
  gradient.fill(0);
  for (let i = 0; i < n; i++) {
    const w = weights[i];
    if (w === 0) continue;
    const base = i * p;
    for (let j = 0; j < p; j++) {
      const wj = w * jac[base + j];
      gradient[j] += wj * residual[i];
      for (let k = 0; k <= j; k++) normal[j * p + k] += wj * jac[base + k];
    }
  }
  for (let j = 0; j < p; j++) for (let k = 0; k < j; k++) normal[k * p + j] = normal[j * p + k];
}

/**
 * Solves (A + λ·D) δ = −b restricted to the `free` parameters (Cholesky after scaling to a unit
 * diagonal). Returns δ over `free`, or null when the matrix is not numerically positive definite.
 */
function solveDamped(
  normal: Float64Array,
  rightHandSide: Float64Array,
  scaling: Float64Array,
  damping: number,
  free: readonly number[],
  p: number,
): Float64Array | null {
  const m = free.length;
  const a = new Float64Array(m * m);
  const scale = new Float64Array(m);
  for (let r = 0; r < m; r++) {
    const j = free[r];
    const diagonal = normal[j * p + j] + damping * scaling[j];
    if (!(diagonal > 0)) return null;
    scale[r] = 1 / Math.sqrt(diagonal);
  }
  for (let r = 0; r < m; r++) {
    for (let c = 0; c < m; c++) {
      const j = free[r];
      const k = free[c];
      const value = normal[j * p + k] + (r === c ? damping * scaling[j] : 0);
      a[r * m + c] = value * scale[r] * scale[c];
    }
  }
  if (!choleskyInPlace(a, m, 0, unitDiagonalPivotFloor)) return null;
  const rhs = new Float64Array(m);
  for (let r = 0; r < m; r++) rhs[r] = -rightHandSide[free[r]] * scale[r];
  choleskySolveInPlace(a, m, rhs);
  for (let r = 0; r < m; r++) rhs[r] *= scale[r];
  return rhs;
}

/** Inverse of a symmetric positive-definite p×p matrix, or null when (numerically) singular. */
function invertSymmetric(matrix: Float64Array, p: number): Float64Array | null {
  const scale = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    const d = matrix[j * p + j];
    if (!(d > 0) || !Number.isFinite(d)) return null;
    scale[j] = 1 / Math.sqrt(d);
  }
  const a = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    for (let k = 0; k < p; k++) a[j * p + k] = matrix[j * p + k] * scale[j] * scale[k];
  }
  if (!choleskyInPlace(a, p, 0, unitDiagonalPivotFloor)) return null;
  const inverse = new Float64Array(p * p);
  const column = new Float64Array(p);
  for (let k = 0; k < p; k++) {
    column.fill(0);
    column[k] = 1;
    choleskySolveInPlace(a, p, column);
    for (let j = 0; j < p; j++) inverse[j * p + k] = column[j] * scale[j] * scale[k];
  }
  // Column-by-column solves leave round-off asymmetry; average it away.
  for (let j = 0; j < p; j++) {
    for (let k = 0; k < j; k++) {
      const mean = (inverse[j * p + k] + inverse[k * p + j]) / 2;
      inverse[j * p + k] = mean;
      inverse[k * p + j] = mean;
    }
  }
  return inverse;
}
