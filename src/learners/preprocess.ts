/**
 * Preprocessing for learners that need complete, comparably scaled features: per-column median
 * imputation of missing values followed by standardization, both fitted on the training rows only so
 * that nothing about the held-out rows leaks into the model.
 *
 * It follows scikit-learn's `SimpleImputer(strategy="median")` followed by `StandardScaler()`:
 *  - the imputed value of a column is the median of its non-missing training values (the mean of the
 *    two middle values for an even count, as numpy's median); a column with no training value at all
 *    imputes 0 (scikit-learn would drop it; keeping it as a constant column keeps the column count);
 *  - the mean and the population standard deviation (divisor n, not n − 1) are taken over the imputed
 *    training values; a constant column, by StandardScaler's test (variance within the round-off bound
 *    of Chan, Golub and LeVeque's two-pass algorithm), gets scale 1.
 *
 * Written with plain Float64Array loops: ml-matrix element access is several times slower.
 */
import { DataError } from "../errors.js";

/** A fitted imputation-and-standardization step. */
export interface Preprocessor {
  /** Number of feature columns it was fitted on. */
  readonly columns: number;
  /** Value put in place of NaN, per column (median of the non-missing training values, or 0). */
  readonly imputedValues: Float64Array;
  /** Mean of each column over the imputed training rows. */
  readonly means: Float64Array;
  /** Divisor of each column: population standard deviation, or 1 for a constant column. */
  readonly scales: Float64Array;
  /**
   * Imputes and standardizes rows: `(x − mean) / scale`, with NaN replaced by the imputed value first.
   * Returns a new row-major `rows × columns` array; the input is not changed.
   * @throws DataError when the array does not hold `rows × columns` values or a value is ±Infinity.
   */
  transform(features: Float64Array, rows: number): Float64Array;
}

/**
 * Fits the imputation values, means and scales on training rows.
 * @param features row-major `rows × columns`; NaN marks a missing value
 * @throws DataError when there are no rows, the array has the wrong length, or a value is ±Infinity.
 * @example
 * // Column 0 holds 1, NaN, 3: the NaN imputes the median 2, the mean is 2, the scale √(2/3).
 * fitPreprocessor(new Float64Array([1, NaN, 3]), 3, 1).transform(new Float64Array([NaN]), 1); // [0]
 */
export function fitPreprocessor(features: Float64Array, rows: number, columns: number): Preprocessor {
  checkShape(features, rows, columns, "training");
  if (rows < 1) throw new DataError("preprocessing: no training rows to fit the imputation and scaling on");
  const imputedValues = new Float64Array(columns);
  const means = new Float64Array(columns);
  const scales = new Float64Array(columns);
  const present = new Float64Array(rows);
  const eps = Number.EPSILON;
  for (let j = 0; j < columns; j++) {
    // Median of the non-missing values.
    let count = 0;
    for (let i = 0; i < rows; i++) {
      const v = features[i * columns + j];
      if (Number.isNaN(v)) continue;
      if (!Number.isFinite(v)) throw new DataError(notFinite("training", i, j, v));
      present[count++] = v;
    }
    let median = 0;
    if (count > 0) {
      const sorted = present.subarray(0, count).sort();
      const half = count >> 1;
      median = count % 2 === 1 ? sorted[half] : (sorted[half - 1] + sorted[half]) / 2;
    }
    imputedValues[j] = median;
    // Mean and population variance of the imputed column (two passes with the rounding correction).
    let sum = 0;
    for (let i = 0; i < rows; i++) {
      const v = features[i * columns + j];
      sum += Number.isNaN(v) ? median : v;
    }
    const mean = sum / rows;
    let squares = 0;
    let residualSum = 0;
    for (let i = 0; i < rows; i++) {
      const v = features[i * columns + j];
      const d = (Number.isNaN(v) ? median : v) - mean;
      squares += d * d;
      residualSum += d;
    }
    const variance = Math.max(0, (squares - (residualSum * residualSum) / rows) / rows);
    // StandardScaler's constant-feature test (sklearn.preprocessing._data._is_constant_feature).
    const bound = rows * eps * variance + (rows * mean * eps) ** 2;
    means[j] = mean;
    scales[j] = variance <= bound ? 1 : Math.sqrt(variance);
  }
  return new FittedPreprocessor(columns, imputedValues, means, scales);
}

class FittedPreprocessor implements Preprocessor {
  constructor(
    readonly columns: number,
    readonly imputedValues: Float64Array,
    readonly means: Float64Array,
    readonly scales: Float64Array,
  ) {}

  transform(features: Float64Array, rows: number): Float64Array {
    const columns = this.columns;
    checkShape(features, rows, columns, "prediction");
    const out = new Float64Array(rows * columns);
    const { imputedValues, means, scales } = this;
    for (let i = 0; i < rows; i++) {
      const offset = i * columns;
      for (let j = 0; j < columns; j++) {
        let v = features[offset + j];
        if (Number.isNaN(v)) v = imputedValues[j];
        else if (!Number.isFinite(v)) throw new DataError(notFinite("prediction", i, j, v));
        out[offset + j] = (v - means[j]) / scales[j];
      }
    }
    return out;
  }
}

function checkShape(features: Float64Array, rows: number, columns: number, role: string): void {
  if (!Number.isInteger(rows) || rows < 0 || !Number.isInteger(columns) || columns < 0)
    throw new DataError(
      `preprocessing: ${role} shape ${rows} rows × ${columns} columns is not a pair of whole numbers`,
    );
  if (features.length !== rows * columns)
    throw new DataError(
      `preprocessing: ${role} features hold ${features.length} values, expected ${rows} rows × ${columns} columns`,
    );
}

function notFinite(role: string, row: number, column: number, value: number): string {
  return `preprocessing: ${role} row ${row + 1}, feature column ${column + 1} is ${value}; only NaN may mark a missing value`;
}
