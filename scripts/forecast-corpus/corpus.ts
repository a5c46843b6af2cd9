/**
 * The forecast corpus: which open data sets it holds, the shape of its files, and a reader.
 * fixtures/forecast-corpus/README.md gives each data set's origin; measure-corpus.ts writes the files.
 */
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { gunzipSync } from "node:zlib";
import type { CurveFile } from "../../src/curve/curveFile.js";

export interface CorpusDataSet {
  name: string;
  task: "classification" | "regression";
  learners: string[];
}

const classification = (name: string): CorpusDataSet => ({
  name,
  task: "classification",
  learners: ["logistic", "forest"],
});
const regression = (name: string): CorpusDataSet => ({
  name,
  task: "regression",
  learners: ["ridge", "knn-regression"],
});

export const corpusDataSets: CorpusDataSet[] = [
  ...[
    "breast_cancer",
    "digits",
    "wine",
    "iris",
    "pima_diabetes",
    "credit_g",
    "ionosphere",
    "segment",
    "vote",
    "fair",
    "breast_cancer_ljubljana",
    "anes96",
    "sonar",
    "vehicle",
    "vowel",
    "satellite",
    "dna",
    "letter",
    "wisconsin",
    "synth",
    "crabs",
    "birthwt",
    "infert",
  ].map(classification),
  ...["diabetes", "cpu", "randhie", "boston", "servo", "quakes", "nlschools", "chickweight"].map(regression),
];

/**
 * Held-out data sets (fixtures/forecast-holdout): measured the same way, but never learned from, so
 * that the shipped continuation can be checked on data it has not seen (evaluate-corpus.ts --corpus
 * fixtures/forecast-holdout --shipped). Chosen after the continuation was: four of Breiman's (1996)
 * generated populations from R's mlbench (3,000 rows each, a fixed seed), R's Titanic table, and four
 * two-class data sets of R's kernlab and caret packages (spam, musk, cell segmentation, mdrr).
 */
export const holdoutDataSets: CorpusDataSet[] = [
  "twonorm",
  "ringnorm",
  "threenorm",
  "waveform",
  "titanic",
  "spam",
  "musk",
  "cells",
  "mdrr",
].map(classification);

/** One data set measured with one learner. */
export interface CorpusFile {
  kind: "headroom-forecast-corpus";
  dataSet: string;
  task: "classification" | "regression";
  learner: string;
  metric: string;
  /** Rows the curves were measured on (after the cut to 3,000). */
  rows: number;
  originalRows: number;
  /** Mean held-out score at each size, over `draws` training draws. */
  truth: { size: number; mean: number; sd: number; draws: number }[];
  /** Pilot curves: `size` rows drawn for the `draw`th time, measured by headroom. */
  pilots: { size: number; draw: number; curve: CurveFile }[];
}

/** Every corpus file in `dir` (NAME--LEARNER.json.gz), sorted by name. */
export function readCorpus(dir: string): CorpusFile[] {
  return readdirSync(dir)
    .filter((f) => f.endsWith(".json.gz"))
    .sort()
    .map((f) => JSON.parse(gunzipSync(readFileSync(join(dir, f))).toString("utf8")) as CorpusFile);
}
