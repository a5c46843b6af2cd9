/**
 * Fit tasks as a SLURM job array (`headroom measure --on slurm --tasks-dir DIR`).
 *
 * The measurement is prepared on the login node as usual (folds, nested orders: see curve/measure.ts),
 * then its (repeat, fold) tasks, plain data, are written to DIR/job.json with the data file's path
 * and SHA-256. One `sbatch` job array runs `headroom run-task DIR --element N` on the nodes: each
 * element reads the data file, runs its share of the tasks exactly as a local run would (built-in
 * learner or trainer) and writes each task's numbers to DIR/results/task-K.json (atomically), or its
 * error line to DIR/failed/task-K.txt. The login node follows the results as they appear, then
 * assembles curve.json with the same code as a local run, so the two are byte-identical.
 *
 * `headroom collect DIR` repeats the preparation from job.json and gathers whatever results are in,
 * naming the tasks still missing and the exact `sbatch --array=...` line that reruns only those.
 *
 * Folder layout: job.json, job.sh (the batch script), results/, failed/, logs/ (one log per element).
 */
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { join, resolve } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import type { ColumnChoice } from "../data/tableToDataset.js";
import { readDataset } from "../data/readDataset.js";
import { DataError, HeadroomError, IncompleteError, InterruptedError, UsageError } from "../errors.js";
import { readJsonFile, sha256OfFile, toJson, writeFileAtomic } from "../io/files.js";
import { message } from "../messages.js";
import { packageRoot } from "../packageRoot.js";
import { fitResultLength, runFitTask, type FitPlan, type FitTask } from "../curve/fitTask.js";
import {
  makeTrainerFolder,
  readTrainerTable,
  removeTrainerFolder,
  runTrainerTask,
  shellQuote,
  TrainerLane,
} from "../curve/trainer.js";
import type { MeasureOptions, TaskRunner } from "../curve/measure.js";

/** The measurement options that change the tasks, as kept in job.json (plain JSON). */
export type StoredMeasureOptions = Pick<
  MeasureOptions,
  | "folds"
  | "repeats"
  | "trainingSizes"
  | "seed"
  | "task"
  | "learner"
  | "metric"
  | "tune"
  | "byRuns"
  | "trainer"
  | "trainerTimeout"
>;

interface StoredTask {
  index: number;
  repeat: number;
  fold: number;
  orderedTrain: number[];
  test: number[];
  prefixLengths?: number[];
}

/** DIR/job.json: everything a node needs to run a task, and `collect` to assemble the curve. */
export interface JobFile {
  kind: "headroom-tasks";
  version: 1;
  /** The data file (absolute path) and its SHA-256 when the tasks were written. */
  data: { file: string; sha256: string };
  read: ColumnChoice;
  measure: StoredMeasureOptions;
  plan: FitPlan;
  tasks: StoredTask[];
  /** Tasks each array element runs: element e runs tasks e·n to e·n + n − 1. */
  tasksPerElement: number;
  elements: number;
  /** Passed to sbatch as written (partition, account, time, memory). */
  slurmOptions: string;
}

/** Settings changed only by tests (to follow a job more often). */
export const slurmSettings = { pollMilliseconds: 2000 };

/** sbatch's default MaxArraySize is 1001: elements 0 to 1000. */
const maxElements = 1000;

/** A job was submitted and not followed (`--submit-only`). */
export class JobSubmitted extends Error {
  constructor(readonly jobId: string) {
    super(`submitted job ${jobId}`);
    this.name = "JobSubmitted";
  }
}

export interface SlurmRun {
  /** Folder on a file system the nodes share. */
  tasksDir: string;
  dataFile: string;
  read: ColumnChoice;
  measure: StoredMeasureOptions;
  /** @default "" */
  slurmOptions?: string;
  /** Submit and return (by throwing JobSubmitted) without waiting. */
  submitOnly?: boolean;
  /** Where the curve will go, for the collect line printed on interruption. */
  out?: string;
}

/** @throws UsageError when sbatch is not on PATH */
export function checkSbatch(): void {
  const probe = spawnSync("sbatch", ["--version"], { stdio: "ignore" });
  if ((probe.error as NodeJS.ErrnoException | undefined)?.code === "ENOENT")
    throw new UsageError(message.sbatchMissing());
}

/**
 * A task runner that writes the tasks to `run.tasksDir`, submits them as one job array, follows it
 * until every result is in, and returns the results in task order.
 */
export function slurmRunner(run: SlurmRun): TaskRunner {
  return async (_data, plan, tasks, options) => {
    const dir = resolve(run.tasksDir);
    if (existsSync(join(dir, "job.json"))) throw new UsageError(message.tasksDirInUse(run.tasksDir));
    const tasksPerElement = Math.ceil(tasks.length / maxElements);
    const job: JobFile = {
      kind: "headroom-tasks",
      version: 1,
      data: { file: resolve(run.dataFile), sha256: sha256OfFile(run.dataFile) },
      read: run.read,
      measure: run.measure,
      plan,
      tasks: tasks.map(storeTask),
      tasksPerElement,
      elements: Math.ceil(tasks.length / tasksPerElement),
      slurmOptions: run.slurmOptions ?? "",
    };
    for (const sub of ["results", "failed", "logs"]) mkdirSync(join(dir, sub), { recursive: true });
    writeFileAtomic(join(dir, "job.sh"), batchScript(dir));
    writeFileAtomic(join(dir, "job.json"), toJson(job));
    const jobId = submit(dir, job, elementList(range(job.elements)));
    if (run.submitOnly) throw new JobSubmitted(jobId);
    return follow(dir, job, jobId, tasks.length, run, options.onTaskDone, options.signal);
  };
}

function storeTask(task: FitTask): StoredTask {
  return {
    index: task.index,
    repeat: task.repeat,
    fold: task.fold,
    orderedTrain: Array.from(task.orderedTrain),
    test: Array.from(task.test),
    ...(task.prefixLengths === undefined ? {} : { prefixLengths: task.prefixLengths }),
  };
}

function loadTask(task: StoredTask): FitTask {
  return { ...task, orderedTrain: Int32Array.from(task.orderedTrain), test: Int32Array.from(task.test) };
}

/** The command that runs headroom itself on a node: this Node.js and this installation's entry point. */
function headroomCommand(): string[] {
  const here = fileURLToPath(import.meta.url);
  if (here.endsWith(".ts")) {
    // From source (tests under tsx): the node loads TypeScript with tsx, as this process does.
    const loader = pathToFileURL(join(packageRoot, "node_modules", "tsx", "dist", "loader.mjs")).href;
    return [process.execPath, "--import", loader, join(packageRoot, "src", "bin", "headroom.ts")];
  }
  return [process.execPath, fileURLToPath(new URL("../bin/headroom.js", import.meta.url))];
}

function batchScript(dir: string): string {
  const command = [...headroomCommand(), "run-task", dir].map(shellQuote).join(" ");
  return [
    "#!/bin/sh",
    "#SBATCH --job-name=headroom",
    `#SBATCH --output=${join(dir, "logs", "element-%a.out")}`,
    "# Written by headroom measure --on slurm: each array element runs its share of the tasks in job.json.",
    `exec ${command} --element "$SLURM_ARRAY_TASK_ID"`,
    "",
  ].join("\n");
}

/** The sbatch line that runs these array elements (a list such as "0-3,7"). */
function sbatchLine(dir: string, job: JobFile, elements: string): string {
  const options = job.slurmOptions.trim();
  return `sbatch --array=${elements}${options === "" ? "" : ` ${options}`} ${shellQuote(join(dir, "job.sh"))}`;
}

/** Submits the elements through the shell (so `--slurm-options` are read as typed); the job id. */
function submit(dir: string, job: JobFile, elements: string): string {
  const line = sbatchLine(dir, job, elements).replace(/^sbatch /, "sbatch --parsable ");
  const result = spawnSync("/bin/sh", ["-c", line], { encoding: "utf8" });
  if (result.status === 127 || /sbatch: (command )?not found/.test(result.stderr ?? ""))
    throw new UsageError(message.sbatchMissing());
  const jobId = (result.stdout ?? "").trim().split(";")[0];
  if (result.status !== 0 || !/^\d+$/.test(jobId))
    throw new UsageError(message.sbatchFailed(`${result.stderr ?? ""} ${result.stdout ?? ""}`));
  return jobId;
}

/** Whether the job has elements pending or running (squeue lists them). */
function jobActive(jobId: string): boolean {
  const result = spawnSync("squeue", ["-h", "-j", jobId, "-o", "%i"], { encoding: "utf8" });
  // squeue fails for a job id the controller has already forgotten: the job has ended.
  return result.status === 0 && result.stdout.trim() !== "";
}

async function follow(
  dir: string,
  job: JobFile,
  jobId: string,
  total: number,
  run: SlurmRun,
  onTaskDone: ((done: number, total: number) => void) | undefined,
  signal: AbortSignal | undefined,
): Promise<number[][]> {
  let reported = 0;
  let ended = false;
  for (;;) {
    const done = countResults(dir);
    for (; reported < done; reported++) onTaskDone?.(reported + 1, total);
    if (done >= total || ended) break;
    // Checked before waiting, so that results written just before the job ended are counted.
    ended = !jobActive(jobId);
    if (ended) continue;
    await sleep(slurmSettings.pollMilliseconds, signal);
    if (signal?.aborted) throw new InterruptedError(message.slurmDetached(jobId, dir, run.out ?? "curve.json"));
  }
  return gather(dir, job, total);
}

function sleep(milliseconds: number, signal: AbortSignal | undefined): Promise<void> {
  return new Promise((resolve) => {
    const timer = setTimeout(done, milliseconds);
    function done() {
      clearTimeout(timer);
      signal?.removeEventListener("abort", done);
      resolve();
    }
    signal?.addEventListener("abort", done, { once: true });
  });
}

function countResults(dir: string): number {
  try {
    return readdirSync(join(dir, "results")).filter((name) => /^task-\d+\.json$/.test(name)).length;
  } catch {
    return 0;
  }
}

/**
 * Every task's numbers from DIR/results, in task order.
 * @throws IncompleteError naming the failed tasks and the sbatch line rerunning the missing ones
 */
function gather(dir: string, job: JobFile, total: number): number[][] {
  const length = fitResultLength(job.plan);
  const results: number[][] = [];
  const missing: number[] = [];
  for (let task = 0; task < total; task++) {
    const scores = readResult(join(dir, "results", `task-${task}.json`), task, length);
    if (scores === undefined) missing.push(task);
    else results.push(scores);
  }
  if (missing.length === 0) return results;
  const failed = missing.flatMap((task) => {
    try {
      const text = readFileSync(join(dir, "failed", `task-${task}.txt`), "utf8").trim();
      return [message.taskFailedLine(task, text)];
    } catch {
      return [];
    }
  });
  const elements = [...new Set(missing.map((task) => Math.floor(task / job.tasksPerElement)))];
  throw new IncompleteError(
    message.tasksIncomplete(dir, total - missing.length, total, failed, sbatchLine(dir, job, elementList(elements))),
  );
}

function readResult(file: string, task: number, length: number): number[] | undefined {
  let value: unknown;
  try {
    value = JSON.parse(readFileSync(file, "utf8"));
  } catch {
    return undefined;
  }
  const entry = value as { task?: unknown; scores?: unknown };
  if (entry?.task !== task || !Array.isArray(entry.scores) || entry.scores.length !== length) return undefined;
  const scores = entry.scores.map((s: unknown) =>
    typeof s === "number" ? s : s === "NaN" || s === "Infinity" || s === "-Infinity" ? Number(s) : undefined,
  );
  return scores.some((s) => s === undefined) ? undefined : (scores as number[]);
}

function range(count: number): number[] {
  return Array.from({ length: count }, (_, i) => i);
}

/** Sorted element numbers as sbatch's --array list: runs of consecutive numbers as "a-b". */
export function elementList(elements: number[]): string {
  const sorted = [...elements].sort((a, b) => a - b);
  const parts: string[] = [];
  for (let i = 0; i < sorted.length;) {
    let j = i;
    while (j + 1 < sorted.length && sorted[j + 1] === sorted[j] + 1) j++;
    parts.push(i === j ? String(sorted[i]) : `${sorted[i]}-${sorted[j]}`);
    i = j + 1;
  }
  return parts.join(",");
}

/** Reads DIR/job.json. @throws InputError or DataError when it is not a tasks folder */
export function readJob(dir: string): JobFile {
  const file = join(dir, "job.json");
  if (!existsSync(file)) throw new UsageError(message.notTasksDir(dir));
  const job = readJsonFile(file) as JobFile;
  if (job?.kind !== "headroom-tasks" || job.version !== 1) throw new DataError(message.wrongFileKind(file, "tasks"));
  return job;
}

/**
 * A task runner for `headroom collect`: the results already in DIR, checked to be of the same tasks.
 * @throws IncompleteError as {@link gather}
 */
export function gatherRunner(dir: string, job: JobFile): TaskRunner {
  return (_data, _plan, tasks, options) => {
    const results = gather(resolve(dir), job, job.tasks.length);
    if (tasks.length !== job.tasks.length) throw new DataError(message.tasksDataChanged(dir, job.data.file));
    options.onTaskDone?.(tasks.length, tasks.length);
    return Promise.resolve(results);
  };
}

/**
 * Runs array element `element` of the job in DIR (on a cluster node): each of its tasks, writing its
 * result or its error. Throws the first task's error after trying them all.
 */
export async function runTaskElement(dir: string, element: number): Promise<void> {
  const job = readJob(dir);
  if (!Number.isInteger(element) || element < 0 || element >= job.elements)
    throw new UsageError(message.taskElement(String(element), job.elements));
  if (sha256OfFile(job.data.file) !== job.data.sha256)
    throw new DataError(message.tasksDataChanged(dir, job.data.file));
  const data = readDataset(job.data.file, job.read);
  const first = element * job.tasksPerElement;
  const tasks = job.tasks.slice(first, first + job.tasksPerElement).map(loadTask);
  let failure: unknown;
  const trainer =
    job.plan.trainer === undefined
      ? undefined
      : {
          table: readTrainerTable(job.data.file, job.read.label),
          folder: makeTrainerFolder(),
          lane: new TrainerLane(),
        };
  try {
    for (const task of tasks) {
      const failedFile = join(dir, "failed", `task-${task.index}.txt`);
      try {
        const scores =
          trainer === undefined
            ? runFitTask(data, job.plan, task)
            : await runTrainerTask(data, trainer.table, job.plan, task, trainer.folder, trainer.lane);
        const encoded = scores.map((s) => (Number.isFinite(s) ? s : String(s)));
        writeFileAtomic(
          join(dir, "results", `task-${task.index}.json`),
          `${JSON.stringify({ task: task.index, scores: encoded })}\n`,
        );
        rmSync(failedFile, { force: true });
      } catch (error) {
        failure ??= error;
        const text = error instanceof HeadroomError ? error.message : String((error as Error)?.message ?? error);
        writeFileAtomic(failedFile, `${text.split("\n")[0]}\n`);
      }
    }
  } finally {
    if (trainer !== undefined) {
      trainer.lane.end();
      removeTrainerFolder(trainer.folder);
    }
  }
  if (failure !== undefined) throw failure;
}
