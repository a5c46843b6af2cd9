/**
 * The curve loop: measures how a learner's held-out score grows with its training size.
 *
 * Phases, in order:
 * 1. resolve options (defaults live in `resolveMeasureOptions` only), the task (classes or a numeric
 *    target) included;
 * 2. choose the split design (`chooseDesign`: stratified or plain k-fold, leave-one-out, grouped
 *    k-fold or leave-one-run-out) and check it against the data (class sizes);
 * 3. fix the folds once per repeat;
 * 4. turn the training sizes into absolute sizes (rows, or whole runs with `byRuns`) and check each
 *    can be drawn from every fold's training pool;
 * 5. order each training pool so that its prefixes are nested subsamples (stratified for classes,
 *    whole runs with `byRuns`), leaving out the folds on which the metric is undefined;
 * 6. run one fit task per (repeat, fold): a plain-data unit that runs the same on the main thread, a
 *    worker thread, beside a child process running the user's trainer, or on a cluster node (the
 *    `runTasks` option; see cluster/slurm.ts), results gathered in task order;
 * 7. assemble curve.json, with scores in repeat-major order.
 */
import type { Dataset } from "../data/dataset.js";
import { DataError, UsageError } from "../errors.js";
import { learnerNames, regressionLearnerNames } from "../learners/registry.js";
import { message } from "../messages.js";
import { StreamPurpose, streamFor } from "../random.js";
import { toolVersion } from "../version.js";
import { chooseDesign, type SplitDesign } from "../splitters/design.js";
import { nestedRandomOrder, nestedRunOrder, nestedStratifiedOrder } from "../splitters/nestedSubsamples.js";
import type { Split } from "../splitters/split.js";
import { datasetDigest, runWithCheckpoint, type CheckpointOptions } from "./checkpoint.js";
import type { CurveFile } from "./curveFile.js";
import {
  createAnyLearner,
  fitResultLength,
  innerFolds,
  metricUndefinedOn,
  tuningGridOf,
  type FitPlan,
  type FitTask,
} from "./fitTask.js";
import { runFitTasks, type PoolOptions } from "./fitPool.js";
import { findMetric, metricRangeFor, metrics } from "./metrics.js";
import { geometricSizes, smallestSensibleRegressionSize, smallestSensibleSize } from "./sizes.js";

export interface MeasureOptions {
  /**
   * Cross-validation folds, or "loo" for leave-one-out (leave-one-run-out with a run column); folds
   * equal to the rows also mean leave-one-out. @default 5
   */
  folds?: number | "loo";
  /** Repeats of the whole k-fold with fresh folds. @default 10 */
  repeats?: number;
  /**
   * Training sizes in rows (in runs with `byRuns`).
   * @default 8 geometric sizes from the smallest sensible size to the whole pool (all run counts from 1
   *   when there are at most 8)
   */
  trainingSizes?: number[];
  /** @default 0 */
  seed?: number;
  /**
   * Whether the label is a class or a numeric target.
   * @default the task of the learner or metric given, else the data set's, else "classification"
   */
  task?: "classification" | "regression";
  /** @default "logistic" for classification, "ridge" for regression */
  learner?: string;
  /** @default "accuracy" for classification, "rmse" for regression */
  metric?: string;
  /**
   * Tune the learner's settings at every training size by an inner 3-fold cross-validation over its
   * tuning grid (a no-op, with a warning, for a learner without one). @default false
   */
  tune?: boolean;
  /** Measure against whole runs: training sets of whole runs, sizes in runs (needs a run column). @default false */
  byRuns?: boolean;
  /**
   * The most threads fitting at once, the main thread included; worker threads start only once the
   * work left makes them worth their start-up (see curve/fitPool.ts). @default 1
   */
  workers?: number;
  /** Called after each (repeat, fold) task. */
  onProgress?: (done: number, total: number) => void;
  /**
   * Keep each finished (repeat, fold) task in this checkpoint file, and continue from it when
   * `resume` is set (see checkpoint.ts). The caller removes it once the curve is written.
   * @default no checkpoint
   */
  checkpoint?: CheckpointOptions;
  /** Aborting it stops the measurement between fits with an InterruptedError. */
  signal?: AbortSignal;
  /**
   * A shell command that fits and predicts instead of a built-in learner (see curve/trainer.ts); the
   * `file` given to {@link measureCurve} must then be the CSV the data set was read from.
   */
  trainer?: string;
  /** Seconds after which a trainer's fit is stopped, as a failure. @default no limit */
  trainerTimeout?: number;
  /**
   * Runs the fit tasks instead of this process (threads, or trainer processes), e.g. as a SLURM job
   * array (cluster/slurm.ts). It must return each task's numbers, in task order.
   */
  runTasks?: TaskRunner;
}

/** Runs a measurement's fit tasks somewhere and returns their numbers in task order. */
export type TaskRunner = (data: Dataset, plan: FitPlan, tasks: FitTask[], options: PoolOptions) => Promise<number[][]>;

export type ResolvedMeasureOptions = Required<
  Omit<
    MeasureOptions,
    "trainingSizes" | "onProgress" | "checkpoint" | "signal" | "trainer" | "trainerTimeout" | "runTasks"
  >
> &
  Pick<MeasureOptions, "trainingSizes" | "onProgress" | "trainer" | "trainerTimeout">;

/**
 * Fills in defaults and checks option values. The task comes from `task`, else from the learner or
 * the metric given (ridge and rmse imply regression), else from `dataTask`, else classification; the
 * default learner and metric then follow the task.
 * @throws UsageError naming the option.
 */
export function resolveMeasureOptions(
  options: MeasureOptions = {},
  dataTask?: "classification" | "regression",
): ResolvedMeasureOptions {
  const learnerTask = options.learner === undefined ? undefined : taskOfLearner(options.learner);
  const metricTask = options.metric === undefined ? undefined : findMetric(options.metric)?.task;
  const task = options.task ?? learnerTask ?? metricTask ?? dataTask ?? "classification";
  if (task !== "classification" && task !== "regression")
    throw new UsageError(message.unknownName(String(task), ["classification", "regression"]), { option: "task" });
  const regression = task === "regression";
  const resolved = {
    folds: options.folds ?? 5,
    repeats: options.repeats ?? 10,
    trainingSizes: options.trainingSizes,
    seed: options.seed ?? 0,
    task,
    learner: options.learner ?? (regression ? "ridge" : "logistic"),
    metric: options.metric ?? (regression ? "rmse" : "accuracy"),
    tune: options.tune ?? false,
    byRuns: options.byRuns ?? false,
    workers: options.workers ?? 1,
    onProgress: options.onProgress,
    trainer: options.trainer,
    trainerTimeout: options.trainerTimeout,
  };
  if (resolved.trainer !== undefined) {
    if (options.learner !== undefined) throw new UsageError(message.trainerWithLearner("--learner"));
    if (resolved.tune) throw new UsageError(message.trainerWithLearner("--tune"));
  }
  if (
    resolved.trainerTimeout !== undefined &&
    !(resolved.trainerTimeout > 0 && Number.isFinite(resolved.trainerTimeout))
  )
    throw new UsageError(message.badTimeout(String(resolved.trainerTimeout)));
  if (resolved.folds !== "loo" && (!Number.isInteger(resolved.folds) || resolved.folds < 2))
    throw new UsageError(message.badFolds(String(resolved.folds)), { option: "folds" });
  if (!Number.isInteger(resolved.repeats) || resolved.repeats < 1)
    throw new UsageError(message.badInteger(String(resolved.repeats), 1), { option: "repeats" });
  if (!Number.isSafeInteger(resolved.seed))
    throw new UsageError(message.badInteger(String(resolved.seed), 0), { option: "seed" });
  if (!Number.isInteger(resolved.workers) || resolved.workers < 1)
    throw new UsageError(message.badInteger(String(resolved.workers), 1), { option: "workers" });
  const learnerOfTask = taskOfLearner(resolved.learner);
  if (learnerOfTask === undefined)
    throw new UsageError(
      message.unknownName(resolved.learner, regression ? regressionLearnerNames() : learnerNames()),
      { option: "learner" },
    );
  if (learnerOfTask !== task)
    throw new UsageError(message.taskMismatch(resolved.learner, learnerOfTask, task, "learner"), { option: "learner" });
  const metric = findMetric(resolved.metric);
  if (!metric)
    throw new UsageError(
      message.unknownName(
        resolved.metric,
        metrics.map((m) => m.name),
      ),
      { option: "metric" },
    );
  if (metric.task !== task)
    throw new UsageError(message.taskMismatch(metric.name, metric.task, task, "metric"), { option: "metric" });
  return resolved;
}

/** The task of the learner of that name, or undefined when there is no such learner. */
function taskOfLearner(name: string): "classification" | "regression" | undefined {
  const learner = createAnyLearner(name);
  return learner === undefined ? undefined : learner.task === "regression" ? "regression" : "classification";
}

/**
 * Measures the learning curve of `data`.
 * @param file the data file's name, for messages
 * @param provenance where the data came from, recorded in the curve
 * @throws UsageError for impossible options; DataError when the data cannot support the design
 */
export async function measureCurve(
  data: Dataset,
  file: string,
  options: MeasureOptions = {},
  provenance: Pick<CurveFile, "source" | "label" | "group"> = {},
): Promise<CurveFile> {
  // 1. options
  const dataTask = data.targets ? "regression" : "classification";
  const o = resolveMeasureOptions(options, dataTask);
  if (o.task !== dataTask) throw new UsageError(message.dataTaskMismatch(o.task, dataTask), { option: "task" });
  const metric = findMetric(o.metric)!;
  const classCount = data.classNames.length;
  const warnings: string[] = [];

  // 2. split design, checked against the data
  const design = chooseDesign({
    task: o.task,
    folds: o.folds,
    rows: data.rows,
    labels: data.labels,
    groups: data.groups,
    groupColumn: provenance.group,
    byRuns: o.byRuns,
  });
  warnings.push(...design.warnings);
  const empty = emptyColumns(data);
  if (empty.length > 0) warnings.push(message.emptyColumns(empty));
  const classCounts = new Array<number>(classCount).fill(0);
  for (const label of data.labels) classCounts[label]++;
  if (design.splitter === "stratified-k-fold") {
    const numericLabels = data.classNames.every((name) => /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(name));
    classCounts.forEach((count, k) => {
      if (count < design.folds)
        throw new DataError(
          (n) =>
            message.classTooSmall(file, data.classNames[k], count, design.folds, n) +
            (numericLabels && provenance.label !== undefined ? message.numericLabelHint(provenance.label, n) : ""),
        );
    });
  }

  // 3. folds fixed once per repeat
  const splitsByRepeat: Split[][] = Array.from({ length: o.repeats }, (_, repeat) =>
    design.splits(streamFor(o.seed, StreamPurpose.folds, repeat)),
  );

  // 4. training sizes, in rows or in runs
  const trainingSizes = checkedSizes(data, file, o, design, splitsByRepeat, classCounts, provenance.group);

  // 5. nested orderings per (repeat, fold), without the folds where the metric is undefined
  const tasks: FitTask[] = [];
  let skipped = 0;
  let firstReason = "";
  splitsByRepeat.forEach((splits, repeat) =>
    splits.forEach((split, fold) => {
      const reason = metricUndefinedOn(metric, data, split.test);
      if (reason !== undefined) {
        if (skipped++ === 0) firstReason = reason;
        return;
      }
      const order = streamFor(o.seed, StreamPurpose.order, repeat, fold);
      const task: FitTask = { index: tasks.length, repeat, fold, orderedTrain: split.train, test: split.test };
      if (design.byRuns) {
        const { rows, runEnds } = nestedRunOrder(split.train, data.groups!, order);
        task.orderedTrain = rows;
        task.prefixLengths = trainingSizes.map((runs) => runEnds[runs - 1]);
      } else if (o.task === "regression") task.orderedTrain = nestedRandomOrder(split.train, order);
      else task.orderedTrain = nestedStratifiedOrder(split.train, data.labels, order);
      tasks.push(task);
    }),
  );
  const totalFolds = splitsByRepeat.reduce((sum, splits) => sum + splits.length, 0);
  if (tasks.length === 0)
    throw new DataError(message.metricUndefinedEverywhere(metric.name, firstReason), { option: "metric" });
  if (skipped > 0) warnings.push(message.metricUndefinedSome(metric.name, skipped, totalFolds, firstReason));
  const grid = o.tune ? tuningGridOf(createAnyLearner(o.learner)!) : undefined;
  if (o.tune && grid === undefined) warnings.push(message.tuneWithoutGrid(o.learner));

  // 6. fits
  const plan: FitPlan = {
    trainingSizes,
    learner: o.learner,
    metric: o.metric,
    seed: o.seed,
    task: o.task,
    tune: grid !== undefined,
    groupedInner: design.grouped,
    ...(o.trainer === undefined
      ? {}
      : {
          trainer: {
            command: o.trainer,
            ...(o.trainerTimeout === undefined ? {} : { timeoutSeconds: o.trainerTimeout }),
          },
        }),
  };
  // What a checkpoint must match to be resumed: the data, every option that changes a score, the
  // version. A trainer's timeout changes no score, so a run stopped by it may resume with another.
  const { workers: _workers, onProgress: _onProgress, trainerTimeout: _timeout, ...measurement } = o;
  const identity = { tool: toolVersion, data: datasetDigest(data), provenance, ...measurement, trainingSizes };
  const runTasks: TaskRunner =
    options.runTasks ??
    (plan.trainer === undefined
      ? runFitTasks
      : async (data, plan, tasks, pool) => {
          // Imported only for a trainer; the data file's cells are read again, as the trainer's files need them.
          const { readTrainerTable, runTrainerTasks } = await import("./trainer.js");
          return runTrainerTasks(data, readTrainerTable(file, provenance.label!), plan, tasks, pool);
        });
  const scoresByTask = await runWithCheckpoint(
    options.checkpoint,
    identity,
    tasks.length,
    fitResultLength(plan),
    (hooks) =>
      runTasks(data, plan, tasks, {
        workers: o.workers,
        onTaskDone: o.onProgress,
        signal: options.signal,
        ...hooks,
      }),
  );
  if (plan.trainer !== undefined) {
    const renormalised = scoresByTask.reduce((sum, scores) => sum + scores[scores.length - 1], 0);
    if (renormalised > 0) warnings.push(message.trainerRenormalised(renormalised, tasks.length * trainingSizes.length));
  }

  // 7. assemble
  const range = metricRangeFor(metric, classCount);
  const sizeCount = trainingSizes.length;
  const curve: CurveFile = {
    kind: "headroom-curve",
    version: 1,
    metric: metric.name,
    higherIsBetter: metric.higherIsBetter,
    ...(range ? { metricRange: range } : {}),
    rows: data.rows,
    task: o.task,
    learner: o.trainer === undefined ? o.learner : "trainer",
    ...(o.trainer === undefined ? {} : { trainer: o.trainer }),
    folds: design.folds,
    repeats: o.repeats,
    seed: o.seed,
    splitter: design.splitter,
    unit: design.byRuns ? "runs" : "rows",
    ...(design.runs === undefined ? {} : { runs: design.runs, rowsPerRun: data.rows / design.runs }),
    ...(grid === undefined ? {} : { tuning: { grid: grid.map((settings) => ({ ...settings })), innerFolds } }),
    ...provenance,
    ...(o.task === "classification" ? { classNames: data.classNames, classCounts } : {}),
    ...(warnings.length > 0 ? { warnings } : {}),
    points: trainingSizes.map((trainingSize, s) => ({
      trainingSize,
      scores: scoresByTask.map((scores) => scores[s]),
      ...(skipped > 0 ? { repeatOfScore: tasks.map((task) => task.repeat) } : {}),
      ...(grid === undefined ? {} : { settingsOfScore: scoresByTask.map((scores) => scores[sizeCount + s]) }),
    })),
  };
  return curve;
}

/**
 * The training sizes: the given ones checked, or the default geometric ones. In rows, each size must
 * fit in every fold's training pool and hold each class (or 2 rows of a numeric target); in runs,
 * each must fit in every pool's runs.
 * @throws UsageError naming a size that cannot be drawn and why; DataError when the data are too
 *   few for a default curve of 3 sizes.
 */
function checkedSizes(
  data: Dataset,
  file: string,
  o: ResolvedMeasureOptions,
  design: SplitDesign,
  splitsByRepeat: Split[][],
  classCounts: number[],
  groupColumn: string | undefined,
): number[] {
  const splits = splitsByRepeat.flat();
  if (design.byRuns) {
    const groups = data.groups!;
    const smallestPool = Math.min(
      ...splits.map((split) => new Set(Array.from(split.train, (row) => groups[row])).size),
    );
    const sizes = o.trainingSizes ?? geometricSizes(1, smallestPool, 8);
    if (o.trainingSizes === undefined && sizes.length < 3)
      throw new DataError(message.tooFewRuns(file, groupColumn ?? "group", design.runs!, neededFor(1, design)));
    for (const size of sizes)
      if (size > smallestPool)
        throw new UsageError(message.sizeTooLargeRuns(size, smallestPool), { option: "trainingSizes" });
    return sizes;
  }
  const smallestPool = Math.min(...splits.map((split) => split.train.length));
  const regression = o.task === "regression";
  let sizes = o.trainingSizes;
  if (sizes === undefined) {
    const smallest = regression ? smallestSensibleRegressionSize : smallestSensibleSize(classCounts);
    sizes = geometricSizes(smallest, smallestPool, 8);
    if (sizes.length < 3) throw new DataError(message.tooFewRows(file, data.rows, neededFor(smallest, design)));
  }
  const classCount = classCounts.length;
  const sizesOption = { option: "trainingSizes" };
  for (const size of sizes) {
    if (size > smallestPool) throw new UsageError(message.sizeTooLarge(size, smallestPool), sizesOption);
    if (regression && size < 2) throw new UsageError(message.sizeTooSmallRegression(size), sizesOption);
    if (!regression && size < Math.max(2, classCount))
      throw new UsageError(message.sizeTooSmall(size, classCount), sizesOption);
  }
  return sizes;
}

/**
 * The fewest rows (or runs) whose training pools, after holding out one of the design's folds (one
 * row or run for the leave-one-out designs), hold the 3 sizes `smallest`, +1, +2.
 */
function neededFor(smallest: number, design: SplitDesign): number {
  const leaveOne = design.splitter === "leave-one-out" || design.splitter === "leave-one-group-out";
  for (let n = smallest + 3; ; n++) {
    if (n - (leaveOne ? 1 : Math.ceil(n / design.folds)) >= smallest + 2) return n;
  }
}

/** Names of the feature columns with no value in any row (every cell missing). */
function emptyColumns(data: Dataset): string[] {
  const columns = data.featureNames.length;
  const seen = new Uint8Array(columns);
  for (let i = 0; i < data.rows; i++) {
    for (let j = 0; j < columns; j++) if (!Number.isNaN(data.features[i * columns + j])) seen[j] = 1;
  }
  return data.featureNames.filter((_, j) => seen[j] === 0);
}
