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
}

/** Cells read as a missing value. Anything else must be a finite decimal number. */
const MISSING = new Set(["", "NA", "N/A", "na", "n/a"]);

/** A decimal number as people write them in CSV files: no hex, no underscores, no "Infinity". */
const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * Builds the data set. Class names are sorted as strings (as scikit-learn's label encoding does), so
 * class indices do not depend on row order.
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
  const features = new Float64Array(rows.length * d);
  const labelText: string[] = new Array(rows.length);
  const groupText: string[] = [];
  for (let r = 0; r < rows.length; r++) {
    const cells = rows[r];
    if (cells.length !== width) throw new DataError(message.raggedRow(file, lines[r], width, cells.length));
    const label = cells[labelColumn].trim();
    if (label === "") throw new DataError(message.labelMissing(file, lines[r], labelColumn + 1, choice.label));
    labelText[r] = label;
    if (groupColumn >= 0) groupText.push(cells[groupColumn].trim());
    for (let j = 0; j < d; j++) {
      const c = featureColumns[j];
      features[r * d + j] = parseCell(cells[c], file, lines[r], c + 1, header[c]);
    }
  }

  const classNames = [...new Set(labelText)].sort(compareStrings);
  if (classNames.length < 2) throw new DataError(message.oneClass(file, choice.label, classNames[0]));
  const classIndex = new Map(classNames.map((name, i) => [name, i]));
  const labels = Int32Array.from(labelText, (name) => classIndex.get(name) as number);

  const dataset: Dataset = {
    features,
    rows: rows.length,
    featureNames: featureColumns.map((c) => header[c]),
    labels,
    classNames,
  };
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

function parseCell(text: string, file: string, line: number, column: number, columnName: string): number {
  const cell = text.trim();
  if (MISSING.has(cell)) return NaN;
  if (DECIMAL.test(cell)) {
    const value = Number(cell);
    if (Number.isFinite(value)) return value;
    throw new DataError(message.notFinite(file, line, column, columnName, cell));
  }
  if (/^[+-]?(inf|infinity|nan)$/i.test(cell)) {
    throw new DataError(message.notFinite(file, line, column, columnName, cell));
  }
  throw new DataError(message.notANumber(file, line, column, columnName, cell));
}

/** Code-unit order, as Python sorts strings: independent of the machine's locale. */
export function compareStrings(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
