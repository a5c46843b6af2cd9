import { describe, it, expect } from "vitest";
import { GaussianNaiveBayes, resolveNaiveBayesOptions } from "../../src/learners/naiveBayes.js";
import { predictClasses } from "../../src/learners/learner.js";
import { RandomStream } from "../../src/random.js";
import { UsageError } from "../../src/errors.js";
import { openDataNames } from "../helpers/openData.js";
import { classificationSplit, trainingSetOf } from "./sklearnReference.js";

/**
 * Reference: scikit-learn 1.2.1 (Debian python3-sklearn), scripts/reference/sklearn_learners.py:
 * make_pipeline(StandardScaler(), GaussianNB()) fitted on the fixed training rows of each open data
 * set; probabilities rounded to 1e-10 in the JSON.
 *
 * Tolerance on probabilities: 1e-6, or 1e-15 × the largest |joint log-likelihood| of the row when
 * that is larger. A feature nearly constant within a class gets a variance of about ε = 1e-9, so a
 * row far from it has joint log-likelihoods near −1e12 (digits test row 318: −6.3e11 for three
 * classes at once); the order of summation alone (numpy's pairwise sums against our running sums)
 * then moves them by about 1e-16 relative, 1e-4 absolute, and the probabilities by as much.
 * Measured: 5e-11 on every row except that one digits row, 3.8e-5 there.
 */
const random = new RandomStream(20261201);

describe("GaussianNaiveBayes against scikit-learn's GaussianNB()", () => {
  it.each(openDataNames)("%s: identical test predictions, probabilities within the stated tolerance", (name) => {
    const { ref, training, testFeatures, testRows } = classificationSplit(name);
    const model = new GaussianNaiveBayes().fit(training, random);
    const rows = testRows.length;
    const classes = ref.classes.length;
    const probabilities = model.predictProbabilities(testFeatures, rows);
    const scores = model.jointLogLikelihoods(testFeatures, rows);
    expect(Array.from(predictClasses(probabilities, rows, classes))).toEqual(ref.naiveBayes.predictions);
    ref.naiveBayes.probabilities!.forEach((row, i) => {
      let largest = 0;
      for (let k = 0; k < classes; k++) largest = Math.max(largest, Math.abs(scores[i * classes + k]));
      const tolerance = Math.max(1e-6, 1e-15 * largest);
      row.forEach((p, k) => expect(Math.abs(probabilities[i * classes + k] - p)).toBeLessThanOrEqual(tolerance));
    });
    // scikit-learn's epsilon_ = 1e-9 × the largest feature variance (≈ 1 after standardizing).
    expect(Math.abs(model.epsilon - ref.naiveBayes.epsilon!)).toBeLessThan(1e-22);
  });

  // Two training rows per class: most within-class variances are tiny or zero and lean on ε.
  it.each(openDataNames)("%s: with two training rows per class, identical predictions", (name) => {
    const { data, ref, testFeatures } = classificationSplit(name);
    const model = new GaussianNaiveBayes().fit(trainingSetOf(data, ref.fewRows.trainRows), random);
    const expected = ref.fewRows.naiveBayes;
    const rows = expected.predictions.length;
    const probabilities = model.predictProbabilities(testFeatures, rows);
    expect(Array.from(predictClasses(probabilities, rows, ref.classes.length))).toEqual(expected.predictions);
    const scores = model.jointLogLikelihoods(testFeatures, rows);
    const classes = ref.classes.length;
    expected.probabilitiesFirstTestRows.forEach((row, i) => {
      let largest = 0;
      for (let k = 0; k < classes; k++) largest = Math.max(largest, Math.abs(scores[i * classes + k]));
      const tolerance = Math.max(1e-6, 1e-15 * largest);
      row.forEach((p, k) => expect(Math.abs(probabilities[i * classes + k] - p)).toBeLessThanOrEqual(tolerance));
    });
  });
});

describe("GaussianNaiveBayes", () => {
  it("computes the normal densities by hand on a small example", () => {
    // One feature, standardized by the preprocessor: x = 0, 2, 4, 6 → z = (x − 3)/√5.
    // Class 0 holds z₀ = −3/√5, −1/√5: mean −2/√5, variance 1/5; class 1 holds 1/√5, 3/√5: mean
    // 2/√5, variance 1/5. ε = 1e-9 × 1 (the variance of z). At x = 3 (z = 0) both classes are
    // equally likely; at x = 1 (z = −2/√5) the ratio is exp(−(4/√5)²/(2(1/5 + ε))) in favour of 0.
    const model = new GaussianNaiveBayes().fit(
      { features: Float64Array.of(0, 2, 4, 6), rows: 4, columns: 1, labels: Int32Array.of(0, 0, 1, 1), classCount: 2 },
      random,
    );
    const p = model.predictProbabilities(Float64Array.of(3, 1), 2);
    expect(p[0]).toBeCloseTo(0.5, 12);
    const variance = 0.2 + 1e-9;
    const ratio = Math.exp(-(16 / 5) / (2 * variance));
    expect(p[3]).toBeCloseTo(ratio / (1 + ratio), 12);
    expect(model.epsilon).toBeCloseTo(1e-9, 20);
  });

  it("when every feature is constant, predicts the class frequencies", () => {
    const model = new GaussianNaiveBayes().fit(
      { features: Float64Array.of(7, 7, 7, 7), rows: 4, columns: 1, labels: Int32Array.of(0, 1, 1, 1), classCount: 2 },
      random,
    );
    const p = model.predictProbabilities(Float64Array.of(7, 8), 2);
    expect(p[0]).toBeCloseTo(0.25, 12);
    expect(p[1]).toBeCloseTo(0.75, 12);
    // Off the constant both classes are equally far: the priors still decide. Both joint
    // log-likelihoods are about −5e8 there (1²/ε/2), whose rounding (ulp 6e-8) limits the agreement.
    expect(Math.abs(p[2] - 0.25)).toBeLessThan(1e-7);
  });

  it("gives an absent class probability 0", () => {
    const model = new GaussianNaiveBayes().fit(
      { features: Float64Array.of(0, 1, 5, 6), rows: 4, columns: 1, labels: Int32Array.of(0, 0, 2, 2), classCount: 3 },
      random,
    );
    const p = model.predictProbabilities(Float64Array.of(0.5), 1);
    expect(p[1]).toBe(0);
    expect(p[0] + p[2]).toBeCloseTo(1, 12);
  });

  it("resolves options and rejects bad ones", () => {
    expect(resolveNaiveBayesOptions()).toEqual({ varSmoothing: 1e-9 });
    expect(() => resolveNaiveBayesOptions({ varSmoothing: -1 })).toThrow(UsageError);
    const tuned = new GaussianNaiveBayes().withOptions({ varSmoothing: 0.01 });
    expect(tuned.options.varSmoothing).toBe(0.01);
    expect(() => new GaussianNaiveBayes().withOptions({ alpha: 1 })).toThrow(UsageError);
  });
});
