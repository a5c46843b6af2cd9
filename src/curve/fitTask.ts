/**
 * One unit of curve work: a (repeat, fold) pair, fitted at every training size on nested prefixes of
 * its ordered training pool and scored on the held-out fold. Tasks carry only plain data, so worker
 * threads can run them; the numbers depend only on the task and the seed, never on which thread
 * runs it or in what order.
 *
 * With tuning (`plan.tune`), each training size first runs an inner cross-validation on its training
 * rows only (3 folds, stratified for classes; grouped when the outer folds keep runs whole and the
 * training rows hold at least 3 runs) over the learner's `tuningGrid`, picks the settings with the
 * best mean inner score (ties to the earlier grid point), refits them on all the training rows and
 * scores that fit on the outer held-out fold. The held-out fold takes no part in the choice, so the
 * outer score stays an honest estimate of the tuned procedure (Varma and Simon 2006, "Bias in error
 * estimation when using cross-validation for model selection").
 */
import { selectLabels, selectRows, type Dataset } from "../data/dataset.js";
import type { FittedModel, Learner, LearnerSettings, RegressionLearner } from "../learners/learner.js";
import { createLearner, createRegressionLearner } from "../learners/registry.js";
import { expectTrainingRows, scratchDoubles } from "../learners/scratch.js";
import { StreamPurpose, streamFor, type RandomStream } from "../random.js";
import { groupKFold } from "../splitters/groupKFold.js";
import { kFold } from "../splitters/kFold.js";
import type { Split } from "../splitters/split.js";
import { stratifiedKFold } from "../splitters/stratifiedKFold.js";
import { findMetric, type Metric } from "./metrics.js";

export interface FitTask {
  /** Position of the task among the tasks run, in repeat-major order. */
  index: number;
  repeat: number;
  fold: number;
  /** The training pool, ordered so that every prefix is a nested subsample (stratified for classes). */
  orderedTrain: Int32Array;
  test: Int32Array;
  /**
   * Rows of `orderedTrain` used at each training size, when sizes count whole runs (the prefix of the
   * first k runs); absent when sizes count rows, which are then the prefix lengths themselves.
   */
  prefixLengths?: number[];
}

/** What every task of one measurement shares. */
export interface FitPlan {
  /** Training sizes, in rows or in runs (then each task carries `prefixLengths`). */
  trainingSizes: number[];
  learner: string;
  metric: string;
  seed: number;
  /** @default "classification" */
  task?: "classification" | "regression";
  /** Tune the learner's settings by inner cross-validation at every size. @default false */
  tune?: boolean;
  /** Whether inner folds keep runs whole (the outer folds do). @default false */
  groupedInner?: boolean;
  /**
   * Fit with the user's own program instead of `learner` (see trainer.ts): the shell command, and
   * the seconds after which a fit is stopped.
   */
  trainer?: { command: string; timeoutSeconds?: number };
}

/** Folds of the inner cross-validation that tunes a learner (3 is common practice for small data). */
export const innerFolds = 3;

/**
 * Numbers one task returns: one score per training size; with tuning, followed by the index into the
 * learner's `tuningGrid` of the settings chosen at each size (−1: the learner's defaults, when no
 * inner fold could be scored); with a trainer, followed by the number of its fits whose class
 * probabilities were renormalised.
 */
export function fitResultLength(plan: FitPlan): number {
  return plan.trainingSizes.length * (plan.tune ? 2 : 1) + (plan.trainer ? 1 : 0);
}

type AnyLearner = Learner | RegressionLearner;

/** The learner of that name (classification or regression), or undefined. */
export function createAnyLearner(name: string): AnyLearner | undefined {
  return createLearner(name) ?? createRegressionLearner(name);
}

/** The grid a learner can be tuned over, or undefined when it has none (or cannot take settings). */
export function tuningGridOf(learner: AnyLearner): readonly LearnerSettings[] | undefined {
  const grid = learner.tuningGrid;
  return grid !== undefined && grid.length > 0 && learner.withOptions !== undefined ? grid : undefined;
}

/** The learner with these settings (called as a method: learners' `withOptions` read `this`). */
function withSettings(learner: AnyLearner, settings: LearnerSettings): AnyLearner {
  return learner.withOptions!(settings);
}

/** Fits the task at every training size; see {@link fitResultLength} for what it returns. */
export function runFitTask(data: Dataset, plan: FitPlan, task: FitTask): number[] {
  const learner = createAnyLearner(plan.learner);
  const metric = findMetric(plan.metric);
  if (!learner || !metric) throw new Error(`unknown learner or metric in fit plan: ${plan.learner}, ${plan.metric}`);
  const grid = plan.tune ? tuningGridOf(learner) : undefined;
  // The held-out rows and the nested training rows are copied into work arrays of this thread
  // (learners/scratch.ts), reused by its next task.
  const columns = data.featureNames.length;
  const test = heldOut(data, task.test, scratchDoubles("fitTask.heldOut", task.test.length * columns));
  const scores: number[] = [];
  const chosen: number[] = [];
  // The sizes run in increasing order on nested rows: each fit may warm-start from the previous one,
  // and reads its features as a prefix of the longest training set's, selected once.
  const warm: WarmStart = {};
  const longest = Math.max(0, ...plan.trainingSizes.map((size, s) => task.prefixLengths?.[s] ?? size));
  expectTrainingRows(longest);
  const nestedFeatures = selectRows(
    data,
    task.orderedTrain.subarray(0, longest),
    scratchDoubles("fitTask.training", longest * columns),
  );
  plan.trainingSizes.forEach((size, s) => {
    const rows = task.orderedTrain.subarray(0, task.prefixLengths?.[s] ?? size);
    let choice = -1;
    if (grid !== undefined) {
      const random = streamFor(plan.seed, StreamPurpose.tuningFolds, task.repeat, task.fold, s);
      choice = chooseSettings(data, plan, learner, grid, metric, rows, random, [task.repeat, task.fold, s]);
    }
    const fitted = choice >= 0 ? withSettings(learner, grid![choice]) : learner;
    const random = streamFor(plan.seed, StreamPurpose.learner, task.repeat, task.fold, s);
    const features = nestedFeatures.subarray(0, rows.length * columns);
    scores.push(fitAndScore(data, fitted, metric, rows, test, random, warm, features));
    chosen.push(choice);
  });
  return plan.tune ? [...scores, ...chosen] : scores;
}

/** Held-out rows: their features and their truth (classes or targets). */
interface HeldOut {
  rows: number;
  features: Float64Array;
  labels: Int32Array;
  targets: Float64Array;
}

/** The held-out rows; their features in the start of `target` when given. */
function heldOut(data: Dataset, rows: ArrayLike<number>, target?: Float64Array): HeldOut {
  return {
    rows: rows.length,
    features: selectRows(data, rows, target),
    labels: data.targets ? new Int32Array(0) : selectLabels(data, rows),
    targets: data.targets ? selectTargets(data.targets, rows) : new Float64Array(0),
  };
}

function selectTargets(targets: Float64Array, rows: ArrayLike<number>): Float64Array {
  return Float64Array.from({ length: rows.length }, (_, i) => targets[rows[i]]);
}

/** Why the metric is undefined on these held-out rows, or undefined when it is defined. */
export function metricUndefinedOn(metric: Metric, data: Dataset, rows: ArrayLike<number>): string | undefined {
  if (metric.task === "regression") return metric.undefinedOn?.(selectTargets(data.targets!, rows));
  return metric.undefinedOn?.(selectLabels(data, rows), data.classNames.length);
}

/** The model fitted at the previous training size of a task, handed to the next fit as a warm start. */
interface WarmStart {
  model?: FittedModel;
}

/** Per data set (as this thread sees it), its complete feature columns: see {@link completeColumnsOf}. */
const completeColumnsCache = new WeakMap<Dataset, Uint8Array>();

/**
 * 1 for each feature column with no missing value in any row of the data set, which every training
 * and held-out row of a measurement comes from: the learners' preprocessing then skips those columns'
 * medians, which would never be used (one selection per column and fit, thousands on wide data). Found
 * once per data set and thread.
 */
function completeColumnsOf(data: Dataset): Uint8Array {
  let complete = completeColumnsCache.get(data);
  if (complete === undefined) {
    const columns = data.featureNames.length;
    complete = new Uint8Array(columns).fill(1);
    const { features } = data;
    for (let at = 0; at < features.length; at++) if (Number.isNaN(features[at])) complete[at % columns] = 0;
    completeColumnsCache.set(data, complete);
  }
  return complete;
}

/**
 * Fits `learner` on the training rows and scores it on the held-out rows. With `warm`, a classifier's
 * fit receives `warm.model` (see {@link Learner.fit}) and the new model replaces it. `features` are
 * the training rows' features when already selected.
 */
function fitAndScore(
  data: Dataset,
  learner: AnyLearner,
  metric: Metric,
  train: Int32Array,
  test: HeldOut,
  random: RandomStream,
  warm?: WarmStart,
  features: Float64Array = selectRows(data, train),
): number {
  const columns = data.featureNames.length;
  const categories = data.categories;
  const completeColumns = completeColumnsOf(data);
  if (learner.task === "regression") {
    if (metric.task !== "regression") throw new Error(`metric ${metric.name} cannot score a regression learner`);
    const targets = selectTargets(data.targets!, train);
    const model = learner.fit({ features, rows: train.length, columns, targets, categories, completeColumns }, random);
    return metric.score(test.targets, model.predictValues(test.features, test.rows));
  }
  if (metric.task !== "classification") throw new Error(`metric ${metric.name} cannot score a classifier`);
  const classCount = data.classNames.length;
  const labels = selectLabels(data, train);
  const training = { features, rows: train.length, columns, labels, classCount, categories, completeColumns };
  const model = learner.fit(training, random, warm?.model);
  if (warm) warm.model = model;
  // The probabilities are scored at once, so they may go to a work array of this thread.
  const target = scratchDoubles("fitTask.probabilities", test.rows * classCount);
  return metric.score(test.labels, model.predictProbabilities(test.features, test.rows, target), classCount);
}

/**
 * The inner cross-validation of one training set: the index of the grid point with the best mean
 * score over the inner folds on which the metric is defined, or −1 when there is no such fold (too
 * few rows, or every inner test fold lacks what the metric needs).
 */
function chooseSettings(
  data: Dataset,
  plan: FitPlan,
  learner: AnyLearner,
  grid: readonly LearnerSettings[],
  metric: Metric,
  rows: Int32Array,
  random: RandomStream,
  path: number[],
): number {
  if (rows.length < innerFolds) return -1;
  const splits = innerSplits(data, plan, rows, random).filter(
    (split) => split.test.length > 0 && metricUndefinedOn(metric, data, split.test) === undefined,
  );
  if (splits.length === 0) return -1;
  const folds = splits.map((split) => ({ train: split.train, test: heldOut(data, split.test) }));
  let best = -1;
  let bestMean = 0;
  grid.forEach((settings, g) => {
    const candidate = withSettings(learner, settings);
    let sum = 0;
    folds.forEach((fold, f) => {
      const stream = streamFor(plan.seed, StreamPurpose.tuningLearner, ...path, g, f);
      sum += fitAndScore(data, candidate, metric, fold.train, fold.test, stream);
    });
    const mean = sum / folds.length;
    const better = metric.higherIsBetter ? mean > bestMean : mean < bestMean;
    if (best < 0 || better) {
      best = g;
      bestMean = mean;
    }
  });
  return best;
}

/** Inner folds of a training set, as data-set row indices. */
function innerSplits(data: Dataset, plan: FitPlan, rows: Int32Array, random: RandomStream): Split[] {
  const local = (splits: Split[]): Split[] =>
    splits.map((split) => ({
      train: Int32Array.from(split.train, (i) => rows[i]),
      test: Int32Array.from(split.test, (i) => rows[i]),
    }));
  if (plan.groupedInner && data.groups) {
    const groups = Int32Array.from(rows, (row) => data.groups![row]);
    if (new Set(groups).size >= innerFolds) return local(groupKFold(groups, innerFolds, random));
  }
  if (plan.task === "regression") return local(kFold(rows.length, innerFolds, random));
  return local(stratifiedKFold(selectLabels(data, rows), innerFolds, random));
}
