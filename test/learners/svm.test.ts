import { describe, it, expect } from "vitest";
import { LinearSvm, resolveSvmOptions } from "../../src/learners/svm.js";
import { predictClasses } from "../../src/learners/learner.js";
import { RandomStream } from "../../src/random.js";
import { UsageError } from "../../src/errors.js";
import { openDataNames } from "../helpers/openData.js";
import { classificationSplit, largestDifference } from "./sklearnReference.js";

/**
 * Reference: scikit-learn 1.2.1 (Debian python3-sklearn), scripts/reference/sklearn_learners.py:
 * make_pipeline(StandardScaler(), LinearSVC(loss="hinge", dual=True, C=1, tol=1e-8,
 * max_iter=1000000)) fitted on the fixed training rows of each open data set; decision scores rounded
 * to 1e-10. The solution (w, b) of each binary problem is unique, so two solvers stopped at a
 * projected-gradient spread of 1e-8 differ only by their distance from it: scikit-learn against itself
 * with another random_state differs by up to 5e-8 in the scores (digits); we allow 1e-5.
 * Measured: scores within 4.5e-8 (breast cancer, wine, iris) and 8.6e-7 (digits); predictions identical.
 */
const random = new RandomStream(20261201);

describe("LinearSvm against scikit-learn's LinearSVC(loss='hinge')", () => {
  it.each(openDataNames)("%s: identical test predictions, decision scores within 1e-5", (name) => {
    const { ref, training, testFeatures, testRows } = classificationSplit(name);
    const model = new LinearSvm({ tolerance: 1e-8, maxIterations: 1_000_000 }).fit(training, random);
    expect(model.converged).toBe(true);
    const rows = testRows.length;
    const scores = model.decisionScores(testFeatures, rows);
    expect(largestDifference(scores, ref.svm.decisionScores!)).toBeLessThan(1e-5);
    const probabilities = model.predictProbabilities(testFeatures, rows);
    expect(Array.from(predictClasses(probabilities, rows, ref.classes.length))).toEqual(ref.svm.predictions);
  });

  it.each(["breast_cancer", "wine", "iris"] as const)(
    "%s: the default options (LinearSVC's tol 1e-4, 1000 epochs) converge and give the same predictions",
    (name) => {
      // Measured: converged in 240–430 epochs (the count depends on the visiting order), scores within 3e-4.
      const { ref, training, testFeatures, testRows } = classificationSplit(name);
      const model = new LinearSvm().fit(training, random);
      expect(model.converged).toBe(true);
      const probabilities = model.predictProbabilities(testFeatures, testRows.length);
      expect(Array.from(predictClasses(probabilities, testRows.length, ref.classes.length))).toEqual(
        ref.svm.predictions,
      );
      expect(
        largestDifference(model.decisionScores(testFeatures, testRows.length), ref.svm.decisionScores!),
      ).toBeLessThan(1e-3);
    },
  );
});

describe("LinearSvm", () => {
  it("finds the maximum-margin separator of a separable toy problem", () => {
    // 1-D, standardized by the preprocessor: values −2, −1 (class 0) and 1, 2 (class 1) have mean 0
    // and scale √2.5, so z = ±1/√2.5, ±2/√2.5. With the intercept penalized as a weight on a constant
    // 1 and C large, the optimum of ½(w² + b²) subject to y(wz + b) ≥ 1 is b = 0, w = √2.5 (the two
    // inner points on the margin), so the score of x is x itself.
    const model = new LinearSvm({ C: 1e6, tolerance: 1e-10, maxIterations: 100_000 }).fit(
      {
        features: Float64Array.of(-2, -1, 1, 2),
        rows: 4,
        columns: 1,
        labels: Int32Array.of(0, 0, 1, 1),
        classCount: 2,
      },
      random,
    );
    expect(model.weights[0]).toBeCloseTo(Math.sqrt(2.5), 8);
    expect(model.intercepts[0]).toBeCloseTo(0, 8);
    const scores = model.decisionScores(Float64Array.of(-1, 0.5, 3), 3);
    [-1, 0.5, 3].forEach((x, i) => expect(scores[i]).toBeCloseTo(x, 8));
  });

  it("maps scores to probabilities by σ (two classes) and softmax (more), keeping their order", () => {
    const { training, testFeatures, testRows } = classificationSplit("wine");
    const model = new LinearSvm().fit(training, random);
    const rows = testRows.length;
    const scores = model.decisionScores(testFeatures, rows);
    const probabilities = model.predictProbabilities(testFeatures, rows);
    for (let i = 0; i < rows; i++) {
      const s = Array.from(scores.subarray(i * 3, i * 3 + 3));
      const e = s.map((v) => Math.exp(v - Math.max(...s)));
      const total = e.reduce((a, b) => a + b, 0);
      e.forEach((v, k) => expect(probabilities[i * 3 + k]).toBeCloseTo(v / total, 14));
    }
    const binary = classificationSplit("breast_cancer");
    const twoClass = new LinearSvm().fit(binary.training, random);
    const firstRows = binary.testFeatures.slice(0, 3 * binary.training.columns);
    const s = twoClass.decisionScores(firstRows, 3);
    const p = twoClass.predictProbabilities(firstRows, 3);
    for (let i = 0; i < 3; i++) expect(p[i * 2 + 1]).toBeCloseTo(1 / (1 + Math.exp(-s[i])), 14);
  });

  it("gives absent classes probability 0 and fits two present classes as one problem", () => {
    const { data, training, testFeatures, testRows } = classificationSplit("iris");
    const keep = [...Array(training.rows).keys()].filter((i) => training.labels[i] !== 1);
    const subset = {
      ...training,
      rows: keep.length,
      labels: Int32Array.from(keep, (i) => training.labels[i]),
      features: Float64Array.from(keep.flatMap((i) => Array.from(training.features.subarray(i * 4, i * 4 + 4)))),
    };
    const model = new LinearSvm().fit(subset, random);
    expect(Array.from(model.classes)).toEqual([0, 2]);
    expect(model.intercepts.length).toBe(1);
    const p = model.predictProbabilities(testFeatures, testRows.length);
    for (let i = 0; i < testRows.length; i++) expect(p[i * 3 + 1]).toBe(0);
    expect(data.classNames.length).toBe(3);
  });

  it("gives the same model for any random stream once converged (the optimum is unique)", () => {
    const { training, testFeatures, testRows } = classificationSplit("breast_cancer");
    const a = new LinearSvm({ tolerance: 1e-8 }).fit(training, new RandomStream(1));
    const b = new LinearSvm({ tolerance: 1e-8 }).fit(training, new RandomStream(2));
    const sa = a.decisionScores(testFeatures, testRows.length);
    const sb = b.decisionScores(testFeatures, testRows.length);
    expect(largestDifference(sa, Array.from(sb))).toBeLessThan(1e-5);
  });

  it("resolves options and rejects bad ones", () => {
    expect(resolveSvmOptions()).toEqual({ C: 1, tolerance: 1e-4, maxIterations: 1000 });
    expect(() => resolveSvmOptions({ C: 0 })).toThrow(UsageError);
    expect(() => resolveSvmOptions({ maxIterations: 0 })).toThrow(UsageError);
    expect(new LinearSvm().withOptions({ C: 10 }).options.C).toBe(10);
    expect(() => new LinearSvm().withOptions({ alpha: 1 })).toThrow(UsageError);
  });
});
