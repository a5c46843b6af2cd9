/**
 * One-hot encoding of text (categorical) feature columns, fitted on the training rows only.
 *
 * A text column arrives as category indices into its list of names (`TrainingSet.categories`), NaN
 * when missing. The encoder replaces it by one indicator column (0 or 1) per category seen in the
 * training rows, in ascending category index; numeric columns are copied unchanged, in place, so the
 * output keeps the input's column order with each text column widened. It follows scikit-learn's
 * `SimpleImputer(strategy="most_frequent")` followed by `OneHotEncoder(handle_unknown="ignore")`:
 *  - a missing value takes the category most frequent among the column's training rows (on a tie, the
 *    lowest category index, as SimpleImputer takes the smallest of the tied values when the names are
 *    listed in sorted order); a column missing in every training row gets no indicator columns;
 *  - a category never seen in the training rows (valid in the data set, absent from this subsample)
 *    gives a row of zeros in that column's indicators, so a model fitted on a small subsample can
 *    still predict rows of a rarer category.
 *
 * Written by hand: the work is one pass over the rows per column on Float64Arrays, and no npm package
 * fits an encoder on some rows and applies it to others with these rules.
 */
import { DataError } from "../errors.js";
import { message } from "../messages.js";

/** A fitted one-hot encoding: maps `rows × columns` raw features to `rows × outputColumns`. */
export interface CategoryEncoder {
  /** Number of input feature columns. */
  readonly columns: number;
  /** Number of output columns: the numeric columns plus one per training category of each text column. */
  readonly outputColumns: number;
  /** For each output column, the input column it comes from. */
  readonly sourceColumns: Int32Array;
  /** For each output column, the category index it indicates, or −1 for a numeric column copied as is. */
  readonly indicatedCategories: Int32Array;
  /** For each input column, the category that fills a missing value, or −1 (numeric, or never seen). */
  readonly fillCategories: Int32Array;
  /**
   * Encodes rows; NaN stays NaN in numeric columns. Returns a new row-major `rows × outputColumns` array.
   * @throws DataError when the array does not hold `rows × columns` values or a text column holds
   *   something other than a category index of that column or NaN.
   */
  transform(features: Float64Array, rows: number): Float64Array;
}

/** True when at least one column is a text column. */
export function hasCategories(categories: readonly (readonly string[] | null)[] | undefined): boolean {
  return categories !== undefined && categories.some((names) => names !== null);
}

/**
 * Fits the encoding on training rows.
 * @param features row-major `rows × columns`; in a text column, the category index or NaN
 * @param categories per column, the category names of a text column or null for a numeric one
 * @throws DataError when `categories` does not have one entry per column, or a text column holds a
 *   value that is not a category index of that column (or NaN).
 * @example
 * // One text column with categories a, b, c; the training rows hold b, c, b, missing.
 * const encoder = fitCategoryEncoder(Float64Array.of(1, 2, 1, NaN), 4, 1, [["a", "b", "c"]]);
 * encoder.transform(Float64Array.of(0, 1, NaN), 3); // [0, 0,  1, 0,  1, 0]: a unseen, b, missing → b
 */
export function fitCategoryEncoder(
  features: Float64Array,
  rows: number,
  columns: number,
  categories: readonly (readonly string[] | null)[],
): CategoryEncoder {
  if (categories.length !== columns) throw new DataError(message.categoryListCount(categories.length, columns));
  if (features.length !== rows * columns)
    throw new DataError(message.featureCount("encoding", "training", features.length, rows, columns));
  const sourceColumns: number[] = [];
  const indicatedCategories: number[] = [];
  const fillCategories = new Int32Array(columns).fill(-1);
  for (let j = 0; j < columns; j++) {
    const names = categories[j];
    if (names === null) {
      sourceColumns.push(j);
      indicatedCategories.push(-1);
      continue;
    }
    const counts = new Int32Array(names.length);
    for (let i = 0; i < rows; i++) {
      const v = features[i * columns + j];
      if (Number.isNaN(v)) continue;
      counts[checkCategory(v, names.length, "training", i, j)]++;
    }
    let fill = -1;
    for (let c = 0; c < names.length; c++) {
      if (counts[c] > (fill < 0 ? 0 : counts[fill])) fill = c;
    }
    fillCategories[j] = fill;
    // The fill category receives the missing rows, so it is seen whenever any row is.
    for (let c = 0; c < names.length; c++) {
      if (counts[c] > 0) {
        sourceColumns.push(j);
        indicatedCategories.push(c);
      }
    }
  }
  return new FittedEncoder(
    columns,
    categories.map((names) => (names === null ? 0 : names.length)),
    Int32Array.from(sourceColumns),
    Int32Array.from(indicatedCategories),
    fillCategories,
  );
}

class FittedEncoder implements CategoryEncoder {
  readonly outputColumns: number;
  /** For each input column, its first output column. */
  private readonly firstOutput: Int32Array;
  /** For each text column, category index → offset of its indicator from firstOutput (−1: unseen). */
  private readonly positions: (Int32Array | null)[];

  constructor(
    readonly columns: number,
    /** For each input column, its number of categories (0 for a numeric column). */
    private readonly categoryCounts: number[],
    readonly sourceColumns: Int32Array,
    readonly indicatedCategories: Int32Array,
    readonly fillCategories: Int32Array,
  ) {
    this.outputColumns = sourceColumns.length;
    this.firstOutput = new Int32Array(columns);
    this.positions = categoryCounts.map((count) => (count > 0 ? new Int32Array(count).fill(-1) : null));
    const seen = new Uint8Array(columns);
    for (let o = 0; o < this.outputColumns; o++) {
      const j = sourceColumns[o];
      if (!seen[j]) {
        seen[j] = 1;
        this.firstOutput[j] = o;
      }
      const c = indicatedCategories[o];
      if (c >= 0) this.positions[j]![c] = o - this.firstOutput[j];
    }
  }

  transform(features: Float64Array, rows: number): Float64Array {
    const { columns, outputColumns, firstOutput, positions, fillCategories, categoryCounts } = this;
    if (!Number.isInteger(rows) || rows < 0 || features.length !== rows * columns)
      throw new DataError(message.featureCount("encoding", "prediction", features.length, rows, columns));
    const out = new Float64Array(rows * outputColumns);
    for (let j = 0; j < columns; j++) {
      const first = firstOutput[j];
      const position = positions[j];
      if (position === null) {
        for (let i = 0; i < rows; i++) out[i * outputColumns + first] = features[i * columns + j];
        continue;
      }
      const fill = fillCategories[j];
      if (fill < 0) continue; // never seen in training: no indicator columns
      for (let i = 0; i < rows; i++) {
        const v = features[i * columns + j];
        const category = Number.isNaN(v) ? fill : checkCategory(v, categoryCounts[j], "prediction", i, j);
        const p = position[category];
        if (p >= 0) out[i * outputColumns + first + p] = 1;
      }
    }
    return out;
  }
}

/** The category index `v`, checked to be a whole number in 0 .. count − 1. */
function checkCategory(v: number, count: number, role: string, row: number, column: number): number {
  if (!(Number.isInteger(v) && v >= 0 && v < count))
    throw new DataError(message.notCategoryIndex(role, row, column, v, count));
  return v;
}
