/**
 * Measuring from a file: reads a CSV, builds the data set and measures its learning curve, as the
 * `measure` command and the study runner do.
 */
import { basename } from "node:path";
import { readDataset } from "../data/readDataset.js";
import type { ColumnChoice } from "../data/tableToDataset.js";
import type { StoredMeasureOptions } from "../cluster/slurm.js";
import type { CurveFile } from "./curveFile.js";
import { measureCurve, resolveMeasureOptions, type MeasureOptions } from "./measure.js";
import { DataError, UsageError } from "../errors.js";
import { sha256OfFile } from "../io/files.js";
import { message } from "../messages.js";

/** Where the fit tasks run: here (threads, or trainer processes), or as a SLURM job array. */
export interface Placement {
  /** @default "local" */
  on?: string;
  /** With `on: "slurm"`: the folder, shared with the nodes, for the tasks and their results. */
  tasksDir?: string;
  /** With `on: "slurm"`: sbatch options as typed on a command line. */
  slurmOptions?: string;
  /** With `on: "slurm"`: submit and stop (throws JobSubmitted, see cluster/slurm.ts). */
  submitOnly?: boolean;
  /** Where the curve is written, named in messages. */
  out?: string;
}

/** Reads a CSV, builds the data set and measures its learning curve (where `on` says). */
export async function measureFile(
  file: string,
  options: ColumnChoice & MeasureOptions & Placement,
): Promise<CurveFile> {
  // The task (classes or a numeric target) decides how the label column is read.
  const { task } = resolveMeasureOptions(options);
  const on = options.on ?? "local";
  if (on !== "local" && on !== "slurm") throw new UsageError(message.unknownPlace(on), { option: "on" });
  let measure: MeasureOptions = options;
  if (on === "slurm") {
    if (options.tasksDir === undefined) throw new UsageError(message.slurmNeedsFolder());
    const slurm = await import("../cluster/slurm.js");
    slurm.checkSbatch();
    const runTasks = slurm.slurmRunner({
      tasksDir: options.tasksDir,
      dataFile: file,
      read: { label: options.label, group: options.group, ignore: options.ignore, task },
      measure: storedOptions(options),
      slurmOptions: options.slurmOptions,
      submitOnly: options.submitOnly,
      out: options.out,
    });
    // The tasks folder keeps the finished tasks: no checkpoint besides it.
    measure = { ...options, runTasks, checkpoint: undefined };
  } else {
    if (options.tasksDir !== undefined) throw new UsageError(message.slurmOnlyOption("tasksDir"));
    if (options.slurmOptions !== undefined) throw new UsageError(message.slurmOnlyOption("slurmOptions"));
    if (options.submitOnly) throw new UsageError(message.slurmOnlyOption("submitOnly"));
  }
  return measureRead(file, task, measure, options);
}

/** The options that decide the tasks, as plain JSON (kept in the tasks folder for `collect`). */
function storedOptions(options: MeasureOptions): StoredMeasureOptions {
  const { folds, repeats, trainingSizes, seed, task, learner, metric, tune, byRuns, trainer, trainerTimeout } = options;
  return JSON.parse(
    JSON.stringify({
      folds,
      repeats,
      trainingSizes,
      seed,
      task,
      learner,
      metric,
      tune,
      byRuns,
      trainer,
      trainerTimeout,
    }),
  ) as StoredMeasureOptions;
}

/**
 * Gathers the results of a measurement run as a SLURM job array (`headroom collect DIR`) into the
 * curve a local run would have written.
 * @throws IncompleteError naming the tasks missing and the sbatch line rerunning them
 */
export async function collectCurve(
  dir: string,
  onProgress?: (done: number, total: number) => void,
): Promise<{ curve: CurveFile; dataFile: string }> {
  const { gatherRunner, readJob } = await import("../cluster/slurm.js");
  const job = readJob(dir);
  if (sha256OfFile(job.data.file) !== job.data.sha256)
    throw new DataError(message.tasksDataChanged(dir, job.data.file));
  const options = { ...job.measure, runTasks: gatherRunner(dir, job), onProgress };
  const task = job.read.task ?? "classification";
  return { curve: await measureRead(job.data.file, task, options, job.read), dataFile: job.data.file };
}

async function measureRead(
  file: string,
  task: "classification" | "regression",
  options: MeasureOptions,
  choice: ColumnChoice,
): Promise<CurveFile> {
  const dataset = readDataset(file, { ...choice, task });
  return measureCurve(dataset, file, options, {
    label: choice.label,
    ...(choice.group === undefined ? {} : { group: choice.group }),
    source: { file: basename(file), sha256: sha256OfFile(file) },
  });
}
