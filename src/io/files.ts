/**
 * File input and output with the guarantees users rely on: outputs appear whole or not at all
 * (written to a temporary file in the same folder, then renamed), inputs are never overwritten, and
 * malformed JSON is reported with its line and column.
 */
import { createHash } from "node:crypto";
import { mkdirSync, readFileSync, realpathSync, renameSync, rmSync, writeFileSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { DataError, OutputError } from "../errors.js";
import { readTextFile } from "../data/csv.js";
import { message } from "../messages.js";

/**
 * Writes `content` to `file` atomically, creating its folder.
 * @param inputs files this run read; writing over one of them is refused
 * @throws OutputError when the file cannot be written or would overwrite an input
 */
export function writeFileAtomic(file: string, content: string, inputs: readonly string[] = []): void {
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
    rmSync(temporary, { force: true });
    const code = (error as NodeJS.ErrnoException).code;
    throw new OutputError(message.cannotWrite(file, code ?? String(error)));
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
  try {
    return JSON.parse(text);
  } catch (error) {
    const detail = (error as Error).message;
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
