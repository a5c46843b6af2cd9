/**
 * `npm run bench`: headroom's learning-curve measurement against scikit-learn's learning_curve on the
 * same job, measured side by side on this machine, printed as ratios (machines are shared and noisy,
 * so absolute times mean little; both sides suffer the same load).
 *
 * The job: median imputation, standardization and L2 logistic regression (C = 1) at 8 training sizes
 * from 10% to 100% of an 80% training pool, 10 fits per size (headroom: 5 folds × 2 repeats;
 * scikit-learn: 10 stratified shuffle splits), accuracy on the held-out part. Data: breast cancer
 * (569 rows, 2 classes) and digits (1,797 rows, 10 classes) from fixtures/open-data, and two generated
 * Gaussian-class sets (5,000 rows × 20 features, 3 classes; 20,000 rows × 16 features, 26 classes).
 * headroom is given the training sizes scikit-learn reports, so both fit the same sizes.
 *
 * Each side runs as a whole process (start-up included), `BENCH_RUNS` times (default 2), alternating;
 * the faster run counts, and the spread column gives the lowest and highest ratio of the runs paired
 * in order (run i of each side), as the load on the machine moves between runs. Peak memory is each process's maximum resident set size; processor time
 * (user + system, all threads) is printed too, as it suffers less from other load on the machine than
 * wall time does. The last column says whether the curve files written with one and two workers are
 * byte-identical, as they must be. `BENCH_ONLY=digits,breast` runs only the data sets whose names
 * contain one of those words. Needs Debian's python3-sklearn.
 *
 * A second table times wide data (generated: 120 × 2,000 and 240 × 5,000 with two classes, 150 ×
 * 2,000 with three; 40 informative columns): each learner with one worker against its scikit-learn
 * counterpart (scripts/bench/sklearn_learning_curve.py --learner), and logistic regression with
 * `--tune` against GridSearchCV inside learning_curve. `BENCH_ONLY=wide` runs only that table,
 * `BENCH_LEARNERS` narrows the learners, `BENCH_CAP` (seconds, default 120) stops a scikit-learn run.
 * The score column there compares learning_curve's unstratified subsamples with headroom's stratified
 * ones, which differ by several points at the smallest sizes; the learners' own parity on wide data
 * is tested on the same rows (test/learners/wide.test.ts).
 */
import { spawnSync } from "node:child_process";
import { copyFileSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import { packageRoot } from "../src/packageRoot.js";
import { RandomStream } from "../src/random.js";

interface Side {
  seconds: number;
  cpuSeconds: number;
  peakMemoryKiB: number;
  meanScores: number[];
  /** The curve file's text (headroom only). */
  curve?: string;
}

interface ScikitLearnSide extends Side {
  trainingSizes: number[];
  /** Stopped at the time cap (see {@link runScikitLearn}). */
  capped?: boolean;
}

const python = "/usr/bin/python3";
const work = mkdtempSync(join(tmpdir(), "headroom-bench-"));
const runs = Number(process.env.BENCH_RUNS ?? 2);
const only = process.env.BENCH_ONLY?.split(",").map((word) => word.trim().toLowerCase());

/** Gaussian classes: centers drawn once, rows scattered around them with unit noise. */
function generated(name: string, rows: number, features: number, classes: number, seed: number): string {
  const random = new RandomStream(seed);
  const centers = Array.from({ length: classes }, () => Array.from({ length: features }, () => 0.9 * random.normal()));
  const lines = [[...Array.from({ length: features }, (_, j) => `x${j}`), "class"].join(",")];
  for (let i = 0; i < rows; i++) {
    const k = random.integer(classes);
    const values = centers[k].map((c) => (c + random.normal()).toFixed(5));
    lines.push([...values, `c${k}`].join(","));
  }
  const file = join(work, `${name}.csv`);
  writeFileSync(file, `${lines.join("\n")}\n`);
  return file;
}

function openData(name: string): string {
  const file = join(work, `${name}.csv`);
  copyFileSync(join(packageRoot, "fixtures", "open-data", `${name}.csv`), file);
  return file;
}

/**
 * Wide data, as from gene-expression or spectra panels: `informative` of the feature columns carry
 * the class (centres drawn once, 0.6 apart on average), the rest are noise; every value has unit
 * noise. Values written with 4 decimals.
 */
function generatedWide(
  name: string,
  rows: number,
  features: number,
  classes: number,
  informative: number,
  seed: number,
): string {
  const random = new RandomStream(seed);
  const centres = Array.from({ length: classes }, () =>
    Array.from({ length: features }, (_, j) => (j < informative ? 0.6 * random.normal() : 0)),
  );
  const lines = [[...Array.from({ length: features }, (_, j) => `x${j}`), "class"].join(",")];
  for (let i = 0; i < rows; i++) {
    const k = i % classes;
    const values = centres[k].map((c) => (c + random.normal()).toFixed(4));
    lines.push([...values, `c${k}`].join(","));
  }
  const file = join(work, `${name}.csv`);
  writeFileSync(file, `${lines.join("\n")}\n`);
  return file;
}

function runHeadroom(file: string, workers: number, trainingSizes: number[], extra: string[] = []): Side {
  const out = join(work, "curve.json");
  const args = [
    "--import",
    join(packageRoot, "scripts", "bench", "peakMemory.mjs"),
    join(packageRoot, "dist", "src", "bin", "headroom.js"),
    "measure",
    file,
    "--label",
    "class",
    "--folds",
    "5",
    "--repeats",
    "2",
    "--sizes",
    trainingSizes.join(","),
    "--workers",
    String(workers),
    "--quiet",
    "--out",
    out,
    ...extra,
  ];
  const started = process.hrtime.bigint();
  const result = spawnSync(process.execPath, args, { encoding: "utf8" });
  const seconds = Number(process.hrtime.bigint() - started) / 1e9;
  if (result.status !== 0) throw new Error(`headroom failed on ${file}: ${result.stderr}`);
  const usage = /peakMemoryKiB=(\d+) cpuSeconds=([\d.]+)/.exec(result.stderr);
  const text = readFileSync(out, "utf8");
  const curve = JSON.parse(text) as { points: { scores: number[] }[] };
  return {
    seconds,
    cpuSeconds: usage ? Number(usage[2]) : NaN,
    peakMemoryKiB: usage ? Number(usage[1]) : NaN,
    meanScores: curve.points.map((p) => p.scores.reduce((a, b) => a + b, 0) / p.scores.length),
    curve: text,
  };
}

/**
 * scikit-learn's side, stopped after `capSeconds` when given: its LDA solves a p × p system per fit,
 * which on thousands of columns takes minutes to hours. A stopped run counts as `capSeconds` (so the
 * ratio printed is an upper bound, marked "<"), with no scores.
 */
function runScikitLearn(file: string, extra: string[] = [], capSeconds?: number): ScikitLearnSide {
  const script = join(packageRoot, "scripts", "bench", "sklearn_learning_curve.py");
  const started = process.hrtime.bigint();
  const result = spawnSync(python, [script, file, ...extra], {
    encoding: "utf8",
    ...(capSeconds === undefined ? {} : { timeout: capSeconds * 1000, killSignal: "SIGKILL" as const }),
  });
  const seconds = Number(process.hrtime.bigint() - started) / 1e9;
  if (capSeconds !== undefined && result.signal === "SIGKILL")
    return {
      seconds: capSeconds,
      cpuSeconds: NaN,
      peakMemoryKiB: NaN,
      meanScores: [],
      trainingSizes: [],
      capped: true,
    };
  if (result.status !== 0) throw new Error(`scikit-learn failed on ${file}: ${result.stderr}`);
  const parsed = JSON.parse(result.stdout) as Omit<ScikitLearnSide, "seconds">;
  return { seconds, ...parsed };
}

/** The load averages over 1, 5 and 15 minutes. */
function load(): string {
  return loadavg()
    .map((l) => l.toFixed(1))
    .join(" ");
}

/** Lowest and highest ratio headroom / scikit-learn of `measure` over the runs paired in order. */
function spread(reference: Side[], headroom: Side[], measure: (side: Side) => number): string {
  const ratios = headroom.map((side, run) => measure(side) / measure(reference[Math.min(run, reference.length - 1)]));
  return `${Math.min(...ratios).toFixed(2)}–${Math.max(...ratios).toFixed(2)}`;
}

function fastest<T extends Side>(sides: T[]): T {
  return sides.reduce((a, b) => (b.seconds < a.seconds ? b : a));
}

const sets: [string, () => string][] = [
  ["breast_cancer (569×30, 2 classes)", () => openData("breast_cancer")],
  ["digits (1797×64, 10 classes)", () => openData("digits")],
  ["gaussian (5000×20, 3 classes)", () => generated("gaussian-5k", 5000, 20, 3, 1)],
  ["gaussian (20000×16, 26 classes)", () => generated("gaussian-20k", 20000, 16, 26, 2)],
];

/** The wide sets: names contain "wide" for BENCH_ONLY. */
const wideSets: [string, () => string][] = [
  ["wide (120×2000, 2 classes)", () => generatedWide("wide-120", 120, 2000, 2, 40, 3)],
  ["wide (240×5000, 2 classes)", () => generatedWide("wide-240", 240, 5000, 2, 40, 4)],
  ["wide (150×2000, 3 classes)", () => generatedWide("wide-150-3", 150, 2000, 3, 40, 5)],
];
/** Longest a scikit-learn run on wide data may take (`BENCH_CAP` seconds). */
const wideCapSeconds = Number(process.env.BENCH_CAP ?? 120);
const wideLearners = (process.env.BENCH_LEARNERS ?? "logistic,lda,naive-bayes,knn,svm,forest").split(",");

const check = spawnSync(python, ["-c", "import sklearn; print(sklearn.__version__)"], { encoding: "utf8" });
if (check.status !== 0) {
  process.stderr.write("bench: needs Debian's python3-sklearn (apt-get install python3-sklearn)\n");
  process.exitCode = 1;
} else {
  process.stdout.write(
    `scikit-learn ${check.stdout.trim()} vs headroom, whole-process wall time (best of ${runs}), ` +
      `processor time and peak memory; load average ${load()}\n`,
  );
  process.stdout.write(
    "data set | sklearn s | headroom 1w s | ratio 1w | headroom 2w s | ratio 2w | sklearn CPU s | " +
      "headroom 1w CPU s | CPU ratio 1w | sklearn MiB | headroom MiB | memory ratio | max |Δ mean score| | " +
      "1w = 2w curve | ratio 1w spread | memory ratio spread | load after\n",
  );
  for (const [name, make] of sets) {
    if (only && !only.some((word) => name.toLowerCase().includes(word))) continue;
    runSet(name, make);
  }
  const wideWanted = wideSets.filter(([name]) => !only || only.some((word) => name.toLowerCase().includes(word)));
  if (wideWanted.length > 0) {
    process.stdout.write(
      "\nWide data, one worker, each learner with scikit-learn's counterpart (--tune: GridSearchCV inside learning_curve)\n" +
        "data set | learner | sklearn s | headroom 1w s | ratio 1w | sklearn CPU s | headroom CPU s | CPU ratio | " +
        "sklearn MiB | headroom MiB | memory ratio | max |Δ mean score| | ratio spread | memory ratio spread | load after\n",
    );
  }
  for (const [name, make] of wideWanted) {
    const file = make();
    for (const learner of wideLearners) runWide(name, file, learner, false);
    if (name.includes("120×2000, 2")) runWide(name, file, "logistic", true);
  }
}
rmSync(work, { recursive: true, force: true });

/** Runs one data set on both sides and prints its row of the table. */
function runSet(name: string, make: () => string): void {
  const file = make();
  const sk: ScikitLearnSide[] = [];
  const one: Side[] = [];
  const two: Side[] = [];
  for (let run = 0; run < runs; run++) {
    sk.push(runScikitLearn(file));
    one.push(runHeadroom(file, 1, sk[0].trainingSizes));
    two.push(runHeadroom(file, 2, sk[0].trainingSizes));
  }
  const s = fastest(sk);
  const h1 = fastest(one);
  const h2 = fastest(two);
  const peakHeadroom = Math.max(h1.peakMemoryKiB, h2.peakMemoryKiB);
  const delta = Math.max(...s.meanScores.map((v, i) => Math.abs(v - h1.meanScores[i])));
  const identical = [...one, ...two].every((side) => side.curve === one[0].curve);
  process.stdout.write(
    [
      name,
      s.seconds.toFixed(2),
      h1.seconds.toFixed(2),
      (h1.seconds / s.seconds).toFixed(2),
      h2.seconds.toFixed(2),
      (h2.seconds / s.seconds).toFixed(2),
      s.cpuSeconds.toFixed(2),
      h1.cpuSeconds.toFixed(2),
      (h1.cpuSeconds / s.cpuSeconds).toFixed(2),
      (s.peakMemoryKiB / 1024).toFixed(0),
      (peakHeadroom / 1024).toFixed(0),
      (peakHeadroom / s.peakMemoryKiB).toFixed(2),
      delta.toFixed(3),
      identical ? "yes" : "NO",
      spread(sk, one, (side) => side.seconds),
      spread(sk, one, (side) => side.peakMemoryKiB),
      load(),
    ].join(" | ") + "\n",
  );
}

/** One learner on one wide set, one worker, both sides; prints its row. */
function runWide(name: string, file: string, learner: string, tune: boolean): void {
  const skArgs = ["--learner", learner, ...(tune ? ["--tune"] : [])];
  const sk: ScikitLearnSide[] = [];
  const one: Side[] = [];
  for (let run = 0; run < runs; run++) {
    // A capped reference is not rerun: its time is the cap whatever the load.
    if (run === 0 || !sk[0].capped) sk.push(runScikitLearn(file, skArgs, wideCapSeconds));
    one.push(runHeadroom(file, 1, wideSizes(file, sk[0]), ["--learner", learner, ...(tune ? ["--tune"] : [])]));
  }
  const s = fastest(sk);
  const h = fastest(one);
  const bound = s.capped ? "<" : "";
  const delta = s.capped ? NaN : Math.max(...s.meanScores.map((v, i) => Math.abs(v - h.meanScores[i])));
  process.stdout.write(
    [
      name,
      tune ? `${learner} --tune` : learner,
      s.seconds.toFixed(2),
      h.seconds.toFixed(2),
      bound + (h.seconds / s.seconds).toFixed(2),
      s.cpuSeconds.toFixed(2),
      h.cpuSeconds.toFixed(2),
      (h.cpuSeconds / s.cpuSeconds).toFixed(2),
      (s.peakMemoryKiB / 1024).toFixed(0),
      (h.peakMemoryKiB / 1024).toFixed(0),
      (h.peakMemoryKiB / s.peakMemoryKiB).toFixed(2),
      delta.toFixed(3),
      s.capped ? "-" : spread(sk, one, (side) => side.seconds),
      s.capped ? "-" : spread(sk, one, (side) => side.peakMemoryKiB),
      load(),
    ].join(" | ") + "\n",
  );
}

/**
 * The training sizes both sides fit: scikit-learn's (8 geometric fractions of an 80% pool, as its
 * script prints them), computed here when its run was stopped at the cap.
 */
function wideSizes(file: string, side: ScikitLearnSide): number[] {
  if (!side.capped) return side.trainingSizes;
  const rows = readFileSync(file, "utf8").trimEnd().split("\n").length - 1;
  const pool = rows - Math.ceil(rows * 0.2);
  return Array.from({ length: 8 }, (_, i) => Math.trunc(pool * 0.1 ** (1 - i / 7) + 1e-9));
}
