/**
 * curve.json: the measured learning curve. A public contract; later versions only add keys.
 *
 * `points[i].scores` holds one score per fit at that training size, in repeat-major order: the fit
 * of repeat r on fold f is at index `r * folds + f`. A curve brought from elsewhere (CSV) may have no
 * repeat structure; then `repeatOfScore` says which repeat each score belongs to, or is absent.
 */
export interface CurvePoint {
  trainingSize: number;
  scores: number[];
  /** Repeat index of each score, when known and not implied by `folds`. */
  repeatOfScore?: number[];
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
  learner?: string;
  folds?: number;
  repeats?: number;
  seed?: number;
  label?: string;
  group?: string;
  classNames?: string[];
  /** File name (not path) and SHA-256 of the data the curve was measured on. */
  source?: { file: string; sha256: string };
  points: CurvePoint[];
}
