/**
 * k-nearest-neighbor classification (`--learner knn`).
 *
 * It computes what scikit-learn's `KNeighborsClassifier(n_neighbors=k)` does (uniform weights,
 * Euclidean distance), on the features as the {@link Preprocessor} gives them (imputed, standardized,
 * text columns one-hot encoded): the probability of class c for a row is the fraction of its k nearest
 * training rows that belong to c, so the predicted class is the most common among them (a tie goes to
 * the lower class index, as scikit-learn's mode). Among training rows at equal distance the earlier
 * one counts (see {@link nearestNeighbors}). When the training rows are fewer than k, all of them
 * are the neighbors (scikit-learn would refuse; a small training subsample should still be scored).
 *
 * Written by hand because the npm package ml-knn takes seconds on 2000 × 60 rows × columns when
 * tried; here fitting only stores the preprocessed rows and predicting is an exact
 * brute-force search on raw Float64Arrays.
 */
import type { RandomStream } from "../random.js";
import type { FittedModel, Learner, LearnerSettings, TrainingSet } from "./learner.js";
import { nearestNeighbors } from "./neighbors.js";
import { fitPreprocessor, type Preprocessor } from "./preprocess.js";
import { checkSettingNames, wholeNumber } from "./settings.js";
import { summarizeClasses } from "./trainingChecks.js";

export interface KnnOptions {
  /** Number of neighbors that vote (scikit-learn's `n_neighbors`). @default 5 */
  neighbors?: number;
}

export type ResolvedKnnOptions = Required<KnnOptions>;

const name = "knn";

/** Neighbor counts the tuning step tries (shared with k-NN regression). */
export const neighborsTuningGrid: readonly LearnerSettings[] = [
  { neighbors: 1 },
  { neighbors: 3 },
  { neighbors: 5 },
  { neighbors: 9 },
  { neighbors: 15 },
];

/**
 * Fills in the defaults of {@link KnnOptions}.
 * @throws UsageError when neighbors is not a whole number of at least 1.
 */
export function resolveKnnOptions(options: KnnOptions = {}, learner = name): ResolvedKnnOptions {
  return { neighbors: wholeNumber(learner, "neighbors", options.neighbors ?? 5, 1) };
}

/** The k-NN classifier. Deterministic: the random stream is unused. */
export class KNearestNeighbors implements Learner {
  readonly name = name;
  readonly options: ResolvedKnnOptions;
  readonly tuningGrid = neighborsTuningGrid;

  constructor(options: KnnOptions = {}) {
    this.options = resolveKnnOptions(options);
  }

  /** @throws UsageError on a setting other than `neighbors` or a bad value. */
  withOptions(settings: LearnerSettings): KNearestNeighbors {
    checkSettingNames(name, settings, ["neighbors"]);
    return new KNearestNeighbors({ ...this.options, ...settings });
  }

  /**
   * Fits the preprocessing and keeps the preprocessed training rows.
   * @throws DataError on a malformed training set (see {@link summarizeClasses}) or a ±Infinity feature.
   */
  fit(training: TrainingSet, _random?: RandomStream): FittedKnn {
    summarizeClasses(name, training);
    const { features, rows, labels, classCount } = training;
    const preprocessor = fitPreprocessor(features, rows, training.columns, {
      categories: training.categories,
      completeColumns: training.completeColumns,
    });
    return new FittedKnn(
      classCount,
      preprocessor,
      preprocessor.transform(features, rows),
      rows,
      labels.slice(),
      Math.min(this.options.neighbors, rows),
    );
  }
}

/** A fitted k-NN classifier: the preprocessed training rows and their labels. */
export class FittedKnn implements FittedModel {
  constructor(
    /** Number of classes in the whole data set: the width of the probability rows. */
    readonly classCount: number,
    /** The encoding, imputation and standardization fitted on the training rows. */
    readonly preprocessor: Preprocessor,
    /** Preprocessed training rows, row-major `trainingRows × outputColumns`. */
    readonly training: Float64Array,
    readonly trainingRows: number,
    /** Class of each training row. */
    readonly labels: Int32Array,
    /** Neighbors that vote: the option, or the number of training rows when fewer. */
    readonly neighbors: number,
  ) {}

  /**
   * Class probabilities, row-major `rows × classCount`: the class fractions among the k neighbors.
   * @throws DataError when the features do not hold rows × columns values or a value is ±Infinity.
   */
  predictProbabilities(features: Float64Array, rows: number): Float64Array {
    const { classCount, neighbors: k, labels } = this;
    const x = this.preprocessor.transform(features, rows);
    const nearest = nearestNeighbors(this.training, this.trainingRows, x, rows, this.preprocessor.outputColumns, k);
    const out = new Float64Array(rows * classCount);
    for (let i = 0; i < rows; i++) {
      for (let n = 0; n < k; n++) out[i * classCount + labels[nearest[i * k + n]]] += 1;
      for (let c = 0; c < classCount; c++) out[i * classCount + c] /= k;
    }
    return out;
  }
}
