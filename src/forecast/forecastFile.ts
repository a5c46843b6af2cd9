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
  /** trainingSize ÷ the largest measured training size (above 1: an extrapolation). */
  extrapolationRatio?: number;
  /**
   * The wider interval, at `level`: the score one model trained at this size would show on a test
   * set of `testSize` rows (the file's key), adding the scatter between training samples and the
   * test set's sampling error to the uncertainty of the expected score.
   */
  singleModelLower?: number;
  singleModelUpper?: number;
}

/** One held-back measured size predicted by one family fitted to the sizes up to `fittedUpTo`. */
export interface BacktestPrediction {
  family: string;
  /** Largest training size the family was fitted to. */
  fittedUpTo: number;
  /** The held-back training size predicted. */
  trainingSize: number;
  predicted: number;
  /** Mean score measured at `trainingSize`. */
  measured: number;
}

/** How the families did when fitted to the smaller sizes and asked to predict the larger ones. */
export interface BacktestSummary {
  predictions: BacktestPrediction[];
  /** Root mean square prediction error of each family, in the metric's units. */
  rootMeanSquareError: Record<string, number>;
  /**
   * Each family's extrapolation error, from its backtest errors beyond the noise of the measured
   * means: the standard deviation at ln(extrapolation ratio) = 1, in the metric's units; it grows as
   * the square root of ln(extrapolation ratio).
   */
  extrapolationError: Record<string, number>;
}

/** The inverse question (`--target`): the smallest training size reaching a target score. */
export interface TargetSizeAnswer {
  target: number;
  confidence: number;
  /** Where the expected score first reaches the target; null when not within `searchedUpTo`. */
  expected: number | null;
  /** Where the target is reached with probability at least `confidence`; null when not within `searchedUpTo`. */
  withConfidence: number | null;
  searchedUpTo: number;
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

/** One drawn curve as stored (see storedCurves.ts): parameters, shift and extrapolation in oriented units. */
export interface StoredCurve {
  family: string;
  parameters: number[];
  /** The shift shared by every size, for which samples were collected. */
  shift: number;
  /** The extrapolation error at ln(n / largest measured size) = 1. */
  extrapolation: number;
  /** The learned gain's error per unit of ln(n / L) (0 without a continuation); absent in earlier files. */
  gainError?: number;
}

/** One family's point fit and its weight, in oriented units. */
export interface StoredFit {
  family: string;
  weight: number;
  parameters: number[];
}

export interface ForecastFile {
  kind: "headroom-forecast";
  version: 1;
  metric: string;
  higherIsBetter: boolean;
  metricRange?: [number, number];
  /** Rows in the data set behind the curve (when known). */
  rows?: number;
  /** The family with the largest weight (or the one forced with `--family`). */
  family: string;
  /** Fitted parameters of `family`, by name. */
  parameters: Record<string, number>;
  measured: MeasuredSummary[];
  largestMeasuredSize: number;
  level: number;
  projections: Projection[];
  /** A smooth curve with its band from the smallest measured size to the largest projection. */
  band: BandPoint[];
  warnings: string[];
  seed: number;
  /** Weight of each family in the combined forecast (summing to 1), by family name. */
  familyWeights?: Record<string, number>;
  /** Fitted parameters of every family, by family name, in the metric's units. */
  familyParameters?: Record<string, Record<string, number>>;
  /** The combined forecast's asymptote (weighted over families), in the metric's units. */
  asymptote?: number;
  /** The families' backtest; absent when there were too few sizes for one. */
  backtest?: BacktestSummary;
  /** Largest projected size ÷ largest measured size. */
  extrapolationRatio?: number;
  /**
   * Standard deviation of the shift shared by the whole curve for which samples happened to be
   * collected (Nadeau and Bengio's correction), in the metric's units.
   */
  sampleStandardDeviation?: number;
  /** Test rows behind the single-model interval (`singleModelLower`, `singleModelUpper`). */
  testSize?: number;
  /** Answers to `--target`, when one was given. */
  targetSize?: TargetSizeAnswer;
  /**
   * What the projections were computed from, so that `weigh` can read the forecast at any training
   * size: the drawn curves (draw j of every projection is `drawn[j]`) and the families' point fits.
   * Oriented units: the score times −1 when lower is better. Absent in files of earlier versions.
   */
  curves?: { drawn: StoredCurve[]; fits: StoredFit[] };
  /**
   * The continuation learned from the corpus of measured curves that every draw and the expected
   * score follow beyond the largest measured size (src/forecast/gainCorrection.ts), with the
   * multiplier of the extrapolation error; absent when each family extrapolates by its own formula
   * (`--family`).
   */
  continuation?: {
    ownWeight: number;
    chordWeight: number;
    slopeWeight: number;
    headroomWeight: number;
    spread: number;
    /** Standard deviation of the learned gain's error per unit of ln(n / L); absent in earlier files. */
    gainSpread?: number;
    /**
     * The learner whose corpus curves the numbers were learned from; null: the classification curves
     * of every learner in the corpus (for a learner it did not measure). Absent in earlier files.
     */
    learnedFrom?: string | null;
    /** Smallest measured size (n₁). */
    smallestSize: number;
    /** The metric's best value, in the metric's units; null when unknown. */
    best: number | null;
    /**
     * The factor of the distance left: 1 − 1/K for K classes, 1/2 otherwise (gainCorrection.ts,
     * `guessError`). Absent in earlier files, whose continuation took the distance whole (1).
     */
    guessError?: number;
    /**
     * r of the slope's reliability L / (L + r) (gainCorrection.ts, `reliabilityOf`), in rows. Absent
     * in earlier files, whose continuation took the slope and the distance left whole.
     */
    reliabilitySize?: number;
  };
}
