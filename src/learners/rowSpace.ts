/**
 * Wide data (more feature columns than rows) in the rows' own n-dimensional space, for the linear
 * learners whose penalty is ½‖w‖² on the coefficients (logistic regression).
 *
 * Whatever w is, the model sees the data only through the scores X w, and the penalty only through
 * ‖w‖; the part of w orthogonal to the rows of X changes neither the fit nor anything but the penalty,
 * so the optimum lies in the row space of X (the representer theorem: Kimeldorf and Wahba 1971;
 * Schölkopf, Herbrich and Smola 2001). With the Gram matrix K = X Xᵀ factored as K = F Fᵀ (pivoted
 * Cholesky, F of n × r, r ≤ n), the rows of F are the coordinates of the rows of X in an orthonormal
 * basis of that space: X w = F ŵ and ‖w‖ = ‖ŵ‖ for w = Xᵀα with ŵ = Fᵀα. Fitting the same penalized
 * model on the n × r features F therefore gives the same objective at every step, and the fitted
 * ŵ maps back to the coefficients on the original columns through {@link RowSpace.lift}. The work is
 * the Gram matrix, n² · p / 2 products, instead of terms in p² or p³.
 */
import { gramMatrix, pivotedCholesky } from "../numerics/linearAlgebra.js";

/**
 * Below this share of the largest diagonal entry of K a pivot is treated as round-off: the centred
 * rows of a standardized block sum to zero, so K is singular by construction, and a direction kept
 * at rounding level would only amplify rounding when mapped back.
 */
const rankTolerance = 1e-11;

/** The coordinates of a block of rows in an orthonormal basis of their span. */
export interface RowSpace {
  /** r: the dimension of the rows' span (numerically). */
  rank: number;
  /** The rows' coordinates, row-major `n × rank`. */
  features: Float64Array;
  /**
   * The coefficients on the original columns (row-major `count × p`) of coefficient rows given in
   * the basis (row-major `count × rank`): w = Xᵀα with Fᵀα = ŵ.
   */
  lift(reduced: Float64Array, count: number): Float64Array;
}

/** Whether the n-dimensional form pays: more columns than rows. */
export function wideEnough(rows: number, columns: number): boolean {
  return columns > rows;
}

/** The row space of the `n × p` row-major block `x` (see the module's comment). `x` must stay unchanged until `lift` is called. */
export function rowSpace(x: Float64Array, n: number, p: number): RowSpace {
  const k = gramMatrix(x, n, p);
  const { rank, factor, pivots } = pivotedCholesky(k, n, rankTolerance);
  return {
    rank,
    features: factor,
    lift(reduced: Float64Array, count: number): Float64Array {
      const out = new Float64Array(count * p);
      const alpha = new Float64Array(rank);
      for (let row = 0; row < count; row++) {
        // Back substitution in Fᵀα = ŵ, α living on the pivot rows, where F is lower triangular.
        for (let c = rank - 1; c >= 0; c--) {
          let s = reduced[row * rank + c];
          for (let a = c + 1; a < rank; a++) s -= factor[pivots[a] * rank + c] * alpha[a];
          alpha[c] = s / factor[pivots[c] * rank + c];
        }
        const w = out.subarray(row * p, (row + 1) * p);
        for (let a = 0; a < rank; a++) {
          const coefficient = alpha[a];
          const offset = pivots[a] * p;
          for (let j = 0; j < p; j++) w[j] += coefficient * x[offset + j];
        }
      }
      return out;
    },
  };
}
