/**
 * The curve loop: measures how a learner's held-out score grows with its training size.
 *
 * Phases, in order:
 * 1. resolve options (defaults live in `resolveMeasureOptions` only);
 * 2. check the design against the data (class sizes, training sizes);
 * 3. fix the folds once per repeat (stratified k-fold) and order each training pool so that its
 *    prefixes are nested stratified subsamples;
 * 4. run one fit task per (repeat, fold), on the main thread or worker threads;
 * 5. assemble curve.json, with scores in repeat-major order.
 */
import type { Dataset } from "../data/dataset.js";
import { DataError, UsageError } from "../errors.js";
import { createLearner, learnerNames } from "../learners/registry.js";
import { message } from "../messages.js";
import { RandomStream } from "../random.js";
import { nestedStratifiedOrder } from "../splitters/nestedSubsamples.js";
import { stratifiedKFold } from "../splitters/stratifiedKFold.js";
import type { CurveFile } from "./curveFile.js";
import { StreamPurpose, type FitTask } from "./fitTask.js";
import { runFitTasks } from "./fitPool.js";
import { findMetric, metrics } from "./metrics.js";
import { geometricSizes, smallestSensibleSize } from "./sizes.js";

export interface MeasureOptions {
  /** Cross-validation folds. @default 5 */
  folds?: number;
  /** Repeats of the whole k-fold with fresh folds. @default 10 */
  repeats?: number;
  /** Training sizes in rows. @default 8 geometric sizes from the smallest sensible size to the whole pool */
  trainingSizes?: number[];
  /** @default 0 */
  seed?: number;
  /** @default "logistic" */
  learner?: string;
  /** @default "accuracy" */
  metric?: string;
  /** Worker threads. @default 1 */
  workers?: number;
  /** Called after each (repeat, fold) task. */
  onProgress?: (done: number, total: number) => void;
}

export type ResolvedMeasureOptions = Required<Omit<MeasureOptions, "trainingSizes" | "onProgress">> &
  Pick<MeasureOptions, "trainingSizes" | "onProgress">;

/** Fills in defaults and checks option values. @throws UsageError naming the option. */
export function resolveMeasureOptions(options: MeasureOptions = {}): ResolvedMeasureOptions {
  const resolved = {
    folds: options.folds ?? 5,
    repeats: options.repeats ?? 10,
    trainingSizes: options.trainingSizes,
    seed: options.seed ?? 0,
    learner: options.learner ?? "logistic",
    metric: options.metric ?? "accuracy",
    workers: options.workers ?? 1,
    onProgress: options.onProgress,
  };
  if (!Number.isInteger(resolved.folds) || resolved.folds < 2)
    throw new UsageError(message.badInteger("--folds", String(resolved.folds), 2));
  if (!Number.isInteger(resolved.repeats) || resolved.repeats < 1)
    throw new UsageError(message.badInteger("--repeats", String(resolved.repeats), 1));
  if (!Number.isSafeInteger(resolved.seed))
    throw new UsageError(message.badInteger("--seed", String(resolved.seed), 0));
  if (!Number.isInteger(resolved.workers) || resolved.workers < 1)
    throw new UsageError(message.badInteger("--workers", String(resolved.workers), 1));
  if (!createLearner(resolved.learner))
    throw new UsageError(message.unknownName("--learner", resolved.learner, learnerNames()));
  if (!findMetric(resolved.metric))
    throw new UsageError(
      message.unknownName(
        "--metric",
        resolved.metric,
        metrics.map((m) => m.name),
      ),
    );
  return resolved;
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
  const o = resolveMeasureOptions(options);
  const metric = findMetric(o.metric)!;
  const classCount = data.classNames.length;

  // 2. design checks
  const classCounts = new Array<number>(classCount).fill(0);
  for (const label of data.labels) classCounts[label]++;
  classCounts.forEach((count, k) => {
    if (count < o.folds) throw new DataError(message.classTooSmall(file, data.classNames[k], count, o.folds));
  });
  const smallestPool = data.rows - Math.ceil(data.rows / o.folds);
  const trainingSizes = o.trainingSizes ?? defaultSizes(file, classCounts, smallestPool, o.folds);
  for (const size of trainingSizes) {
    if (size > smallestPool) throw new UsageError(message.sizeTooLarge(size, smallestPool));
    if (size < Math.max(2, classCount)) throw new UsageError(message.sizeTooSmall(size, classCount));
  }

  // 3. folds fixed once per repeat; nested orderings per (repeat, fold)
  const tasks: FitTask[] = [];
  for (let repeat = 0; repeat < o.repeats; repeat++) {
    const splits = stratifiedKFold(data.labels, o.folds, new RandomStream(o.seed, StreamPurpose.folds, repeat));
    splits.forEach((split, fold) => {
      const order = new RandomStream(o.seed, StreamPurpose.order, repeat, fold);
      tasks.push({
        index: repeat * o.folds + fold,
        repeat,
        fold,
        orderedTrain: nestedStratifiedOrder(split.train, data.labels, order),
        test: split.test,
      });
    });
  }

  // 4. fits
  const plan = { trainingSizes, learner: o.learner, metric: o.metric, seed: o.seed };
  const scoresByTask = await runFitTasks(data, plan, tasks, { workers: o.workers, onTaskDone: o.onProgress });

  // 5. assemble
  const curve: CurveFile = {
    kind: "headroom-curve",
    version: 1,
    metric: metric.name,
    higherIsBetter: metric.higherIsBetter,
    ...(metric.range ? { metricRange: metric.range } : {}),
    rows: data.rows,
    learner: o.learner,
    folds: o.folds,
    repeats: o.repeats,
    seed: o.seed,
    ...provenance,
    classNames: data.classNames,
    points: trainingSizes.map((trainingSize, s) => ({
      trainingSize,
      scores: scoresByTask.map((scores) => scores[s]),
    })),
  };
  return curve;
}

function defaultSizes(file: string, classCounts: number[], smallestPool: number, folds: number): number[] {
  const smallest = smallestSensibleSize(classCounts);
  const sizes = geometricSizes(smallest, smallestPool, 8);
  if (sizes.length < 3) {
    // Three distinct sizes need a pool of at least smallest + 2 rows after holding out a fold.
    const rows = classCounts.reduce((a, b) => a + b, 0);
    throw new DataError(message.tooFewRows(file, rows, Math.ceil(((smallest + 2) * folds) / (folds - 1))));
  }
  return sizes;
}
