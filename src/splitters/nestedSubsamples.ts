/**
 * Nested stratified subsamples of a training pool: one ordering of the pool such that every prefix
 * keeps the class proportions as closely as whole rows allow. Training on the first n rows of the
 * ordering for increasing n gives nested training sets (each smaller set inside the larger one), so a
 * curve's points differ only by the added rows, not by a fresh draw, which makes the curve smoother
 * for the same number of fits.
 *
 * Construction: shuffle each class; the j-th row of a class with m rows gets the key (j + u) / m with
 * u uniform in [0, 1); sorting all rows by key interleaves the classes in proportion.
 */
import type { RandomStream } from "../random.js";

/**
 * @param pool row indices of the training pool
 * @param labels class index of every row of the data set
 * @returns the pool reordered so that each prefix is a stratified subsample
 */
export function nestedStratifiedOrder(pool: Int32Array, labels: Int32Array, random: RandomStream): Int32Array {
  const byClass = new Map<number, number[]>();
  for (const row of pool) {
    const list = byClass.get(labels[row]);
    if (list) list.push(row);
    else byClass.set(labels[row], [row]);
  }
  const keyed: { row: number; key: number }[] = [];
  for (const cls of [...byClass.keys()].sort((a, b) => a - b)) {
    const rows = random.shuffle(byClass.get(cls) as number[]);
    rows.forEach((row, j) => keyed.push({ row, key: (j + random.uniform()) / rows.length }));
  }
  keyed.sort((a, b) => a.key - b.key || a.row - b.row);
  return Int32Array.from(keyed, (k) => k.row);
}

/**
 * Nested random subsamples for a numeric target (no classes to stratify): the pool in a random order,
 * so that every prefix is a simple random sample of the pool and each prefix holds the shorter ones.
 */
export function nestedRandomOrder(pool: Int32Array, random: RandomStream): Int32Array {
  return Int32Array.from(random.shuffle(Array.from(pool)));
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
  const rowsOf = new Map<number, number[]>();
  for (const row of pool) {
    const list = rowsOf.get(groups[row]);
    if (list) list.push(row);
    else rowsOf.set(groups[row], [row]);
  }
  const runs = random.shuffle([...rowsOf.keys()].sort((a, b) => a - b));
  const rows = new Int32Array(pool.length);
  const runEnds: number[] = [];
  let end = 0;
  for (const run of runs) {
    for (const row of (rowsOf.get(run) as number[]).sort((a, b) => a - b)) rows[end++] = row;
    runEnds.push(end);
  }
  return { rows, runEnds };
}
