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
import { rowsByValue } from "./rowsByValue.js";
import { shuffleRows } from "./shuffleRows.js";
import { splitsFromFoldOf, type Split } from "./split.js";

/**
 * @param groups group index of each row, in `0 .. groupCount − 1`
 * @param folds number of folds, at least 2 and at most the number of groups that have rows
 * @param random the stream that decides this repeat's folds
 * @throws RangeError when there are fewer groups than folds (the caller checks this first)
 */
export function groupKFold(groups: Int32Array, folds: number, random: RandomStream): Split[] {
  // Groups are numbered by their position among the distinct group indices, in increasing order.
  const { starts, valueIndex } = rowsByValue(groups);
  const groupCount = starts.length - 1;
  if (groupCount < folds) throw new RangeError(`groupKFold: ${groupCount} groups cannot fill ${folds} folds`);
  const rowsOf = (group: number) => starts[group + 1] - starts[group];
  const order = Int32Array.from({ length: groupCount }, (_, g) => g);
  shuffleRows(order, random);
  // Largest first; equal sizes keep their shuffled order (the tie-break on the shuffled position does
  // not rely on the sort being stable).
  const shuffledAt = new Int32Array(groupCount);
  order.forEach((group, position) => (shuffledAt[group] = position));
  order.sort((a, b) => rowsOf(b) - rowsOf(a) || shuffledAt[a] - shuffledAt[b]);
  const foldRank = Int32Array.from({ length: folds }, (_, f) => f);
  shuffleRows(foldRank, random);
  const load = new Float64Array(folds);
  const foldOfGroup = new Int32Array(groupCount);
  for (const group of order) {
    let best = foldRank[0];
    for (const f of foldRank) if (load[f] < load[best]) best = f;
    foldOfGroup[group] = best;
    load[best] += rowsOf(group);
  }
  return splitsFromFoldOf(
    valueIndex.map((group) => foldOfGroup[group]),
    folds,
  );
}
