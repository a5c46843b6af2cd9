import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import {
  accuracy,
  brier,
  findMetric,
  logLoss,
  metricRangeFor,
  metrics,
  rocAuc,
  type ClassificationMetric,
  type RegressionMetric,
} from "../../src/curve/metrics.js";
import { fixturePath } from "../helpers/openData.js";

/**
 * Reference values: fixtures/reference/sklearn-metrics.json, written by
 * scripts/reference/sklearn_metrics.py with Debian's python3-sklearn 1.2.1 (numpy 1.24.2); the
 * multiclass Brier score there is Brier's formula evaluated with numpy (scikit-learn 1.2 has none).
 */
interface Reference {
  classification: Record<
    string,
    { labels: number[]; probabilities: number[][]; classCount: number; expected: Record<string, number | null> }
  >;
  regression: Record<string, { targets: number[]; predictions: number[]; expected: Record<string, number | null> }>;
}
const reference = JSON.parse(readFileSync(fixturePath("reference", "sklearn-metrics.json"), "utf8")) as Reference;

const tolerance = 1e-12;
const classificationMetrics = metrics.filter((m): m is ClassificationMetric => m.task === "classification");
const regressionMetrics = metrics.filter((m): m is RegressionMetric => m.task === "regression");

describe("classification metrics equal scikit-learn 1.2's to 1e-12 (sklearn-metrics.json)", () => {
  const cases = Object.entries(reference.classification).flatMap(([name, c]) =>
    classificationMetrics.map((metric) => ({ name, metric: metric.name, c })),
  );
  it.each(cases)("$metric on $name", ({ metric: metricName, c }) => {
    const metric = findMetric(metricName) as ClassificationMetric;
    const labels = Int32Array.from(c.labels);
    const probabilities = Float64Array.from(c.probabilities.flat());
    const expected = c.expected[metricName];
    const reason = metric.undefinedOn?.(labels, c.classCount);
    if (expected === null) {
      // scikit-learn raises here; headroom calls the score undefined on this fold.
      expect(reason).toBeTypeOf("string");
      return;
    }
    expect(reason).toBeUndefined();
    const value = metric.score(labels, probabilities, c.classCount);
    expect(Math.abs(value - (expected as number))).toBeLessThanOrEqual(tolerance * Math.max(1, Math.abs(expected!)));
  });
});

describe("regression metrics equal scikit-learn 1.2's to 1e-12 (sklearn-metrics.json)", () => {
  const cases = Object.entries(reference.regression).flatMap(([name, c]) =>
    regressionMetrics.map((metric) => ({ name, metric: metric.name, c })),
  );
  it.each(cases)("$metric on $name", ({ metric: metricName, c }) => {
    const metric = findMetric(metricName) as RegressionMetric;
    const targets = Float64Array.from(c.targets);
    const expected = c.expected[metricName];
    const reason = metric.undefinedOn?.(targets);
    if (expected === null) {
      expect(reason).toBeTypeOf("string");
      return;
    }
    expect(reason).toBeUndefined();
    const value = metric.score(targets, Float64Array.from(c.predictions));
    expect(Math.abs(value - (expected as number))).toBeLessThanOrEqual(tolerance * Math.max(1, Math.abs(expected!)));
  });

  it("covers every metric in the reference file", () => {
    const names = new Set(
      [...Object.values(reference.classification), ...Object.values(reference.regression)].flatMap((c) =>
        Object.keys(c.expected),
      ),
    );
    for (const metric of metrics) expect(names.has(metric.name)).toBe(true);
  });
});

describe("metric details", () => {
  it("gives the worked value of a 2 × 2 ROC AUC with one tie by hand", () => {
    // Positives score 0.8 and 0.4, negatives 0.4 and 0.1: of the 4 (positive, negative) pairs, 3 are
    // ordered right and 1 ties (counts one half), so AUC = 3.5 / 4 (worked by hand).
    const labels = Int32Array.from([1, 1, 0, 0]);
    const p1 = [0.8, 0.4, 0.4, 0.1];
    const probabilities = Float64Array.from(p1.flatMap((p) => [1 - p, p]));
    expect(rocAuc.score(labels, probabilities, 2)).toBe(0.875);
  });

  it("clips a probability of 0 for the true class at the machine epsilon in log loss", () => {
    // −ln(2⁻⁵²) = 52·ln 2 = 36.0436533891171... (the row [1 − ε, ε] sums to 1 exactly).
    const value = logLoss.score(Int32Array.from([1]), Float64Array.from([1, 0]), 2);
    expect(value).toBeCloseTo(52 * Math.LN2, 12);
  });

  it.each([
    [2, [0, 1]],
    [3, [0, 2]],
  ])("records the Brier range for %i classes as %o", (classCount, range) => {
    expect(metricRangeFor(brier, classCount)).toEqual(range);
  });

  it("knows each metric's direction and leaves unbounded ranges out", () => {
    const directions = Object.fromEntries(metrics.map((m) => [m.name, [m.higherIsBetter, m.range ?? null]]));
    expect(directions).toEqual({
      accuracy: [true, [0, 1]],
      balanced_accuracy: [true, [0, 1]],
      roc_auc: [true, [0, 1]],
      log_loss: [false, null],
      brier: [false, [0, 2]],
      f1_macro: [true, [0, 1]],
      rmse: [false, null],
      mae: [false, null],
      r2: [true, null],
    });
    expect(accuracy.task).toBe("classification");
  });
});
