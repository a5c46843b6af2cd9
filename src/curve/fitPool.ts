/**
 * Runs fit tasks on the main thread, alone or beside a pool of worker threads, and returns results
 * in task order. Results do not depend on the number of workers: each task's numbers follow from the task
 * and the seed alone.
 *
 * Hand-written over node:worker_threads rather than a pool library. Every thread, the main one
 * included, claims the next task from one counter in shared memory (`Atomics.add`), so no thread waits
 * for another to hand it work, and each worker receives the data set and the task list once.
 *
 * The main thread starts fitting at once, and starts the worker threads only once the tasks left
 * besides its next one, at the pace of its last task, would take it a second or more (`poolSettings`):
 * a worker thread takes some tenths of a second to start and load its modules, and its first task
 * runs several times slower than later ones while V8 compiles its code, all on a processor the main
 * thread could use, so a small curve finishes sooner without workers (README, "Speed"). So `workers`
 * is the most threads a run uses.
 *
 * Once every task is claimed, the main thread may run again a task a worker thread is still fitting;
 * the first of the two to finish counts, since a task's scores are the same wherever it runs. A
 * worker's first tasks run slowly, so the last worker task could otherwise leave the run slower than
 * with no worker at all. The main thread does so only when it expects to finish first: the worker's
 * last task took longer than the main thread's last task plus the time the worker has already spent
 * on this one (or the worker has finished none yet); the main thread cannot stop halfway, so a copy
 * that loses only delays the end.
 */
import { Worker } from "node:worker_threads";
import type { Dataset } from "../data/dataset.js";
import { InterruptedError } from "../errors.js";
import { releaseLearnerMemory } from "../learners/registry.js";
import { message as messages } from "../messages.js";
import { runFitTask, type FitPlan, type FitTask } from "./fitTask.js";
import type { FromWorker, ToWorker } from "./fitWorker.js";
import { shareDataset } from "./sharedDataset.js";

export interface PoolOptions {
  /**
   * The most threads fitting at once, the main thread included; 1 runs everything on the main thread.
   * Worker threads start only when the work left makes them worth it (see above).
   */
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

/** Settings of the pool, changed only by tests (to have worker threads start at once). */
export const poolSettings = {
  /**
   * Work left, in milliseconds at the pace of the main thread's last task, that makes worker threads
   * worth starting: about four times a worker thread's start-up (see above).
   */
  workerWorthMilliseconds: 1000,
};

/** The fit worker's module: from TypeScript source, a small .mjs shim registers tsx in the worker first. */
function workerUrl(): URL {
  return import.meta.url.endsWith(".ts")
    ? new URL("./fitWorkerFromSource.mjs", import.meta.url)
    : new URL("./fitWorker.js", import.meta.url);
}

export async function runFitTasks(
  data: Dataset,
  plan: FitPlan,
  tasks: FitTask[],
  options: PoolOptions,
): Promise<number[][]> {
  try {
    return await runPool(data, plan, tasks, options);
  } finally {
    // The fits' work memory on this thread, as large as the largest fit's, is not kept once the
    // measurement ends (worker threads end with it).
    releaseLearnerMemory();
  }
}

async function runPool(data: Dataset, plan: FitPlan, tasks: FitTask[], options: PoolOptions): Promise<number[][]> {
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
  if (options.signal?.aborted) throw interrupted();
  // The main thread runs tasks too, beside up to workers − 1 worker threads, started once worth it.
  const pool: Worker[] = [];
  // The position in `pending` of the next task to claim, shared by all threads, and for each position
  // when and by which worker (numbered from 1; 0 for the main thread) it was claimed.
  const claims = new Int32Array(new SharedArrayBuffer(Int32Array.BYTES_PER_ELEMENT));
  const claimedAt = new Float64Array(new SharedArrayBuffer(pending.length * Float64Array.BYTES_PER_ELEMENT));
  const claimedBy = new Int32Array(new SharedArrayBuffer(pending.length * Int32Array.BYTES_PER_ELEMENT));
  // Positions the main thread has run (or is running), so that it runs each at most once.
  const ranOnMain = new Uint8Array(pending.length);
  // How long the last task took on the main thread and on each worker (Infinity: none yet).
  let mainMilliseconds = Infinity;
  const workerMilliseconds = new Array<number>(workers).fill(Infinity);
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
        // Worker threads claim no further task.
        Atomics.store(claims, 0, pending.length);
        rejectPool(error);
      };
      onAbort = () => reject(interrupted());
      options.signal?.addEventListener("abort", onAbort, { once: true });
      // A task's scores, from whichever thread finishes it first (a second copy is ignored).
      const record = (index: number, scores: number[]) => {
        if (stopped || results[index] !== undefined) return;
        try {
          finish(index, scores);
        } catch (error) {
          return reject(error);
        }
        if (done === tasks.length) resolve();
      };
      // Starts the worker threads, each told the data set (in shared memory: one copy for all), the
      // plan and the tasks once.
      const startWorkers = () => {
        const sharedData = shareDataset(data);
        for (let number = 1; number < workers; number++) {
          const worker = new Worker(workerUrl());
          pool.push(worker);
          worker.on("message", (message: FromWorker) => {
            if (message.kind === "failed")
              return reject(new Error(`a fit failed in a worker thread: ${message.message}`));
            workerMilliseconds[number] = message.milliseconds;
            record(message.index, message.scores);
          });
          worker.on("error", reject);
          // A worker thread ends by itself (code 0) once no task is left to claim.
          worker.on("exit", (code) => {
            if (code !== 0) reject(new Error(`a fit worker thread stopped (exit code ${code})`));
          });
          worker.postMessage({
            kind: "setup",
            data: sharedData,
            plan,
            tasks: pending,
            claims,
            claimedAt,
            claimedBy,
            worker: number,
          } satisfies ToWorker);
        }
      };
      // Every task is claimed: the position of a task a worker thread is fitting that the main
      // thread expects to finish sooner, or −1.
      const lateTask = (): number => {
        const now = Date.now();
        for (let position = pending.length - 1; position >= 0; position--) {
          if (ranOnMain[position] === 1 || results[pending[position].index] !== undefined) continue;
          const worker = Atomics.load(claimedBy, position);
          const remaining = workerMilliseconds[worker] - (now - claimedAt[position]);
          if (worker > 0 && mainMilliseconds < remaining) return position;
        }
        return -1;
      };
      const runOnMainThread = () => {
        if (stopped) return;
        let position = Atomics.add(claims, 0, 1);
        if (position >= pending.length) position = lateTask();
        // Nothing left to run here: the workers' results will end the run.
        if (position < 0) return;
        ranOnMain[position] = 1;
        const task = pending[position];
        const begun = Date.now();
        let scores: number[];
        try {
          scores = runFitTask(data, plan, task);
        } catch (error) {
          return reject(error);
        }
        mainMilliseconds = Date.now() - begun;
        record(task.index, scores);
        if (stopped) return;
        // Tasks left for worker threads, besides the one this thread claims next.
        const left = pending.length - Math.min(pending.length, Atomics.load(claims, 0)) - 1;
        if (pool.length === 0 && left * mainMilliseconds >= poolSettings.workerWorthMilliseconds) startWorkers();
        // Yield between tasks, so that the workers' results (and a Ctrl-C) are handled.
        setImmediate(runOnMainThread);
      };
      setImmediate(runOnMainThread);
    });
  } finally {
    if (onAbort) options.signal?.removeEventListener("abort", onAbort);
    await Promise.all(pool.map((worker) => worker.terminate()));
  }
  return results;
}
