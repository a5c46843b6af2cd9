/**
 * curve.json is byte-identical whatever the number of worker threads: every fit's random streams
 * derive from the seed and the fit's (repeat, fold, size), never from the thread that runs it. Checked
 * with the real logistic learner on iris (fixtures/open-data/iris.csv, UCI via scikit-learn); with two
 * workers the pool runs src/curve/fitWorkerFromSource.mjs, which loads the TypeScript source.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { poolSettings } from "../../src/curve/fitPool.js";
import { measureCurve, type MeasureOptions } from "../../src/curve/measure.js";
import type { Dataset } from "../../src/data/dataset.js";
import { toJson } from "../../src/io/files.js";
import { loadOpenData } from "../helpers/openData.js";

function iris(withRuns: boolean): Dataset {
  const { features, rows, featureNames, labels, classNames } = loadOpenData("iris");
  const data: Dataset = { features, rows, featureNames, labels, classNames };
  if (withRuns) {
    // Six invented runs of 25 rows, each holding rows of every class (rows are ordered by class).
    data.groups = Int32Array.from({ length: rows }, (_, i) => i % 6);
    data.groupNames = ["r0", "r1", "r2", "r3", "r4", "r5"];
  }
  return data;
}

describe("worker threads", () => {
  // Worker threads start after the main thread's first task, however small the job.
  const worth = poolSettings.workerWorthMilliseconds;
  beforeAll(() => void (poolSettings.workerWorthMilliseconds = 0));
  afterAll(() => void (poolSettings.workerWorthMilliseconds = worth));

  it.each<[string, boolean, MeasureOptions]>([
    ["stratified 3-fold", false, { folds: 3, repeats: 2 }],
    ["runs kept whole, sizes in runs, tuned", true, { folds: 3, repeats: 2, byRuns: true, tune: true }],
  ])("give the same curve.json bytes with 1 and 2 workers: %s", async (_, withRuns, options) => {
    const run = async (workers: number) =>
      toJson(await measureCurve(iris(withRuns), "iris.csv", { ...options, seed: 11, learner: "logistic", workers }));
    const one = await run(1);
    const two = await run(2);
    expect(two).toBe(one);
    const curve = JSON.parse(one);
    expect(curve.points.length).toBeGreaterThanOrEqual(3);
    // logistic's tuning grid (C from 0.01 to 100): the tuned case records a setting per score.
    if (options.tune) expect(curve.points[0].settingsOfScore).toHaveLength(curve.points[0].scores.length);
    // Real fits: scores vary between fits and lie in (0, 1].
    const scores = curve.points.flatMap((p: { scores: number[] }) => p.scores);
    expect(new Set(scores).size).toBeGreaterThan(1);
    for (const score of scores) expect(score > 0 && score <= 1).toBe(true);
  });

  it("give the same curve.json bytes with 3 threads", async () => {
    const options: MeasureOptions = { folds: 5, repeats: 3, seed: 3, learner: "logistic" };
    const run = async (workers: number) => toJson(await measureCurve(iris(false), "iris.csv", { ...options, workers }));
    expect(await run(3)).toBe(await run(1));
  });
});
