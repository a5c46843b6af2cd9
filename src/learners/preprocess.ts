/**
 * Preprocessing for learners that need complete, comparably scaled features: one-hot encoding of text
 * columns, per-column median imputation of missing numbers and standardization, all fitted on the
 * training rows only so that nothing about the held-out rows leaks into the model.
 *
 * It follows scikit-learn's `SimpleImputer(strategy="median")` followed by `StandardScaler()` for the
 * numeric columns:
 *  - the imputed value of a column is the median of its non-missing training values (the mean of the
 *    two middle values for an even count, as numpy's median); a column with no training value at all
 *    imputes 0 (scikit-learn would drop it; keeping it as a constant column keeps the column count);
 *  - the mean and the population standard deviation (divisor n, not n − 1) are taken over the imputed
 *    training values; a constant column, by StandardScaler's test (variance within the round-off bound
 *    of Chan, Golub and LeVeque's two-pass algorithm), gets scale 1;
 *  - with `standardize: false` (for trees, which only compare values within a column) the means are 0
 *    and the scales 1, so only the imputation applies.
 *
 * Text columns (given by `categories`) go first through {@link fitCategoryEncoder}: one 0/1 indicator
 * column per category seen in training, a missing value taking the most frequent training category,
 * an unseen category giving zeros. The indicators are not standardized (as scikit-learn's usual
 * `ColumnTransformer` with a `OneHotEncoder` beside the scaled numeric columns). Numeric-only data
 * (no text column) gives exactly the columns and values it gave before text columns were supported.
 *
 * Written with plain Float64Array loops: ml-matrix element access is several times slower.
 */
import { DataError } from "../errors.js";
import { message } from "../messages.js";
import { fitCategoryEncoder, hasCategories, type CategoryEncoder } from "./encode.js";
import { scratchRowDoubles } from "./scratch.js";

/** What {@link fitPreprocessor} does besides imputing. */
export interface PreprocessOptions {
  /** Per input column, the category names of a text column or null for a numeric one. @default all numeric */
  categories?: readonly (readonly string[] | null)[];
  /** Whether to center and scale the numeric columns. @default true */
  standardize?: boolean;
  /**
   * Per input column, 1 when no value of it is missing in any row the fitted step will see, training or
   * predicted (`completeColumns` of a training set, learner.ts): its median, which would never be used, is not
   * computed, and its imputed value is NaN. `transform` rejects a missing value in such a column.
   * @default every column may hold missing values
   */
  completeColumns?: Uint8Array;
}

/** A fitted encoding, imputation and standardization step. */
export interface Preprocessor {
  /** Number of input feature columns it was fitted on. */
  readonly columns: number;
  /** Number of columns `transform` returns: `columns` when no column holds text. */
  readonly outputColumns: number;
  /** The one-hot encoding of the text columns, or null when every column is numeric. */
  readonly encoder: CategoryEncoder | null;
  /**
   * Value put in place of NaN, per output column (median of the non-missing training values, or 0;
   * 0 for an indicator column, which is never missing; NaN for a column fitted as complete).
   */
  readonly imputedValues: Float64Array;
  /** Mean of each output column over the imputed training rows (0 for indicators and without standardizing). */
  readonly means: Float64Array;
  /** Divisor of each output column: population standard deviation, or 1 (constant, indicator, unstandardized). */
  readonly scales: Float64Array;
  /**
   * Encodes, imputes and standardizes rows: `(x − mean) / scale`, with NaN replaced by the imputed
   * value first. Returns a row-major `rows × outputColumns` array: a new one, or the start of `out`
   * when given (it must hold at least that many values; a learner passes a work array from
   * scratch.ts). The input is not changed.
   * @throws DataError when the array does not hold `rows × columns` values, a value is ±Infinity, or a
   *   text column holds something other than a category index.
   */
  transform(features: Float64Array, rows: number, out?: Float64Array): Float64Array;
  /**
   * Whether `transform` would give these rows' values back unchanged (no text column, no
   * standardization, no missing value), so that a caller may read them as they are. The rows must
   * be finite or NaN, as training rows that passed the fit are.
   */
  passesThrough(features: Float64Array): boolean;
}

/**
 * Fits the encoding, imputation values, means and scales on training rows.
 * @param features row-major `rows × columns`; NaN marks a missing value; in a text column, the value is
 *   the category index
 * @throws DataError when there are no rows, the array has the wrong length, a value is ±Infinity, or a
 *   text column holds something other than a category index (see {@link fitCategoryEncoder}).
 * @example
 * // Column 0 holds 1, NaN, 3: the NaN imputes the median 2, the mean is 2, the scale √(2/3).
 * fitPreprocessor(new Float64Array([1, NaN, 3]), 3, 1).transform(new Float64Array([NaN]), 1); // [0]
 */
export function fitPreprocessor(
  features: Float64Array,
  rows: number,
  columns: number,
  options: PreprocessOptions = {},
): Preprocessor {
  checkShape(features, rows, columns, "training");
  if (rows < 1) throw new DataError(message.nothingToPreprocess());
  const standardize = options.standardize ?? true;
  const encoder = hasCategories(options.categories)
    ? fitCategoryEncoder(features, rows, columns, options.categories!)
    : null;
  // Without text columns the input is read directly (no copy).
  const values = encoder ? encoder.transform(features, rows) : features;
  const width = encoder ? encoder.outputColumns : columns;
  const imputedValues = new Float64Array(width);
  const means = new Float64Array(width);
  const scales = new Float64Array(width).fill(1);
  const complete = options.completeColumns;
  const numeric = (j: number) => !(encoder && encoder.indicatedCategories[j] >= 0);
  const isComplete = (j: number) => complete !== undefined && complete[encoder ? encoder.sourceColumns[j] : j] === 1;
  // Without standardizing, a complete column only needs its values checked, which one pass over the
  // rows as they lie does without a column-major copy (as large as the training rows).
  let columnWork = standardize;
  for (let j = 0; j < width && !columnWork; j++) columnWork = numeric(j) && !isComplete(j);
  if (!columnWork && allFinite(values)) {
    for (let j = 0; j < width; j++) if (numeric(j)) imputedValues[j] = NaN;
    return new FittedPreprocessor(columns, width, encoder, imputedValues, means, scales);
  }
  // Standardizing numeric columns none of which needs a median: the sums run along the rows as they lie,
  // each column's in the same order as below, so the means and scales are the same to the last bit.
  let medianNeeded = false;
  for (let j = 0; j < width && !medianNeeded; j++) medianNeeded = !isComplete(j);
  if (standardize && !encoder && !medianNeeded && allFinite(values)) {
    for (let j = 0; j < width; j++) imputedValues[j] = NaN;
    fitScalesByRow(values, rows, width, means, scales);
    return new FittedPreprocessor(columns, width, encoder, imputedValues, means, scales);
  }
  const present = scratchRowDoubles("preprocess.present", rows);
  // On wide rows a walk down one column touches a new cache line at every value; a column-major copy
  // (one pass) makes each column's passes contiguous. Same values, same order of sums.
  const byColumn = columnWork && width > transposeWidth && rows > 1;
  const source = byColumn
    ? transpose(values, rows, width, scratchRowDoubles("preprocess.columns", rows, width))
    : values;
  const stride = byColumn ? 1 : width;
  for (let j = 0; j < width; j++) {
    if (!numeric(j)) continue; // an indicator: kept as 0/1
    const start = byColumn ? j * rows : j;
    const column = encoder ? encoder.sourceColumns[j] : j;
    if (isComplete(j)) {
      // No value missing here or in any row to come: the median would never be used.
      const row = firstNotFinite(source, rows, start, stride);
      if (row >= 0) {
        const value = values[row * width + j];
        throw new DataError(
          Number.isNaN(value)
            ? message.missingInCompleteColumn("training", row, column)
            : message.featureNotFinite("training", row, column, value),
        );
      }
      imputedValues[j] = NaN;
    } else {
      // Median of the non-missing values.
      const count = presentValues(source, rows, start, stride, present);
      if (count < 0) {
        const row = -1 - count;
        throw new DataError(message.featureNotFinite("training", row, column, values[row * width + j]));
      }
      imputedValues[j] = count > 0 ? medianInPlace(present, count) : 0;
    }
    if (standardize) fitScale(source, rows, start, stride, j, imputedValues, means, scales);
  }
  return new FittedPreprocessor(columns, width, encoder, imputedValues, means, scales);
}

// The loops over the rows of one column live in small functions of their own, called once per
// column: V8 optimizes them after a few calls, where loops nested in fitPreprocessor's ran
// unoptimized, boxing every number, through the first fits of each thread.

/** Widths above which {@link fitPreprocessor} reads the columns from a column-major copy. */
const transposeWidth = 64;

/** The row-major `rows × width` matrix as column-major, into `out`; 32 × 32 tiles. */
function transpose(values: Float64Array, rows: number, width: number, out: Float64Array): Float64Array {
  const tile = 32;
  for (let i0 = 0; i0 < rows; i0 += tile) {
    const i1 = Math.min(rows, i0 + tile);
    for (let j0 = 0; j0 < width; j0 += tile) {
      const j1 = Math.min(width, j0 + tile);
      for (let i = i0; i < i1; i++) for (let j = j0; j < j1; j++) out[j * rows + i] = values[i * width + j];
    }
  }
  return out;
}

/**
 * Copies the non-missing values of one column (the `rows` values at `start`, `start + stride`, ...)
 * into `present` and returns their count, or −1 − i when row i holds ±Infinity there.
 */
function presentValues(
  values: Float64Array,
  rows: number,
  start: number,
  stride: number,
  present: Float64Array,
): number {
  let count = 0;
  for (let i = 0; i < rows; i++) {
    const v = values[start + i * stride];
    if (Number.isNaN(v)) continue;
    if (!Number.isFinite(v)) return -1 - i;
    present[count++] = v;
  }
  return count;
}

/** Whether no value is NaN or ±Infinity. */
function allFinite(values: Float64Array): boolean {
  for (let at = 0; at < values.length; at++) if (!Number.isFinite(values[at])) return false;
  return true;
}

/** The first of the column's rows (as in {@link presentValues}) whose value is NaN or ±Infinity, else −1. */
function firstNotFinite(values: Float64Array, rows: number, start: number, stride: number): number {
  for (let i = 0; i < rows; i++) if (!Number.isFinite(values[start + i * stride])) return i;
  return -1;
}

/**
 * Sets `means[j]` and `scales[j]` from column `j` (the values at `start`, `start + stride`, ...) with NaN read as `imputedValues[j]`: the mean and
 * the population standard deviation (two passes with the rounding correction), the scale 1 for a
 * constant column.
 */
function fitScale(
  values: Float64Array,
  rows: number,
  start: number,
  stride: number,
  j: number,
  imputedValues: Float64Array,
  means: Float64Array,
  scales: Float64Array,
): void {
  const median = imputedValues[j];
  let sum = 0;
  for (let i = 0; i < rows; i++) {
    const v = values[start + i * stride];
    sum += Number.isNaN(v) ? median : v;
  }
  const mean = sum / rows;
  let squares = 0;
  let residualSum = 0;
  for (let i = 0; i < rows; i++) {
    const v = values[start + i * stride];
    const d = (Number.isNaN(v) ? median : v) - mean;
    squares += d * d;
    residualSum += d;
  }
  const variance = Math.max(0, (squares - (residualSum * residualSum) / rows) / rows);
  means[j] = mean;
  scales[j] = scaleOf(variance, rows, mean);
}

/**
 * Means and scales of every column of the row-major `rows × width` block (all finite), as
 * {@link fitScale} gives them column by column: here each pass reads the rows in order and adds into one
 * running sum per column, without the column-major copy (measured on 192 × 5,000: a fifth less time).
 */
function fitScalesByRow(
  values: Float64Array,
  rows: number,
  width: number,
  means: Float64Array,
  scales: Float64Array,
): void {
  const sums = scratchRowDoubles("preprocess.sums", width).fill(0);
  const residuals = scratchRowDoubles("preprocess.residuals", width).fill(0);
  for (let i = 0; i < rows; i++) addRow(values, i * width, width, sums);
  for (let j = 0; j < width; j++) means[j] = sums[j] / rows;
  const squares = sums.fill(0);
  for (let i = 0; i < rows; i++) addDeviations(values, i * width, width, means, squares, residuals);
  for (let j = 0; j < width; j++) {
    const variance = Math.max(0, (squares[j] - (residuals[j] * residuals[j]) / rows) / rows);
    scales[j] = scaleOf(variance, rows, means[j]);
  }
}

/** Adds the row at `offset` into `sums`, column by column. */
function addRow(values: Float64Array, offset: number, width: number, sums: Float64Array): void {
  for (let j = 0; j < width; j++) sums[j] += values[offset + j];
}

/** Adds the row's squared deviations from `means` into `squares` and its deviations into `residuals`. */
function addDeviations(
  values: Float64Array,
  offset: number,
  width: number,
  means: Float64Array,
  squares: Float64Array,
  residuals: Float64Array,
): void {
  for (let j = 0; j < width; j++) {
    const d = values[offset + j] - means[j];
    squares[j] += d * d;
    residuals[j] += d;
  }
}

/**
 * A column's scale from its population variance: the standard deviation, or 1 for a constant column by
 * StandardScaler's test (sklearn.preprocessing._data._is_constant_feature: a variance within the
 * round-off bound of Chan, Golub and LeVeque's two-pass algorithm).
 */
function scaleOf(variance: number, rows: number, mean: number): number {
  const eps = Number.EPSILON;
  const bound = rows * eps * variance + (rows * mean * eps) ** 2;
  return variance <= bound ? 1 : Math.sqrt(variance);
}

class FittedPreprocessor implements Preprocessor {
  constructor(
    readonly columns: number,
    readonly outputColumns: number,
    readonly encoder: CategoryEncoder | null,
    readonly imputedValues: Float64Array,
    readonly means: Float64Array,
    readonly scales: Float64Array,
  ) {}

  passesThrough(features: Float64Array): boolean {
    if (this.encoder) return false;
    for (let j = 0; j < this.outputColumns; j++) if (this.means[j] !== 0 || this.scales[j] !== 1) return false;
    return allFinite(features);
  }

  transform(features: Float64Array, rows: number, target?: Float64Array): Float64Array {
    const { columns, outputColumns, encoder } = this;
    checkShape(features, rows, columns, "prediction");
    const input = encoder ? encoder.transform(features, rows) : features;
    if (target !== undefined && target.length < rows * outputColumns)
      throw new RangeError(
        `preprocessing: the output array holds ${target.length} values, fewer than ${rows} rows × ${outputColumns} columns`,
      );
    const out =
      target !== undefined
        ? target.subarray(0, rows * outputColumns)
        : encoder
          ? input
          : new Float64Array(rows * outputColumns);
    const { imputedValues, means, scales } = this;
    for (let i = 0; i < rows; i++) {
      const j = standardizeRow(input, out, i * outputColumns, imputedValues, means, scales);
      if (j >= 0) {
        const column = encoder ? encoder.sourceColumns[j] : j;
        const value = input[i * outputColumns + j];
        throw new DataError(
          Number.isNaN(value)
            ? message.missingInCompleteColumn("prediction", i, column)
            : message.featureNotFinite("prediction", i, column, value),
        );
      }
    }
    return out;
  }
}

/**
 * Writes `(x − mean) / scale` of the row at `offset` of `input` into `out`, NaN read as the imputed
 * value; returns the first column holding ±Infinity, or NaN where there is no imputed value (a
 * column fitted as complete), the row then left unfinished; else −1. A function of its own, called
 * once per row, for the reason given above presentValues.
 */
function standardizeRow(
  input: Float64Array,
  out: Float64Array,
  offset: number,
  imputedValues: Float64Array,
  means: Float64Array,
  scales: Float64Array,
): number {
  for (let j = 0; j < means.length; j++) {
    let v = input[offset + j];
    if (Number.isNaN(v)) {
      v = imputedValues[j];
      if (Number.isNaN(v)) return j;
    } else if (!Number.isFinite(v)) return j;
    out[offset + j] = (v - means[j]) / scales[j];
  }
  return -1;
}

/**
 * The median of `values[0 .. count − 1]` (count ≥ 1) as numpy's median takes it from the sorted
 * values: the middle value, or the mean of the two middle values for an even count. Found by
 * selection (Hoare's FIND as Wirth writes it, with a median-of-three pivot) in linear expected time
 * instead of a sort, which took a tenth of a learning curve's time on digits; it reorders `values`.
 * The values are finite. A zero keeps the sign a sort gives it (a typed-array sort puts −0 before +0,
 * while selection compares them as equal), so that the result is the sorted one bit for bit.
 */
export function medianInPlace(values: Float64Array, count: number): number {
  const half = count >> 1;
  const upper = zeroSignAsSorted(values, count, half, selectInPlace(values, count, half));
  if (count % 2 === 1) return upper;
  // Selection leaves the values below rank `half` in front of it: the largest of them is rank half − 1.
  let lower = values[0];
  for (let i = 1; i < half; i++) if (values[i] > lower) lower = values[i];
  return (zeroSignAsSorted(values, count, half - 1, lower) + upper) / 2;
}

/**
 * Reorders `values[0 .. count − 1]` so that the value of rank `k` (0-based, ascending) stands at `k`,
 * with none larger before it and none smaller after it, and returns it.
 */
function selectInPlace(values: Float64Array, count: number, k: number): number {
  let low = 0;
  let high = count - 1;
  while (low < high) {
    const a = values[low];
    const b = values[(low + high) >> 1];
    const c = values[high];
    const pivot = a < b ? (b < c ? b : a < c ? c : a) : a < c ? a : b < c ? c : b;
    let i = low;
    let j = high;
    do {
      while (values[i] < pivot) i++;
      while (pivot < values[j]) j--;
      if (i <= j) {
        const swap = values[i];
        values[i] = values[j];
        values[j] = swap;
        i++;
        j--;
      }
    } while (i <= j);
    if (j < k) low = i;
    if (k < i) high = j;
  }
  return values[k];
}

/** `value`, the value of rank `rank`, with the sign a sort would give it if it is a zero. */
function zeroSignAsSorted(values: Float64Array, count: number, rank: number, value: number): number {
  if (value !== 0) return value;
  let belowPositiveZero = 0; // negative numbers and negative zeros: sorted before +0
  for (let i = 0; i < count; i++) {
    const v = values[i];
    if (v < 0 || Object.is(v, -0)) belowPositiveZero++;
  }
  return rank < belowPositiveZero ? -0 : 0;
}

function checkShape(features: Float64Array, rows: number, columns: number, role: string): void {
  if (!Number.isInteger(rows) || rows < 0 || !Number.isInteger(columns) || columns < 0)
    throw new DataError(message.shapeNotWhole(role, rows, columns));
  if (features.length !== rows * columns)
    throw new DataError(message.featureCount("preprocessing", role, features.length, rows, columns));
}
