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
