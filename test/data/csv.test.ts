import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { parseCsv, readCsv } from "../../src/data/csv.js";
import { DataError, InputError } from "../../src/errors.js";

const dir = mkdtempSync(join(tmpdir(), "headroom-csv-"));
function file(name: string, content: string | Buffer): string {
  const path = join(dir, name);
  writeFileSync(path, content);
  return path;
}

describe("parseCsv", () => {
  it("gives each row the line it starts on, across blank lines and quoted newlines", () => {
    const table = parseCsv('a,b\n1,2\n\n"x\ny",3\n4,5\n', "f.csv");
    expect(table.header).toEqual(["a", "b"]);
    expect(table.rows).toEqual([
      ["1", "2"],
      ["x\ny", "3"],
      ["4", "5"],
    ]);
    expect(table.lines).toEqual([2, 4, 6]);
  });

  it("detects a semicolon delimiter", () => {
    expect(parseCsv("a;b\n1,5;2\n", "f.csv").rows).toEqual([["1,5", "2"]]);
  });

  it.each([
    ["empty", "", "f.csv: the file is empty"],
    ["blank", "\n\n", "f.csv: the file is empty"],
    ["header only", "a,b\n", "f.csv: the file has a header but no data rows"],
    ["unterminated quote", 'a,b\n1,"2\n', "f.csv:2: CSV syntax error: Quoted field unterminated"],
  ])("rejects %s input with a one-line message", (_, text, expected) => {
    expect(() => parseCsv(text, "f.csv")).toThrow(new DataError(expected));
  });
});

describe("readCsv", () => {
  it("drops a byte-order mark", () => {
    expect(readCsv(file("bom.csv", "\ufeffa,b\n1,2\n")).header).toEqual(["a", "b"]);
  });

  it("names the line of binary content", () => {
    const path = file("bin.csv", Buffer.from("a,b\n1,2\n3,\u0000\n"));
    expect(() => readCsv(path)).toThrow(`${path}:3: the file contains binary data`);
  });

  it("names the line of the first byte that is not UTF-8", () => {
    const path = file(
      "latin1.csv",
      Buffer.concat([Buffer.from("a,b\n1,2\n"), Buffer.from([0x63, 0xe9, 0x2c, 0x31, 0x0a])]),
    );
    expect(() => readCsv(path)).toThrow(`${path}:3: the file is not UTF-8 text`);
  });

  it("says when the file is missing", () => {
    expect(() => readCsv(join(dir, "nope.csv"))).toThrow(InputError);
    expect(() => readCsv(join(dir, "nope.csv"))).toThrow("no such file");
  });
});
