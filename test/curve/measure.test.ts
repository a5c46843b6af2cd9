import { describe, expect, it } from "vitest";
import type { Dataset } from "../../src/data/dataset.js";
import { measureCurve } from "../../src/curve/measure.js";
import { DataError, UsageError } from "../../src/errors.js";
import type { Learner, TrainingSet } from "../../src/learners/learner.js";
import { registerLearner } from "../../src/learners/registry.js";

/**
 * A fake learner whose accuracy is a known function of its training size: on a test fold of m rows
 * it classifies the first round(f(n)·m) rows correctly (it reads the true class from feature 0) and
 * the rest wrongly. It also records the row ids (feature 1) it was trained on.
 */
const knownCurve = (n: number) => 0.9 - 0.5 / Math.sqrt(n);
const trainedOn: number[][] = [];
const fakeLearner: Learner = {
  name: "fake",
  fit(training: TrainingSet) {
    const n = training.rows;
    trainedOn.push(Array.from({ length: n }, (_, i) => training.features[i * training.columns + 1]));
    return {
      predictProbabilities(features: Float64Array, rows: number) {
        const correct = Math.round(knownCurve(n) * rows);
        const out = new Float64Array(rows * 2);
        for (let i = 0; i < rows; i++) {
          const truth = features[i * 2];
          const predicted = i < correct ? truth : 1 - truth;
          out[i * 2 + predicted] = 1;
        }
        return out;
      },
    };
  },
};
registerLearner("fake", () => fakeLearner);

/** 100 rows, classes 50/50, feature 0 = class, feature 1 = row id. */
function dataset(): Dataset {
  const rows = 100;
  const features = new Float64Array(rows * 2);
  const labels = new Int32Array(rows);
  for (let i = 0; i < rows; i++) {
    labels[i] = i % 2;
    features[i * 2] = labels[i];
    features[i * 2 + 1] = i;
  }
  return { features, rows, featureNames: ["truth", "id"], labels, classNames: ["a", "b"] };
}

describe("measureCurve", () => {
  it("warns of a feature column with no value in any row, and only of such columns", async () => {
    const base = dataset();
    // Add a third column, missing in every row, and a fourth, missing in all rows but one.
    const features = new Float64Array(base.rows * 4);
    for (let i = 0; i < base.rows; i++) {
      features[i * 4] = base.features[i * 2];
      features[i * 4 + 1] = base.features[i * 2 + 1];
      features[i * 4 + 2] = NaN;
      features[i * 4 + 3] = i === 7 ? 1 : NaN;
    }
    const data = { ...base, features, featureNames: ["truth", "id", "blank", "once"] };
    const curve = await measureCurve(data, "fake.csv", { repeats: 1, trainingSizes: [20, 40], learner: "fake" });
    expect(curve.warnings).toEqual([
      "column 'blank' has no value in any row and adds nothing to the model; check the file, or ignore it (a column left out of the features)",
    ]);
    const clean = await measureCurve(dataset(), "fake.csv", { repeats: 1, trainingSizes: [20, 40], learner: "fake" });
    expect(clean.warnings).toBeUndefined();
  });

  it("records exactly the score the fake learner's known curve gives at each size", async () => {
    trainedOn.length = 0;
    const sizes = [10, 20, 40, 80];
    const curve = await measureCurve(dataset(), "fake.csv", {
      folds: 5,
      repeats: 3,
      trainingSizes: sizes,
      seed: 4,
      learner: "fake",
    });
    expect(curve.points.map((p) => p.trainingSize)).toEqual(sizes);
    for (const point of curve.points) {
      expect(point.scores).toHaveLength(15);
      // Test folds hold exactly 20 rows (100 rows, 5 folds, classes balanced).
      const expected = Math.round(knownCurve(point.trainingSize) * 20) / 20;
      for (const score of point.scores) expect(score).toBe(expected);
    }
    expect(curve).toMatchObject({ metric: "accuracy", higherIsBetter: true, rows: 100, folds: 5, repeats: 3 });
  });

  it("trains on nested, stratified subsamples of each fold's pool", async () => {
    trainedOn.length = 0;
    await measureCurve(dataset(), "fake.csv", { folds: 5, repeats: 2, trainingSizes: [10, 30, 80], learner: "fake" });
    expect(trainedOn).toHaveLength(2 * 5 * 3);
    for (let task = 0; task < 10; task++) {
      const [small, middle, large] = trainedOn.slice(task * 3, task * 3 + 3);
      expect(middle.slice(0, 10)).toEqual(small);
      expect(large.slice(0, 30)).toEqual(middle);
      // Even ids are class a: each prefix is half each class, to within one row.
      for (const rows of [small, middle, large]) {
        const classA = rows.filter((id) => id % 2 === 0).length;
        expect(Math.abs(classA - rows.length / 2)).toBeLessThanOrEqual(1);
      }
    }
  });

  it("gives the same scores for the same seed", async () => {
    const run = () =>
      measureCurve(dataset(), "fake.csv", { repeats: 2, trainingSizes: [10, 40], seed: 9, learner: "fake" });
    expect(await run()).toEqual(await run());
  });

  it.each([
    [{ folds: 1 }, UsageError, "folds: '1' is neither a whole number of at least 2 nor 'loo'"],
    [{ repeats: 0 }, UsageError, "repeats: '0' is not a whole number of at least 1"],
    [{ trainingSizes: [10, 81] }, UsageError, "training size 81 is larger than the smallest training pool (80 rows"],
    [{ learner: "oracle" }, UsageError, "learner: unknown name 'oracle'"],
    [{ folds: 51 }, DataError, "class 'a' has 50 rows, fewer than folds 51"],
  ])("rejects %o", async (options, errorClass, text) => {
    const attempt = measureCurve(dataset(), "fake.csv", { learner: "fake", ...options });
    await expect(attempt).rejects.toThrow(errorClass);
    await expect(attempt).rejects.toThrow(text);
  });
});
