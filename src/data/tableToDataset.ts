/**
 * Turns a parsed CSV table into a Dataset: checks the header, picks the label, group and feature
 * columns, and converts numbers by hand so that every bad cell is reported with its line and column
 * (CSV libraries' own number conversion either reports no position or silently accepts "0x10").
 */
import { DataError, UsageError } from "../errors.js";
import { message } from "../messages.js";
import type { CsvTable } from "./csv.js";
import type { Dataset } from "./dataset.js";

export interface ColumnChoice {
  /** Name of the label column. */
  label: string;
  /** Name of the column that says which run (batch) each row came from. */
  group?: string;
  /** Columns to leave out of the features (identifiers, free text). */
  ignore?: string[];
  /**
   * Whether the label is a class (classification) or a numeric target (regression). Given, not
   * guessed: a numeric column with few distinct whole numbers is usually classes.
   * @default "classification"
   */
  task?: "classification" | "regression";
}

/** Cells read as a missing value. Anything else must be a finite decimal number. */
const MISSING = new Set(["", "NA", "N/A", "na", "n/a"]);

/** A decimal number as people write them in CSV files: no hex, no underscores, no "Infinity". */
const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * Builds the data set. Class names are sorted as strings (as scikit-learn's label encoding does), so
 * class indices do not depend on row order. With `task: "regression"` the label column must hold a
 * finite number in every row; it fills `targets`, and `labels` and `classNames` are empty.
 *
 * Feature columns: a column whose cells are all numbers (or missing) is numeric. A column that is
 * mostly text (more text cells than number cells) is categorical: its category names are its distinct
 * non-missing cells (numbers included, as written) sorted as strings, and a row's value is the index
 * of its category (NaN when missing); `categories` records the names. A column that is mostly
 * numbers with some text is an error at its first text cell, since that is usually a typo or a code
 * such as "<0.5" that would silently turn a measurement into categories. `NaN` and `Infinity` are
 * errors in any column.
 * @throws UsageError when a named column is absent; DataError for bad header or cells.
 */
export function tableToDataset(table: CsvTable, choice: ColumnChoice): Dataset {
  const builder = new DatasetBuilder(table.file, table.header, choice, table.rows.length);
  table.rows.forEach((cells, r) => builder.addRow(cells, table.lines[r]));
  return builder.finish(() => table.rows);
}

/**
 * {@link tableToDataset} a row at a time, so that a reader can convert each CSV row as it is parsed
 * instead of first holding the whole file as rows of text (for 20,000 rows × 17 columns, 17 MiB of
 * live strings and arrays). The checks and errors are tableToDataset's, raised in the same order:
 * the header's in the constructor, each row's in `addRow`, the columns' and classes' in `finish`.
 */
export class DatasetBuilder {
  private readonly labelColumn: number;
  private readonly groupColumn: number;
  private readonly featureColumns: number[];
  private readonly regression: boolean;
  private rows = 0;
  private features: Float64Array;
  private targets: Float64Array;
  /** Index of each row's label (group) into `labelNames` (`groupNames`), in order of first appearance. */
  private labelIds: Int32Array;
  private groupIds: Int32Array;
  private readonly labelNames = new Map<string, number>();
  private readonly groupNames = new Map<string, number>();
  // Per feature column: how many cells were numbers and text, and where the first text cell was.
  private readonly numberCells: Int32Array;
  private readonly textCells: Int32Array;
  private readonly firstText: { line: number; text: string }[];

  /**
   * @param header the header's cells, trimmed
   * @param expectedRows room for this many rows is made at once (more are welcome)
   * @throws UsageError when a named column is absent; DataError for a bad header.
   */
  constructor(
    private readonly file: string,
    private readonly header: string[],
    private readonly choice: ColumnChoice,
    expectedRows = 64,
  ) {
    checkHeader(file, header);
    const indexOf = (option: string, name: string): number => {
      const index = header.indexOf(name);
      if (index < 0) throw new UsageError(message.columnMissing(file, option, name, header));
      return index;
    };
    this.labelColumn = indexOf("label", choice.label);
    this.groupColumn = choice.group === undefined ? -1 : indexOf("group", choice.group);
    if (this.groupColumn === this.labelColumn) {
      throw new UsageError(message.columnTwice(file, "group", choice.label, "label"));
    }
    const ignored = new Set((choice.ignore ?? []).map((name) => indexOf("ignore", name)));
    for (const [column, option] of [
      [this.labelColumn, "label"],
      [this.groupColumn, "group"],
    ] as const) {
      if (ignored.has(column)) {
        throw new UsageError(message.columnTwice(file, "ignore", header[column], option));
      }
    }
    this.featureColumns = header
      .map((_, i) => i)
      .filter((i) => i !== this.labelColumn && i !== this.groupColumn && !ignored.has(i));
    if (this.featureColumns.length === 0) throw new DataError(message.noFeatures(file));
    this.regression = choice.task === "regression";
    const d = this.featureColumns.length;
    const capacity = Math.max(1, expectedRows);
    this.features = sharedDoubles(capacity * d);
    this.targets = new Float64Array(this.regression ? capacity : 0);
    this.labelIds = new Int32Array(this.regression ? 0 : capacity);
    this.groupIds = new Int32Array(this.groupColumn >= 0 ? capacity : 0);
    this.numberCells = new Int32Array(d);
    this.textCells = new Int32Array(d);
    this.firstText = new Array(d);
  }

  /**
   * Converts one data row (its cells untrimmed, as parsed) starting on `line`.
   * @throws DataError for a ragged row, an empty label, a target that is not a number, or a cell that
   *   is NaN, Infinity or too large.
   */
  addRow(cells: string[], line: number): void {
    const { file, header, featureColumns, labelColumn, groupColumn, choice } = this;
    const width = header.length;
    const d = featureColumns.length;
    if (cells.length !== width) throw new DataError(message.raggedRow(file, line, width, cells.length));
    const r = this.rows;
    if (r === this.capacity()) this.grow();
    const label = cells[labelColumn].trim();
    if (label === "") throw new DataError(message.labelMissing(file, line, labelColumn + 1, choice.label));
    if (this.regression) {
      const target = readNumber(label, file, line, labelColumn + 1, choice.label);
      if (target === undefined || Number.isNaN(target))
        throw new DataError(message.targetNotNumber(file, line, labelColumn + 1, choice.label, label));
      this.targets[r] = target;
    } else this.labelIds[r] = idOf(this.labelNames, label);
    if (groupColumn >= 0) this.groupIds[r] = idOf(this.groupNames, cells[groupColumn].trim());
    const features = this.features;
    for (let j = 0; j < d; j++) {
      const c = featureColumns[j];
      const value = readNumber(cells[c].trim(), file, line, c + 1, header[c]);
      if (value === undefined) {
        if (this.textCells[j]++ === 0) this.firstText[j] = { line, text: cells[c].trim() };
        features[r * d + j] = NaN;
      } else {
        if (!Number.isNaN(value)) this.numberCells[j]++;
        features[r * d + j] = value;
      }
    }
    this.rows++;
  }

  /**
   * The data set of the rows added.
   * @param rowsAgain the data rows once more, in the same order: read only when some column holds
   *   text, to name its categories as written
   * @throws DataError for a mostly numeric column with text in it, or a single class.
   */
  finish(rowsAgain: () => readonly string[][]): Dataset {
    const { file, header, featureColumns, choice, rows } = this;
    const d = featureColumns.length;
    let features = this.features;
    if (features.length !== rows * d) {
      features = sharedDoubles(rows * d);
      features.set(this.features.subarray(0, rows * d));
    }
    // Text columns: categorical when mostly text, an error at the first text cell when mostly numbers.
    featureColumns.forEach((c, j) => {
      if (this.textCells[j] > 0 && this.textCells[j] <= this.numberCells[j]) {
        const { line, text } = this.firstText[j];
        throw new DataError(message.mixedColumn(file, line, c + 1, header[c], text));
      }
    });
    const textColumns = featureColumns.some((_, j) => this.textCells[j] > 0);
    const table = textColumns ? rowsAgain() : [];
    const categories: (string[] | null)[] = featureColumns.map((c, j) =>
      this.textCells[j] === 0 ? null : encodeCategories(table, c, j, d, features),
    );

    const classNames = this.regression ? [] : sortedNames(this.labelNames);
    if (!this.regression && classNames.length < 2)
      throw new DataError(message.oneClass(file, choice.label, classNames[0]));
    const dataset: Dataset = {
      features,
      rows,
      featureNames: featureColumns.map((c) => header[c]),
      labels: this.regression ? new Int32Array(0) : renumbered(this.labelIds, rows, this.labelNames, classNames),
      classNames,
    };
    if (this.regression) dataset.targets = this.targets.slice(0, rows);
    if (categories.some((names) => names !== null)) dataset.categories = categories;
    if (this.groupColumn >= 0) {
      const groupNames = sortedNames(this.groupNames);
      dataset.groups = renumbered(this.groupIds, rows, this.groupNames, groupNames);
      dataset.groupNames = groupNames;
    }
    return dataset;
  }

  private capacity(): number {
    return this.features.length / this.featureColumns.length;
  }

  /** Doubles the room for rows. */
  private grow(): void {
    const features = sharedDoubles(this.features.length * 2);
    features.set(this.features);
    this.features = features;
    this.targets = doubled(this.targets);
    this.labelIds = doubled(this.labelIds);
    this.groupIds = doubled(this.groupIds);
  }
}

/**
 * A Float64Array over shared memory. The features live there from the start: worker threads read them
 * without a copy (curve/sharedDataset.ts keeps arrays already shared), so a measurement with worker
 * threads does not hold them twice.
 */
function sharedDoubles(length: number): Float64Array {
  return new Float64Array(new SharedArrayBuffer(length * Float64Array.BYTES_PER_ELEMENT));
}

/** A copy of `array` twice as long (an empty array stays empty: that column is not kept). */
function doubled<T extends Float64Array | Int32Array>(array: T): T {
  if (array.length === 0) return array;
  const copy = new (array.constructor as new (length: number) => T)(array.length * 2);
  copy.set(array);
  return copy;
}

/** The id of `name` in `ids`, given the next id when it is new. */
function idOf(ids: Map<string, number>, name: string): number {
  let id = ids.get(name);
  if (id === undefined) ids.set(name, (id = ids.size));
  return id;
}

/** The names of `ids`, sorted as strings. */
function sortedNames(ids: Map<string, number>): string[] {
  return [...ids.keys()].sort(compareStrings);
}

/** The first `rows` ids, each turned from its order of first appearance into its name's place in `names`. */
function renumbered(ids: Int32Array, rows: number, byName: Map<string, number>, names: string[]): Int32Array {
  const place = new Int32Array(names.length);
  names.forEach((name, index) => (place[byName.get(name)!] = index));
  return Int32Array.from(ids.subarray(0, rows), (id) => place[id]);
}

function checkHeader(file: string, header: string[]): void {
  const seen = new Map<string, number>();
  header.forEach((name, i) => {
    if (name === "") throw new DataError(message.emptyColumnName(file, i + 1));
    const first = seen.get(name);
    if (first !== undefined) throw new DataError(message.duplicateColumn(file, name, first + 1, i + 1));
    seen.set(name, i);
  });
}

/**
 * The largest magnitude a number may have: the square of a larger one, or a sum of a few hundred such
 * squares, overflows a double (about 1.8e308), so no mean, variance, distance or squared error could be
 * computed from it. Without this check a column of such values turned into NaN scales and a model that
 * predicted one class, with no error.
 */
const largestUsable = 1e150;

/**
 * A trimmed cell as a number: NaN when missing, undefined when it is text.
 * @throws DataError for NaN, Infinity, numbers too large for a double and numbers above {@link largestUsable}.
 */
function readNumber(cell: string, file: string, line: number, column: number, columnName: string): number | undefined {
  if (MISSING.has(cell)) return NaN;
  if (DECIMAL.test(cell)) {
    const value = Number(cell);
    if (!Number.isFinite(value)) throw new DataError(message.notFinite(file, line, column, columnName, cell));
    if (Math.abs(value) > largestUsable) throw new DataError(message.tooLarge(file, line, column, columnName, cell));
    return value;
  }
  if (/^[+-]?(inf|infinity|nan)$/i.test(cell)) {
    throw new DataError(message.notFinite(file, line, column, columnName, cell));
  }
  return undefined;
}

/**
 * Makes feature column `j` (CSV column `c`) categorical: its distinct non-missing cells sorted as
 * strings become the category names, and each row's value becomes its category's index (NaN when
 * missing). Returns the names.
 */
function encodeCategories(
  rows: readonly string[][],
  c: number,
  j: number,
  d: number,
  features: Float64Array,
): string[] {
  const cells = rows.map((cells) => cells[c].trim());
  const names = [...new Set(cells.filter((cell) => !MISSING.has(cell)))].sort(compareStrings);
  const index = new Map(names.map((name, k) => [name, k]));
  cells.forEach((cell, r) => (features[r * d + j] = MISSING.has(cell) ? NaN : (index.get(cell) as number)));
  return names;
}

/** Code-unit order, as Python sorts strings: independent of the machine's locale. */
export function compareStrings(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
