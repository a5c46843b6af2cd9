/**
 * The learner interface. A learner only fits and predicts; splitting and scoring live elsewhere.
 * Features arrive raw (NaN for missing); each learner's `fit` applies the preprocessing it needs,
 * fitted on its own training rows only.
 */
import type { RandomStream } from "../random.js";

/**
 * Named numeric settings of a learner, e.g. `{ C: 0.1 }` or `{ neighbors: 9 }`: one point of a tuning
 * grid, or the options given to `withOptions`. Plain data, so it can cross to worker threads.
 */
export type LearnerSettings = Readonly<Record<string, number>>;

export interface TrainingSet {
  /** Row-major, `rows × columns`. */
  features: Float64Array;
  rows: number;
  columns: number;
  /** Class index per row, in `0 .. classCount - 1`. */
  labels: Int32Array;
  /** Number of classes in the whole data set (a training subsample may lack some). */
  classCount: number;
  /**
   * For each feature column, its category names when the column held text (the feature value is then
   * the category's index, NaN when missing), or null for a numeric column. Absent: all numeric.
   */
  categories?: readonly (readonly string[] | null)[];
  /**
   * Per feature column, 1 when none of its values is missing in the data set the rows come from (the
   * training rows and every row the model will predict), so that the preprocessing can skip what only
   * imputes (`completeColumns` of preprocess.ts). Absent: any column may hold missing values.
   */
  completeColumns?: Uint8Array;
}

/** Training rows of a regression problem: like TrainingSet, with a numeric target per row. */
export interface RegressionTrainingSet {
  features: Float64Array;
  rows: number;
  columns: number;
  targets: Float64Array;
  categories?: readonly (readonly string[] | null)[];
  /** As {@link TrainingSet.completeColumns}. */
  completeColumns?: Uint8Array;
}

export interface FittedRegressionModel {
  /** Predicted target of each row. */
  predictValues(features: Float64Array, rows: number): Float64Array;
}

/** A learner for numeric targets. */
export interface RegressionLearner {
  readonly name: string;
  readonly task: "regression";
  fit(training: RegressionTrainingSet, random: RandomStream): FittedRegressionModel;
  /** The settings an inner cross-validation tries, as data (absent: nothing to tune). */
  readonly tuningGrid?: readonly LearnerSettings[];
  /**
   * A learner of the same kind with these settings in place of its own (the others kept).
   * @throws UsageError on a setting the learner does not have or a value it cannot take.
   */
  withOptions?(settings: LearnerSettings): RegressionLearner;
}

export interface FittedModel {
  /**
   * Class probabilities for each row: row-major `rows × classCount`.
   * @param features row-major, `rows × columns`
   * @param target where the caller would like them written (at least `rows × classCount` values), to
   *   spare an allocation per prediction: a model may write them into its start and return that view
   *   (then valid only until the caller reuses `target`), or ignore it and return a new array
   */
  predictProbabilities(features: Float64Array, rows: number, target?: Float64Array): Float64Array;
}

export interface Learner {
  /** Our name for the learner, as given to `--learner`. */
  readonly name: string;
  /** Classification learners may say so; absent means classification. */
  readonly task?: "classification";
  /**
   * Fits the model on the training rows. `previous`, when given, is a model this learner fitted on a
   * nested smaller subsample of the same data (the previous training size of one (repeat, fold)); a
   * learner that can use it as a warm start may, others ignore it. Either way the result must depend
   * only on the arguments, so that runs stay reproducible.
   */
  fit(training: TrainingSet, random: RandomStream, previous?: FittedModel): FittedModel;
  /** The settings an inner cross-validation tries, as data (absent: nothing to tune). */
  readonly tuningGrid?: readonly LearnerSettings[];
  /**
   * A learner of the same kind with these settings in place of its own (the others kept).
   * @throws UsageError on a setting the learner does not have or a value it cannot take.
   */
  withOptions?(settings: LearnerSettings): Learner;
}

/** The most probable class of each row (ties go to the lower class index, as numpy's argmax). */
export function predictClasses(probabilities: Float64Array, rows: number, classCount: number): Int32Array {
  const out = new Int32Array(rows);
  for (let i = 0; i < rows; i++) {
    let best = 0;
    let bestP = probabilities[i * classCount];
    for (let k = 1; k < classCount; k++) {
      const p = probabilities[i * classCount + k];
      if (p > bestP) {
        bestP = p;
        best = k;
      }
    }
    out[i] = best;
  }
  return out;
}
