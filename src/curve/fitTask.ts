/**
 * One unit of curve work: a (repeat, fold) pair, fitted at every training size on nested prefixes of
 * its ordered training pool and scored on the held-out fold. Tasks carry only plain data, so worker
 * threads can run them; the numbers depend only on the task and the seed, never on which thread
 * runs it or in what order.
 */
import { selectLabels, selectRows, type Dataset } from "../data/dataset.js";
import { createLearner } from "../learners/registry.js";
import { RandomStream } from "../random.js";
import { findMetric } from "./metrics.js";

export interface FitTask {
  /** Position of the task in repeat-major order: `repeat * folds + fold`. */
  index: number;
  repeat: number;
  fold: number;
  /** The training pool, ordered so that every prefix is a stratified subsample. */
  orderedTrain: Int32Array;
  test: Int32Array;
}

/** What every task of one measurement shares. */
export interface FitPlan {
  trainingSizes: number[];
  learner: string;
  metric: string;
  seed: number;
}

/** Stream tags, so that streams for different purposes never coincide. */
export const StreamPurpose = { folds: 1, order: 2, learner: 3 } as const;

/** Fits the task at every training size and returns one score per size. */
export function runFitTask(data: Dataset, plan: FitPlan, task: FitTask): number[] {
  const learner = createLearner(plan.learner);
  const metric = findMetric(plan.metric);
  if (!learner || !metric) throw new Error(`unknown learner or metric in fit plan: ${plan.learner}, ${plan.metric}`);
  const classCount = data.classNames.length;
  const columns = data.featureNames.length;
  const testFeatures = selectRows(data, task.test);
  const testLabels = selectLabels(data, task.test);
  return plan.trainingSizes.map((size, s) => {
    const rows = task.orderedTrain.subarray(0, size);
    const model = learner.fit(
      { features: selectRows(data, rows), rows: size, columns, labels: selectLabels(data, rows), classCount },
      new RandomStream(plan.seed, StreamPurpose.learner, task.repeat, task.fold, s),
    );
    return metric.score(testLabels, model.predictProbabilities(testFeatures, task.test.length), classCount);
  });
}
