/**
 * Ridge regression (`--learner ridge`, for numeric targets).
 *
 * It computes what scikit-learn's `Ridge(alpha)` does (with its default intercept and its "cholesky"
 * solver), on the features as the {@link Preprocessor} gives them (imputed, standardized, text columns
 * one-hot encoded): it minimizes
 *
 *     ‖y − X w − b‖² + α ‖w‖²
 *
 * with the intercept b not penalized. The columns and the targets are centered on their training means
 * x̄ and ȳ, the normal equations (XcᵀXc + αI) w = Xcᵀyc are solved by a Cholesky factorization, and
 * b = ȳ − x̄·w. With α = 0 and a singular XcᵀXc, the minimum-norm solution is taken.
 *
 * Written by hand: the fit is one pass forming the p × p normal equations and a Cholesky solve on raw
 * Float64Arrays (src/numerics/linearAlgebra.ts), fast enough for the hundreds of fits of a learning
 * curve.
 */
import type { RandomStream } from "../random.js";
import type { FittedRegressionModel, LearnerSettings, RegressionLearner, RegressionTrainingSet } from "./learner.js";
import { choleskyInPlace, choleskySolveInPlace, minimumNormSolve } from "../numerics/linearAlgebra.js";
import { fitPreprocessor, type Preprocessor } from "./preprocess.js";
import { checkSettingNames, nonNegative } from "./settings.js";
import { checkRegressionSet } from "./trainingChecks.js";

export interface RidgeOptions {
  /** Strength of the L2 penalty (scikit-learn's `alpha`); larger means more shrinkage. @default 1 */
  alpha?: number;
}

export type ResolvedRidgeOptions = Required<RidgeOptions>;

const name = "ridge";

/** Penalties the tuning step tries. */
export const ridgeTuningGrid: readonly LearnerSettings[] = [
  { alpha: 0.01 },
  { alpha: 0.1 },
  { alpha: 1 },
  { alpha: 10 },
  { alpha: 100 },
];

/**
 * Fills in the defaults of {@link RidgeOptions}.
 * @throws UsageError when alpha is not a finite number of at least 0.
 */
export function resolveRidgeOptions(options: RidgeOptions = {}): ResolvedRidgeOptions {
  return { alpha: nonNegative(name, "alpha", options.alpha ?? 1) };
}

/** The ridge-regression learner. Deterministic: the random stream is unused. */
export class RidgeRegression implements RegressionLearner {
  readonly name = name;
  readonly task = "regression";
  readonly options: ResolvedRidgeOptions;
  readonly tuningGrid = ridgeTuningGrid;

  constructor(options: RidgeOptions = {}) {
    this.options = resolveRidgeOptions(options);
  }

  /** @throws UsageError on a setting other than `alpha` or a bad value. */
  withOptions(settings: LearnerSettings): RidgeRegression {
    checkSettingNames(name, settings, ["alpha"]);
    return new RidgeRegression({ ...this.options, ...settings });
  }

  /**
   * Fits the preprocessing, the coefficients and the intercept on the training rows.
   * @throws DataError on a malformed training set (see {@link checkRegressionSet}) or a ±Infinity feature.
   */
  fit(training: RegressionTrainingSet, _random?: RandomStream): FittedRidge {
    checkRegressionSet(name, training);
    const { features, rows, targets } = training;
    const preprocessor = fitPreprocessor(features, rows, training.columns, {
      categories: training.categories,
      completeColumns: training.completeColumns,
    });
    const p = preprocessor.outputColumns;
    const x = preprocessor.transform(features, rows);

    const columnMeans = new Float64Array(p);
    let targetMean = 0;
    for (let i = 0; i < rows; i++) {
      targetMean += targets[i];
      for (let j = 0; j < p; j++) columnMeans[j] += x[i * p + j];
    }
    targetMean /= rows;
    for (let j = 0; j < p; j++) columnMeans[j] /= rows;

    // Normal equations on the centered columns: lower triangle accumulated, then mirrored.
    const gram = new Float64Array(p * p);
    const right = new Float64Array(p);
    const centered = new Float64Array(p);
    for (let i = 0; i < rows; i++) {
      const offset = i * p;
      for (let j = 0; j < p; j++) centered[j] = x[offset + j] - columnMeans[j];
      const y = targets[i] - targetMean;
      for (let a = 0; a < p; a++) {
        const va = centered[a];
        if (va === 0) continue;
        right[a] += va * y;
        const row = a * p;
        for (let b = 0; b <= a; b++) gram[row + b] += va * centered[b];
      }
    }
    for (let a = 0; a < p; a++) {
      gram[a * p + a] += this.options.alpha;
      for (let b = 0; b < a; b++) gram[b * p + a] = gram[a * p + b];
    }
    const factor = gram.slice();
    const coefficients = choleskyInPlace(factor, p)
      ? choleskySolveInPlace(factor, p, right.slice())
      : minimumNormSolve(gram, p, right);
    let intercept = targetMean;
    for (let j = 0; j < p; j++) intercept -= columnMeans[j] * coefficients[j];
    return new FittedRidge(preprocessor, coefficients, intercept);
  }
}

/** A fitted ridge regression. */
export class FittedRidge implements FittedRegressionModel {
  constructor(
    /** The encoding, imputation and standardization fitted on the training rows. */
    readonly preprocessor: Preprocessor,
    /** Coefficients on the preprocessed columns (scikit-learn's `coef_`). */
    readonly coefficients: Float64Array,
    /** The unpenalized intercept (scikit-learn's `intercept_`). */
    readonly intercept: number,
  ) {}

  /**
   * Predicted targets w·x + b.
   * @throws DataError when the features do not hold rows × columns values or a value is ±Infinity.
   */
  predictValues(features: Float64Array, rows: number): Float64Array {
    const x = this.preprocessor.transform(features, rows);
    const p = this.preprocessor.outputColumns;
    const out = new Float64Array(rows);
    for (let i = 0; i < rows; i++) {
      let s = this.intercept;
      for (let j = 0; j < p; j++) s += this.coefficients[j] * x[i * p + j];
      out[i] = s;
    }
    return out;
  }
}
