/**
 * The committed scikit-learn reference for the learners (fixtures/reference/sklearn-learners.json,
 * written by scripts/reference/sklearn_learners.py with Debian's python3-sklearn 1.2.1) and the
 * training/test sets it describes, built from the open data in fixtures/open-data/ (see the README
 * there). For tests only.
 */
import { readFileSync } from "node:fs";
import type { RegressionTrainingSet, TrainingSet } from "../../src/learners/learner.js";
import { fixturePath, loadOpenData, type OpenData, type OpenDataName } from "../helpers/openData.js";

interface ClassifierReference {
  predictions: number[];
  probabilities?: number[][];
  decisionScores?: number[][];
  epsilon?: number;
  algorithm?: string;
}

export interface ClassificationReference {
  classes: string[];
  rows: number;
  permutation: number[];
  trainRows: number;
  lda: ClassifierReference;
  naiveBayes: ClassifierReference;
  knn: ClassifierReference;
  svm: ClassifierReference;
  fewRows: {
    trainRows: number[];
    lda: { predictions: number[]; probabilitiesFirstTestRows: number[][] };
    naiveBayes: { predictions: number[]; probabilitiesFirstTestRows: number[][] };
  };
  forest: { folds: number[]; accuracyPerSeed: number[]; meanAccuracy: number; sdAccuracy: number };
}

export interface RegressionReference {
  featureNames: string[];
  rows: number;
  permutation: number[];
  trainRows: number;
  ridge: { coef: number[]; intercept: number; predictions: number[] };
  knnRegression: { algorithm: string; predictions: number[] };
  sexAsText: { column: string; ridgePredictions: number[]; knnRegressionPredictions: number[] };
}

export interface LearnersReference {
  versions: { sklearn: string };
  settings: Record<string, string | number>;
  classification: Record<OpenDataName, ClassificationReference>;
  regression: { diabetes: RegressionReference };
}

export const reference: LearnersReference = JSON.parse(
  readFileSync(fixturePath("reference", "sklearn-learners.json"), "utf8"),
);

/** The listed rows of a row-major matrix, in the order given. */
export function selectRows(features: Float64Array, columns: number, rows: readonly number[]): Float64Array {
  const out = new Float64Array(rows.length * columns);
  rows.forEach((r, i) => out.set(features.subarray(r * columns, (r + 1) * columns), i * columns));
  return out;
}

/** A classification training set of the listed rows of an open data set, in that order. */
export function trainingSetOf(d: OpenData, rows: readonly number[]): TrainingSet {
  return {
    features: selectRows(d.features, d.columns, rows),
    rows: rows.length,
    columns: d.columns,
    labels: Int32Array.from(rows, (r) => d.labels[r]),
    classCount: d.classNames.length,
  };
}

/** The reference's fixed split of a classification data set: training set, test rows and their features. */
export function classificationSplit(name: OpenDataName): {
  data: OpenData;
  ref: ClassificationReference;
  training: TrainingSet;
  testRows: number[];
  testFeatures: Float64Array;
} {
  const data = loadOpenData(name);
  const ref = reference.classification[name];
  const train = ref.permutation.slice(0, ref.trainRows);
  const testRows = ref.permutation.slice(ref.trainRows);
  return {
    data,
    ref,
    training: trainingSetOf(data, train),
    testRows,
    testFeatures: selectRows(data.features, data.columns, testRows),
  };
}

export interface RegressionData {
  features: Float64Array;
  rows: number;
  columns: number;
  featureNames: string[];
  targets: Float64Array;
}

/** fixtures/open-data/diabetes.csv: ten numeric features, then `target`. */
export function loadDiabetes(): RegressionData {
  const lines = readFileSync(fixturePath("open-data", "diabetes.csv"), "utf8")
    .split(/\r?\n/)
    .filter((line) => line.length > 0);
  const header = lines[0].split(",");
  if (header[header.length - 1] !== "target") throw new Error("diabetes.csv: last column is not 'target'");
  const columns = header.length - 1;
  const rows = lines.length - 1;
  const features = new Float64Array(rows * columns);
  const targets = new Float64Array(rows);
  for (let i = 0; i < rows; i++) {
    const fields = lines[i + 1].split(",").map(Number);
    if (fields.length !== columns + 1 || fields.some((v) => !Number.isFinite(v)))
      throw new Error(`diabetes.csv:${i + 2}: malformed row`);
    features.set(fields.slice(0, columns), i * columns);
    targets[i] = fields[columns];
  }
  return { features, rows, columns, featureNames: header.slice(0, columns), targets };
}

/** The reference's fixed split of the diabetes data. */
export function diabetesSplit(): {
  data: RegressionData;
  ref: RegressionReference;
  training: RegressionTrainingSet;
  testRows: number[];
  testFeatures: Float64Array;
} {
  const data = loadDiabetes();
  const ref = reference.regression.diabetes;
  const train = ref.permutation.slice(0, ref.trainRows);
  const testRows = ref.permutation.slice(ref.trainRows);
  return {
    data,
    ref,
    training: {
      features: selectRows(data.features, data.columns, train),
      rows: train.length,
      columns: data.columns,
      targets: Float64Array.from(train, (r) => data.targets[r]),
    },
    testRows,
    testFeatures: selectRows(data.features, data.columns, testRows),
  };
}

/** Largest |actual − expected| over a flattened matrix. */
export function largestDifference(
  actual: ArrayLike<number>,
  expected: readonly (readonly number[])[] | number[],
): number {
  const flat = (expected as (number | number[])[]).flat();
  if (actual.length !== flat.length) throw new Error(`${actual.length} values, expected ${flat.length}`);
  let worst = 0;
  flat.forEach((e, i) => (worst = Math.max(worst, Math.abs(actual[i] - e))));
  return worst;
}
