/**
 * Writes a large, seeded, labeled CSV for testing headroom on big inputs:
 *
 *     npx tsx scripts/make-large-csv.ts out.csv [rows=100000] [features=50] [seed=1]
 *
 * Two classes in equal proportion; each feature is a normal draw shifted by a class-dependent mean
 * (the first ten features carry signal, the rest are noise), written with 5 decimals. About 1 in
 * 1000 cells is left empty (a missing value), so the imputation path is exercised too. The same
 * arguments always give the same bytes. Rows are written in blocks so memory stays small.
 */
import { closeSync, openSync, writeSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { RandomStream } from "../src/random.js";

export interface LargeCsvOptions {
  /** @default 100000 */
  rows?: number;
  /** @default 50 */
  features?: number;
  /** @default 1 */
  seed?: number;
}

/** Writes the CSV to `file` and returns its size in bytes. */
export function writeLargeCsv(file: string, options: LargeCsvOptions = {}): number {
  const rows = options.rows ?? 100_000;
  const features = options.features ?? 50;
  const random = new RandomStream(options.seed ?? 1);
  const shift = Array.from({ length: features }, (_, j) => (j < 10 ? 0.3 + 0.05 * j : 0));
  const fd = openSync(file, "w");
  let bytes = 0;
  const write = (text: string) => (bytes += writeSync(fd, text));
  try {
    write(`${[...Array.from({ length: features }, (_, j) => `x${j}`), "class"].join(",")}\n`);
    let block: string[] = [];
    for (let i = 0; i < rows; i++) {
      const positive = random.uniform() < 0.5;
      const cells = shift.map((s) => {
        const value = random.normal() + (positive ? s : -s);
        return random.uniform() < 0.001 ? "" : value.toFixed(5);
      });
      cells.push(positive ? "yes" : "no");
      block.push(cells.join(","));
      if (block.length === 1000) {
        write(`${block.join("\n")}\n`);
        block = [];
      }
    }
    if (block.length > 0) write(`${block.join("\n")}\n`);
  } finally {
    closeSync(fd);
  }
  return bytes;
}

if (process.argv[1] !== undefined && fileURLToPath(import.meta.url) === process.argv[1]) {
  const [file, rows, features, seed] = process.argv.slice(2);
  if (file === undefined) {
    process.stderr.write("usage: make-large-csv <out.csv> [rows] [features] [seed]\n");
    process.exitCode = 64;
  } else {
    const size = writeLargeCsv(file, {
      rows: rows === undefined ? undefined : Number(rows),
      features: features === undefined ? undefined : Number(features),
      seed: seed === undefined ? undefined : Number(seed),
    });
    process.stdout.write(`wrote ${file} (${(size / 1e6).toFixed(1)} MB)\n`);
  }
}
