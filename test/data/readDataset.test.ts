/**
 * readDataset converts each CSV row as it is parsed; it must give what tableToDataset(readCsv(file))
 * gives, array for array, and the same first error. Checked on the open data sets in
 * fixtures/open-data (UCI, as shipped by scikit-learn), on hand-made files with text columns, runs,
 * numeric targets, blank lines and quoted line breaks, on the error cases of tableToDataset's own
 * tests, and on random tables (fast-check).
 */
import fc from "fast-check";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { shareDataset } from "../../src/curve/sharedDataset.js";
import { readCsv } from "../../src/data/csv.js";
import type { Dataset } from "../../src/data/dataset.js";
import { readDataset } from "../../src/data/readDataset.js";
import { tableToDataset, type ColumnChoice } from "../../src/data/tableToDataset.js";
import { HeadroomError } from "../../src/errors.js";

const folder = mkdtempSync(join(tmpdir(), "headroom-read-dataset-"));
let written = 0;
function file(text: string): string {
  const path = join(folder, `d${written++}.csv`);
  writeFileSync(path, text);
  return path;
}

/** Every field of a data set as plain arrays (NaN and −0 kept apart by their text). */
function plain(data: Dataset): Record<string, unknown> {
  const show = (value: unknown): unknown =>
    ArrayBuffer.isView(value)
      ? Array.from(value as Float64Array, (v) => (Object.is(v, -0) ? "-0" : Number.isNaN(v) ? "NaN" : v))
      : value;
  return Object.fromEntries(
    Object.entries(data)
      .sort(([a], [b]) => (a < b ? -1 : 1))
      .map(([key, value]) => [key, show(value)]),
  );
}

/** The outcome of reading `path` one way: the data set, or the error's class and message. */
function outcome(read: () => Dataset): unknown {
  try {
    return plain(read());
  } catch (error) {
    if (!(error instanceof HeadroomError)) throw error;
    return `${error.constructor.name}: ${error.message}`;
  }
}

function expectSame(path: string, choice: ColumnChoice): unknown {
  const streamed = outcome(() => readDataset(path, choice));
  expect(streamed).toEqual(outcome(() => tableToDataset(readCsv(path), choice)));
  return streamed;
}

describe("readDataset", () => {
  it.each([
    ["breast_cancer", "class"],
    ["digits", "class"],
    ["iris", "class"],
  ])("reads %s as tableToDataset(readCsv(...)) does", (name, label) => {
    const result = expectSame(join("fixtures", "open-data", `${name}.csv`), { label }) as Record<string, unknown>;
    // Sizes from the UCI descriptions: 569 × 30, 1,797 × 64, 150 × 4.
    const rows = { breast_cancer: 569, digits: 1797, iris: 150 }[name];
    expect(result.rows).toBe(rows);
  });

  it("puts the features in shared memory, which worker threads read without a copy", () => {
    const data = readDataset(join("fixtures", "open-data", "iris.csv"), { label: "class" });
    expect(data.features.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(shareDataset(data).features).toBe(data.features);
  });

  it.each<[string, string, ColumnChoice]>([
    ["text columns and missing cells", "color,x,c\nred,1,a\nblue,2,b\n,3,a\nred,NA,b\ngreen,5,a\n", { label: "c" }],
    [
      "runs and ignored columns",
      "id,x,run,c\n1,1.5,r2,b\n2,-2e1,r1,a\n3,.5,r2,b\n",
      { label: "c", group: "run", ignore: ["id"] },
    ],
    ["a numeric target", "x,y\n1,2.5\n2,-1e-3\n3,40\n", { label: "y", task: "regression" }],
    ["blank lines, CRLF and a quoted line break", 'x,"c"\r\n1,a\r\n\r\n"2",b\r\n3,"a\r\nb"\r\n', { label: "c" }],
    ["no final line break and a negative zero", "x,c\n-0,a\n0,b\n-0.000,a", { label: "c" }],
    ["semicolons and a decimal comma as text", "x;s;c\n1;1,5;a\n2;2,5;b\n", { label: "c" }],
  ])("reads %s as tableToDataset(readCsv(...)) does", (_, text, choice) => {
    const result = expectSame(file(text), choice);
    expect(typeof result).toBe("object");
  });

  it.each([
    ["text in a mostly numeric column", "x,c\n1,a\n2,b\nabc,a\n", "DataError: "],
    ["a ragged row before a bad number", "x,c\n1,a\n2\nNaN,b\n", "DataError: "],
    ["a duplicate column", "x,x,c\n1,2,a\n", "DataError: "],
    ["a missing label column", "x,y\n1,a\n", "UsageError: "],
    ["one class only", "x,c\n1,a\n2,a\n", "DataError: "],
    ["a header only", "x,c\n", "DataError: "],
    ["an empty file", "\n\n", "DataError: "],
    ["a bad number before a CSV syntax error", 'x,c\nNaN,a\n2,"b\n', "DataError: "],
  ])("gives the same first error for %s", (_, text, kind) => {
    const result = expectSame(file(text), { label: "c" });
    expect(String(result).startsWith(kind)).toBe(true);
  });

  it("gives the same result or error as tableToDataset(readCsv(...)) on random tables", () => {
    const cell = fc.constantFrom("", "1", "-2.5", "0", "-0", "3e2", "NA", "a", "b", "x y", "NaN", '"q,1"', "7");
    const table = fc.integer({ min: 1, max: 4 }).chain((columns) =>
      fc.array(fc.array(cell, { minLength: columns, maxLength: columns + (columns > 1 ? 0 : 1) }), {
        minLength: 0,
        maxLength: 9,
      }),
    );
    fc.assert(
      fc.property(table, fc.constantFrom("\n", "\r\n"), (rows, newline) => {
        const width = rows[0]?.length ?? 1;
        const header = [...Array.from({ length: width }, (_, j) => `f${j}`), "c"];
        const lines = rows.map((row, r) => [...row, r % 3 === 0 ? "p" : "q"].join(","));
        const path = file([header.join(","), ...lines].join(newline) + newline);
        expectSame(path, { label: "c" });
      }),
      { numRuns: 150 },
    );
  });
});
