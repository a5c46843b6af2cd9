/**
 * Worker-thread side of the fit pool: receives the data set and fit plan once, then runs tasks
 * as they arrive and posts each task's scores back.
 */
import { parentPort } from "node:worker_threads";
import type { Dataset } from "../data/dataset.js";
import { runFitTask, type FitPlan, type FitTask } from "./fitTask.js";

export type ToWorker = { kind: "setup"; data: Dataset; plan: FitPlan } | { kind: "task"; task: FitTask };
export type FromWorker =
  { kind: "ready" } | { kind: "done"; index: number; scores: number[] } | { kind: "failed"; message: string };

let data: Dataset | undefined;
let plan: FitPlan | undefined;

parentPort?.on("message", (message: ToWorker) => {
  if (message.kind === "setup") {
    data = message.data;
    plan = message.plan;
    // Loaded and set up: the pool hands out tasks from now on.
    parentPort?.postMessage({ kind: "ready" } satisfies FromWorker);
    return;
  }
  try {
    if (!data || !plan) throw new Error("fit worker received a task before its setup");
    const scores = runFitTask(data, plan, message.task);
    parentPort?.postMessage({ kind: "done", index: message.task.index, scores } satisfies FromWorker);
  } catch (error) {
    parentPort?.postMessage({ kind: "failed", message: String((error as Error)?.stack ?? error) } satisfies FromWorker);
  }
});
