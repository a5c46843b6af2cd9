/**
 * Runs fit tasks on the main thread, alone or beside a pool of worker threads, and returns results
 * in task order. Results do not depend on the number of workers: each task's numbers follow from the task
 * and the seed alone.
 *
 * Hand-written over node:worker_threads rather than a pool library: the pool is a queue of plain
 * tasks with one setup message per worker (the data set is sent once, not with every task), which is
 * a few dozen lines.
 */
import { Worker } from "node:worker_threads";
import type { Dataset } from "../data/dataset.js";
import { InterruptedError } from "../errors.js";
import { message as messages } from "../messages.js";
import { runFitTask, type FitPlan, type FitTask } from "./fitTask.js";
import type { FromWorker, ToWorker } from "./fitWorker.js";
import { shareDataset } from "./sharedDataset.js";

export interface PoolOptions {
  /** Threads fitting at once, the main thread included; 1 runs everything on the main thread. */
  workers: number;
  /** Called after each finished task. */
  onTaskDone?: (done: number, total: number) => void;
  /** Scores of tasks finished in an earlier run (read from a checkpoint), by task index: not run again. */
  completed?: ReadonlyMap<number, number[]>;
  /** Called with each newly finished task's scores, before `onTaskDone` (e.g. to checkpoint them). */
  onTaskResult?: (index: number, scores: number[]) => void;
  /** Aborting it stops the run between tasks: the promise rejects with an InterruptedError. */
  signal?: AbortSignal;
}

export async function runFitTasks(
  data: Dataset,
  plan: FitPlan,
  tasks: FitTask[],
  options: PoolOptions,
): Promise<number[][]> {
  const results: number[][] = new Array(tasks.length);
  const pending = tasks.filter((task) => {
    const scores = options.completed?.get(task.index);
    if (scores !== undefined) results[task.index] = scores;
    return scores === undefined;
  });
  let done = tasks.length - pending.length;
  const finish = (index: number, scores: number[]) => {
    results[index] = scores;
    options.onTaskResult?.(index, scores);
    done++;
    options.onTaskDone?.(done, tasks.length);
  };
  const interrupted = () => new InterruptedError(messages.interrupted(done, tasks.length, undefined));
  const workers = Math.min(options.workers, pending.length);
  if (workers <= 1) {
    for (const task of pending) {
      // Let a Ctrl-C handler run between tasks.
      if (options.signal) await new Promise((resolve) => setImmediate(resolve));
      if (options.signal?.aborted) throw interrupted();
      finish(task.index, runFitTask(data, plan, task));
    }
    return results;
  }
  // From TypeScript source, a small .mjs shim registers tsx in the worker before loading it.
  const workerUrl = import.meta.url.endsWith(".ts")
    ? new URL("./fitWorkerFromSource.mjs", import.meta.url)
    : new URL("./fitWorker.js", import.meta.url);
  if (options.signal?.aborted) throw interrupted();
  // Shared memory: workers read one copy of the data set instead of a copy each.
  const sharedData = shareDataset(data);
  // The main thread runs tasks too, beside workers − 1 worker threads: a thread takes a few tenths
  // of a second to start and load the modules, during which the main thread is already fitting (a
  // small job may be done before any thread is ready), and each holds its own modules and heap.
  const pool = Array.from({ length: workers - 1 }, () => new Worker(workerUrl));
  let next = 0;
  let onAbort: (() => void) | undefined;
  let stopped = false;
  try {
    await new Promise<void>((resolvePool, rejectPool) => {
      const resolve = () => {
        stopped = true;
        resolvePool();
      };
      const reject = (error: unknown) => {
        stopped = true;
        rejectPool(error);
      };
      onAbort = () => reject(interrupted());
      options.signal?.addEventListener("abort", onAbort, { once: true });
      // Tasks queued per worker thread: two while many remain, so that it never waits for the main
      // thread, busy with a task of its own, to hand it the next; one near the end, so that no thread
      // holds a queued task while another has none.
      const queued = new Map<Worker, number>();
      const feed = (worker: Worker) => {
        const depth = pending.length - next >= 2 * workers ? 2 : 1;
        while ((queued.get(worker) ?? 0) < depth && next < pending.length) {
          worker.postMessage({ kind: "task", task: pending[next++] } satisfies ToWorker);
          queued.set(worker, (queued.get(worker) ?? 0) + 1);
        }
      };
      // One task at a time on the main thread, yielding between tasks so that the workers' results
      // (and a Ctrl-C) are handled.
      const runOnMainThread = () => {
        if (stopped || next >= pending.length) return;
        const task = pending[next++];
        try {
          finish(task.index, runFitTask(data, plan, task));
        } catch (error) {
          return reject(error);
        }
        if (done === tasks.length) resolve();
        else setImmediate(runOnMainThread);
      };
      for (const worker of pool) {
        worker.on("message", (message: FromWorker) => {
          // Tasks go to a worker thread once it is ready.
          if (message.kind === "ready") return feed(worker);
          if (message.kind === "failed")
            return reject(new Error(`a fit failed in a worker thread: ${message.message}`));
          try {
            finish(message.index, message.scores);
          } catch (error) {
            return reject(error);
          }
          queued.set(worker, queued.get(worker)! - 1);
          if (done === tasks.length) resolve();
          else feed(worker);
        });
        worker.on("error", reject);
        worker.postMessage({ kind: "setup", data: sharedData, plan } satisfies ToWorker);
      }
      setImmediate(runOnMainThread);
    });
  } finally {
    if (onAbort) options.signal?.removeEventListener("abort", onAbort);
    await Promise.all(pool.map((worker) => worker.terminate()));
  }
  return results;
}
