/**
 * Leave-one-out: as many folds as rows, each holding out one row (Lachenbruch and Mickey 1968). It
 * uses every row but one for training, which matters when rows are few; it needs no randomness.
 */
import type { Split } from "./split.js";

/** One split per row, in row order: test = [row], train = every other row in order. */
export function leaveOneOut(rows: number): Split[] {
  return Array.from({ length: rows }, (_, held) => {
    const train = new Int32Array(rows - 1);
    for (let i = 0, j = 0; i < rows; i++) if (i !== held) train[j++] = i;
    return { train, test: Int32Array.of(held) };
  });
}
