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
 *
 * Each side runs as a whole process (start-up included), twice, alternating; the faster run counts.
 * Peak memory is each process's maximum resident set size. Needs Debian's python3-sklearn.
 */
import { spawnSync } from "node:child_process";
import { copyFileSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { packageRoot } from "../src/packageRoot.js";
import { RandomStream } from "../src/random.js";

interface Side {
  seconds: number;
  peakMemoryKiB: number;
  meanScores: number[];
}

const python = "/usr/bin/python3";
const work = mkdtempSync(join(tmpdir(), "headroom-bench-"));

/** Gaussian classes: centres drawn once, rows scattered around them with unit noise. */
function generated(name: string, rows: number, features: number, classes: number, seed: number): string {
  const random = new RandomStream(seed);
  const centres = Array.from({ length: classes }, () => Array.from({ length: features }, () => 0.9 * random.normal()));
  const lines = [[...Array.from({ length: features }, (_, j) => `x${j}`), "class"].join(",")];
  for (let i = 0; i < rows; i++) {
    const k = random.integer(classes);
    const values = centres[k].map((c) => (c + random.normal()).toFixed(5));
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

function countRows(file: string): number {
  return readFileSync(file, "utf8").trimEnd().split("\n").length - 1;
}

/** Training sizes as scikit-learn computes them: floor(fraction × pool) for 8 geometric fractions. */
function sizesFor(rows: number): number[] {
  const pool = rows - Math.ceil(rows / 5);
  const sizes = Array.from({ length: 8 }, (_, i) => Math.floor(Math.pow(10, -1 + i / 7) * pool));
  return [...new Set(sizes)];
}

function runHeadroom(file: string, workers: number): Side {
  const out = join(work, "curve.json");
  const sizes = sizesFor(countRows(file));
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
    sizes.join(","),
    "--workers",
    String(workers),
    "--quiet",
    "--out",
    out,
  ];
  const started = process.hrtime.bigint();
  const result = spawnSync(process.execPath, args, { encoding: "utf8" });
  const seconds = Number(process.hrtime.bigint() - started) / 1e9;
  if (result.status !== 0) throw new Error(`headroom failed on ${file}: ${result.stderr}`);
  const peak = /peakMemoryKiB=(\d+)/.exec(result.stderr);
  const curve = JSON.parse(readFileSync(out, "utf8")) as {
    points: { scores: number[] }[];
  };
  return {
    seconds,
    peakMemoryKiB: peak ? Number(peak[1]) : NaN,
    meanScores: curve.points.map((p) => p.scores.reduce((a, b) => a + b, 0) / p.scores.length),
  };
}

function runScikitLearn(file: string): Side {
  const script = join(packageRoot, "scripts", "bench", "sklearn_learning_curve.py");
  const started = process.hrtime.bigint();
  const result = spawnSync(python, [script, file], { encoding: "utf8" });
  const seconds = Number(process.hrtime.bigint() - started) / 1e9;
  if (result.status !== 0) throw new Error(`scikit-learn failed on ${file}: ${result.stderr}`);
  const parsed = JSON.parse(result.stdout) as { peakMemoryKiB: number; meanScores: number[] };
  return { seconds, peakMemoryKiB: parsed.peakMemoryKiB, meanScores: parsed.meanScores };
}

function fastest(runs: Side[]): Side {
  return runs.reduce((a, b) => (b.seconds < a.seconds ? b : a));
}

const sets: [string, string][] = [
  ["breast_cancer (569×30, 2 classes)", openData("breast_cancer")],
  ["digits (1797×64, 10 classes)", openData("digits")],
  ["gaussian (5000×20, 3 classes)", generated("gaussian-5k", 5000, 20, 3, 1)],
  ["gaussian (20000×16, 26 classes)", generated("gaussian-20k", 20000, 16, 26, 2)],
];

const check = spawnSync(python, ["-c", "import sklearn; print(sklearn.__version__)"], { encoding: "utf8" });
if (check.status !== 0) {
  process.stderr.write("bench: needs Debian's python3-sklearn (apt-get install python3-sklearn)\n");
  process.exitCode = 1;
} else {
  process.stdout.write(`scikit-learn ${check.stdout.trim()} vs headroom, whole-process wall time and peak memory\n`);
  process.stdout.write(
    "data set | sklearn s | headroom 1w s | ratio 1w | headroom 2w s | ratio 2w | sklearn MiB | headroom MiB | memory ratio | max |Δ mean score|\n",
  );
  for (const [name, file] of sets) {
    const sk: Side[] = [];
    const one: Side[] = [];
    const two: Side[] = [];
    for (let run = 0; run < 2; run++) {
      sk.push(runScikitLearn(file));
      one.push(runHeadroom(file, 1));
      two.push(runHeadroom(file, 2));
    }
    const s = fastest(sk);
    const h1 = fastest(one);
    const h2 = fastest(two);
    const peakHeadroom = Math.max(h1.peakMemoryKiB, h2.peakMemoryKiB);
    const delta = Math.max(...s.meanScores.map((v, i) => Math.abs(v - h1.meanScores[i])));
    process.stdout.write(
      [
        name,
        s.seconds.toFixed(2),
        h1.seconds.toFixed(2),
        (h1.seconds / s.seconds).toFixed(2),
        h2.seconds.toFixed(2),
        (h2.seconds / s.seconds).toFixed(2),
        (s.peakMemoryKiB / 1024).toFixed(0),
        (peakHeadroom / 1024).toFixed(0),
        (peakHeadroom / s.peakMemoryKiB).toFixed(2),
        delta.toFixed(3),
      ].join(" | ") + "\n",
    );
  }
}
