/**
 * Grouped k-fold: whole groups (experimental runs, batches) go to the folds, so the rows of one run
 * are never split between training and test. Samples of one run share its conditions (calibration,
 * season, operator) and are correlated; letting a run straddle training and test would score the
 * model on near-copies of its training rows and make the curve optimistic.
 *
 * Assignment: the groups are shuffled, then sorted by row count, largest first (the shuffle decides
 * the order among groups of equal size); each in turn goes to the fold holding the fewest rows so far,
 * ties going to the earlier fold of a shuffled fold order. This is the longest-processing-time rule
 * (Graham 1969), as scikit-learn's `GroupKFold` uses without the shuffles; it keeps the folds' row
 * counts within one largest group of each other.
 */
import type { RandomStream } from "../random.js";
import { splitsFromFoldOf, type Split } from "./split.js";

/**
 * @param groups group index of each row, in `0 .. groupCount − 1`
 * @param folds number of folds, at least 2 and at most the number of groups that have rows
 * @param random the stream that decides this repeat's folds
 * @throws RangeError when there are fewer groups than folds (the caller checks this first)
 */
export function groupKFold(groups: Int32Array, folds: number, random: RandomStream): Split[] {
  const rowsOf = new Map<number, number>();
  for (const group of groups) rowsOf.set(group, (rowsOf.get(group) ?? 0) + 1);
  if (rowsOf.size < folds) throw new RangeError(`groupKFold: ${rowsOf.size} groups cannot fill ${folds} folds`);
  const order = random.shuffle([...rowsOf.keys()].sort((a, b) => a - b));
  // Array.prototype.sort is stable: equal sizes keep their shuffled order.
  order.sort((a, b) => (rowsOf.get(b) as number) - (rowsOf.get(a) as number));
  const foldRank = random.shuffle(Array.from({ length: folds }, (_, f) => f));
  const load = new Array<number>(folds).fill(0);
  const foldOfGroup = new Map<number, number>();
  for (const group of order) {
    let best = foldRank[0];
    for (const f of foldRank) if (load[f] < load[best]) best = f;
    foldOfGroup.set(group, best);
    load[best] += rowsOf.get(group) as number;
  }
  return splitsFromFoldOf(
    Int32Array.from(groups, (group) => foldOfGroup.get(group) as number),
    folds,
  );
}
