/**
 * curve.json: the measured learning curve. A public contract; later versions only add keys.
 *
 * `points[i].scores` holds one score per fit at that training size, in repeat-major order: the fit
 * of repeat r on fold f is at index `r * folds + f`. When some folds were left out (the metric is
 * undefined on them, e.g. ROC AUC on a test fold lacking a class) or a curve is brought from
 * elsewhere (CSV), `repeatOfScore` says which repeat each score belongs to, or is absent.
 */
export interface CurvePoint {
  trainingSize: number;
  scores: number[];
  /** Repeat index of each score, when known and not implied by `folds`. */
  repeatOfScore?: number[];
  /**
   * With tuning: for each score, the index into `tuning.grid` of the settings the inner
   * cross-validation chose for that fit (−1: the learner's defaults, no inner fold could be scored).
   */
  settingsOfScore?: number[];
}

export interface CurveFile {
  /** Identifies the file's kind and schema version. */
  kind: "headroom-curve";
  version: 1;
  metric: string;
  higherIsBetter: boolean;
  /** Lowest and highest possible score of the metric, when bounded. */
  metricRange?: [number, number];
  /** Rows in the data set that was measured. */
  rows: number;
  /** Classes (classification) or a numeric target (regression); absent in older files: classification. */
  task?: "classification" | "regression";
  /** The learner's name; "trainer" when the user's own program fitted (`--trainer`). */
  learner?: string;
  /** The shell command of the user's own trainer, when it fitted. */
  trainer?: string;
  /** Folds per repeat (for leave-one-out designs, the rows or the runs). */
  folds?: number;
  repeats?: number;
  seed?: number;
  label?: string;
  group?: string;
  /**
   * How the rows were split: "stratified-k-fold", "k-fold" (numeric target), "leave-one-out",
   * "grouped-k-fold" or "leave-one-group-out" (runs kept whole across training and test).
   */
  splitter?: string;
  /** What `trainingSize` counts: rows (default) or whole runs (`--by-runs`). */
  unit?: "rows" | "runs";
  /** Runs (distinct values of the group column) in the data set, when a group column was given. */
  runs?: number;
  /** Mean rows per run (`rows / runs`), to convert sizes in runs to rows. */
  rowsPerRun?: number;
  /** With `--tune`: the settings the inner cross-validation chose from, and its folds. */
  tuning?: { grid: Record<string, number>[]; innerFolds: number };
  classNames?: string[];
  /**
   * Rows of each class in the data set measured, in `classNames` order. Absent in older files and
   * in curves brought as CSV.
   */
  classCounts?: number[];
  /** What the user should know about how the curve was measured (fallbacks, left-out folds). */
  warnings?: string[];
  /** File name (not path) and SHA-256 of the data the curve was measured on. */
  source?: { file: string; sha256: string };
  points: CurvePoint[];
}
