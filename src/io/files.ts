/**
 * File input and output with the guarantees users rely on: outputs appear whole or not at all
 * (written to a temporary file in the same folder, then renamed), inputs are never overwritten, and
 * malformed JSON is reported with its line and column.
 */
import { createHash } from "node:crypto";
import {
  mkdirSync,
  readFileSync,
  realpathSync,
  renameSync,
  rmSync,
  statSync,
  writeFileSync,
  type Stats,
} from "node:fs";
import { dirname, resolve } from "node:path";
import { DataError, OutputError } from "../errors.js";
import { readTextFile } from "../data/csv.js";
import { message } from "../messages.js";
import { findJsonSyntaxError } from "./jsonSyntax.js";

/**
 * Writes `content` to `file` atomically, creating its folder.
 * @param inputs files this run read; writing over one of them is refused
 * @throws OutputError when the file cannot be written or would overwrite an input
 */
export function writeFileAtomic(file: string, content: string | Uint8Array, inputs: readonly string[] = []): void {
  const target = resolve(file);
  for (const input of inputs) {
    if (sameFile(input, target)) throw new OutputError(message.outputExists(file));
  }
  const temporary = `${target}.tmp-${process.pid}`;
  try {
    mkdirSync(dirname(target), { recursive: true });
    writeFileSync(temporary, content);
    renameSync(temporary, target);
  } catch (error) {
    try {
      rmSync(temporary, { force: true });
    } catch {
      // The temporary file's folder may not exist (ENOTDIR): nothing to clean up.
    }
    const code = (error as NodeJS.ErrnoException).code;
    throw new OutputError(message.cannotWrite(file, code ?? String(error)));
  }
}

/**
 * Checks, before any work, that `file` could be written: it is not one of the inputs and no part of
 * its folder path is a regular file. Nothing is created.
 * @throws OutputError naming the file
 */
export function checkOutputPath(file: string, inputs: readonly string[] = []): void {
  const target = resolve(file);
  for (const input of inputs) {
    if (sameFile(input, target)) throw new OutputError(message.outputExists(file));
  }
  let folder = dirname(target);
  for (;;) {
    let stats: Stats | undefined;
    try {
      stats = statSync(folder);
    } catch {
      stats = undefined;
    }
    if (stats !== undefined) {
      if (!stats.isDirectory()) throw new OutputError(message.outputUnder(file, folder));
      return;
    }
    const parent = dirname(folder);
    if (parent === folder) return;
    folder = parent;
  }
}

function sameFile(input: string, target: string): boolean {
  try {
    return realpathSync(input) === realpathSync(target);
  } catch {
    return resolve(input) === target;
  }
}

/** JSON text with two-space indentation and a final newline. */
export function toJson(value: unknown): string {
  return `${JSON.stringify(value, null, 2)}\n`;
}

/**
 * Reads and parses a JSON file.
 * @throws InputError when missing; DataError with line and column when malformed
 */
export function readJsonFile(file: string): unknown {
  const text = readTextFile(file);
  if (text.trim() === "") throw new DataError(message.emptyFile(file));
  try {
    return JSON.parse(text);
  } catch (error) {
    const syntax = findJsonSyntaxError(text);
    if (syntax !== undefined) throw new DataError(message.badJson(file, syntax.line, syntax.column, syntax.reason));
    const detail = (error as Error).message.split("\n")[0];
    const position = /position (\d+)/.exec(detail);
    const offset = position ? Number(position[1]) : text.length;
    const before = text.slice(0, offset);
    const line = before.split("\n").length;
    const column = offset - before.lastIndexOf("\n");
    throw new DataError(message.badJson(file, line, column, detail.replace(/ in JSON at position \d+.*$/, "")));
  }
}

/** SHA-256 of a file's bytes, hex. */
export function sha256OfFile(file: string): string {
  return createHash("sha256").update(readFileSync(file)).digest("hex");
}
