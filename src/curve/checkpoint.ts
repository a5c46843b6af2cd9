/**
 * Checkpoints of a running measurement, so that an interrupted run (Ctrl-C, a killed process, a
 * power cut) can continue where it stopped instead of starting over.
 *
 * The checkpoint is a JSON Lines file kept next to the output (`curve.json.checkpoint.jsonl`):
 *
 *     {"kind":"headroom-checkpoint","version":1,"fingerprint":"…","inputs":{…}}
 *     {"task":3,"scores":[0.71,0.8,0.86]}
 *     {"task":0,"scores":[0.69,0.78,0.85]}
 *
 * The first line names what was being measured: the fingerprint is the SHA-256 of `inputs` (the
 * data's SHA-256, every option that changes a score, and the tool's version), so a checkpoint is
 * never applied to other data or options. Each further line holds the scores of one finished
 * (repeat, fold) fit task, in the order tasks finished. Lines are written whole, one append each, so
 * a process killed while writing leaves at most one torn last line, which is dropped on resume.
 * Scores are written as JSON numbers (shortest round-trip form, so they read back bit for bit), with
 * non-finite values spelt "NaN", "Infinity" and "-Infinity".
 */
import { createHash } from "node:crypto";
import { appendFileSync, mkdirSync, readFileSync, rmSync, statSync, truncateSync, writeFileSync } from "node:fs";
import { dirname } from "node:path";
import { DataError, InterruptedError, OutputError, UsageError } from "../errors.js";
import { message } from "../messages.js";

/** The file that holds the checkpoint of the measurement written to `output`. */
export function checkpointFileFor(output: string): string {
  return `${output}.checkpoint.jsonl`;
}

/** What identifies a measurement: plain JSON values only (the data's hash, options, version). */
export type CheckpointInputs = Record<string, unknown>;

export interface CheckpointOptions {
  /** The checkpoint file. */
  file: string;
  /**
   * Continue from an existing checkpoint. Without it, an existing checkpoint is an error (it would
   * be lost); with it, a missing checkpoint simply starts a new one.
   * @default false
   */
  resume?: boolean;
}

/** An open checkpoint: the tasks already done and a way to record more. */
export interface Checkpoint {
  readonly file: string;
  /** Scores of each task finished before this run, by task index. */
  readonly completed: Map<number, number[]>;
  /** Records one finished task (one whole line, appended). @throws OutputError */
  record(task: number, scores: readonly number[]): void;
}

const kind = "headroom-checkpoint";
const version = 1;

/**
 * The SHA-256 (hex) of `inputs` written as JSON with object keys sorted, so the same inputs give
 * the same fingerprint whatever order their keys were built in.
 */
export function checkpointFingerprint(inputs: CheckpointInputs): string {
  return createHash("sha256").update(canonicalJson(inputs)).digest("hex");
}

/**
 * Opens the checkpoint of a measurement with `taskCount` tasks of `scoresPerTask` scores each:
 * reads the tasks already done when resuming, else starts a new file holding only the header line.
 * @throws UsageError when a checkpoint exists and `resume` is not set, or when it was written for
 *   other data or options; DataError when a line other than the last is malformed; OutputError
 *   when the file cannot be written.
 */
export function openCheckpoint(
  options: CheckpointOptions,
  inputs: CheckpointInputs,
  taskCount: number,
  scoresPerTask: number,
): Checkpoint {
  const { file } = options;
  const fingerprint = checkpointFingerprint(inputs);
  const completed = new Map<number, number[]>();
  const existing = readExisting(file);
  if (existing !== undefined && !options.resume) throw new UsageError(message.checkpointExists(file));
  if (existing !== undefined && existing.header !== undefined) {
    checkHeader(file, existing.header, fingerprint, inputs);
    existing.lines.forEach((text, i) => {
      const entry = parseTaskLine(text);
      if (entry === undefined || entry.task >= taskCount || entry.scores.length !== scoresPerTask)
        throw new DataError(message.checkpointLine(file, i + 2));
      completed.set(entry.task, entry.scores);
    });
    // Drop a torn last line so that the next append starts on a line of its own.
    if (existing.validBytes < existing.totalBytes) guard(file, () => truncateSync(file, existing.validBytes));
  } else {
    const header = `{"kind":"${kind}","version":${version},"fingerprint":"${fingerprint}","inputs":${canonicalJson(inputs)}}\n`;
    guard(file, () => {
      mkdirSync(dirname(file), { recursive: true });
      writeFileSync(file, header);
    });
  }
  return {
    file,
    completed,
    record(task, scores) {
      const line = `${JSON.stringify({ task, scores: scores.map(encodeScore) })}\n`;
      guard(file, () => appendFileSync(file, line));
    },
  };
}

/** Deletes a checkpoint once its measurement's output is safely written. Missing is fine. */
export function removeCheckpoint(file: string): void {
  guard(file, () => rmSync(file, { force: true }));
}

/** Reads whole lines; `validBytes` is the length of the prefix made of complete lines. */
function readExisting(
  file: string,
): { header: unknown; lines: string[]; validBytes: number; totalBytes: number } | undefined {
  let bytes: Buffer;
  try {
    if (!statSync(file).isFile()) throw new OutputError(message.cannotWrite(file, "it is not a regular file"));
    bytes = readFileSync(file);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === "ENOENT") return undefined;
    if (error instanceof OutputError) throw error;
    throw new OutputError(message.cannotWrite(file, (error as NodeJS.ErrnoException).code ?? String(error)));
  }
  const validBytes = bytes.lastIndexOf(10) + 1;
  const lines = bytes.subarray(0, validBytes).toString("utf8").split("\n").slice(0, -1);
  // A header torn before its newline means the run stopped before any task was recorded.
  if (lines.length === 0) return { header: undefined, lines: [], validBytes: 0, totalBytes: bytes.length };
  let header: unknown;
  try {
    header = JSON.parse(lines[0]);
  } catch {
    throw new DataError(message.checkpointLine(file, 1));
  }
  return { header, lines: lines.slice(1), validBytes, totalBytes: bytes.length };
}

function checkHeader(file: string, header: unknown, fingerprint: string, inputs: CheckpointInputs): void {
  const h = header as { kind?: unknown; version?: unknown; fingerprint?: unknown; inputs?: unknown };
  if (typeof h !== "object" || h === null || h.kind !== kind || h.version !== version)
    throw new DataError(message.checkpointLine(file, 1));
  if (h.fingerprint === fingerprint) return;
  const before = (typeof h.inputs === "object" && h.inputs !== null ? h.inputs : {}) as Record<string, unknown>;
  const keys = [...new Set([...Object.keys(before), ...Object.keys(inputs)])].sort();
  const changed = keys.filter((key) => canonicalJson(before[key]) !== canonicalJson(inputs[key]));
  throw new UsageError(message.checkpointMismatch(file, changed.length > 0 ? changed : ["fingerprint"]));
}

function parseTaskLine(text: string): { task: number; scores: number[] } | undefined {
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch {
    return undefined;
  }
  const entry = value as { task?: unknown; scores?: unknown };
  if (typeof entry !== "object" || entry === null) return undefined;
  if (!Number.isSafeInteger(entry.task) || (entry.task as number) < 0 || !Array.isArray(entry.scores)) return undefined;
  const scores = entry.scores.map(decodeScore);
  if (scores.some((s) => s === undefined)) return undefined;
  return { task: entry.task as number, scores: scores as number[] };
}

function encodeScore(score: number): number | string {
  return Number.isFinite(score) ? score : String(score);
}

function decodeScore(value: unknown): number | undefined {
  if (typeof value === "number") return value;
  if (value === "NaN" || value === "Infinity" || value === "-Infinity") return Number(value);
  return undefined;
}

/** JSON with object keys sorted at every depth; undefined values are left out, as JSON.stringify does. */
function canonicalJson(value: unknown): string {
  return (
    JSON.stringify(value, (_key, v: unknown) => {
      if (typeof v !== "object" || v === null || Array.isArray(v)) return v;
      const sorted: Record<string, unknown> = {};
      for (const key of Object.keys(v).sort()) sorted[key] = (v as Record<string, unknown>)[key];
      return sorted;
    }) ?? "null"
  );
}

function guard(file: string, action: () => void): void {
  try {
    action();
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new OutputError(message.cannotWrite(file, code ?? String(error)));
  }
}

/** What the fit pool needs from a checkpoint: the tasks to skip and a hook recording new ones. */
export interface CheckpointHooks {
  completed?: ReadonlyMap<number, number[]>;
  onTaskResult?: (index: number, scores: number[]) => void;
}

/**
 * Runs a measurement's fit tasks with a checkpoint, when one is asked for: opens it (resuming when
 * asked), hands `run` the finished tasks and a hook that records each new one, and, when the run is
 * interrupted, says how many fits are kept and how to resume. Without `options`, just calls `run`.
 * @throws what {@link openCheckpoint} throws; InterruptedError naming the checkpoint when stopped
 */
export async function runWithCheckpoint(
  options: CheckpointOptions | undefined,
  inputs: CheckpointInputs,
  taskCount: number,
  scoresPerTask: number,
  run: (hooks: CheckpointHooks) => Promise<number[][]>,
): Promise<number[][]> {
  if (options === undefined) return run({});
  const checkpoint = openCheckpoint(options, inputs, taskCount, scoresPerTask);
  let kept = checkpoint.completed.size;
  try {
    return await run({
      completed: checkpoint.completed,
      onTaskResult: (index, scores) => {
        checkpoint.record(index, scores);
        kept++;
      },
    });
  } catch (error) {
    if (error instanceof InterruptedError)
      throw new InterruptedError(message.interrupted(kept, taskCount, checkpoint.file));
    throw error;
  }
}

/**
 * A SHA-256 (hex) of a data set's content: every typed array's bytes and every other field as
 * canonical JSON, keys in sorted order. Two data sets with the same digest give the same fits.
 */
export function datasetDigest(data: object): string {
  const hash = createHash("sha256");
  for (const key of Object.keys(data).sort()) {
    const value = (data as Record<string, unknown>)[key];
    hash.update(`${key}\n`);
    if (ArrayBuffer.isView(value)) {
      hash.update(`${value.constructor.name}:${value.byteLength}\n`);
      hash.update(new Uint8Array(value.buffer, value.byteOffset, value.byteLength));
    } else hash.update(`${canonicalJson(value)}\n`);
  }
  return hash.digest("hex");
}
