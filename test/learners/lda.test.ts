import { describe, it, expect } from "vitest";
import { LinearDiscriminant, resolveLdaOptions } from "../../src/learners/lda.js";
import { predictClasses } from "../../src/learners/learner.js";
import { RandomStream } from "../../src/random.js";
import { DataError, UsageError } from "../../src/errors.js";
import { openDataNames, loadOpenData } from "../helpers/openData.js";
import { classificationSplit, largestDifference, reference, selectRows, trainingSetOf } from "./sklearnReference.js";

/**
 * Reference: scikit-learn 1.2.1 (Debian python3-sklearn), scripts/reference/sklearn_learners.py:
 * make_pipeline(StandardScaler(), LinearDiscriminantAnalysis(solver="lsqr", shrinkage="auto")) fitted
 * on the fixed training rows of each open data set, probabilities rounded to 1e-10 in the JSON.
 */
const random = new RandomStream(20261201);

describe("LinearDiscriminant against scikit-learn's LDA(lsqr, auto shrinkage)", () => {
  // Measured: predictions identical on all four sets; probabilities within 5e-11 (the JSON's rounding).
  it.each(openDataNames)("%s: identical test predictions, probabilities within 1e-6", (name) => {
    const { ref, training, testFeatures, testRows } = classificationSplit(name);
    const model = new LinearDiscriminant().fit(training, random);
    const probabilities = model.predictProbabilities(testFeatures, testRows.length);
    expect(Array.from(predictClasses(probabilities, testRows.length, ref.classes.length))).toEqual(ref.lda.predictions);
    expect(largestDifference(probabilities, ref.lda.probabilities!)).toBeLessThan(1e-6);
  });

  // Two training rows per class: no class covariance gets any shrinkage, and on digits (10 classes,
  // 64 features, 20 rows) the pooled covariance is singular, so the minimum-norm solve is exercised.
  // Measured: predictions identical, probabilities within 5e-11.
  it.each(openDataNames)("%s: with two training rows per class, matches scikit-learn's lstsq answer", (name) => {
    const { data, ref, testFeatures } = classificationSplit(name);
    const model = new LinearDiscriminant().fit(trainingSetOf(data, ref.fewRows.trainRows), random);
    const expected = ref.fewRows.lda;
    const rows = expected.predictions.length;
    const probabilities = model.predictProbabilities(testFeatures, rows);
    expect(Array.from(predictClasses(probabilities, rows, ref.classes.length))).toEqual(expected.predictions);
    const first = expected.probabilitiesFirstTestRows.length;
    expect(
      largestDifference(probabilities.subarray(0, first * ref.classes.length), expected.probabilitiesFirstTestRows),
    ).toBeLessThan(1e-6);
  });

  it("reproduces a singular pooled covariance by the minimum-norm solution", () => {
    // Class 0 has one row, class 1 two: neither is shrunk and Σ = (2/3)·S₁ has rank 1.
    // scikit-learn 1.2.1, run by hand: make_pipeline(StandardScaler(), LDA(solver="lsqr",
    // shrinkage="auto")).fit([[0, 1], [2, 0], [1, 3]], [0, 1, 1]).predict_proba([[5, 5], [0, 0], [1, 2]])
    // gave [[0.36156461, 0.63843539], [0.29317811, 0.70682189], [0.36878381, 0.63121619]].
    const model = new LinearDiscriminant().fit(
      {
        features: Float64Array.of(0, 1, 2, 0, 1, 3),
        rows: 3,
        columns: 2,
        labels: Int32Array.of(0, 1, 1),
        classCount: 2,
      },
      random,
    );
    const probabilities = model.predictProbabilities(Float64Array.of(5, 5, 0, 0, 1, 2), 3);
    [0.36156461, 0.63843539, 0.29317811, 0.70682189, 0.36878381, 0.63121619].forEach((p, i) =>
      expect(Math.abs(probabilities[i] - p)).toBeLessThan(1e-8),
    );
  });
});

describe("LinearDiscriminant", () => {
  it("does not depend on the units of a feature", () => {
    // LDA is invariant under per-column affine maps (the preprocessor and the Ledoit–Wolf step both
    // standardize), so rescaling a column leaves the probabilities unchanged up to rounding.
    const d = loadOpenData("wine");
    const rows = [...Array(d.rows).keys()];
    const set = trainingSetOf(d, rows);
    const rescaled = set.features.map((v, i) => (i % d.columns === 4 ? v * 1e4 + 3 : v));
    const a = new LinearDiscriminant().fit(set, random).predictProbabilities(set.features, d.rows);
    const b = new LinearDiscriminant()
      .fit({ ...set, features: rescaled }, random)
      .predictProbabilities(rescaled, d.rows);
    expect(largestDifference(a, Array.from(b))).toBeLessThan(1e-9);
  });

  it("with shrinkage 1 uses a diagonal covariance: a nearest-mean rule weighted by the priors", () => {
    // With δ = 1 each class covariance is (trace S / p)·I, so Σ = c·I and the scores are
    // (μₖ·x − ½‖μₖ‖²)/c + log πₖ: the class whose mean is nearest wins when the priors are equal.
    const features = Float64Array.of(0, 0, 1, 0, 0, 1, 10, 10, 11, 10, 10, 11);
    const model = new LinearDiscriminant({ shrinkage: 1 }).fit(
      { features, rows: 6, columns: 2, labels: Int32Array.of(0, 0, 0, 1, 1, 1), classCount: 2 },
      random,
    );
    const p = model.predictProbabilities(Float64Array.of(2, 2, 9, 9), 2);
    expect(p[0]).toBeGreaterThan(0.5);
    expect(p[3]).toBeGreaterThan(0.5);
    // The coefficients are proportional to the standardized class means.
    const ratio = model.coefficients[0] / model.coefficients[1];
    expect(ratio).toBeCloseTo(1, 12);
  });

  it("gives an absent class probability 0 and one present class probability 1", () => {
    const d = loadOpenData("iris");
    const rows = [...Array(d.rows).keys()];
    const withoutSetosa = rows.filter((r) => d.labels[r] !== 0);
    const p = new LinearDiscriminant()
      .fit(trainingSetOf(d, withoutSetosa), random)
      .predictProbabilities(selectRows(d.features, d.columns, rows), d.rows);
    for (let i = 0; i < d.rows; i++) {
      expect(p[i * 3]).toBe(0);
      expect(p[i * 3 + 1] + p[i * 3 + 2]).toBeCloseTo(1, 12);
    }
    const onlyVirginica = rows.filter((r) => d.labels[r] === 2).slice(0, 5);
    const single = new LinearDiscriminant().fit(trainingSetOf(d, onlyVirginica), random);
    expect(Array.from(single.predictProbabilities(d.features.slice(0, 4), 1))).toEqual([0, 0, 1]);
  });

  it("is deterministic and ignores the random stream", () => {
    const { training, testFeatures, testRows } = classificationSplit("wine");
    const a = new LinearDiscriminant().fit(training, new RandomStream(1));
    const b = new LinearDiscriminant().fit(training, new RandomStream(2));
    expect(Array.from(a.predictProbabilities(testFeatures, testRows.length))).toEqual(
      Array.from(b.predictProbabilities(testFeatures, testRows.length)),
    );
  });

  it("resolves options and rejects bad ones", () => {
    expect(Number.isNaN(resolveLdaOptions().shrinkage)).toBe(true);
    expect(resolveLdaOptions({ shrinkage: 0.5 }).shrinkage).toBe(0.5);
    expect(() => resolveLdaOptions({ shrinkage: 1.5 })).toThrow(UsageError);
    expect(new LinearDiscriminant().withOptions({ shrinkage: 0.2 }).options.shrinkage).toBe(0.2);
    expect(() => new LinearDiscriminant().withOptions({ C: 1 })).toThrow(UsageError);
  });

  it("throws a DataError on a label outside the classes", () => {
    expect(() =>
      new LinearDiscriminant().fit(
        { features: Float64Array.of(1, 2), rows: 2, columns: 1, labels: Int32Array.of(0, 2), classCount: 2 },
        random,
      ),
    ).toThrow(DataError);
  });

  it("uses the reference written by scikit-learn 1.2", () => {
    expect(reference.versions.sklearn).toMatch(/^1\.2\./);
  });
});
