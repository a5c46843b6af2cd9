/**
 * Stratified k-fold: each fold holds about 1/k of every class. Rows of each class are shuffled and
 * dealt round-robin to the folds, continuing the deal from one class to the next so fold sizes differ
 * by at most one row. This is the usual construction (e.g. Kohavi 1995, "A study of cross-validation
 * and bootstrap for accuracy estimation and model selection"); fold membership differs from
 * scikit-learn's StratifiedKFold, which allots class counts per fold differently, but the invariants
 * are the same: disjoint test folds covering every row once, class proportions kept.
 */
import type { RandomStream } from "../random.js";
import { rowsByValue } from "./rowsByValue.js";
import { shuffleRows } from "./shuffleRows.js";
import { splitsFromFoldOf, type Split } from "./split.js";

/**
 * @param labels class index of each row
 * @param folds number of folds, at least 2 and at most the number of rows
 * @param random the stream that decides this repeat's folds
 */
export function stratifiedKFold(labels: Int32Array, folds: number, random: RandomStream): Split[] {
  // Classes in increasing order, each class's rows in row order before its shuffle.
  const { starts, rows } = rowsByValue(labels);
  const foldOf = new Int32Array(labels.length);
  let next = random.integer(folds);
  for (let k = 0; k + 1 < starts.length; k++) {
    shuffleRows(rows, random, starts[k], starts[k + 1]);
    for (let i = starts[k]; i < starts[k + 1]; i++) {
      foldOf[rows[i]] = next;
      next = (next + 1) % folds;
    }
  }
  return splitsFromFoldOf(foldOf, folds);
}
