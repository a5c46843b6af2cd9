/**
 * Chooses how the rows are split into training and test folds, from the task, the `--folds` option
 * and the run (group) column. A practitioner's expectations, in order:
 *
 * - With a run column (`--group`) and at least 3 runs, runs are kept whole: grouped k-fold, or
 *   leave-one-run-out when `--folds loo` is given or the folds are at least the runs (then a warning
 *   says so). Samples of one run are correlated, so a run never straddles training and test.
 * - With a run column of fewer than 3 runs, runs cannot be kept whole in a useful way (a grouped split
 *   of 2 runs trains on one run); the rows are split as without a run column, with a warning that the
 *   scores may be optimistic.
 * - Without a run column: leave-one-out when `--folds loo` or the folds equal the rows; otherwise
 *   stratified k-fold for classes and plain shuffled k-fold for a numeric target.
 *
 * Splitters only yield splits; this module only chooses one and says why.
 */
import { UsageError } from "../errors.js";
import { message } from "../messages.js";
import type { RandomStream } from "../random.js";
import { groupKFold } from "./groupKFold.js";
import { kFold } from "./kFold.js";
import { leaveOneGroupOut } from "./leaveOneGroupOut.js";
import { leaveOneOut } from "./leaveOneOut.js";
import type { Split } from "./split.js";
import { stratifiedKFold } from "./stratifiedKFold.js";

export type SplitterName = "stratified-k-fold" | "k-fold" | "leave-one-out" | "grouped-k-fold" | "leave-one-group-out";

/** The fewest runs for which runs are kept whole across training and test. */
export const fewestRunsToKeepWhole = 3;

export interface DesignInput {
  task: "classification" | "regression";
  /** Folds asked for, or "loo" for leave-one-out (leave-one-run-out with a run column). */
  folds: number | "loo";
  rows: number;
  /** Class of each row (classification). */
  labels: Int32Array;
  /** Run of each row, when a run column was given. */
  groups?: Int32Array;
  /** The run column's name, for messages. */
  groupColumn?: string;
  /** Whether training sizes should count whole runs. */
  byRuns: boolean;
}

export interface SplitDesign {
  splitter: SplitterName;
  /** Folds per repeat. */
  folds: number;
  /** Whether runs are kept whole across training and test. */
  grouped: boolean;
  /** Whether training sizes count whole runs (only when grouped). */
  byRuns: boolean;
  /** Runs in the data set, when a run column was given. */
  runs?: number;
  /** What the user should know about the choice (a fallback, fewer folds than asked). */
  warnings: string[];
  /** The splits of one repeat, decided by `random` (unused by leave-one-out designs). */
  splits(random: RandomStream): Split[];
}

/**
 * @throws UsageError when `--by-runs` has no run column, or the folds exceed the rows.
 */
export function chooseDesign(input: DesignInput): SplitDesign {
  const warnings: string[] = [];
  const runs = input.groups === undefined ? undefined : new Set(input.groups).size;
  if (input.byRuns && input.groups === undefined)
    throw new UsageError(message.byRunsNeedsGroup(), { option: "byRuns" });
  const column = input.groupColumn ?? "group";

  if (input.groups !== undefined && runs !== undefined && runs >= fewestRunsToKeepWhole) {
    const groups = input.groups;
    const base = { grouped: true, byRuns: input.byRuns, runs, warnings };
    if (input.folds === "loo" || input.folds >= runs) {
      if (input.folds !== "loo" && input.folds > runs) warnings.push(message.foldsAboveRuns(input.folds, runs, column));
      return { ...base, splitter: "leave-one-group-out", folds: runs, splits: () => leaveOneGroupOut(groups) };
    }
    const folds = input.folds;
    return { ...base, splitter: "grouped-k-fold", folds, splits: (random) => groupKFold(groups, folds, random) };
  }

  const ungrouped = ungroupedDesign(input);
  if (runs !== undefined)
    warnings.push(message.fewRunsFallback(column, runs, ungrouped.splitter.replace(/-/g, " "), input.byRuns));
  return { ...ungrouped, grouped: false, byRuns: false, ...(runs === undefined ? {} : { runs }), warnings };
}

function ungroupedDesign(input: DesignInput): Pick<SplitDesign, "splitter" | "folds" | "splits"> {
  const { rows } = input;
  if (input.folds === "loo" || input.folds === rows) {
    return { splitter: "leave-one-out", folds: rows, splits: () => leaveOneOut(rows) };
  }
  const folds = input.folds;
  if (folds > rows) throw new UsageError(message.foldsAboveRows(folds, rows), { option: "folds" });
  if (input.task === "regression") return { splitter: "k-fold", folds, splits: (random) => kFold(rows, folds, random) };
  const labels = input.labels;
  return { splitter: "stratified-k-fold", folds, splits: (random) => stratifiedKFold(labels, folds, random) };
}
