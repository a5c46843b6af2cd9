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
  const { file, header, rows, lines } = table;
  checkHeader(table);
  const indexOf = (option: string, name: string): number => {
    const index = header.indexOf(name);
    if (index < 0) throw new UsageError(message.columnMissing(file, option, name, header));
    return index;
  };
  const labelColumn = indexOf("--label", choice.label);
  const groupColumn = choice.group === undefined ? -1 : indexOf("--group", choice.group);
  const ignored = new Set((choice.ignore ?? []).map((name) => indexOf("--ignore", name)));
  const featureColumns = header
    .map((_, i) => i)
    .filter((i) => i !== labelColumn && i !== groupColumn && !ignored.has(i));
  if (featureColumns.length === 0) throw new DataError(message.noFeatures(file));

  const width = header.length;
  const d = featureColumns.length;
  const regression = choice.task === "regression";
  const features = new Float64Array(rows.length * d);
  const labelText: string[] = new Array(rows.length);
  const targets = new Float64Array(regression ? rows.length : 0);
  const groupText: string[] = [];
  // Per feature column: how many cells were numbers and text, and where the first text cell was.
  const numberCells = new Int32Array(d);
  const textCells = new Int32Array(d);
  const firstText: { row: number; text: string }[] = new Array(d);
  for (let r = 0; r < rows.length; r++) {
    const cells = rows[r];
    if (cells.length !== width) throw new DataError(message.raggedRow(file, lines[r], width, cells.length));
    const label = cells[labelColumn].trim();
    if (label === "") throw new DataError(message.labelMissing(file, lines[r], labelColumn + 1, choice.label));
    labelText[r] = label;
    if (regression) {
      const target = readNumber(label, file, lines[r], labelColumn + 1, choice.label);
      if (target === undefined || Number.isNaN(target))
        throw new DataError(message.targetNotNumber(file, lines[r], labelColumn + 1, choice.label, label));
      targets[r] = target;
    }
    if (groupColumn >= 0) groupText.push(cells[groupColumn].trim());
    for (let j = 0; j < d; j++) {
      const c = featureColumns[j];
      const value = readNumber(cells[c].trim(), file, lines[r], c + 1, header[c]);
      if (value === undefined) {
        if (textCells[j]++ === 0) firstText[j] = { row: r, text: cells[c].trim() };
        features[r * d + j] = NaN;
      } else {
        if (!Number.isNaN(value)) numberCells[j]++;
        features[r * d + j] = value;
      }
    }
  }

  // Text columns: categorical when mostly text, an error at the first text cell when mostly numbers.
  const categories: (string[] | null)[] = featureColumns.map((c, j) => {
    if (textCells[j] === 0) return null;
    if (textCells[j] <= numberCells[j]) {
      const { row, text } = firstText[j];
      throw new DataError(message.mixedColumn(file, lines[row], c + 1, header[c], text));
    }
    return encodeCategories(rows, c, j, d, features);
  });

  const classNames = regression ? [] : [...new Set(labelText)].sort(compareStrings);
  if (!regression && classNames.length < 2) throw new DataError(message.oneClass(file, choice.label, classNames[0]));
  const classIndex = new Map(classNames.map((name, i) => [name, i]));
  const labels = regression ? new Int32Array(0) : Int32Array.from(labelText, (name) => classIndex.get(name) as number);

  const dataset: Dataset = {
    features,
    rows: rows.length,
    featureNames: featureColumns.map((c) => header[c]),
    labels,
    classNames,
  };
  if (regression) dataset.targets = targets;
  if (categories.some((names) => names !== null)) dataset.categories = categories;
  if (groupColumn >= 0) {
    const groupNames = [...new Set(groupText)].sort(compareStrings);
    const groupIndex = new Map(groupNames.map((name, i) => [name, i]));
    dataset.groups = Int32Array.from(groupText, (name) => groupIndex.get(name) as number);
    dataset.groupNames = groupNames;
  }
  return dataset;
}

function checkHeader({ file, header }: CsvTable): void {
  const seen = new Map<string, number>();
  header.forEach((name, i) => {
    if (name === "") throw new DataError(message.emptyColumnName(file, i + 1));
    const first = seen.get(name);
    if (first !== undefined) throw new DataError(message.duplicateColumn(file, name, first + 1, i + 1));
    seen.set(name, i);
  });
}

/**
 * A trimmed cell as a number: NaN when missing, undefined when it is text.
 * @throws DataError for NaN, Infinity and numbers too large for a double.
 */
function readNumber(cell: string, file: string, line: number, column: number, columnName: string): number | undefined {
  if (MISSING.has(cell)) return NaN;
  if (DECIMAL.test(cell)) {
    const value = Number(cell);
    if (Number.isFinite(value)) return value;
    throw new DataError(message.notFinite(file, line, column, columnName, cell));
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
function encodeCategories(rows: string[][], c: number, j: number, d: number, features: Float64Array): string[] {
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
