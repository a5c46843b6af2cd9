/**
 * Leave-one-group-out: one fold per group (experimental run), holding out that run's rows and
 * training on all the others, as scikit-learn's `LeaveOneGroupOut`. With few runs it is the only
 * grouped design that uses all but one of them for training; it needs no randomness.
 */
import { rowsByValue } from "./rowsByValue.js";
import { splitsFromFoldOf, type Split } from "./split.js";

/**
 * One split per group that has rows, in increasing group index.
 * @param groups group index of each row
 */
export function leaveOneGroupOut(groups: Int32Array): Split[] {
  // Fold f holds out the f-th distinct group index in increasing order.
  const { values, valueIndex } = rowsByValue(groups);
  return splitsFromFoldOf(valueIndex, values.length);
}
