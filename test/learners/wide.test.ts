/**
 * The learners on wide data (more feature columns than rows), where logistic regression fits in the
 * rows' own space (src/learners/rowSpace.ts), LDA solves by the Woodbury identity and the SVM's
 * descent runs on the Gram matrix, against
 * scikit-learn 1.2.1 (Debian python3-sklearn): scripts/reference/sklearn_wide.py, which also generates
 * the two data sets (fixtures/reference/wide/, seeded; its header says how) and writes
 * fixtures/reference/sklearn-wide.json.
 */
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { readCsv } from "../../src/data/csv.js";
import { selectRows } from "../../src/data/dataset.js";
import { tableToDataset } from "../../src/data/tableToDataset.js";
import { LinearDiscriminant } from "../../src/learners/lda.js";
import { LogisticRegression } from "../../src/learners/logistic.js";
import { LinearSvm } from "../../src/learners/svm.js";
import { RandomStream } from "../../src/random.js";

interface WideReference {
  trainRows: number;
  logisticProbabilities: number[][];
  ldaProbabilities: number[][];
  svmScores: number[][];
  trainingSizes: number[];
  meanScores: { logistic: number[]; lda: number[] };
  splits: { test: number[]; subsets: number[][] }[];
}

const root = new URL("../../", import.meta.url);
const reference: { sets: Record<string, WideReference> } = JSON.parse(
  readFileSync(new URL("fixtures/reference/sklearn-wide.json", root), "utf8"),
);

function load(name: string) {
  const file = new URL(`fixtures/reference/wide/${name}.csv`, root).pathname;
  return tableToDataset(readCsv(file), { label: "class" });
}

function largestDifference(got: Float64Array, expected: number[][], classCount: number): number {
  let worst = 0;
  expected.forEach((row, i) => row.forEach((p, k) => (worst = Math.max(worst, Math.abs(got[i * classCount + k] - p)))));
  return worst;
}

describe.each(["binary", "three"])("wide data set %s", (name) => {
  const expected = reference.sets[name];
  const dataset = load(name);
  const columns = dataset.featureNames.length;
  const classCount = dataset.classNames.length;
  const train = {
    features: dataset.features.subarray(0, expected.trainRows * columns),
    rows: expected.trainRows,
    columns,
    labels: dataset.labels.subarray(0, expected.trainRows),
    classCount,
  };
  const testRows = dataset.rows - expected.trainRows;
  const testFeatures = dataset.features.subarray(expected.trainRows * columns);

  it("logistic regression (row-space form): test probabilities within 1e-4 of scikit-learn's at tol 1e-10", () => {
    expect(columns).toBeGreaterThan(train.rows);
    const model = new LogisticRegression({ tolerance: 1e-10, relativeDecrease: 0 }).fit(train);
    expect(model.converged).toBe(true);
    expect(model.coefficients.length).toBe((classCount === 2 ? 1 : classCount) * columns);
    const difference = largestDifference(
      model.predictProbabilities(testFeatures, testRows),
      expected.logisticProbabilities,
      classCount,
    );
    // scikit-learn's lbfgs also stops on SciPy's relative-decrease test, which leaves its own
    // coefficients some 1e-6 from the optimum.
    expect(difference).toBeLessThan(1e-4);
  });

  it("LDA (Woodbury form): test probabilities within 1e-8 of scikit-learn's", () => {
    const model = new LinearDiscriminant().fit(train);
    const difference = largestDifference(
      model.predictProbabilities(testFeatures, testRows),
      expected.ldaProbabilities,
      classCount,
    );
    expect(difference).toBeLessThan(1e-8);
  });

  it("linear SVM (descent on the Gram matrix): test decision scores within 1e-5 of scikit-learn's at tol 1e-8", () => {
    const model = new LinearSvm({ tolerance: 1e-8, maxIterations: 1_000_000 }).fit(train, new RandomStream(1));
    expect(model.converged).toBe(true);
    const scores = model.decisionScores(testFeatures, testRows);
    const width = expected.svmScores[0].length;
    let worst = 0;
    expected.svmScores.forEach((row, i) =>
      row.forEach((v, k) => (worst = Math.max(worst, Math.abs(scores[i * width + k] - v)))),
    );
    // The hinge-loss problem's solution (w, b) is unique, whatever the order of the visits.
    expect(worst).toBeLessThan(1e-5);
  });

  it.each(["logistic", "lda"] as const)(
    "%s learning curve on scikit-learn's splits: mean accuracy within 0.005 of scikit-learn's at every size",
    (learner) => {
      const make = learner === "logistic" ? () => new LogisticRegression() : () => new LinearDiscriminant();
      const differences = expected.trainingSizes.map((_, s) => {
        let sum = 0;
        for (const split of expected.splits) {
          const rows = split.subsets[s];
          const model = make().fit({
            features: selectRows(dataset, rows),
            rows: rows.length,
            columns,
            labels: Int32Array.from(rows, (r) => dataset.labels[r]),
            classCount,
          });
          const probabilities = model.predictProbabilities(selectRows(dataset, split.test), split.test.length);
          let correct = 0;
          split.test.forEach((r, i) => {
            let best = 0;
            for (let k = 1; k < classCount; k++)
              if (probabilities[i * classCount + k] > probabilities[i * classCount + best]) best = k;
            if (best === dataset.labels[r]) correct++;
          });
          sum += correct / split.test.length;
        }
        return sum / expected.splits.length - expected.meanScores[learner][s];
      });
      console.log(`${name} ${learner}: differences ${differences.map((d) => d.toFixed(4)).join(" ")}`);
      // The issue asks for 1.5 points; on the same rows only predictions within rounding of a tie may differ.
      for (const difference of differences) expect(Math.abs(difference)).toBeLessThanOrEqual(0.005);
    },
    240_000,
  );
});
