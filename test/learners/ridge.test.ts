import { describe, it, expect } from "vitest";
import { RidgeRegression, resolveRidgeOptions } from "../../src/learners/ridge.js";
import { RandomStream } from "../../src/random.js";
import { DataError, UsageError } from "../../src/errors.js";
import { diabetesSplit } from "./sklearnReference.js";

/**
 * Reference: scikit-learn 1.2.1 (Debian python3-sklearn), scripts/reference/sklearn_learners.py:
 * make_pipeline(StandardScaler(), Ridge(alpha=1.0)) on the diabetes data (Efron et al. 2004,
 * fixtures/open-data/diabetes.csv) with the fixed split; values rounded to 1e-10 in the JSON.
 */
const random = new RandomStream(20261201);

describe("RidgeRegression against scikit-learn's Ridge(alpha=1)", () => {
  // Measured: coefficients, intercept and predictions within 1e-10 (the JSON's rounding).
  it("diabetes: coefficients and intercept within 1e-8 · max(1, |ref|), predictions within 1e-8 · max(1, |ref|)", () => {
    const { ref, training, testFeatures, testRows } = diabetesSplit();
    const model = new RidgeRegression().fit(training, random);
    ref.ridge.coef.forEach((c, j) =>
      expect(Math.abs(model.coefficients[j] - c)).toBeLessThan(1e-8 * Math.max(1, Math.abs(c))),
    );
    expect(Math.abs(model.intercept - ref.ridge.intercept)).toBeLessThan(1e-8 * Math.abs(ref.ridge.intercept));
    const predictions = model.predictValues(testFeatures, testRows.length);
    ref.ridge.predictions.forEach((p, i) =>
      expect(Math.abs(predictions[i] - p)).toBeLessThan(1e-8 * Math.max(1, Math.abs(p))),
    );
  });

  it("diabetes with sex as a text column: predictions match ColumnTransformer + OneHotEncoder to 1e-8", () => {
    // scikit-learn: StandardScaler on the nine numeric columns, OneHotEncoder(handle_unknown="ignore")
    // on sex (two unscaled indicators). Here sex (1 or 2) becomes category index 0 or 1.
    const { data, ref, training, testFeatures, testRows } = diabetesSplit();
    const sex = data.featureNames.indexOf("sex");
    const asText = (features: Float64Array) => features.map((v, i) => (i % data.columns === sex ? v - 1 : v));
    const categories = data.featureNames.map((name) => (name === "sex" ? ["1", "2"] : null));
    const model = new RidgeRegression().fit({ ...training, features: asText(training.features), categories }, random);
    expect(model.preprocessor.outputColumns).toBe(11);
    const predictions = model.predictValues(asText(testFeatures), testRows.length);
    ref.sexAsText.ridgePredictions.forEach((p, i) =>
      expect(Math.abs(predictions[i] - p)).toBeLessThan(1e-8 * Math.max(1, Math.abs(p))),
    );
  });
});

describe("RidgeRegression", () => {
  it("solves a one-feature problem by hand", () => {
    // x = 1, 2, 3 → z = (x − 2)/√(2/3) = −√1.5, 0, √1.5; y = 3, 5, 7 → centered −2, 0, 2.
    // Σz² = 3, Σz·y = 2·√1.5·2 = 4√1.5; w = 4√1.5/(3 + α); b = 5.
    for (const alpha of [0, 1, 10]) {
      const model = new RidgeRegression({ alpha }).fit(
        { features: Float64Array.of(1, 2, 3), rows: 3, columns: 1, targets: Float64Array.of(3, 5, 7) },
        random,
      );
      expect(model.coefficients[0]).toBeCloseTo((4 * Math.sqrt(1.5)) / (3 + alpha), 12);
      expect(model.intercept).toBeCloseTo(5, 12);
    }
  });

  it("with alpha 0 and a duplicated column takes the minimum-norm solution", () => {
    // Two identical columns: XᵀX is singular; the minimum-norm least-squares answer splits the
    // weight equally, and the predictions are still exact for y = 2x + 1.
    const features = Float64Array.of(1, 1, 2, 2, 3, 3, 4, 4);
    const model = new RidgeRegression({ alpha: 0 }).fit(
      { features, rows: 4, columns: 2, targets: Float64Array.of(3, 5, 7, 9) },
      random,
    );
    expect(model.coefficients[0]).toBeCloseTo(model.coefficients[1], 10);
    const predictions = model.predictValues(Float64Array.of(5, 5), 1);
    expect(predictions[0]).toBeCloseTo(11, 10);
  });

  it("resolves options and rejects bad ones", () => {
    expect(resolveRidgeOptions()).toEqual({ alpha: 1 });
    expect(() => resolveRidgeOptions({ alpha: -1 })).toThrow(UsageError);
    expect(new RidgeRegression().withOptions({ alpha: 10 }).options.alpha).toBe(10);
    expect(() => new RidgeRegression().withOptions({ C: 1 })).toThrow(UsageError);
    expect(() =>
      new RidgeRegression().fit(
        { features: Float64Array.of(1), rows: 1, columns: 1, targets: Float64Array.of(Infinity) },
        random,
      ),
    ).toThrow(DataError);
  });
});
