/**
 * The curve loop's split designs, numeric targets, undefined metrics and tuning, checked with fake
 * learners whose scores are known functions of what they are given (STYLE.md's fake-learner habit),
 * so every expected number below follows from the design alone.
 */
import { describe, expect, it } from "vitest";
import type { Dataset } from "../../src/data/dataset.js";
import { measureCurve, type MeasureOptions } from "../../src/curve/measure.js";
import { DataError, UsageError } from "../../src/errors.js";
import type {
  Learner,
  LearnerSettings,
  RegressionLearner,
  RegressionTrainingSet,
  TrainingSet,
} from "../../src/learners/learner.js";
import { registerLearner, registerRegressionLearner } from "../../src/learners/registry.js";

/** What one fit saw: the row ids (feature 1) it was trained on and those it was asked to predict. */
interface FitCall {
  train: number[];
  predicted: number[];
  settings?: LearnerSettings;
}
const calls: FitCall[] = [];
const idsOf = (features: Float64Array, rows: number, columns: number) =>
  Array.from({ length: rows }, (_, i) => features[i * columns + 1]);

/** Predicts every row's true class (feature 0) with probability 1, and records its calls. */
const recorder: Learner = {
  name: "recorder",
  fit(training: TrainingSet) {
    const call: FitCall = { train: idsOf(training.features, training.rows, training.columns), predicted: [] };
    calls.push(call);
    return {
      predictProbabilities(features: Float64Array, rows: number) {
        call.predicted.push(...idsOf(features, rows, 2));
        const out = new Float64Array(rows * 2);
        for (let i = 0; i < rows; i++) out[i * 2 + features[i * 2]] = 1;
        return out;
      },
    };
  },
};
registerLearner("recorder", () => recorder);

/**
 * A regression learner whose predictions miss the true target (feature 0) by exactly 1/n, n its
 * training rows: its RMSE and MAE on any held-out fold are 1/n.
 */
const regressionFake: RegressionLearner = {
  name: "regression-fake",
  task: "regression",
  fit(training: RegressionTrainingSet) {
    const n = training.rows;
    calls.push({ train: idsOf(training.features, n, training.columns), predicted: [] });
    return {
      predictValues: (features: Float64Array, rows: number) =>
        Float64Array.from({ length: rows }, (_, i) => features[i * 2] + 1 / n),
    };
  },
};
registerRegressionLearner("regression-fake", () => regressionFake);

/**
 * A tunable fake: setting `k` 0 scores accuracy 0.8 at any training size; `k` 1 scores 0.95 when
 * trained on at least 30 rows and 0.5 below. So an inner cross-validation on n rows (inner training
 * sets of about 2n/3) should pick k = 0 for n = 20 and k = 1 for n = 80.
 */
function tunable(k: number): Learner {
  return {
    name: "tunable",
    tuningGrid: [{ k: 0 }, { k: 1 }],
    withOptions: (settings: LearnerSettings) => tunable(settings.k),
    fit(training: TrainingSet) {
      const n = training.rows;
      const call: FitCall = { train: idsOf(training.features, n, training.columns), predicted: [], settings: { k } };
      calls.push(call);
      const rate = k === 0 ? 0.8 : n >= 30 ? 0.95 : 0.5;
      return {
        predictProbabilities(features: Float64Array, rows: number) {
          call.predicted.push(...idsOf(features, rows, 2));
          const correct = Math.round(rate * rows);
          const out = new Float64Array(rows * 2);
          for (let i = 0; i < rows; i++) {
            const truth = features[i * 2];
            out[i * 2 + (i < correct ? truth : 1 - truth)] = 1;
          }
          return out;
        },
      };
    },
  };
}
registerLearner("tunable", () => tunable(0));

/** `rows` rows, classes alternating, feature 0 = class, feature 1 = row id; runs of `runSize` rows. */
function dataset(rows = 100, runSize?: number): Dataset {
  const features = new Float64Array(rows * 2);
  const labels = new Int32Array(rows);
  for (let i = 0; i < rows; i++) {
    labels[i] = i % 2;
    features[i * 2] = labels[i];
    features[i * 2 + 1] = i;
  }
  const data: Dataset = { features, rows, featureNames: ["truth", "id"], labels, classNames: ["a", "b"] };
  if (runSize !== undefined) {
    data.groups = Int32Array.from({ length: rows }, (_, i) => Math.floor(i / runSize));
    data.groupNames = Array.from({ length: Math.ceil(rows / runSize) }, (_, g) => `run${g}`);
  }
  return data;
}

const runOf = (id: number, runSize: number) => Math.floor(id / runSize);

describe("leave-one-out", () => {
  it("holds out every row once per repeat and trains on nested subsamples of the rest", async () => {
    calls.length = 0;
    const curve = await measureCurve(dataset(30), "d.csv", {
      folds: "loo",
      repeats: 2,
      trainingSizes: [10, 29],
      learner: "recorder",
    });
    expect(curve).toMatchObject({ splitter: "leave-one-out", folds: 30, unit: "rows" });
    expect(curve.points.map((p) => p.scores.length)).toEqual([60, 60]);
    expect(calls).toHaveLength(2 * 30 * 2);
    for (let task = 0; task < 60; task++) {
      const [small, whole] = [calls[2 * task], calls[2 * task + 1]];
      expect(whole.predicted).toEqual([task % 30]);
      expect(whole.train).toHaveLength(29);
      expect(whole.train).not.toContain(task % 30);
      expect(whole.train.slice(0, 10)).toEqual(small.train);
    }
  });

  it("refuses ROC AUC, undefined on every one-row test fold", async () => {
    const attempt = measureCurve(dataset(30), "d.csv", { folds: "loo", learner: "recorder", metric: "roc_auc" });
    await expect(attempt).rejects.toThrow(DataError);
    await expect(attempt).rejects.toThrow("metric: roc_auc is undefined on every test fold");
  });
});

describe("runs kept whole (--group)", () => {
  it("never trains on a run it tests on, with grouped 5-fold on 10 runs", async () => {
    calls.length = 0;
    const curve = await measureCurve(dataset(100, 10), "d.csv", {
      folds: 5,
      repeats: 2,
      trainingSizes: [20, 80],
      learner: "recorder",
    });
    expect(curve).toMatchObject({ splitter: "grouped-k-fold", folds: 5, runs: 10, rowsPerRun: 10, unit: "rows" });
    expect(calls).toHaveLength(2 * 5 * 2);
    for (const call of calls) {
      const testRuns = new Set(call.predicted.map((id) => runOf(id, 10)));
      expect(testRuns.size).toBe(2);
      expect(call.train.filter((id) => testRuns.has(runOf(id, 10)))).toEqual([]);
    }
  });

  it("measures against whole runs with byRuns: sizes in runs, training sets of whole runs", async () => {
    calls.length = 0;
    const curve = await measureCurve(dataset(100, 10), "d.csv", {
      folds: "loo",
      repeats: 1,
      learner: "recorder",
      byRuns: true,
    });
    // Leave-one-run-out on 10 runs: pools of 9 runs; default sizes 1..9 runs, geometric, made distinct.
    expect(curve).toMatchObject({ splitter: "leave-one-group-out", folds: 10, unit: "runs", runs: 10, rowsPerRun: 10 });
    const sizes = curve.points.map((p) => p.trainingSize);
    expect(sizes).toEqual([1, 2, 3, 4, 5, 7, 9]);
    for (let task = 0; task < 10; task++) {
      const fits = calls.slice(task * sizes.length, (task + 1) * sizes.length);
      fits.forEach((fit, s) => {
        const runs = new Set(fit.train.map((id) => runOf(id, 10)));
        expect(runs.size).toBe(sizes[s]);
        expect(fit.train).toHaveLength(10 * sizes[s]);
        expect(runs.has(task)).toBe(false);
        expect(new Set(fit.predicted.map((id) => runOf(id, 10)))).toEqual(new Set([task]));
        if (s > 0) expect(fit.train.slice(0, fits[s - 1].train.length)).toEqual(fits[s - 1].train);
      });
    }
  });

  it("uses leave-one-run-out when the folds exceed the runs, and says so", async () => {
    const curve = await measureCurve(
      dataset(100, 25),
      "d.csv",
      { folds: 5, repeats: 1, learner: "recorder" },
      { group: "run" },
    );
    expect(curve).toMatchObject({ splitter: "leave-one-group-out", folds: 4 });
    expect(curve.warnings).toEqual([
      "5 folds are more than the 4 runs in 'run': leave-one-run-out (4 folds) is used instead",
    ]);
  });

  it("falls back to stratified k-fold on rows with fewer than 3 runs, with a warning", async () => {
    const curve = await measureCurve(
      dataset(100, 50),
      "d.csv",
      { repeats: 1, learner: "recorder", byRuns: true },
      { group: "run" },
    );
    expect(curve).toMatchObject({ splitter: "stratified-k-fold", folds: 5, unit: "rows", runs: 2 });
    expect(curve.warnings?.[0]).toMatch(/^the run column 'run' has only 2 runs: .* scores may be optimistic/);
  });

  it.each<[MeasureOptions, typeof UsageError, string]>([
    [
      { byRuns: true, trainingSizes: [9] },
      UsageError,
      "trainingSizes: training size 9 runs is more than the smallest training pool (8 runs",
    ],
    [{ byRuns: true, folds: "loo" }, DataError, "3 runs in 'run' are too few"],
  ])("rejects %o", async (options, errorClass, text) => {
    const data = options.folds === "loo" ? dataset(30, 10) : dataset(100, 10);
    const attempt = measureCurve(data, "d.csv", { learner: "recorder", ...options }, { group: "run" });
    await expect(attempt).rejects.toThrow(errorClass);
    await expect(attempt).rejects.toThrow(text);
  });

  it("leaves out the folds where ROC AUC is undefined, recording each score's repeat", async () => {
    // Runs of 10 rows; run 0 holds only class a, so a test fold of run 0 alone has one class.
    const data = dataset(100, 10);
    for (let i = 0; i < 10; i++) {
      data.labels[i] = 0;
      data.features[i * 2] = 0;
    }
    const curve = await measureCurve(data, "d.csv", {
      folds: "loo",
      repeats: 2,
      trainingSizes: [20, 40],
      learner: "recorder",
      metric: "roc_auc",
    });
    // Leave-one-run-out: of the 10 folds per repeat, run 0's is undefined.
    expect(curve.points[0].scores).toEqual(new Array(18).fill(1));
    expect(curve.points[0].repeatOfScore).toEqual([...new Array(9).fill(0), ...new Array(9).fill(1)]);
    expect(curve.warnings).toEqual([
      "the metric roc_auc is undefined on 2 of 20 test folds (first: ROC AUC needs every class in the test fold; class 1 is absent); their fits are left out, and each point's repeatOfScore says which repeat each score is from",
    ]);
  });
});

describe("numeric targets (regression)", () => {
  /** 60 rows, target = feature 0 = 3·id, feature 1 = id. */
  function regressionData(): Dataset {
    const rows = 60;
    const features = new Float64Array(rows * 2);
    const targets = new Float64Array(rows);
    for (let i = 0; i < rows; i++) {
      targets[i] = 3 * i;
      features[i * 2] = targets[i];
      features[i * 2 + 1] = i;
    }
    return { features, rows, featureNames: ["x", "id"], labels: new Int32Array(0), classNames: [], targets };
  }

  it.each(["rmse", "mae"])("records %s = 1/n exactly at every size, with plain k-fold", async (metric) => {
    calls.length = 0;
    const curve = await measureCurve(regressionData(), "r.csv", {
      repeats: 2,
      learner: "regression-fake",
      metric,
      trainingSizes: [10, 20, 48],
    });
    expect(curve).toMatchObject({ task: "regression", splitter: "k-fold", higherIsBetter: false, unit: "rows" });
    expect(curve.metricRange).toBeUndefined();
    expect(curve.classNames).toBeUndefined();
    for (const point of curve.points) {
      // To 1e-12: (y + 1/n) − y rounds at the ulp of y ≤ 177 (about 3e-14).
      for (const score of point.scores) expect(Math.abs(score - 1 / point.trainingSize)).toBeLessThan(1e-12);
    }
    // Nested random subsamples: each smaller training set is the start of the larger one.
    for (let task = 0; task < 10; task++) {
      const [a, b, c] = calls.slice(task * 3, task * 3 + 3).map((call) => call.train);
      expect(b.slice(0, 10)).toEqual(a);
      expect(c.slice(0, 20)).toEqual(b);
    }
  });

  it("defaults the metric to rmse for a regression learner, and sizes from 10 rows", async () => {
    const curve = await measureCurve(regressionData(), "r.csv", { repeats: 1, learner: "regression-fake" });
    expect(curve.metric).toBe("rmse");
    expect(curve.points[0].trainingSize).toBe(10);
    expect(curve.points[curve.points.length - 1].trainingSize).toBe(48);
  });

  it.each([
    [
      { learner: "regression-fake", metric: "accuracy" },
      "metric: 'accuracy' is for classification, but the task is regression",
    ],
    [
      { task: "regression" as const, learner: "recorder" },
      "learner: 'recorder' is for classification, but the task is regression",
    ],
    [{ learner: "recorder" }, "task: the data set was read for regression, not classification"],
    [
      { learner: "regression-fake", trainingSizes: [1, 10] },
      "trainingSizes: training size 1 is too small to fit a numeric target",
    ],
  ])("rejects %o", async (options, text) => {
    const attempt = measureCurve(regressionData(), "r.csv", options);
    await expect(attempt).rejects.toThrow(UsageError);
    await expect(attempt).rejects.toThrow(text);
  });
});

describe("tuning (tune: true)", () => {
  it("picks the setting that is best at each size by inner cross-validation on the training rows only", async () => {
    calls.length = 0;
    const curve = await measureCurve(dataset(), "d.csv", {
      folds: 5,
      repeats: 2,
      trainingSizes: [20, 80],
      learner: "tunable",
      tune: true,
    });
    expect(curve.tuning).toEqual({ grid: [{ k: 0 }, { k: 1 }], innerFolds: 3 });
    // Size 20: inner training sets of ~13 rows, k = 0 wins (0.8 vs 0.5); outer score 0.8 on 20 rows.
    expect(curve.points[0].settingsOfScore).toEqual(new Array(10).fill(0));
    expect(curve.points[0].scores).toEqual(new Array(10).fill(0.8));
    // Size 80: inner training sets of ~53 rows, k = 1 wins (0.95 vs 0.8); outer score 19/20.
    expect(curve.points[1].settingsOfScore).toEqual(new Array(10).fill(1));
    expect(curve.points[1].scores).toEqual(new Array(10).fill(0.95));
    // Per task and size: 2 settings × 3 inner fits, then the refit. The inner fits train and predict
    // only within the refit's training rows, each inner pair disjoint; the refit predicts the test fold.
    expect(calls).toHaveLength(10 * 2 * 7);
    for (let block = 0; block < 20; block++) {
      const inner = calls.slice(block * 7, block * 7 + 6);
      const refit = calls[block * 7 + 6];
      const training = new Set(refit.train);
      for (const call of inner) {
        expect([...call.train, ...call.predicted].every((id) => training.has(id))).toBe(true);
        expect(call.predicted.filter((id) => call.train.includes(id))).toEqual([]);
      }
      expect(refit.predicted.filter((id) => training.has(id))).toEqual([]);
      expect(refit.predicted).toHaveLength(20);
    }
  });

  it("is a no-op with a warning for a learner without a tuning grid", async () => {
    const curve = await measureCurve(dataset(), "d.csv", {
      repeats: 1,
      trainingSizes: [20, 40],
      learner: "recorder",
      tune: true,
    });
    expect(curve.tuning).toBeUndefined();
    expect(curve.points[0].settingsOfScore).toBeUndefined();
    expect(curve.warnings).toEqual([
      "tuning: learner 'recorder' has no tuning grid yet, so it was measured with its default settings",
    ]);
  });
});
