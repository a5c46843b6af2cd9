/**
 * Plain k-fold without stratification, for numeric targets (regression) where there are no classes
 * to keep in proportion: the rows are shuffled and dealt round-robin to the folds, so fold sizes
 * differ by at most one row (scikit-learn's `KFold(shuffle=True)` has the same invariants; its fold
 * membership differs).
 */
import type { RandomStream } from "../random.js";
import { shuffleRows } from "./shuffleRows.js";
import { splitsFromFoldOf, type Split } from "./split.js";

/**
 * @param rows number of rows in the data set
 * @param folds number of folds, at least 2 and at most `rows`
 * @param random the stream that decides this repeat's folds
 */
export function kFold(rows: number, folds: number, random: RandomStream): Split[] {
  const order = Int32Array.from({ length: rows }, (_, i) => i);
  shuffleRows(order, random);
  const foldOf = new Int32Array(rows);
  for (let position = 0; position < rows; position++) foldOf[order[position]] = position % folds;
  return splitsFromFoldOf(foldOf, folds);
}
