/**
 * Limited-memory BFGS minimisation of a smooth function, with the stopping tests of SciPy's L-BFGS-B
 * as scikit-learn's lbfgs solver uses them (a bound on the gradient, and a relative decrease of the
 * objective), used by the logistic-regression learner. Written by hand because no npm package offers
 * an allocation-free L-BFGS over Float64Arrays with these tests, and a learning curve runs hundreds
 * of fits. Tested against SciPy's L-BFGS-B on the Rosenbrock function (test/numerics/lbfgs.test.ts).
 */
import { FitError } from "../errors.js";

/** When {@link minimizeLbfgs} stops. */
export interface LbfgsOptions {
  /** Converged when the gradient's size (largest entry, or Euclidean length) is at most this. */
  gradientTolerance: number;
  /** Judge the gradient by its Euclidean length instead of its largest entry. @default false */
  euclidean?: boolean;
  /**
   * Converged also when an iteration lowers F = objectiveScale · f by at most this times
   * max(|F|, 1) (SciPy's `ftol`); 0 turns the test off.
   */
  relativeDecrease: number;
  /** The factor from the minimized f to the objective F the relative-decrease test judges. @default 1 */
  objectiveScale?: number;
  /** Most iterations. */
  maxIterations: number;
  /** Correction pairs kept. @default 10 */
  memory?: number;
  /** A work array of at least (7 + 2 · memory) · start.length values to use instead of allocating one. */
  work?: Float64Array;
}

/** What {@link minimizeLbfgs} found. */
export interface LbfgsResult {
  /** The last iterate (inside `work` when one was given). */
  solution: Float64Array;
  /** f at the solution. */
  value: number;
  iterations: number;
  /** Whether a stopping test was met within maxIterations. */
  converged: boolean;
}

/** An objective for {@link minimizeLbfgs}: its value at θ, with its gradient written into `gradient`. */
export interface Objective {
  evaluate(theta: Float64Array, gradient: Float64Array): number;
}

/**
 * Limited-memory BFGS (Nocedal and Wright 2006, algorithm 7.5, with the two-loop recursion of
 * algorithm 7.4 and the initial scaling sᵀy / yᵀy of equation 7.20), keeping `memory` correction pairs.
 * Each step backtracks from the full step until Armijo's sufficient-decrease condition holds (halving,
 * or the minimiser of the quadratic through the trial point when that is inside [0.1, 0.5] of it).
 * A pair with sᵀy ≤ 0 is skipped, keeping the inverse-Hessian estimate positive definite.
 * Near the optimum the decrease Armijo's condition asks for falls below the rounding error of the
 * objective; a step is then also accepted under the approximate Wolfe conditions (see
 * {@link approximateWolfe}), which judge it by the slope at the trial point.
 * Stops when a stopping test of {@link LbfgsOptions} is met (converged), after maxIterations, or
 * when no step is accepted even from steepest descent (not converged).
 *
 * When the objective itself is cheap (the logistic fits' sums run in WebAssembly), this bookkeeping is
 * a large share of the time: each update of the recursion is therefore fused with the next pair's
 * dot product (one pass over the vector instead of two), and the loops keep partial sums.
 */
export function minimizeLbfgs(objective: Objective, start: Float64Array, options: LbfgsOptions): LbfgsResult {
  const gradientBound = options.gradientTolerance;
  const euclidean = options.euclidean ?? false;
  const maxIterations = options.maxIterations;
  const scale = options.objectiveScale ?? 1;
  const memory = options.memory ?? 10;
  const size = start.length;
  // The vectors live in one work array, each written before it is read: the solution returned is
  // one of them (a caller that passes a reused work array reads it before the next call).
  const length = (7 + 2 * memory) * size;
  const work = options.work !== undefined && options.work.length >= length ? options.work : new Float64Array(length);
  const vector = (index: number) => work.subarray(index * size, (index + 1) * size);
  let x = vector(0);
  x.set(start);
  let trial = vector(1);
  let gradient = vector(2);
  let trialGradient = vector(3);
  const direction = vector(4);
  const alpha = new Float64Array(memory);
  const rho = new Float64Array(memory);
  // sᵀy / yᵀy of each pair, the scaling of the initial inverse Hessian when the pair is the newest.
  const scaling = new Float64Array(memory);
  const s = Array.from({ length: memory }, (_, c) => vector(7 + c));
  const yDiff = Array.from({ length: memory }, (_, c) => vector(7 + memory + c));
  // A new pair is written here first and swapped into the ring only if it is kept.
  let spareS = vector(5);
  let spareY = vector(6);
  const order = new Int32Array(memory); // ring slots from the newest pair to the oldest
  const pairProducts = new Float64Array(2); // sᵀy and yᵀy of the newest pair
  let stored = 0; // pairs held
  let newest = -1; // slot of the newest pair in the ring
  let f = objective.evaluate(x, gradient);
  if (!Number.isFinite(f)) throw new FitError("L-BFGS: the objective is not finite at the start");
  let iterations = 0;
  let converged = false;
  let justReset = false;

  for (;;) {
    if (gradientSize(gradient, euclidean) <= gradientBound) {
      converged = true;
      break;
    }
    if (iterations >= maxIterations) break;
    iterations++;

    // Two-loop recursion: direction = −H g.
    let initialStep = 1;
    if (stored > 0) {
      for (let c = 0; c < stored; c++) order[c] = (newest - c + memory) % memory;
      // q = −g, then for the pairs from the newest: αᵢ = ρᵢ sᵢ·q, q −= αᵢ yᵢ.
      let product = negateAndDot(gradient, direction, s[order[0]]);
      for (let c = 0; c < stored; c++) {
        const slot = order[c];
        alpha[slot] = rho[slot] * product;
        product = axpyThenDot(direction, -alpha[slot], yDiff[slot], c + 1 < stored ? s[order[c + 1]] : null);
      }
      // r = γ q, then for the pairs from the oldest: β = ρᵢ yᵢ·r, r += (αᵢ − β) sᵢ.
      product = scaleAndDot(direction, scaling[newest], yDiff[order[stored - 1]]);
      for (let c = stored - 1; c >= 0; c--) {
        const slot = order[c];
        const beta = rho[slot] * product;
        product = axpyThenDot(direction, alpha[slot] - beta, s[slot], c > 0 ? yDiff[order[c - 1]] : null);
      }
    } else {
      // First step (or after a reset): steepest descent, scaled to move by at most 1 in any entry.
      negate(gradient, direction);
      initialStep = Math.min(1, 1 / maxAbs(gradient));
    }
    let slope = dot(gradient, direction);
    if (!(slope < 0)) {
      // Not a descent direction (rounding): fall back to steepest descent and forget the pairs.
      negate(gradient, direction);
      slope = -dot(gradient, gradient);
      initialStep = Math.min(1, 1 / maxAbs(gradient));
      stored = 0;
    }

    // Backtracking line search.
    let t = initialStep;
    let accepted = false;
    let fTrial = f;
    for (let attempt = 0; attempt < 40; attempt++) {
      stepAlong(x, t, direction, trial);
      fTrial = objective.evaluate(trial, trialGradient);
      if (fTrial <= f + 1e-4 * t * slope || approximateWolfe(f, fTrial, slope, dot(trialGradient, direction))) {
        accepted = true;
        break;
      }
      // Minimiser of the quadratic matching f, the slope and fTrial, kept within [0.1 t, 0.5 t].
      const curvature = fTrial - f - slope * t;
      let next = Number.isFinite(curvature) && curvature > 0 ? (-slope * t * t) / (2 * curvature) : t / 2;
      next = Math.min(0.5 * t, Math.max(0.1 * t, next));
      t = next;
    }
    if (!accepted) {
      // Retry once from steepest descent with the pairs forgotten; a second failure in a row means
      // no step can decrease the objective any more.
      if (justReset) break;
      justReset = true;
      stored = 0;
      iterations--;
      continue;
    }
    justReset = false;

    // The correction pair s = Δx, y = Δg, kept when its curvature sᵀy is positive.
    correctionPair(x, trial, gradient, trialGradient, spareS, spareY, pairProducts);
    const sy = pairProducts[0];
    const yy = pairProducts[1];
    if (sy > 1e-12 * yy && sy > 0) {
      const slot = (newest + 1) % memory;
      const oldS = s[slot];
      s[slot] = spareS;
      spareS = oldS;
      const oldY = yDiff[slot];
      yDiff[slot] = spareY;
      spareY = oldY;
      rho[slot] = 1 / sy;
      scaling[slot] = sy / yy;
      newest = slot;
      stored = Math.min(stored + 1, memory);
    }
    const swapX = x;
    x = trial;
    trial = swapX;
    const swapGradient = gradient;
    gradient = trialGradient;
    trialGradient = swapGradient;
    const fPrevious = f;
    f = fTrial;
    if (
      gradientSize(gradient, euclidean) > gradientBound &&
      decreasedLittle(fPrevious, f, options.relativeDecrease, scale)
    ) {
      converged = true;
      break;
    }
  }
  return { solution: x, value: f, iterations, converged };
}

// The loops over the parameters live in small functions of their own: V8 optimises a small function
// after a few calls, while a loop inside the optimizer's long one waited for a slow compilation of
// the whole, running unoptimised (boxing every number) for much of each thread's first fits.

/** Sets `out` = −g. */
function negate(g: Float64Array, out: Float64Array): void {
  for (let i = 0; i < g.length; i++) out[i] = -g[i];
}

/** Sets `out` = x + t · direction. */
function stepAlong(x: Float64Array, t: number, direction: Float64Array, out: Float64Array): void {
  for (let i = 0; i < x.length; i++) out[i] = x[i] + t * direction[i];
}

/**
 * The correction pair of a step from x to `trial`: s = trial − x into `s`, y = trialGradient −
 * gradient into `y`, and [sᵀy, yᵀy] into `products`.
 */
function correctionPair(
  x: Float64Array,
  trial: Float64Array,
  gradient: Float64Array,
  trialGradient: Float64Array,
  s: Float64Array,
  y: Float64Array,
  products: Float64Array,
): void {
  let sy = 0;
  let yy = 0;
  for (let i = 0; i < x.length; i++) {
    const ds = trial[i] - x[i];
    const dy = trialGradient[i] - gradient[i];
    s[i] = ds;
    y[i] = dy;
    sy += ds * dy;
    yy += dy * dy;
  }
  products[0] = sy;
  products[1] = yy;
}

/** Sets `out` = −g and returns a·out, in one pass. */
function negateAndDot(g: Float64Array, out: Float64Array, a: Float64Array): number {
  let d0 = 0;
  let d1 = 0;
  const size = g.length;
  let i = 0;
  for (; i + 1 < size; i += 2) {
    const v0 = -g[i];
    const v1 = -g[i + 1];
    out[i] = v0;
    out[i + 1] = v1;
    d0 += a[i] * v0;
    d1 += a[i + 1] * v1;
  }
  for (; i < size; i++) {
    out[i] = -g[i];
    d0 += a[i] * out[i];
  }
  return d0 + d1;
}

/** Sets `v` = γ v and returns a·v, in one pass. */
function scaleAndDot(v: Float64Array, gamma: number, a: Float64Array): number {
  let d0 = 0;
  let d1 = 0;
  const size = v.length;
  let i = 0;
  for (; i + 1 < size; i += 2) {
    const v0 = gamma * v[i];
    const v1 = gamma * v[i + 1];
    v[i] = v0;
    v[i + 1] = v1;
    d0 += a[i] * v0;
    d1 += a[i + 1] * v1;
  }
  for (; i < size; i++) {
    v[i] *= gamma;
    d0 += a[i] * v[i];
  }
  return d0 + d1;
}

/** Sets `v` += c·u and returns a·v (0 without `a`), in one pass. */
function axpyThenDot(v: Float64Array, c: number, u: Float64Array, a: Float64Array | null): number {
  const size = v.length;
  if (a === null) {
    for (let i = 0; i < size; i++) v[i] += c * u[i];
    return 0;
  }
  let d0 = 0;
  let d1 = 0;
  let i = 0;
  for (; i + 1 < size; i += 2) {
    const v0 = v[i] + c * u[i];
    const v1 = v[i + 1] + c * u[i + 1];
    v[i] = v0;
    v[i + 1] = v1;
    d0 += a[i] * v0;
    d1 += a[i + 1] * v1;
  }
  for (; i < size; i++) {
    v[i] += c * u[i];
    d0 += a[i] * v[i];
  }
  return d0 + d1;
}

/**
 * SciPy's relative-reduction test (L-BFGS-B's `ftol`) on F = scale · f: (F_before − F_after) ≤
 * ε · max(|F_before|, |F_after|, 1). Off when ε is 0.
 */
export function decreasedLittle(before: number, after: number, relativeDecrease: number, scale: number): boolean {
  return (
    relativeDecrease > 0 &&
    (before - after) * scale <= relativeDecrease * Math.max(Math.abs(before) * scale, Math.abs(after) * scale, 1)
  );
}

/**
 * The approximate Wolfe conditions of Hager and Zhang (2005, "A new conjugate gradient method with
 * guaranteed descent and an efficient line search", SIAM J. Optim. 16(1), eq. 4.3) with δ = 0.1 and
 * σ = 0.9: σ·φ'(0) ≤ φ'(t) ≤ (2δ − 1)·φ'(0), where φ(t) is the objective along the search direction,
 * together with φ(t) ≤ φ(0) + ε·|φ(0)| — here ε = 1e-10, a few hundred times the rounding error of a
 * sum of a few thousand terms, so that only steps that change the objective by rounding qualify.
 */
export function approximateWolfe(f: number, fTrial: number, slope: number, trialSlope: number): boolean {
  return fTrial <= f + 1e-10 * Math.abs(f) && 0.9 * slope <= trialSlope && trialSlope <= -0.8 * slope;
}

/** The largest entry in absolute value. */
export function maxAbs(v: Float64Array): number {
  let m = 0;
  for (let i = 0; i < v.length; i++) {
    const a = Math.abs(v[i]);
    if (a > m) m = a;
  }
  return m;
}

/** The gradient's largest entry in absolute value, or its Euclidean length when `euclidean`. */
export function gradientSize(v: Float64Array, euclidean: boolean): number {
  return euclidean ? Math.sqrt(dot(v, v)) : maxAbs(v);
}

/** The inner product a·b. */
export function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}
