/**
 * The user's own trainer (`--trainer CMD`): a (repeat, fold) fit task whose fits are run by an
 * outside program through files, so that the learning curve is that of the model the user will use.
 *
 * For each training size of a task, headroom writes the training rows (the data file's header and
 * cells as read, label included) and, once per task, the held-out rows (label column removed) as CSV
 * into one temporary folder, and runs CMD through the shell with HEADROOM_TRAIN, HEADROOM_TEST,
 * HEADROOM_PREDICTIONS, HEADROOM_LABEL, HEADROOM_TASK and HEADROOM_SEED in its environment. The
 * program writes one row per held-out row, in order: one column per class holding probabilities, or
 * one column `prediction` (class names, or the numeric target). headroom scores the predictions with
 * the chosen metric, so splits, nested sizes, repeats and seeds stay headroom's own.
 *
 * Each program runs in a process group of its own, so that a timeout or Ctrl-C stops the program and
 * everything it started (a shell's `python3 ...` child included).
 */
import { spawn, type ChildProcessWithoutNullStreams } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { constants, tmpdir } from "node:os";
import { join } from "node:path";
import { kill } from "node:process";
import type { Dataset } from "../data/dataset.js";
import { parseCsv } from "../data/csv.js";
import { readTextFile } from "../io/files.js";
import { DataError, InterruptedError, TrainerError, UsageError } from "../errors.js";
import { message, type FitName } from "../messages.js";
import { StreamPurpose, streamFor } from "../random.js";
import type { FitPlan, FitTask } from "./fitTask.js";
import type { PoolOptions } from "./fitPool.js";
import { findMetric, metrics, type Metric } from "./metrics.js";

/** What a trainer's fits need besides the data set: the data file's cells as written, and the label's name. */
export interface TrainerTable {
  /** The header line, written as the first line of every training file. */
  headerLine: string;
  /** The header line without the label column (the test files' first line). */
  testHeaderLine: string;
  /** Each data row as a CSV line, label included, and without the label column. */
  trainLines: string[];
  testLines: string[];
  label: string;
}

/** Reads the data file again as text cells, for writing the trainer's files (rows as in `readDataset`). */
export function readTrainerTable(file: string, label: string): TrainerTable {
  const table = parseCsv(readTextFile(file, "CSV"), file);
  const labelColumn = table.header.indexOf(label);
  if (labelColumn < 0) throw new UsageError(message.columnMissing(file, "--label", label, table.header));
  const without = (cells: string[]) => cells.filter((_, c) => c !== labelColumn);
  return {
    headerLine: csvLine(table.header),
    testHeaderLine: csvLine(without(table.header)),
    trainLines: table.rows.map(csvLine),
    testLines: table.rows.map((cells) => csvLine(without(cells))),
    label,
  };
}

/** One CSV line, comma-separated, a cell quoted when it holds a comma, a quote or a line break. */
function csvLine(cells: readonly string[]): string {
  return cells.map((cell) => (/[",\r\n]/.test(cell) ? `"${cell.replace(/"/g, '""')}"` : cell)).join(",");
}

/** A folder for one measurement's trainer files, removed by {@link removeTrainerFolder}. */
export function makeTrainerFolder(): string {
  return mkdtempSync(join(tmpdir(), "headroom-trainer-"));
}

export function removeTrainerFolder(folder: string): void {
  rmSync(folder, { recursive: true, force: true });
}

/** Relative tolerance within which a row of probabilities counts as summing to 1. */
const sumTolerance = 1e-6;

/**
 * Runs one task's fits through the trainer, in increasing size. Returns the score at each size, then
 * the number of fits whose probabilities had to be renormalised (see `fitResultLength`).
 * @throws TrainerError naming the fit; UsageError when the metric needs probabilities the trainer
 *   does not write; InterruptedError when `signal` aborts.
 */
export async function runTrainerTask(
  data: Dataset,
  table: TrainerTable,
  plan: FitPlan,
  task: FitTask,
  folder: string,
  lane: TrainerLane,
  signal?: AbortSignal,
): Promise<number[]> {
  const trainer = plan.trainer!;
  const metric = findMetric(plan.metric)!;
  const regression = plan.task === "regression";
  const base = join(folder, `task-${task.index}`);
  const testFile = `${base}-test.csv`;
  writeFileSync(testFile, linesOf(table.testHeaderLine, table.testLines, task.test));
  const scores: number[] = [];
  let renormalised = 0;
  try {
    for (let s = 0; s < plan.trainingSizes.length; s++) {
      const length = task.prefixLengths?.[s] ?? plan.trainingSizes[s];
      const rows = task.orderedTrain.subarray(0, length);
      const fit: FitName = { repeat: task.repeat, fold: task.fold, size: plan.trainingSizes[s] };
      const trainFile = `${base}-size-${s}-train.csv`;
      const predictionsFile = `${base}-size-${s}-predictions.csv`;
      writeFileSync(trainFile, linesOf(table.headerLine, table.trainLines, rows));
      const seed = streamFor(plan.seed, StreamPurpose.learner, task.repeat, task.fold, s).nextUint32();
      const env = {
        HEADROOM_TRAIN: trainFile,
        HEADROOM_TEST: testFile,
        HEADROOM_PREDICTIONS: predictionsFile,
        HEADROOM_LABEL: table.label,
        HEADROOM_TASK: regression ? "regression" : "classification",
        HEADROOM_SEED: String(seed),
      };
      const run = await lane.run(trainer.command, env, `${base}-size-${s}-stderr.txt`, trainer.timeoutSeconds, signal);
      if (signal?.aborted) throw new InterruptedError(message.interrupted(0, 0, undefined));
      const fail = (problem: string) => new TrainerError(message.trainerFit(fit, problem, stderrTail(run.stderr)));
      if (run.startError !== undefined) throw fail(message.trainerStartFailed(run.startError));
      if (run.timedOut) throw fail(message.trainerTimeout(trainer.timeoutSeconds!));
      if (run.code !== 0) throw fail(message.trainerExit(run.code, run.signal));
      let text: string;
      try {
        text = readFileSync(predictionsFile, "utf8");
      } catch {
        throw fail(message.trainerNoPredictions(predictionsFile));
      }
      const read = readPredictions(text, predictionsFile, data, metric, task.test);
      if (typeof read === "string") throw fail(read);
      scores.push(read.score);
      if (read.renormalised) renormalised++;
      rmSync(trainFile, { force: true });
      rmSync(predictionsFile, { force: true });
    }
  } finally {
    rmSync(testFile, { force: true });
  }
  return [...scores, renormalised];
}

function linesOf(header: string, lines: readonly string[], rows: ArrayLike<number>): string {
  const out = new Array<string>(rows.length + 1);
  out[0] = header;
  for (let i = 0; i < rows.length; i++) out[i + 1] = lines[rows[i]];
  return `${out.join("\n")}\n`;
}

/**
 * Scores a predictions file against the held-out rows `test`: the score and whether probabilities
 * were renormalised, or the problem found (a one-line message).
 * @throws UsageError when the metric reads probabilities and the file holds class names only
 */
function readPredictions(
  text: string,
  file: string,
  data: Dataset,
  metric: Metric,
  test: Int32Array,
): { score: number; renormalised: boolean } | string {
  let header: string[];
  let rows: string[][];
  let lines: number[];
  try {
    ({ header, rows, lines } = parseCsv(text, file));
  } catch (error) {
    if (!(error instanceof DataError)) throw error;
    if (error.message === message.headerOnly(file)) return message.trainerRowCount(test.length, 0);
    return message.trainerBadPredictions(error.message);
  }
  if (rows.length !== test.length) return message.trainerRowCount(test.length, rows.length);
  const cell = (r: number, c: number) => (rows[r][c] ?? "").trim();
  const number = (r: number, c: number): number | string => {
    const written = cell(r, c);
    const value = Number(written);
    return written === "" || !Number.isFinite(value) ? message.trainerNotNumber(lines[r], header[c], written) : value;
  };
  const labelsOnly = header.length === 1 && header[0] === "prediction";
  if (metric.task === "regression") {
    if (!labelsOnly) return message.trainerRegressionColumn(header);
    const predictions = new Float64Array(rows.length);
    for (let r = 0; r < rows.length; r++) {
      const value = number(r, 0);
      if (typeof value === "string") return value;
      predictions[r] = value;
    }
    const targets = Float64Array.from(test, (row) => data.targets![row]);
    return { score: metric.score(targets, predictions), renormalised: false };
  }
  const classes = data.classNames;
  const classCount = classes.length;
  const probabilities = new Float64Array(rows.length * classCount);
  let renormalised = false;
  if (labelsOnly) {
    if (metric.readsProbabilities)
      throw new UsageError(
        message.trainerLabelsOnly(
          metric.name,
          metrics.filter((m) => m.task === "classification" && !m.readsProbabilities).map((m) => m.name),
        ),
      );
    for (let r = 0; r < rows.length; r++) {
      const k = classes.indexOf(cell(r, 0));
      if (k < 0) return message.trainerUnknownClass(lines[r], cell(r, 0), classes);
      probabilities[r * classCount + k] = 1;
    }
  } else {
    // Columns named by classes, in any order; a class without a column has probability 0.
    const columnClass = header.map((name) => classes.indexOf(name));
    const unknown = columnClass.indexOf(-1);
    if (unknown >= 0) return message.trainerUnknownColumn(header[unknown], classes);
    for (let r = 0; r < rows.length; r++) {
      let sum = 0;
      for (let c = 0; c < header.length; c++) {
        const value = number(r, c);
        if (typeof value === "string") return value;
        if (value < 0) return message.trainerBadProbabilities(lines[r]);
        probabilities[r * classCount + columnClass[c]] = value;
        sum += value;
      }
      if (!(sum > 0)) return message.trainerBadProbabilities(lines[r]);
      if (Math.abs(sum - 1) > sumTolerance) {
        renormalised = true;
        for (let k = 0; k < classCount; k++) probabilities[r * classCount + k] /= sum;
      }
    }
  }
  const labels = Int32Array.from(test, (row) => data.labels[row]);
  return { score: metric.score(labels, probabilities, classCount), renormalised };
}

/** The last lines of a program's stderr, on one line. */
function stderrTail(stderr: string): string {
  const lines = stderr
    .split(/\r?\n/)
    .map((line) => line.trim())
    .filter((line) => line !== "");
  const tail = lines.slice(-3).join(" | ");
  return tail.length > 400 ? `...${tail.slice(-397)}` : tail;
}

interface CommandRun {
  code: number | null;
  signal: string | null;
  stderr: string;
  timedOut: boolean;
  startError?: string;
}

/** Quotes a word for sh. */
export function shellQuote(word: string): string {
  return /^[\w@%+=:,./-]+$/.test(word) ? word : `'${word.replace(/'/g, `'\\''`)}'`;
}

/**
 * Runs one lane's fits, one after another, through a shell of its own that reads them from its
 * standard input: the shell, a small process, starts each program, where `child_process.spawn` from
 * this process would fork all of Node's memory for every fit (the larger part of the per-fit cost
 * `npm run bench:trainer` measures). Each fit runs as `sh -c CMD` in a subshell, with the protocol's
 * variables exported, stdin and stdout from /dev/null and stderr to a file; the lane's shell then
 * prints the exit status. The shell leads a process group of its own, so that a timeout or Ctrl-C
 * stops it, the program and everything the program started; the next fit starts a new shell.
 */
export class TrainerLane {
  private shell: ChildProcessWithoutNullStreams | undefined;
  private output = "";
  private onLine: ((line: string | undefined) => void) | undefined;

  async run(
    command: string,
    variables: Record<string, string>,
    stderrFile: string,
    timeoutSeconds: number | undefined,
    signal: AbortSignal | undefined,
  ): Promise<CommandRun> {
    const shell = this.shell ?? this.start();
    let timedOut = false;
    const stop = () => this.stop();
    const timer =
      timeoutSeconds === undefined
        ? undefined
        : setTimeout(() => {
            timedOut = true;
            stop();
          }, timeoutSeconds * 1000);
    signal?.addEventListener("abort", stop, { once: true });
    const exports = Object.entries(variables)
      .map(([name, value]) => `${name}=${shellQuote(value)}`)
      .join(" ");
    const line = new Promise<string | undefined>((resolve) => (this.onLine = resolve));
    shell.stdin.write(
      `(export ${exports}; exec /bin/sh -c ${shellQuote(command)}) </dev/null >/dev/null 2>${shellQuote(stderrFile)}; echo "$?"\n`,
    );
    const status = await line;
    if (timer !== undefined) clearTimeout(timer);
    signal?.removeEventListener("abort", stop);
    let stderr = "";
    try {
      stderr = readFileSync(stderrFile, "utf8").slice(-8192);
      rmSync(stderrFile, { force: true });
    } catch {
      // No stderr file: the shell was stopped before the program started.
    }
    if (status === undefined) return { code: null, signal: "SIGKILL", stderr, timedOut };
    const code = Number(status);
    // A program killed by a signal has status 128 + the signal's number in the shell.
    const byNumber = Object.entries(constants.signals).find(([, number]) => number === code - 128);
    if (code > 128 && byNumber !== undefined) return { code: null, signal: byNumber[0], stderr, timedOut };
    return { code, signal: null, stderr, timedOut };
  }

  private start(): ChildProcessWithoutNullStreams {
    const shell = spawn("/bin/sh", ["-s"], { stdio: ["pipe", "pipe", "pipe"], detached: true });
    this.shell = shell;
    this.output = "";
    shell.stdout.setEncoding("utf8");
    shell.stdout.on("data", (chunk: string) => {
      this.output += chunk;
      const end = this.output.indexOf("\n");
      if (end < 0) return;
      const line = this.output.slice(0, end);
      this.output = this.output.slice(end + 1);
      this.deliver(line.trim());
    });
    // Writing to a shell that was just stopped fails; its close reports the fit.
    shell.stdin.on("error", () => {});
    shell.stderr.resume();
    shell.on("close", () => {
      if (this.shell === shell) this.shell = undefined;
      this.deliver(undefined);
    });
    return shell;
  }

  private deliver(line: string | undefined): void {
    const onLine = this.onLine;
    this.onLine = undefined;
    onLine?.(line);
  }

  /** Stops the shell and the program it runs (the whole process group). */
  stop(): void {
    const pid = this.shell?.pid;
    if (pid === undefined) return;
    try {
      kill(-pid, "SIGKILL");
    } catch {
      // The group has already ended.
    }
  }

  /** Ends the shell after its last fit. */
  end(): void {
    this.shell?.stdin.end();
    this.shell = undefined;
  }
}

/**
 * Runs trainer tasks, at most `options.workers` programs at a time, and returns results in task
 * order. The first failure stops the others (their programs are stopped); finished tasks have by
 * then been handed to `onTaskResult` (the checkpoint). The temporary folder is removed in every case.
 */
export async function runTrainerTasks(
  data: Dataset,
  table: TrainerTable,
  plan: FitPlan,
  tasks: FitTask[],
  options: PoolOptions,
): Promise<number[][]> {
  const results: number[][] = new Array(tasks.length);
  const pending = tasks.filter((task) => {
    const scores = options.completed?.get(task.index);
    if (scores !== undefined) results[task.index] = scores;
    return scores === undefined;
  });
  let done = tasks.length - pending.length;
  const stop = new AbortController();
  const onAbort = () => stop.abort();
  options.signal?.addEventListener("abort", onAbort, { once: true });
  const folder = makeTrainerFolder();
  let failure: { error: unknown } | undefined;
  let next = 0;
  const lanes: TrainerLane[] = [];
  const runLane = async () => {
    const lane = new TrainerLane();
    lanes.push(lane);
    while (failure === undefined && !stop.signal.aborted && next < pending.length) {
      const task = pending[next++];
      try {
        const scores = await runTrainerTask(data, table, plan, task, folder, lane, stop.signal);
        results[task.index] = scores;
        options.onTaskResult?.(task.index, scores);
        done++;
        options.onTaskDone?.(done, tasks.length);
      } catch (error) {
        failure ??= { error };
        stop.abort();
      }
    }
  };
  try {
    if (options.signal?.aborted) stop.abort();
    await Promise.all(Array.from({ length: Math.max(1, Math.min(options.workers, pending.length)) }, runLane));
    if (options.signal?.aborted) throw new InterruptedError(message.interrupted(done, tasks.length, undefined));
    if (failure !== undefined) throw failure.error;
    return results;
  } finally {
    for (const lane of lanes) lane.end();
    options.signal?.removeEventListener("abort", onAbort);
    removeTrainerFolder(folder);
  }
}
