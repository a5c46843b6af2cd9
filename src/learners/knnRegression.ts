/**
 * k-nearest-neighbor regression (`--learner knn-regression`, for numeric targets).
 *
 * It computes what scikit-learn's `KNeighborsRegressor(n_neighbors=k)` does (uniform weights,
 * Euclidean distance), on the features as the {@link Preprocessor} gives them (imputed, standardized,
 * text columns one-hot encoded): the prediction for a row is the mean target of its k nearest
 * training rows. Among training rows at equal distance the earlier one counts (see
 * {@link nearestNeighbors}); with fewer than k training rows, all of them are the neighbors.
 *
 * Written by hand for the reason given in neighbors.ts: the npm package ml-knn takes seconds on
 * 2000 × 60; this is an exact brute-force search on raw Float64Arrays.
 */
import type { RandomStream } from "../random.js";
import type { FittedRegressionModel, LearnerSettings, RegressionLearner, RegressionTrainingSet } from "./learner.js";
import { neighborsTuningGrid, resolveKnnOptions, type KnnOptions, type ResolvedKnnOptions } from "./knn.js";
import { nearestNeighbors } from "./neighbors.js";
import { fitPreprocessor, type Preprocessor } from "./preprocess.js";
import { checkSettingNames } from "./settings.js";
import { checkRegressionSet } from "./trainingChecks.js";

const name = "knn-regression";

/** The k-NN regressor. Deterministic: the random stream is unused. */
export class KNearestNeighborsRegression implements RegressionLearner {
  readonly name = name;
  readonly task = "regression";
  readonly options: ResolvedKnnOptions;
  readonly tuningGrid = neighborsTuningGrid;

  /** @throws UsageError when neighbors is not a whole number of at least 1. */
  constructor(options: KnnOptions = {}) {
    this.options = resolveKnnOptions(options, name);
  }

  /** @throws UsageError on a setting other than `neighbors` or a bad value. */
  withOptions(settings: LearnerSettings): KNearestNeighborsRegression {
    checkSettingNames(name, settings, ["neighbors"]);
    return new KNearestNeighborsRegression({ ...this.options, ...settings });
  }

  /**
   * Fits the preprocessing and keeps the preprocessed training rows and their targets.
   * @throws DataError on a malformed training set (see {@link checkRegressionSet}) or a ±Infinity feature.
   */
  fit(training: RegressionTrainingSet, _random?: RandomStream): FittedKnnRegression {
    checkRegressionSet(name, training);
    const { features, rows, targets } = training;
    const preprocessor = fitPreprocessor(features, rows, training.columns, {
      categories: training.categories,
      completeColumns: training.completeColumns,
    });
    return new FittedKnnRegression(
      preprocessor,
      preprocessor.transform(features, rows),
      rows,
      targets.slice(),
      Math.min(this.options.neighbors, rows),
    );
  }
}

/** A fitted k-NN regressor. */
export class FittedKnnRegression implements FittedRegressionModel {
  constructor(
    /** The encoding, imputation and standardization fitted on the training rows. */
    readonly preprocessor: Preprocessor,
    /** Preprocessed training rows, row-major `trainingRows × outputColumns`. */
    readonly training: Float64Array,
    readonly trainingRows: number,
    /** Target of each training row. */
    readonly targets: Float64Array,
    /** Neighbors averaged: the option, or the number of training rows when fewer. */
    readonly neighbors: number,
  ) {}

  /**
   * The mean target of each row's k nearest training rows.
   * @throws DataError when the features do not hold rows × columns values or a value is ±Infinity.
   */
  predictValues(features: Float64Array, rows: number): Float64Array {
    const k = this.neighbors;
    const x = this.preprocessor.transform(features, rows);
    const nearest = nearestNeighbors(this.training, this.trainingRows, x, rows, this.preprocessor.outputColumns, k);
    const out = new Float64Array(rows);
    for (let i = 0; i < rows; i++) {
      let sum = 0;
      for (let n = 0; n < k; n++) sum += this.targets[nearest[i * k + n]];
      out[i] = sum / k;
    }
    return out;
  }
}
