/**
 * The labeled data set as the rest of headroom sees it: a dense numeric feature matrix (NaN marks a
 * missing value), integer class labels, and optional run (batch) ids.
 */
export interface Dataset {
  /** Row-major features, `rows × featureNames.length`; NaN where the CSV cell was empty. */
  features: Float64Array;
  /** Number of rows (samples). */
  rows: number;
  featureNames: string[];
  /** Class index of each row, into `classNames`. */
  labels: Int32Array;
  /** Class names in order of first appearance sorted as strings (stable, like scikit-learn's). */
  classNames: string[];
  /**
   * Numeric target of each row, for a regression data set; then `labels` is empty and `classNames`
   * is []. Absent for classification.
   */
  targets?: Float64Array;
  /**
   * For each feature column, its category names when the CSV column held text (the feature value is
   * then the category's index, NaN when missing), or null for a numeric column. Absent: all numeric.
   */
  categories?: (string[] | null)[];
  /** Run (batch) index of each row into `groupNames`, when a group column was given. */
  groups?: Int32Array;
  groupNames?: string[];
}

/**
 * Copies the given rows of a data set's features into a row-major matrix: a new one, or the start of
 * `target` when given (it must hold at least rows × features values).
 */
export function selectRows(data: Dataset, indices: ArrayLike<number>, target?: Float64Array): Float64Array {
  const d = data.featureNames.length;
  const out = target ? target.subarray(0, indices.length * d) : new Float64Array(indices.length * d);
  for (let i = 0; i < indices.length; i++) {
    const src = indices[i] * d;
    out.set(data.features.subarray(src, src + d), i * d);
  }
  return out;
}

/** The labels of the given rows. */
export function selectLabels(data: Dataset, indices: ArrayLike<number>): Int32Array {
  const out = new Int32Array(indices.length);
  for (let i = 0; i < indices.length; i++) out[i] = data.labels[indices[i]];
  return out;
}
