/**
 * The fit pool returns every task's scores once, in task order, the same with worker threads as on
 * the main thread alone (each task's numbers follow from the task and the seed), skips the tasks a
 * checkpoint already holds, and stops on request. Data: iris (fixtures/open-data/iris.csv, UCI via
 * scikit-learn), with the real logistic learner; worker threads load the TypeScript source.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { poolSettings, runFitTasks } from "../../src/curve/fitPool.js";
import { type FitPlan, type FitTask } from "../../src/curve/fitTask.js";
import type { Dataset } from "../../src/data/dataset.js";
import { InterruptedError } from "../../src/errors.js";
import { StreamPurpose, streamFor } from "../../src/random.js";
import { nestedStratifiedOrder } from "../../src/splitters/nestedSubsamples.js";
import { stratifiedKFold } from "../../src/splitters/stratifiedKFold.js";
import { loadOpenData } from "../helpers/openData.js";

const { features, rows, featureNames, labels, classNames } = loadOpenData("iris");
const data: Dataset = { features, rows, featureNames, labels, classNames };
const plan: FitPlan = { trainingSizes: [12, 30, 60, 100], learner: "logistic", metric: "log_loss", seed: 4 };

/** 5 folds × 3 repeats, each training pool in nested stratified order, as measureCurve makes them. */
function makeTasks(): FitTask[] {
  const tasks: FitTask[] = [];
  for (let repeat = 0; repeat < 3; repeat++) {
    stratifiedKFold(labels, 5, streamFor(plan.seed, StreamPurpose.folds, repeat)).forEach((split, fold) => {
      const order = streamFor(plan.seed, StreamPurpose.order, repeat, fold);
      const orderedTrain = nestedStratifiedOrder(split.train, labels, order);
      tasks.push({ index: tasks.length, repeat, fold, orderedTrain, test: split.test });
    });
  }
  return tasks;
}

/** Holds the main thread for `milliseconds`, so that the worker threads get tasks to run. */
function holdMainThread(milliseconds: number): void {
  Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, milliseconds);
}

describe("runFitTasks", () => {
  const worth = poolSettings.workerWorthMilliseconds;
  beforeAll(() => void (poolSettings.workerWorthMilliseconds = 0));
  afterAll(() => void (poolSettings.workerWorthMilliseconds = worth));
  const tasks = makeTasks();

  it("gives each task's scores once, the same with worker threads as on the main thread alone", async () => {
    const alone = await runFitTasks(data, plan, tasks, { workers: 1 });
    expect(alone).toHaveLength(15);
    // Log loss of real fits: positive, and falling with the training size on average.
    for (const scores of alone) for (const score of scores) expect(score).toBeGreaterThan(0);
    const meanAt = (s: number) => alone.reduce((sum, scores) => sum + scores[s], 0) / alone.length;
    expect(meanAt(3)).toBeLessThan(meanAt(0));

    const reported: number[] = [];
    const pooled = await runFitTasks(data, plan, tasks, {
      workers: 3,
      onTaskResult: (index) => reported.push(index),
      // The main thread, slowed down, leaves tasks to the two worker threads.
      onTaskDone: () => holdMainThread(150),
    });
    expect(pooled).toEqual(alone);
    expect([...reported].sort((a, b) => a - b)).toEqual(tasks.map((task) => task.index));
  }, 30_000);

  it("does not run again the tasks a checkpoint holds", async () => {
    const completed = new Map([
      [0, [1, 2, 3, 4]],
      [7, [5, 6, 7, 8]],
    ]);
    const reported: number[] = [];
    const results = await runFitTasks(data, plan, tasks, {
      workers: 2,
      completed,
      onTaskResult: (index) => reported.push(index),
    });
    expect(results[0]).toEqual([1, 2, 3, 4]);
    expect(results[7]).toEqual([5, 6, 7, 8]);
    expect(reported).toHaveLength(13);
    expect(reported).not.toContain(0);
    expect(reported).not.toContain(7);
  }, 30_000);

  it("stops with an InterruptedError when its signal is aborted", async () => {
    const controller = new AbortController();
    let done = 0;
    const run = runFitTasks(data, plan, tasks, {
      workers: 2,
      signal: controller.signal,
      onTaskDone: () => {
        if (++done === 3) controller.abort();
      },
    });
    await expect(run).rejects.toThrow(InterruptedError);
    expect(done).toBeLessThan(15);
  }, 30_000);
});
