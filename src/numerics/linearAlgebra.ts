/**
 * The dense linear algebra of the learners and the curve fitter, on row-major Float64Arrays: the
 * Cholesky factorization of a symmetric positive-definite matrix (optionally damped) and its solves
 * (ridge regression, linear discriminant analysis, the logistic Newton step, Levenberg–Marquardt), the
 * Gram matrix of a block of rows (the learners' n-dimensional forms for wide data), and a minimum-norm
 * solve by symmetric eigendecomposition for the rare singular case.
 *
 * Written by hand: the learners' loops run on raw Float64Arrays, where ml-matrix goes through method
 * calls per element, and its Cholesky wants an exactly symmetric matrix. (The curve fitter's small
 * systems would not need the speed; they share this code so that there is one factorization.)
 */
import { gramSimd } from "./gramKernel.js";

/**
 * Overwrites the lower triangle of the symmetric `n × n` matrix `a` with the Cholesky factor L of
 * a + damping·I (= L Lᵀ; Golub and Van Loan, "Matrix Computations", algorithm 4.2.1). Only the lower
 * triangle is read. Returns false, leaving `a` partly overwritten, when a pivot is at most
 * `pivotFloor`: the matrix is not positive definite to working precision (a caller that scaled it to
 * a unit diagonal may ask for a floor above round-off).
 */
export function choleskyInPlace(a: Float64Array, n: number, damping = 0, pivotFloor = 0): boolean {
  for (let j = 0; j < n; j++) {
    const rowJ = j * n;
    let d = a[rowJ + j] + damping;
    for (let k = 0; k < j; k++) d -= a[rowJ + k] * a[rowJ + k];
    if (!(d > pivotFloor)) return false;
    const pivot = Math.sqrt(d);
    a[rowJ + j] = pivot;
    for (let i = j + 1; i < n; i++) {
      const rowI = i * n;
      let s = a[rowI + j];
      for (let k = 0; k < j; k++) s -= a[rowI + k] * a[rowJ + k];
      a[rowI + j] = s / pivot;
    }
  }
  return true;
}

/** Solves L Lᵀ x = b in place in `b`, given the factor from {@link choleskyInPlace}. */
export function choleskySolveInPlace(factor: Float64Array, n: number, b: Float64Array): Float64Array {
  for (let i = 0; i < n; i++) {
    const row = i * n;
    let s = b[i];
    for (let k = 0; k < i; k++) s -= factor[row + k] * b[k];
    b[i] = s / factor[row + i];
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i];
    for (let k = i + 1; k < n; k++) s -= factor[k * n + i] * b[k];
    b[i] = s / factor[i * n + i];
  }
  return b;
}

/**
 * Eigenvalues and eigenvectors of a symmetric `n × n` matrix by cyclic Jacobi rotations (Golub and
 * Van Loan, algorithm 8.5.3), until the off-diagonal mass is below 1e-30 of the total or after 100
 * sweeps. Returns the eigenvalues and the eigenvectors as the columns of a row-major `n × n` matrix.
 */
export function symmetricEigen(matrix: Float64Array, n: number): { values: Float64Array; vectors: Float64Array } {
  const a = matrix.slice();
  const v = new Float64Array(n * n);
  for (let i = 0; i < n; i++) v[i * n + i] = 1;
  let total = 0;
  for (let i = 0; i < n * n; i++) total += a[i] * a[i];
  for (let sweep = 0; sweep < 100; sweep++) {
    let off = 0;
    for (let p = 0; p < n; p++) for (let q = p + 1; q < n; q++) off += 2 * a[p * n + q] * a[p * n + q];
    if (off <= 1e-30 * total) break;
    for (let p = 0; p < n; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = a[p * n + q];
        if (apq === 0) continue;
        const theta = (a[q * n + q] - a[p * n + p]) / (2 * apq);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < n; k++) {
          const akp = a[k * n + p];
          const akq = a[k * n + q];
          a[k * n + p] = c * akp - s * akq;
          a[k * n + q] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = a[p * n + k];
          const aqk = a[q * n + k];
          a[p * n + k] = c * apk - s * aqk;
          a[q * n + k] = s * apk + c * aqk;
        }
        for (let k = 0; k < n; k++) {
          const vkp = v[k * n + p];
          const vkq = v[k * n + q];
          v[k * n + p] = c * vkp - s * vkq;
          v[k * n + q] = s * vkp + c * vkq;
        }
      }
    }
  }
  const values = new Float64Array(n);
  for (let i = 0; i < n; i++) values[i] = a[i * n + i];
  return { values, vectors: v };
}

/**
 * The minimum-norm least-squares solution of `a x = b` for a symmetric positive-semidefinite `a`
 * (what LAPACK's gelsd gives, as used by scipy.linalg.lstsq): eigenvalues at most n · ε · the largest
 * are treated as zero.
 */
export function minimumNormSolve(a: Float64Array, n: number, b: Float64Array): Float64Array {
  const { values, vectors } = symmetricEigen(a, n);
  let largest = 0;
  for (let i = 0; i < n; i++) largest = Math.max(largest, Math.abs(values[i]));
  const cutoff = Math.max(n, 1) * Number.EPSILON * largest;
  const x = new Float64Array(n);
  for (let e = 0; e < n; e++) {
    if (!(Math.abs(values[e]) > cutoff)) continue;
    let projection = 0;
    for (let i = 0; i < n; i++) projection += vectors[i * n + e] * b[i];
    const scale = projection / values[e];
    for (let i = 0; i < n; i++) x[i] += scale * vectors[i * n + e];
  }
  return x;
}

/**
 * Linear scores `wₖ·xᵢ + bₖ` of every row against every weight row: row-major `rows × k`, where
 * `k = intercepts.length` and `weights` is row-major `k × columns`.
 */
export function linearScores(
  x: Float64Array,
  rows: number,
  columns: number,
  weights: Float64Array,
  intercepts: Float64Array,
): Float64Array {
  const k = intercepts.length;
  const out = new Float64Array(rows * k);
  for (let i = 0; i < rows; i++) {
    const offset = i * columns;
    for (let c = 0; c < k; c++) {
      let s = intercepts[c];
      const w = c * columns;
      for (let j = 0; j < columns; j++) s += weights[w + j] * x[offset + j];
      out[i * k + c] = s;
    }
  }
  return out;
}

/**
 * The Gram matrix X Xᵀ of the `n × p` row-major block `x`, into `out` (`n × n`, row-major, both
 * triangles): the inner products of every pair of rows, each summed as even columns plus odd columns
 * (see gramKernel.ts, a WebAssembly SIMD kernel: the benchmark's wide sets spend most of a logistic
 * fit here).
 * @throws FitError when the block does not fit in a WebAssembly memory (4 GiB).
 */
export function gramMatrix(
  x: Float64Array,
  n: number,
  p: number,
  out: Float64Array = new Float64Array(n * n),
): Float64Array {
  return gramSimd(x, n, p, out);
}

/** A factor of a symmetric positive-semidefinite matrix K = F Fᵀ from {@link pivotedCholesky}. */
export interface PivotedCholesky {
  /** Numerical rank r: the number of pivots above the tolerance. */
  rank: number;
  /** F, row-major `n × rank`, in the rows' original order: K ≈ F Fᵀ. */
  factor: Float64Array;
  /** The rows chosen as pivots, in order: rows `pivots[0 .. rank − 1]` of F form a lower-triangular block. */
  pivots: Int32Array;
}

/**
 * Cholesky factorization with diagonal pivoting of a symmetric positive-semidefinite `n × n` matrix
 * (Higham, "Accuracy and Stability of Numerical Algorithms", 2nd ed., algorithm 10.22; LAPACK's
 * dpstrf): at each step the largest remaining diagonal entry is the pivot, and the factorization
 * stops when it is at most `relativeTolerance` · the largest diagonal entry of K (dpstrf's default
 * is n · ε), the rest of K being treated as round-off. Reads only `k`.
 */
export function pivotedCholesky(k: Float64Array, n: number, relativeTolerance = n * Number.EPSILON): PivotedCholesky {
  const remaining = new Float64Array(n);
  let largest = 0;
  for (let i = 0; i < n; i++) {
    remaining[i] = k[i * n + i];
    largest = Math.max(largest, remaining[i]);
  }
  const tolerance = relativeTolerance * largest;
  // Columns of F as they are found, column-major (column c holds n values).
  const columns = new Float64Array(n * n);
  const pivots = new Int32Array(n);
  const chosen = new Uint8Array(n);
  let rank = 0;
  for (; rank < n; rank++) {
    let q = -1;
    let best = tolerance;
    for (let i = 0; i < n; i++) {
      if (chosen[i] === 0 && remaining[i] > best) {
        best = remaining[i];
        q = i;
      }
    }
    if (q < 0) break;
    chosen[q] = 1;
    pivots[rank] = q;
    const pivot = Math.sqrt(best);
    const column = rank * n;
    for (let i = 0; i < n; i++) {
      if (chosen[i] === 1 && i !== q) {
        columns[column + i] = 0;
        continue;
      }
      let s = k[i * n + q];
      for (let c = 0; c < rank; c++) s -= columns[c * n + i] * columns[c * n + q];
      columns[column + i] = i === q ? pivot : s / pivot;
    }
    for (let i = 0; i < n; i++) {
      if (chosen[i] === 0) remaining[i] -= columns[column + i] * columns[column + i];
    }
  }
  const factor = new Float64Array(n * rank);
  for (let i = 0; i < n; i++) for (let c = 0; c < rank; c++) factor[i * rank + c] = columns[c * n + i];
  return { rank, factor, pivots: pivots.slice(0, rank) };
}
