/**
 * Nested stratified subsamples of a training pool: one ordering of the pool such that every prefix
 * keeps the class proportions as closely as whole rows allow. Training on the first n rows of the
 * ordering for increasing n gives nested training sets (each smaller set inside the larger one), so a
 * curve's points differ only by the added rows, not by a fresh draw, which makes the curve smoother
 * for the same number of fits.
 *
 * Construction: shuffle each class; the j-th row of a class with m rows gets the key (j + u) / m with
 * u uniform in [0, 1); sorting all rows by key interleaves the classes in proportion.
 *
 * Rows, keys and orders live in typed arrays (rows grouped by a counting sort, the order found by
 * sorting an array of positions), never in one JavaScript object per row: with tens of thousands of
 * rows per fold, per-row objects made V8 grow the main thread's young generation to its maximum.
 */
import type { RandomStream } from "../random.js";
import { rowsByValue } from "./rowsByValue.js";
import { shuffleRows } from "./shuffleRows.js";

/**
 * @param pool row indices of the training pool
 * @param labels class index of every row of the data set
 * @returns the pool reordered so that each prefix is a stratified subsample
 */
export function nestedStratifiedOrder(pool: Int32Array, labels: Int32Array, random: RandomStream): Int32Array {
  // Classes in increasing order, each class's rows in pool order, then shuffled and keyed class by
  // class (the draws' order: shuffle of the first class, its keys, shuffle of the second, ...).
  const { starts, rows } = rowsByValue(labels, pool);
  const keys = new Float64Array(rows.length);
  for (let k = 0; k + 1 < starts.length; k++) {
    const start = starts[k];
    const classRows = starts[k + 1] - start;
    shuffleRows(rows, random, start, starts[k + 1]);
    for (let j = 0; j < classRows; j++) keys[start + j] = (j + random.uniform()) / classRows;
  }
  // Positions by increasing key, ties by increasing row. An Int32Array of positions sorts as small
  // integers; sorting the keys themselves with a comparator would box every one of them.
  const positions = Int32Array.from({ length: rows.length }, (_, i) => i);
  positions.sort((a, b) => keys[a] - keys[b] || rows[a] - rows[b]);
  const order = new Int32Array(rows.length);
  for (let i = 0; i < order.length; i++) order[i] = rows[positions[i]];
  return order;
}

/**
 * Nested random subsamples for a numeric target (no classes to stratify): the pool in a random order,
 * so that every prefix is a simple random sample of the pool and each prefix holds the shorter ones.
 */
export function nestedRandomOrder(pool: Int32Array, random: RandomStream): Int32Array {
  const order = pool.slice();
  shuffleRows(order, random);
  return order;
}

/** A pool ordered run by run, for training sets made of whole runs. */
export interface RunOrder {
  /** The pool's rows, the rows of each run together, runs in a random order. */
  rows: Int32Array;
  /** `runEnds[k]`: number of rows in the first k + 1 runs of the order. */
  runEnds: number[];
}

/**
 * Nested subsamples of whole runs: the runs of the pool in a random order, each run's rows kept
 * together (in increasing row order), so the first k runs of the order are a random draw of k runs
 * and each draw holds the smaller ones. Training on `rows.subarray(0, runEnds[k − 1])` trains on k
 * whole runs.
 * @param groups run index of every row of the data set
 */
export function nestedRunOrder(pool: Int32Array, groups: Int32Array, random: RandomStream): RunOrder {
  // Runs in increasing order of their index, each run's rows in pool order; the shuffle draws the
  // runs' order as one over the sorted run indices would.
  const { starts, rows: byRun } = rowsByValue(groups, pool);
  const runs = Int32Array.from({ length: starts.length - 1 }, (_, r) => r);
  shuffleRows(runs, random);
  const rows = new Int32Array(pool.length);
  const runEnds: number[] = [];
  let end = 0;
  for (const run of runs) {
    for (const row of byRun.subarray(starts[run], starts[run + 1]).sort()) rows[end++] = row;
    runEnds.push(end);
  }
  return { rows, runEnds };
}
