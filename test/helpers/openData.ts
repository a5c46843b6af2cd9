/**
 * A small loader for the open data sets in fixtures/open-data/ (see the README there), for tests only:
 * those files are plain numbers with a header and a last `class` column, so splitting on newlines and
 * commas is enough. Class names become indices in sorted string order, as scikit-learn's `classes_`.
 */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";

export const openDataNames = ["breast_cancer", "wine", "iris", "digits"] as const;
export type OpenDataName = (typeof openDataNames)[number];

export interface OpenData {
  /** Row-major `rows × columns`. */
  features: Float64Array;
  rows: number;
  columns: number;
  featureNames: string[];
  /** Index of each row's class into `classNames`. */
  labels: Int32Array;
  /** Class names sorted as strings (JavaScript's default sort compares UTF-16 code units, as numpy's for ASCII). */
  classNames: string[];
}

/** Path of a file in fixtures/, resolved from this file's location. */
export function fixturePath(...parts: string[]): string {
  return fileURLToPath(new URL(["..", "..", "fixtures", ...parts].join("/"), import.meta.url));
}

/** Reads fixtures/open-data/<name>.csv. Throws on a non-numeric feature or a ragged row. */
export function loadOpenData(name: OpenDataName): OpenData {
  const text = readFileSync(fixturePath("open-data", `${name}.csv`), "utf8");
  const lines = text.split(/\r?\n/).filter((line) => line.length > 0);
  const header = lines[0].split(",");
  if (header[header.length - 1] !== "class") throw new Error(`${name}.csv: last column is not 'class'`);
  const columns = header.length - 1;
  const rows = lines.length - 1;
  const features = new Float64Array(rows * columns);
  const names: string[] = [];
  for (let i = 0; i < rows; i++) {
    const fields = lines[i + 1].split(",");
    if (fields.length !== columns + 1) throw new Error(`${name}.csv:${i + 2}: ${fields.length} fields`);
    for (let j = 0; j < columns; j++) {
      const value = Number(fields[j]);
      if (fields[j].trim() === "" || !Number.isFinite(value))
        throw new Error(`${name}.csv:${i + 2}:${j + 1}: '${fields[j]}' is not a number`);
      features[i * columns + j] = value;
    }
    names.push(fields[columns]);
  }
  const classNames = [...new Set(names)].sort();
  const index = new Map(classNames.map((c, k) => [c, k]));
  const labels = Int32Array.from(names, (c) => index.get(c)!);
  return { features, rows, columns, featureNames: header.slice(0, columns), labels, classNames };
}
