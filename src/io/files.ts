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
import { DataError, InputError, OutputError } from "../errors.js";
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
  const text = readTextFile(file, "JSON");
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

/**
 * Reads a file as UTF-8 text (a leading byte-order mark is dropped); `format` is what the text
 * should be, for the message when it is binary.
 * @throws InputError when missing or unreadable; DataError when binary or not UTF-8.
 */
export function readTextFile(file: string, format: "CSV" | "JSON"): string {
  let bytes: Buffer;
  try {
    if (statSync(file).isDirectory()) throw new InputError(message.fileUnreadable(file, "it is a folder"));
    bytes = readFileSync(file);
  } catch (error) {
    if (error instanceof InputError) throw error;
    const code = (error as NodeJS.ErrnoException).code;
    if (code === "ENOENT") throw new InputError(message.fileMissing(file));
    throw new InputError(message.fileUnreadable(file, code ?? String(error)));
  }
  const nul = bytes.indexOf(0);
  if (nul >= 0) throw new DataError(message.binaryContent(file, lineOfByte(bytes, nul), format));
  try {
    const text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
    return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  } catch {
    throw new DataError(message.notUtf8(file, lineOfByte(bytes, firstInvalidUtf8(bytes))));
  }
}

function lineOfByte(bytes: Buffer, offset: number): number {
  let line = 1;
  for (let i = 0; i < offset; i++) if (bytes[i] === 10) line++;
  return line;
}

/** Offset of the first byte that breaks UTF-8, found by decoding growing prefixes line by line. */
function firstInvalidUtf8(bytes: Buffer): number {
  const decoder = new TextDecoder("utf-8", { fatal: true });
  let start = 0;
  while (start < bytes.length) {
    let end = bytes.indexOf(10, start);
    if (end < 0) end = bytes.length;
    try {
      decoder.decode(bytes.subarray(start, end));
    } catch {
      return start;
    }
    start = end + 1;
  }
  return 0;
}
