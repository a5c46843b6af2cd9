/**
 * Runs fit tasks on the main thread or on a pool of worker threads, and returns results in task
 * order. Results do not depend on the number of workers: each task's numbers follow from the task
 * and the seed alone.
 *
 * Hand-written over node:worker_threads rather than a pool library: the pool is a queue of plain
 * tasks with one setup message per worker (the data set is sent once, not with every task), which is
 * a few dozen lines.
 */
import { Worker } from "node:worker_threads";
import type { Dataset } from "../data/dataset.js";
import { runFitTask, type FitPlan, type FitTask } from "./fitTask.js";
import type { FromWorker, ToWorker } from "./fitWorker.js";

export interface PoolOptions {
  /** Worker threads; 1 runs everything on the main thread. */
  workers: number;
  /** Called after each finished task. */
  onTaskDone?: (done: number, total: number) => void;
}

export async function runFitTasks(
  data: Dataset,
  plan: FitPlan,
  tasks: FitTask[],
  options: PoolOptions,
): Promise<number[][]> {
  const results: number[][] = new Array(tasks.length);
  const workers = Math.min(options.workers, tasks.length);
  if (workers <= 1) {
    tasks.forEach((task, i) => {
      results[task.index] = runFitTask(data, plan, task);
      options.onTaskDone?.(i + 1, tasks.length);
    });
    return results;
  }
  // From TypeScript source, a small .mjs shim registers tsx in the worker before loading it.
  const workerUrl = import.meta.url.endsWith(".ts")
    ? new URL("./fitWorkerFromSource.mjs", import.meta.url)
    : new URL("./fitWorker.js", import.meta.url);
  const pool = Array.from({ length: workers }, () => new Worker(workerUrl));
  let next = 0;
  let done = 0;
  try {
    await new Promise<void>((resolve, reject) => {
      const feed = (worker: Worker) => {
        if (next < tasks.length) worker.postMessage({ kind: "task", task: tasks[next++] } satisfies ToWorker);
      };
      for (const worker of pool) {
        worker.on("message", (message: FromWorker) => {
          if (message.kind === "failed")
            return reject(new Error(`a fit failed in a worker thread: ${message.message}`));
          results[message.index] = message.scores;
          done++;
          options.onTaskDone?.(done, tasks.length);
          if (done === tasks.length) resolve();
          else feed(worker);
        });
        worker.on("error", reject);
        worker.postMessage({ kind: "setup", data, plan } satisfies ToWorker);
        feed(worker);
      }
    });
  } finally {
    await Promise.all(pool.map((worker) => worker.terminate()));
  }
  return results;
}
