/**
 * forecast.json: the fitted curve and projections. A public contract; later versions only add keys.
 * Scores are in the metric's own units (accuracy as a fraction 0–1).
 */
export interface Projection {
  trainingSize: number;
  /** Expected score of a model trained on `trainingSize` samples. */
  expected: number;
  /** Interval for the expected score at `level` (central). */
  lower: number;
  upper: number;
  level: number;
  /**
   * Resampled values of the expected score at this size. Draw j of every projection comes from the
   * same refit, so differences between sizes can be taken draw by draw.
   */
  draws: number[];
}

export interface MeasuredSummary {
  trainingSize: number;
  mean: number;
  standardDeviation: number;
  fits: number;
}

export interface BandPoint {
  trainingSize: number;
  expected: number;
  lower: number;
  upper: number;
}

export interface ForecastFile {
  kind: "headroom-forecast";
  version: 1;
  metric: string;
  higherIsBetter: boolean;
  metricRange?: [number, number];
  /** Rows in the data set behind the curve (when known). */
  rows?: number;
  family: string;
  /** Fitted parameters of the point fit, by name. */
  parameters: Record<string, number>;
  measured: MeasuredSummary[];
  largestMeasuredSize: number;
  level: number;
  projections: Projection[];
  /** A smooth curve with its band from the smallest measured size to the largest projection. */
  band: BandPoint[];
  warnings: string[];
  seed: number;
}
