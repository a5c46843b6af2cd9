/**
 * Property-based tests of the CSV reader: any table written as RFC 4180 CSV (cells quoted when
 * they hold a quote, a delimiter or a line break) reads back cell for cell with the right line
 * numbers, and random bytes never crash it: it either reads them or throws a DataError.
 */
import fc from "fast-check";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { parseCsv, readCsv } from "../../src/data/csv.js";
import { tableToDataset } from "../../src/data/tableToDataset.js";
import { DataError, HeadroomError } from "../../src/errors.js";

/** A CSV writer following RFC 4180: a cell is quoted, its quotes doubled, when it needs to be. */
function writeCsv(header: string[], rows: string[][], newline: string): { text: string; lines: number[] } {
  const cell = (value: string) => (/[",\r\n]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value);
  let text = `${header.map(cell).join(",")}${newline}`;
  const lines: number[] = [];
  for (const row of rows) {
    lines.push(text.split("\n").length);
    text += `${row.map(cell).join(",")}${newline}`;
  }
  return { text, lines };
}

// Cells mix letters, digits, spaces, quotes, delimiters of all three kinds and line breaks.
const cellText = fc
  .array(fc.constantFrom("a", "Z", "7", ".", "-", " ", '"', ",", ";", "\t", "\n", "\r\n", "é", "€"), {
    maxLength: 8,
  })
  .map((parts) => parts.join(""));

const table = fc.integer({ min: 2, max: 5 }).chain((columns) =>
  fc.record({
    header: fc.uniqueArray(fc.constantFrom("id", "x", "y2", "dose_mg", "site", "label", "a_b", "Z"), {
      minLength: columns,
      maxLength: columns,
    }),
    rows: fc.array(fc.array(cellText, { minLength: columns, maxLength: columns }), { minLength: 1, maxLength: 12 }),
    newline: fc.constantFrom("\n", "\r\n"),
  }),
);

describe("parseCsv round trip", () => {
  it("reads back every cell and the line each row starts on", () => {
    fc.assert(
      fc.property(table, ({ header, rows, newline }) => {
        const { text, lines } = writeCsv(header, rows, newline);
        const parsed = parseCsv(text, "t.csv");
        expect(parsed.header).toEqual(header);
        expect(parsed.rows).toEqual(rows);
        expect(parsed.lines).toEqual(lines);
      }),
      { numRuns: 500, seed: 20261201 },
    );
  });
});

describe("readCsv on random bytes", () => {
  const dir = mkdtempSync(join(tmpdir(), "headroom-csv-random-"));
  // Bytes biased towards CSV's own characters, so that many inputs get past the UTF-8 check.
  const csvish = fc.array(
    fc.oneof(
      { weight: 6, arbitrary: fc.constantFrom(...Buffer.from('ab1.,;"\n\r\t -e9')) },
      { weight: 1, arbitrary: fc.integer({ min: 0, max: 255 }) },
    ),
    { maxLength: 200 },
  );

  it("reads the bytes or throws a DataError, and a data set from them or a HeadroomError", () => {
    let file = 0;
    fc.assert(
      fc.property(csvish, (bytes) => {
        const path = join(dir, `r${file++}.csv`);
        writeFileSync(path, Uint8Array.from(bytes));
        let parsed;
        try {
          parsed = readCsv(path);
        } catch (error) {
          expect(error).toBeInstanceOf(DataError);
          expect((error as Error).message).not.toContain("\n");
          return;
        }
        expect(parsed.rows.length).toBe(parsed.lines.length);
        try {
          const data = tableToDataset(parsed, { label: parsed.header[parsed.header.length - 1] });
          expect(data.features.length).toBe(data.rows * data.featureNames.length);
        } catch (error) {
          expect(error).toBeInstanceOf(HeadroomError);
          expect((error as Error).message).not.toContain("\n");
        }
      }),
      { numRuns: 400, seed: 20261201 },
    );
  });
});
