/**
 * An honest check of `headroom forecast`: how close its projections come to scores measured at sizes
 * it never saw, and how often its intervals hold them.
 *
 *     npx tsx scripts/evaluate-forecasts.ts [--suite open|generated|all] [--seeds N] [--workers W]
 *                                           [--family NAME] [--json results.json] [--verbose]
 *                                           [--cache DIR] [--only NAME,...] [--pilots P,...]
 *                                           [--repeats R]
 *
 * For each data set and pilot size P, and each seed (5 per open data set, 3 per generated one, or
 * `--seeds N`): draw a stratified pilot subset of P rows, measure its curve
 * with the project's own `measureCurve` (defaults: 5 folds × 10 repeats, 8 sizes, logistic
 * regression, accuracy), forecast with the defaults at 3, 5 and 10 times P, and compare with the
 * truth at that size: the mean held-out accuracy of logistic regression trained on that many rows.
 *
 * Two suites:
 * - open: the ten classification data sets in fixtures/open-data (breast_cancer, digits, wine, iris
 *   from scikit-learn; pima_diabetes, credit_g, ionosphere, segment, vote from Weka's examples; fair
 *   from statsmodels; all as shipped in Debian packages, see fixtures/open-data/README.md). Pilots of
 *   50, 100, 200 and 400 rows where 3 times the pilot leaves held-out rows (else one pilot of a third of
 *   the largest target: 41 rows for iris). The truth at size n is the mean accuracy over 30
 *   stratified random draws of n training rows from the whole data set, each tested on the
 *   remaining rows; only sizes that leave at least max(25, 10%) rows for testing are used.
 * - generated: populations from latent logistic models (binary and three-class, sparse and dense,
 *   with label noise, and one with an interaction the learner cannot represent), each with two
 *   coefficient seeds. The truth at size n is the mean accuracy over 20 training sets of n fresh rows,
 *   each tested on the same 4,000 fresh rows.
 *
 * Printed: one line per forecast (data set, pilot, seed, target size, truth, forecast, 80% interval,
 * error in percentage points, whether the interval holds the truth), then per data set, per target
 * multiple, per pilot size and per suite the mean absolute error, the signed error (mean of forecast −
 * truth), the gain ratio (Σ(forecast − pilot's mean at its largest size) ÷ Σ(truth at the target −
 * truth at that size)), the 80% interval's coverage and the largest error, the coverage
 * of the single-model interval (how often one model's held-out accuracy falls inside it), and the
 * pilot's own error: the mean absolute difference between the pilot curve's mean score at its
 * largest size and the truth at that size, the part of the error that comes from which rows the
 * pilot happened to hold and that no extrapolation can remove.
 *
 * Runs on the main thread by default: about 3 minutes for both suites on an idle core, up to 10 on
 * two busy shared ones.
 * `--only` keeps the data sets whose names start with one of the given names, `--pilots` the given
 * pilot sizes; `--repeats` measures the pilots with R repeats instead of the default.
 * `--cache DIR` keeps the measured pilot curves and the truths in DIR and reuses them on the next
 * run (they depend only on the data set, pilot size and seed), so that a change to the forecast
 * alone can be checked in seconds.
 */
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import type { CurveFile } from "../src/curve/curveFile.js";
import { readCsv } from "../src/data/csv.js";
import type { Dataset } from "../src/data/dataset.js";
import { selectLabels, selectRows } from "../src/data/dataset.js";
import { tableToDataset } from "../src/data/tableToDataset.js";
import { measureCurve } from "../src/curve/measure.js";
import { findMetric, type ClassificationMetric } from "../src/curve/metrics.js";
import { forecastCurve } from "../src/forecast/forecast.js";
import { createLearner } from "../src/learners/registry.js";
import { packageRoot } from "../src/packageRoot.js";
import { RandomStream } from "../src/random.js";
import { nestedStratifiedOrder } from "../src/splitters/nestedSubsamples.js";

// ---------------------------------------------------------------------------------------------
// Options

const argv = process.argv.slice(2);
function option(name: string): string | undefined {
  const index = argv.indexOf(name);
  return index >= 0 ? argv[index + 1] : undefined;
}
const suite = option("--suite") ?? "all";
const seedsOption = option("--seeds");
const workers = Number(option("--workers") ?? 1);
const forcedFamily = option("--family");
const jsonOut = option("--json");
const verbose = argv.includes("--verbose");
const cacheDir = option("--cache");
if (cacheDir !== undefined) mkdirSync(cacheDir, { recursive: true });

/** `compute()`, or its cached value under `key` in the cache folder. */
async function cached<T>(key: string, compute: () => T | Promise<T>): Promise<T> {
  if (cacheDir === undefined) return compute();
  const file = join(cacheDir, `${key}.json`);
  if (existsSync(file)) return JSON.parse(readFileSync(file, "utf8")) as T;
  const value = await compute();
  writeFileSync(file, JSON.stringify(value));
  return value;
}
const multiples = [3, 5, 10];
/** The classification data sets of fixtures/open-data (see its README for their origins). */
const openDataSets = [
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
];
const only = option("--only")?.split(",");
const pilotsOption = option("--pilots")?.split(",").map(Number);
const repeatsOption = option("--repeats");
const repeats = repeatsOption === undefined ? undefined : Number(repeatsOption);
const level = 0.8;

// ---------------------------------------------------------------------------------------------
// Populations

interface Population {
  suite: "open" | "generated";
  name: string;
  pilotSizes: number[];
  seeds: number;
  /** Largest target size the truth can be measured at. */
  largestTarget: number;
  drawPilot(size: number, random: RandomStream): Dataset;
  /** Mean held-out accuracy at size n, one model's held-out accuracies, and their test rows. */
  truth(n: number): { mean: number; scores: number[]; testRows: number };
}

const accuracy = findMetric("accuracy") as ClassificationMetric;

function subset(data: Dataset, rows: ArrayLike<number>): Dataset {
  return {
    features: selectRows(data, rows),
    rows: rows.length,
    featureNames: data.featureNames,
    labels: selectLabels(data, rows),
    classNames: data.classNames,
  };
}

/** Held-out accuracy of logistic regression trained on `train`, tested on `test`. */
function heldOutAccuracy(train: Dataset, test: Dataset, random: RandomStream): number {
  const learner = createLearner("logistic")!;
  const classCount = train.classNames.length;
  const model = learner.fit(
    {
      features: train.features,
      rows: train.rows,
      columns: train.featureNames.length,
      labels: train.labels,
      classCount,
    },
    random,
  );
  return accuracy.score(test.labels, model.predictProbabilities(test.features, test.rows), classCount);
}

function openPopulation(name: string, seeds: number): Population {
  const data = tableToDataset(readCsv(`${packageRoot}/fixtures/open-data/${name}.csv`), {
    label: "class",
    task: "classification",
  });
  const largestTarget = data.rows - Math.max(25, Math.ceil(0.1 * data.rows));
  // Pilots of 50, 100, 200 and 400 rows where 3 times the pilot can still be tested on held-out rows; a
  // data set too small for a 50-row pilot gets one pilot of a third of its largest target.
  const usual = [50, 100, 200, 400].filter((p) => 3 * p <= largestTarget);
  const pilotSizes = usual.length > 0 ? usual : [Math.floor(largestTarget / 3)];
  const all = Int32Array.from({ length: data.rows }, (_, i) => i);
  const truthDraws = 30;
  const cache = new Map<number, { mean: number; scores: number[]; testRows: number }>();
  return {
    suite: "open",
    name,
    pilotSizes,
    seeds,
    largestTarget,
    drawPilot(size, random) {
      // A pilot must hold every class at least 5 times (5 folds): redraw the rare failures (a
      // stratified 50 of digits' 10 classes can leave a class 4 rows).
      for (;;) {
        const pilot = subset(data, nestedStratifiedOrder(all, data.labels, random).subarray(0, size));
        const counts = new Array<number>(data.classNames.length).fill(0);
        for (const label of pilot.labels) counts[label]++;
        if (Math.min(...counts) >= 5) return pilot;
      }
    },
    truth(n) {
      const known = cache.get(n);
      if (known) return known;
      const scores: number[] = [];
      for (let d = 0; d < truthDraws; d++) {
        const order = nestedStratifiedOrder(all, data.labels, new RandomStream(7001, n, d));
        scores.push(
          heldOutAccuracy(
            subset(data, order.subarray(0, n)),
            subset(data, order.subarray(n)),
            new RandomStream(7002, n, d),
          ),
        );
      }
      const result = { mean: mean(scores), scores, testRows: data.rows - n };
      cache.set(n, result);
      return result;
    },
  };
}

interface LatentSpec {
  features: number;
  /** Features with a non-zero coefficient (the rest are noise). */
  informative: number;
  classes: number;
  /** Length of each class's coefficient vector. */
  signal: number;
  /** Chance that a label is replaced by a uniformly drawn class. */
  labelNoise?: number;
  /** Coefficient of x₁·x₂ in the logit of class 1 (a term logistic regression cannot represent). */
  interaction?: number;
}

/**
 * A latent logistic population: features N(0, 1) scaled by a per-feature factor in [0.5, 2];
 * class k's logit is β_k·x (plus an intercept), β_k drawn once from the coefficient seed; the label
 * is drawn from the softmax, then replaced by a random class with probability `labelNoise`.
 */
function latentPopulation(
  name: string,
  spec: LatentSpec,
  coefficientSeed: number,
  pilotSizes: number[],
  seeds: number,
): Population {
  const setup = new RandomStream(9001, coefficientSeed);
  const scales = Array.from({ length: spec.features }, () => 0.5 * Math.pow(4, setup.uniform()));
  const coefficients = Array.from({ length: spec.classes === 2 ? 1 : spec.classes }, () => {
    const beta = Array.from({ length: spec.features }, (_, j) => (j < spec.informative ? setup.normal() : 0));
    const norm = Math.sqrt(beta.reduce((s, v) => s + v * v, 0)) || 1;
    return { beta: beta.map((b) => (b * spec.signal) / norm), intercept: 0.5 * setup.normal() };
  });
  const featureNames = Array.from({ length: spec.features }, (_, j) => `x${j}`);
  const classNames = Array.from({ length: spec.classes }, (_, k) => `c${k}`);
  const sample = (rows: number, random: RandomStream): Dataset => {
    const features = new Float64Array(rows * spec.features);
    const labels = new Int32Array(rows);
    const logits = new Float64Array(spec.classes);
    for (let i = 0; i < rows; i++) {
      const x = scales.map(() => random.normal());
      x.forEach((value, j) => (features[i * spec.features + j] = value * scales[j]));
      if (spec.classes === 2) {
        logits[0] = 0;
        logits[1] = coefficients[0].intercept + dot(coefficients[0].beta, x) + (spec.interaction ?? 0) * x[0] * x[1];
      } else {
        coefficients.forEach(
          (c, k) => (logits[k] = c.intercept + dot(c.beta, x) + (k === 1 ? (spec.interaction ?? 0) * x[0] * x[1] : 0)),
        );
      }
      const top = Math.max(...logits);
      const weights = Array.from(logits, (l) => Math.exp(l - top));
      const total = weights.reduce((s, v) => s + v, 0);
      let u = random.uniform() * total;
      let label = 0;
      while (label < spec.classes - 1 && u >= weights[label]) u -= weights[label++];
      if (spec.labelNoise !== undefined && random.uniform() < spec.labelNoise) label = random.integer(spec.classes);
      labels[i] = label;
    }
    return { features, rows, featureNames, labels, classNames };
  };
  const testSet = sample(4000, new RandomStream(9002, coefficientSeed));
  const truthDraws = 20;
  const cache = new Map<number, { mean: number; scores: number[]; testRows: number }>();
  return {
    suite: "generated",
    name: `${name}#${coefficientSeed}`,
    pilotSizes,
    seeds,
    largestTarget: Infinity,
    drawPilot(size, random) {
      // A pilot must hold every class at least 5 times (5 folds): redraw the rare failures.
      for (;;) {
        const pilot = sample(size, random);
        const counts = new Array<number>(spec.classes).fill(0);
        for (const label of pilot.labels) counts[label]++;
        if (Math.min(...counts) >= 5) return pilot;
      }
    },
    truth(n) {
      const known = cache.get(n);
      if (known) return known;
      const scores: number[] = [];
      for (let d = 0; d < truthDraws; d++) {
        const train = sample(n, new RandomStream(9003, coefficientSeed, n, d));
        scores.push(heldOutAccuracy(train, testSet, new RandomStream(9004, n, d)));
      }
      const result = { mean: mean(scores), scores, testRows: testSet.rows };
      cache.set(n, result);
      return result;
    },
  };
}

function dot(a: readonly number[], b: readonly number[]): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}

function mean(values: readonly number[]): number {
  return values.reduce((s, v) => s + v, 0) / values.length;
}

function populations(): Population[] {
  const list: Population[] = [];
  if (suite === "open" || suite === "all") {
    const seeds = Number(seedsOption ?? 5);
    for (const name of openDataSets) list.push(openPopulation(name, seeds));
  }
  if (suite === "generated" || suite === "all") {
    const seeds = Number(seedsOption ?? 3);
    const specs: [string, LatentSpec][] = [
      ["latent-d5", { features: 5, informative: 5, classes: 2, signal: 3 }],
      ["latent-d20-sparse", { features: 20, informative: 5, classes: 2, signal: 4 }],
      ["latent-d40", { features: 40, informative: 40, classes: 2, signal: 5 }],
      ["latent-3class-d10", { features: 10, informative: 10, classes: 3, signal: 3 }],
      ["latent-d10-noisy", { features: 10, informative: 10, classes: 2, signal: 4, labelNoise: 0.1 }],
      ["latent-d8-interaction", { features: 8, informative: 8, classes: 2, signal: 2, interaction: 2 }],
    ];
    for (const [name, spec] of specs) {
      for (const coefficientSeed of [1, 2])
        list.push(latentPopulation(name, spec, coefficientSeed, [50, 100, 200], seeds));
    }
  }
  return list;
}

// ---------------------------------------------------------------------------------------------
// The evaluation

interface Row {
  suite: string;
  dataSet: string;
  pilot: number;
  seed: number;
  target: number;
  truth: number;
  forecast: number;
  lower: number;
  upper: number;
  inside: boolean;
  singleModelCoverage: number;
  /** The pilot's measured mean at its largest size minus the truth there: error before any extrapolation. */
  pilotError: number;
  /** The forecast's standard deviation for which samples were collected (its shared shift). */
  sampleStandardDeviation: number;
  /** The pilot curve's mean at its largest size, and the truth there (for the gain ratio). */
  scoreAtLargest: number;
  truthAtLargest: number;
}

const rows: Row[] = [];
const started = performance.now();
const pct = (v: number): string => (100 * v).toFixed(1).padStart(5);

console.log(
  ["suite", "data set", "pilot", "seed", "target", "truth", "forecast", "80% interval", "error pp", "inside"].join(
    "\t",
  ),
);
for (const population of populations()) {
  if (only !== undefined && !only.some((name) => population.name.startsWith(name))) continue;
  for (const pilot of population.pilotSizes) {
    if (pilotsOption !== undefined && !pilotsOption.includes(pilot)) continue;
    const targets = multiples.map((m) => m * pilot).filter((n) => n <= population.largestTarget);
    if (targets.length === 0) continue;
    for (let seed = 1; seed <= population.seeds; seed++) {
      const curve = await cached<CurveFile>(
        `${population.name}-pilot${pilot}-seed${seed}${repeats === undefined ? "" : `-repeats${repeats}`}`,
        () =>
          measureCurve(population.drawPilot(pilot, new RandomStream(5001, pilot, seed)), `${population.name}-pilot`, {
            seed,
            workers,
            ...(repeats === undefined ? {} : { repeats }),
          }),
      );
      for (const target of targets) {
        const truth = await cached(`${population.name}-truth${target}`, () => population.truth(target));
        const forecast = forecastCurve(curve, {
          at: [target],
          level,
          seed,
          testSize: truth.testRows,
          ...(forcedFamily ? { family: forcedFamily } : {}),
        });
        const p = forecast.projections[0];
        const inside = p.lower <= truth.mean && truth.mean <= p.upper;
        const singleLower = p.singleModelLower ?? p.lower;
        const singleUpper = p.singleModelUpper ?? p.upper;
        const singleModelCoverage = mean(truth.scores.map((s) => (singleLower <= s && s <= singleUpper ? 1 : 0)));
        const largest = forecast.largestMeasuredSize;
        const atLargest = await cached(`${population.name}-truth${largest}`, () => population.truth(largest));
        const lastMean = forecast.measured[forecast.measured.length - 1].mean;
        rows.push({
          suite: population.suite,
          dataSet: population.name,
          pilot,
          seed,
          target,
          truth: truth.mean,
          forecast: p.expected,
          lower: p.lower,
          upper: p.upper,
          inside,
          singleModelCoverage,
          pilotError: lastMean - atLargest.mean,
          sampleStandardDeviation: forecast.sampleStandardDeviation ?? 0,
          scoreAtLargest: lastMean,
          truthAtLargest: atLargest.mean,
        });
        console.log(
          [
            population.suite,
            population.name,
            pilot,
            seed,
            target,
            pct(truth.mean),
            pct(p.expected),
            `[${pct(p.lower)}, ${pct(p.upper)}]`,
            (100 * (p.expected - truth.mean)).toFixed(1).padStart(5),
            inside ? "yes" : "no",
          ].join("\t"),
        );
        if (verbose) {
          const weights = Object.entries(forecast.familyWeights ?? {})
            .map(([name, w]) => `${name} ${w.toFixed(2)}`)
            .join(", ");
          console.log(
            `\t\tweights: ${weights}; sample sd ${pct(forecast.sampleStandardDeviation ?? 0)}; ` +
              `level error at ${largest} ${pct(lastMean - atLargest.mean)}; ` +
              `gain error ${pct(p.expected - lastMean - (truth.mean - atLargest.mean))}`,
          );
        }
      }
    }
  }
}

// ---------------------------------------------------------------------------------------------
// Summary

interface Summary {
  forecasts: number;
  meanAbsoluteError: number;
  /** Mean of forecast − truth: a one-sided bias shows here, not in the absolute error. */
  signedError: number;
  /**
   * Σ(forecast − pilot's score at its largest size) ÷ Σ(truth at the target − truth at that size):
   * the share of the true gain from the largest measured size that the forecast foresaw.
   */
  gainRatio: number;
  coverage: number;
  largestError: number;
  singleModelCoverage: number;
  /** Mean absolute pilot error: how far the pilot's own score at its largest size was from the truth there. */
  pilotError: number;
}

function summarize(selection: readonly Row[]): Summary {
  const errors = selection.map((r) => Math.abs(r.forecast - r.truth));
  return {
    forecasts: selection.length,
    meanAbsoluteError: mean(errors),
    signedError: mean(selection.map((r) => r.forecast - r.truth)),
    gainRatio:
      selection.reduce((s, r) => s + r.forecast - r.scoreAtLargest, 0) /
      selection.reduce((s, r) => s + r.truth - r.truthAtLargest, 0),
    coverage: mean(selection.map((r) => (r.inside ? 1 : 0))),
    largestError: Math.max(...errors),
    singleModelCoverage: mean(selection.map((r) => r.singleModelCoverage)),
    pilotError: mean(selection.map((r) => Math.abs(r.pilotError))),
  };
}

function summaryLine(label: string, s: Summary): string {
  return [
    label.padEnd(28),
    String(s.forecasts).padStart(4),
    (100 * s.meanAbsoluteError).toFixed(2).padStart(8),
    (100 * s.signedError).toFixed(2).padStart(10),
    s.gainRatio.toFixed(2).padStart(10),
    `${(100 * s.coverage).toFixed(0)}%`.padStart(9),
    (100 * s.largestError).toFixed(1).padStart(9),
    `${(100 * s.singleModelCoverage).toFixed(0)}%`.padStart(13),
    (100 * s.pilotError).toFixed(2).padStart(15),
  ].join("  ");
}

const summaries: Record<string, Summary> = {};
console.log("");
console.log(
  [
    "data set".padEnd(28),
    "n".padStart(4),
    "MAE (pp)".padStart(8),
    "signed (pp)".padStart(10),
    "gain ratio".padStart(10),
    "coverage".padStart(9),
    "max (pp)".padStart(9),
    "single-model".padStart(13),
    "pilot MAE (pp)".padStart(15),
  ].join("  "),
);
for (const group of ["open", "generated"]) {
  const inGroup = rows.filter((r) => r.suite === group);
  if (inGroup.length === 0) continue;
  for (const name of [...new Set(inGroup.map((r) => r.dataSet))]) {
    const s = summarize(inGroup.filter((r) => r.dataSet === name));
    summaries[name] = s;
    console.log(summaryLine(name, s));
  }
  for (const multiple of multiples) {
    const selection = inGroup.filter((r) => r.target === multiple * r.pilot);
    if (selection.length > 0) console.log(summaryLine(`${group}, ${multiple}× pilot`, summarize(selection)));
  }
  for (const pilot of [...new Set(inGroup.map((r) => r.pilot))].sort((p, q) => p - q)) {
    console.log(summaryLine(`${group}, pilot of ${pilot} rows`, summarize(inGroup.filter((r) => r.pilot === pilot))));
  }
  const s = summarize(inGroup);
  summaries[`all ${group}`] = s;
  console.log(summaryLine(`all ${group}`, s));
}
console.log(`\n${rows.length} forecasts in ${((performance.now() - started) / 1000).toFixed(0)} s`);
if (jsonOut !== undefined) writeFileSync(jsonOut, JSON.stringify({ rows, summaries }, null, 1) + "\n");
