import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { readCsv } from "../../src/data/csv.js";
import { readJsonFile } from "../../src/io/files.js";

const dir = mkdtempSync(join(tmpdir(), "headroom-files-"));

describe("reading text files", () => {
  it("names the format each reader expected when the file is binary", () => {
    const json = join(dir, "plan.json");
    writeFileSync(json, Buffer.from('{\n  "a": 1,\n  "b": "\u0000"\n}\n'));
    expect(() => readJsonFile(json)).toThrow(
      `${json}:3: the file contains binary data (a NUL byte); expected JSON text`,
    );
    const csv = join(dir, "data.csv");
    writeFileSync(csv, Buffer.from("a,b\n\u0000,1\n"));
    expect(() => readCsv(csv)).toThrow(`${csv}:2: the file contains binary data (a NUL byte); expected CSV text`);
  });
});
