import { describe, it, expect } from "vitest";
import { KNearestNeighborsRegression } from "../../src/learners/knnRegression.js";
import { RandomStream } from "../../src/random.js";
import { DataError, UsageError } from "../../src/errors.js";
import { diabetesSplit, largestDifference } from "./sklearnReference.js";

/**
 * Reference: scikit-learn 1.2.1 (Debian python3-sklearn), scripts/reference/sklearn_learners.py:
 * make_pipeline(StandardScaler(), KNeighborsRegressor(n_neighbors=5)) on the diabetes data (Efron et
 * al. 2004, fixtures/open-data/diabetes.csv) with the fixed split; predictions rounded to 1e-10.
 */
const random = new RandomStream(20261201);

describe("KNearestNeighborsRegression against scikit-learn's KNeighborsRegressor(5)", () => {
  it("diabetes: test predictions within 1e-8 (means of five targets)", () => {
    // Measured: 0 (the predictions are means of whole numbers, exact to the JSON's rounding).
    const { ref, training, testFeatures, testRows } = diabetesSplit();
    const model = new KNearestNeighborsRegression().fit(training, random);
    expect(
      largestDifference(model.predictValues(testFeatures, testRows.length), ref.knnRegression.predictions),
    ).toBeLessThan(1e-8);
  });

  it("diabetes with sex as a text column: matches scikit-learn's ColumnTransformer + OneHotEncoder", () => {
    // scikit-learn: StandardScaler on the nine numeric columns, OneHotEncoder(handle_unknown="ignore")
    // on sex, whose two indicators are not scaled. Here sex (1 or 2) becomes category index 0 or 1.
    const { data, ref, training, testFeatures, testRows } = diabetesSplit();
    const sex = data.featureNames.indexOf("sex");
    const asText = (features: Float64Array) => features.map((v, i) => (i % data.columns === sex ? v - 1 : v));
    const categories = data.featureNames.map((name) => (name === "sex" ? ["1", "2"] : null));
    const model = new KNearestNeighborsRegression().fit(
      { ...training, features: asText(training.features), categories },
      random,
    );
    const predictions = model.predictValues(asText(testFeatures), testRows.length);
    expect(largestDifference(predictions, ref.sexAsText.knnRegressionPredictions)).toBeLessThan(1e-8);
  });
});

describe("KNearestNeighborsRegression", () => {
  it("averages the k nearest targets, earlier rows winning ties", () => {
    // Training 0, 2, 4, 6 with targets 1, 2, 3, 4; at x = 3, k = 2: rows 1 and 2 (distance 1 each).
    // At x = 1 with k = 2: rows 0 and 1 tie at distance 1 → (1 + 2)/2.
    const model = new KNearestNeighborsRegression({ neighbors: 2 }).fit(
      { features: Float64Array.of(0, 2, 4, 6), rows: 4, columns: 1, targets: Float64Array.of(1, 2, 3, 4) },
      random,
    );
    expect(Array.from(model.predictValues(Float64Array.of(3, 1, 100), 3))).toEqual([2.5, 1.5, 3.5]);
  });

  it("rejects a non-finite target and a bad neighbor count", () => {
    expect(() =>
      new KNearestNeighborsRegression().fit(
        { features: Float64Array.of(0, 1), rows: 2, columns: 1, targets: Float64Array.of(1, NaN) },
        random,
      ),
    ).toThrow(DataError);
    expect(() => new KNearestNeighborsRegression({ neighbors: 0 })).toThrow(UsageError);
    expect(new KNearestNeighborsRegression().withOptions({ neighbors: 3 }).options.neighbors).toBe(3);
  });
});
