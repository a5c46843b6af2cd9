/**
 * Every user-facing error message, in one place. Each is one line saying what is wrong and where
 * (file, line, column, option or key), so a user can fix it without reading code.
 */

/** `file:line:column` or `file:line`, as compilers print positions. */
export function at(file: string, line?: number, column?: number): string {
  if (line === undefined) return file;
  return column === undefined ? `${file}:${line}` : `${file}:${line}:${column}`;
}

export const message = {
  fileMissing: (file: string) => `${file}: no such file`,
  fileUnreadable: (file: string, reason: string) => `${file}: cannot be read (${reason})`,
  notUtf8: (file: string, line: number) => `${at(file, line)}: the file is not UTF-8 text`,
  binaryContent: (file: string, line: number) =>
    `${at(file, line)}: the file contains binary data (a NUL byte); expected CSV text`,
  emptyFile: (file: string) => `${file}: the file is empty`,
  headerOnly: (file: string) => `${file}: the file has a header but no data rows`,
  csvSyntax: (file: string, line: number, detail: string) => `${at(file, line)}: CSV syntax error: ${detail}`,
  raggedRow: (file: string, line: number, expected: number, found: number) =>
    `${at(file, line)}: expected ${expected} fields as in the header, found ${found}`,
  emptyColumnName: (file: string, column: number) => `${at(file, 1, column)}: the header has an empty column name`,
  duplicateColumn: (file: string, name: string, first: number, second: number) =>
    `${at(file, 1, second)}: duplicate column name '${name}' (also column ${first})`,
  columnMissing: (file: string, option: string, name: string, available: string[]) =>
    `${file}: ${option} column '${name}' is not in the header (columns: ${preview(available)})`,
  labelMissing: (file: string, line: number, column: number, name: string) =>
    `${at(file, line, column)}: the label '${name}' is empty`,
  notANumber: (file: string, line: number, column: number, columnName: string, text: string) =>
    `${at(file, line, column)}: '${clip(text)}' in column '${columnName}' is not a number`,
  notFinite: (file: string, line: number, column: number, columnName: string, text: string) =>
    `${at(file, line, column)}: '${clip(text)}' in column '${columnName}' is not a finite number; leave the cell empty for a missing value`,
  noFeatures: (file: string) => `${file}: no feature columns are left besides the label, group and ignored columns`,
  oneClass: (file: string, label: string, className: string) =>
    `${file}: the label column '${label}' has only one class ('${clip(className)}'); a learning curve needs at least two`,
  classTooSmall: (file: string, className: string, count: number, folds: number) =>
    `${file}: class '${clip(className)}' has ${count} row${count === 1 ? "" : "s"}, fewer than --folds ${folds}; lower --folds or collect more of that class`,
  tooFewRows: (file: string, rows: number, needed: number) =>
    `${file}: ${rows} rows are too few for a learning curve (at least ${needed} needed)`,
  sizeTooLarge: (size: number, pool: number) =>
    `--sizes: training size ${size} is larger than the smallest training pool (${pool} rows after holding out a fold)`,
  sizeTooSmall: (size: number, classes: number) =>
    `--sizes: training size ${size} is too small to hold each of the ${classes} classes`,
  badInteger: (option: string, text: string, min: number) =>
    `${option}: '${clip(text)}' is not a whole number of at least ${min}`,
  badNumber: (option: string, text: string) => `${option}: '${clip(text)}' is not a number`,
  badLevel: (option: string, text: string) => `${option}: '${clip(text)}' is not a probability between 0 and 1`,
  badList: (option: string, text: string) =>
    `${option}: '${clip(text)}' is not a comma-separated list of whole numbers`,
  badJson: (file: string, line: number, column: number, detail: string) =>
    `${at(file, line, column)}: malformed JSON: ${detail}`,
  badKey: (file: string, key: string, detail: string) => `${file}: ${key}: ${detail}`,
  wrongFileKind: (file: string, expected: string) => `${file}: not a ${expected} file written by headroom`,
  curveTooShort: (sizes: number) =>
    `the curve has ${sizes} distinct training size${sizes === 1 ? "" : "s"}; a forecast needs at least 3`,
  missingProjections: (file: string, missing: number[], needed: number[]) =>
    `${file}: the forecast has no projection at training size${missing.length === 1 ? "" : "s"} ${missing.join(", ")}; rerun headroom forecast with --at ${needed.join(",")}`,
  outputExists: (file: string) => `${file}: refusing to overwrite an input file`,
  cannotWrite: (file: string, reason: string) => `${file}: cannot be written (${reason})`,
  unknownName: (option: string, name: string, known: string[]) =>
    `${option}: unknown name '${clip(name)}' (known: ${known.join(", ")})`,
} as const;

function clip(text: string): string {
  const oneLine = text.replace(/[\r\n\t]/g, " ");
  return oneLine.length > 40 ? `${oneLine.slice(0, 37)}...` : oneLine;
}

function preview(names: string[]): string {
  const shown = names.slice(0, 8).map((n) => `'${clip(n)}'`);
  return names.length > 8 ? `${shown.join(", ")}, ... (${names.length} in all)` : shown.join(", ");
}
