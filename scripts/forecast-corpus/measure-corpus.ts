/**
 * Measures the forecast corpus: learning curves of open data sets, stored so that a forecasting
 * method can be judged on thousands of pilot-to-target cases without fitting a learner again.
 *
 *     /usr/bin/python3 scripts/forecast-corpus/export_data.py /tmp/corpus-data
 *     npx tsx scripts/forecast-corpus/measure-corpus.ts --data /tmp/corpus-data [--out fixtures/forecast-corpus]
 *                                                       [--only NAME,...] [--add-pilots] [--holdout]
 *
 * With `--holdout`, the held-out data sets (corpus.ts, `holdoutDataSets`; export_data.py --holdout)
 * go to fixtures/forecast-holdout instead.
 *
 * For each data set and learner (classification: logistic regression and random forest, scored by
 * accuracy; numeric target: ridge regression and k-nearest neighbours, scored by R²), one file
 * `NAME--LEARNER.json.gz` holding:
 * - pilots: for pilot sizes of 50, 100, 200, 400 and 800 rows (those with room for targets at least twice
 *   the pilot, and with every class expected at least 6 times), several pilot draws (6; 4 for the
 *   slow random forest), each a stratified (for classes) or simple random subset of the data set,
 *   measured with headroom's own `measureCurve` at its defaults (5 folds × 10 repeats, 8 sizes), so
 *   that a pilot is measured exactly as a user's curve is. Scores are rounded to 5 decimals.
 * - truth: the mean held-out score at sizes 40·2^(k/3) (40, 50, 63, 80, ...; the pilots' largest
 *   measured sizes 40, 80, 160 and 320 among them) up to the largest that leaves max(25, 10%) rows
 *   for testing, and at that largest size: each a mean over random draws of n training rows
 *   (stratified for classes) tested on the remaining rows; 16 draws up to 320 rows, 8 up to 1,000,
 *   4 beyond (half as many, at least 3, for the random forest), since the spread between draws
 *   shrinks with the size.
 *
 * A data set of more than 3,000 rows is first cut to a fixed random 3,000 (stratified for classes),
 * which then stands for the whole population. Files already written are kept, so an interrupted run
 * continues where it stopped (`--only` narrows it); with `--add-pilots` a file already written gets
 * the pilots of the sizes it lacks, and its truth and other pilots are kept as they are (each pilot
 * draws from its own random stream, so the ones added do not depend on those kept). Runs on one
 * thread.
 */
import { existsSync, mkdirSync, readFileSync, writeFileSync, renameSync } from "node:fs";
import { join } from "node:path";
import { gunzipSync, gzipSync } from "node:zlib";
import type { CurveFile } from "../../src/curve/curveFile.js";
import { readCsv } from "../../src/data/csv.js";
import type { Dataset } from "../../src/data/dataset.js";
import { selectLabels, selectRows } from "../../src/data/dataset.js";
import { tableToDataset } from "../../src/data/tableToDataset.js";
import { measureCurve } from "../../src/curve/measure.js";
import { findMetric, type ClassificationMetric, type RegressionMetric } from "../../src/curve/metrics.js";
import { createLearner, createRegressionLearner } from "../../src/learners/registry.js";
import { RandomStream } from "../../src/random.js";
import { nestedRandomOrder, nestedStratifiedOrder } from "../../src/splitters/nestedSubsamples.js";
import { corpusDataSets, holdoutDataSets, type CorpusFile } from "./corpus.js";

const argv = process.argv.slice(2);
function option(name: string): string | undefined {
  const index = argv.indexOf(name);
  return index >= 0 ? argv[index + 1] : undefined;
}
const dataDir = option("--data") ?? "/tmp/corpus-data";
const holdout = argv.includes("--holdout");
const outDir = option("--out") ?? (holdout ? "fixtures/forecast-holdout" : "fixtures/forecast-corpus");
const only = option("--only")?.split(",");
const addPilots = argv.includes("--add-pilots");
mkdirSync(outDir, { recursive: true });

const largestRows = 3000;
const pilotSizes = [50, 100, 200, 400, 800];
/** Stream tags (first path index) of this script's draws. */
const stream = { cap: 6001, pilot: 6002, truthOrder: 6003, truthFit: 6004 };

function subset(data: Dataset, rows: ArrayLike<number>): Dataset {
  const out: Dataset = {
    features: selectRows(data, rows),
    rows: rows.length,
    featureNames: data.featureNames,
    labels: data.targets ? new Int32Array(0) : selectLabels(data, rows),
    classNames: data.classNames,
  };
  if (data.targets) out.targets = Float64Array.from(rows, (r) => (data.targets as Float64Array)[r]);
  if (data.categories) out.categories = data.categories;
  return out;
}

function order(data: Dataset, random: RandomStream): Int32Array {
  const all = Int32Array.from({ length: data.rows }, (_, i) => i);
  return data.targets ? nestedRandomOrder(all, random) : nestedStratifiedOrder(all, data.labels, random);
}

function heldOutScore(
  train: Dataset,
  test: Dataset,
  learnerName: string,
  metricName: string,
  random: RandomStream,
): number {
  const columns = train.featureNames.length;
  if (train.targets) {
    const model = createRegressionLearner(learnerName)!.fit(
      { features: train.features, rows: train.rows, columns, targets: train.targets, categories: train.categories },
      random,
    );
    return (findMetric(metricName) as RegressionMetric).score(
      test.targets as Float64Array,
      model.predictValues(test.features, test.rows),
    );
  }
  const classCount = train.classNames.length;
  const model = createLearner(learnerName)!.fit(
    {
      features: train.features,
      rows: train.rows,
      columns,
      labels: train.labels,
      classCount,
      categories: train.categories,
    },
    random,
  );
  return (findMetric(metricName) as ClassificationMetric).score(
    test.labels,
    model.predictProbabilities(test.features, test.rows),
    classCount,
  );
}

const round = (v: number): number => Math.round(v * 1e5) / 1e5;
const mean = (v: readonly number[]): number => v.reduce((s, x) => s + x, 0) / v.length;

for (const spec of holdout ? holdoutDataSets : corpusDataSets) {
  if (only !== undefined && !only.includes(spec.name)) continue;
  const regression = spec.task === "regression";
  let data = tableToDataset(readCsv(join(dataDir, `${spec.name}.csv`)), {
    label: regression ? "target" : "class",
    task: spec.task,
  });
  const originalRows = data.rows;
  if (data.rows > largestRows) data = subset(data, order(data, new RandomStream(stream.cap)).subarray(0, largestRows));
  const largestTruth = data.rows - Math.max(25, Math.ceil(0.1 * data.rows));
  const truthSizes: number[] = [];
  for (let k = 0; Math.round(40 * 2 ** (k / 3)) < largestTruth; k++) truthSizes.push(Math.round(40 * 2 ** (k / 3)));
  truthSizes.push(largestTruth);
  const smallestClassShare = regression
    ? 1
    : Math.min(...data.classNames.map((_, k) => data.labels.filter((l) => l === k).length)) / data.rows;
  const pilots = pilotSizes.filter((p) => 2 * p <= largestTruth && p * smallestClassShare >= 6);
  for (const learner of spec.learners) {
    const file = join(outDir, `${spec.name}--${learner}.json.gz`);
    const earlier = existsSync(file)
      ? (JSON.parse(gunzipSync(readFileSync(file)).toString("utf8")) as CorpusFile)
      : undefined;
    if (earlier !== undefined && !addPilots) continue;
    const missing = pilots.filter((size) => earlier === undefined || !earlier.pilots.some((p) => p.size === size));
    if (missing.length === 0) continue;
    const started = performance.now();
    const metric = regression ? "r2" : "accuracy";
    const slow = learner === "forest";
    const truth =
      earlier?.truth ??
      truthSizes.map((n) => {
        const draws = Math.max(slow ? 3 : 0, Math.round((n <= 320 ? 16 : n <= 1000 ? 8 : 4) / (slow ? 2 : 1)));
        const scores: number[] = [];
        for (let d = 0; d < draws; d++) {
          const rows = order(data, new RandomStream(stream.truthOrder, n, d));
          scores.push(
            heldOutScore(
              subset(data, rows.subarray(0, n)),
              subset(data, rows.subarray(n)),
              learner,
              metric,
              new RandomStream(stream.truthFit, n, d),
            ),
          );
        }
        const m = mean(scores);
        const sd = Math.sqrt(scores.reduce((s, x) => s + (x - m) ** 2, 0) / Math.max(1, scores.length - 1));
        return { size: n, mean: round(m), sd: round(sd), draws };
      });
    const pilotCurves: CorpusFile["pilots"] = earlier?.pilots.slice() ?? [];
    for (const size of missing) {
      for (let draw = 1; draw <= (slow ? 4 : 6); draw++) {
        let rows: Int32Array | undefined;
        for (let attempt = 0; attempt < 50 && rows === undefined; attempt++) {
          const candidate = order(data, new RandomStream(stream.pilot, size, draw, attempt)).subarray(0, size);
          const counts = new Array<number>(data.classNames.length).fill(0);
          for (const r of candidate) counts[data.labels[r]]++;
          if (regression || Math.min(...counts) >= 5) rows = candidate;
        }
        if (rows === undefined) continue;
        const curve: CurveFile = await measureCurve(subset(data, rows), `${spec.name}-pilot`, {
          seed: draw,
          learner,
          metric,
        });
        curve.points = curve.points.map((p) => ({ ...p, scores: p.scores.map(round) }));
        delete curve.source;
        pilotCurves.push({ size, draw, curve });
      }
    }
    pilotCurves.sort((p, q) => p.size - q.size || p.draw - q.draw);
    const record: CorpusFile = {
      kind: "headroom-forecast-corpus",
      dataSet: spec.name,
      task: spec.task,
      learner,
      metric,
      rows: data.rows,
      originalRows,
      truth,
      pilots: pilotCurves,
    };
    writeFileSync(`${file}.partial`, gzipSync(JSON.stringify(record), { level: 9 }));
    renameSync(`${file}.partial`, file);
    console.log(
      `${spec.name} ${learner}: ${pilotCurves.length} pilots, ${truth.length} truth sizes, ${((performance.now() - started) / 1000).toFixed(0)} s`,
    );
  }
}
