/**
 * Worker-thread side of the fit pool: receives the data set, the fit plan and the tasks once, then
 * claims tasks one at a time from the counter it shares with the other threads and posts each task's
 * scores back, until none is left; it then ends by itself. It notes in shared memory which task it
 * claimed when, and reports how long each took, for the main thread to judge whether running a late
 * task again would finish sooner (see fitPool.ts).
 */
import { parentPort } from "node:worker_threads";
import type { Dataset } from "../data/dataset.js";
import { runFitTask, type FitPlan, type FitTask } from "./fitTask.js";

export type ToWorker = {
  kind: "setup";
  data: Dataset;
  plan: FitPlan;
  tasks: FitTask[];
  /** Shared counter: `Atomics.add(claims, 0, 1)` claims the task at that position of `tasks`. */
  claims: Int32Array;
  /** Shared, per position of `tasks`: when its task was claimed (`Date.now()`), and by which worker. */
  claimedAt: Float64Array;
  claimedBy: Int32Array;
  /** This worker's number, 1 .. workers − 1. */
  worker: number;
};
export type FromWorker =
  { kind: "done"; index: number; scores: number[]; milliseconds: number } | { kind: "failed"; message: string };

parentPort?.once("message", (message: ToWorker) => {
  const { data, plan, tasks, claims, claimedAt, claimedBy, worker } = message;
  for (;;) {
    const position = Atomics.add(claims, 0, 1);
    if (position >= tasks.length) return;
    const started = Date.now();
    claimedAt[position] = started;
    Atomics.store(claimedBy, position, worker);
    const task = tasks[position];
    try {
      const scores = runFitTask(data, plan, task);
      const milliseconds = Date.now() - started;
      parentPort?.postMessage({ kind: "done", index: task.index, scores, milliseconds } satisfies FromWorker);
    } catch (error) {
      parentPort?.postMessage({
        kind: "failed",
        message: String((error as Error)?.stack ?? error),
      } satisfies FromWorker);
      return;
    }
  }
});
