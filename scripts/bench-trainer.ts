/**
 * `npm run bench:trainer` (also run by `npm run bench`): the cost headroom adds around the user's own
 * trainer (`--trainer`): writing each fit's files, starting the program through the shell, reading
 * and scoring its predictions. A trivial trainer is run 400 times by `headroom measure` (iris, 40
 * repeats × 5 folds × 2 sizes, one program at a time), and 400 times bare from a shell loop on
 * prepared files of the same size; the ratio of the two wall times is printed (aim: at most 2).
 * Two trivial trainers: examples/majority.sh (sh and awk) and a three-line Python program that
 * writes one class for every test row (Debian's /usr/bin/python3, no imports beyond os).
 * Each side runs `BENCH_RUNS` times (default 2), alternating; the faster run counts.
 */
import { spawnSync } from "node:child_process";
import { copyFileSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import { packageRoot } from "../src/packageRoot.js";

const work = mkdtempSync(join(tmpdir(), "headroom-bench-trainer-"));
const runs = Number(process.env.BENCH_RUNS ?? 2);
const fits = 400;
const iris = join(work, "iris.csv");
copyFileSync(join(packageRoot, "fixtures/open-data/iris.csv"), iris);

const constant = join(work, "constant.py");
writeFileSync(
  constant,
  [
    "import os",
    "rows = sum(1 for _ in open(os.environ['HEADROOM_TEST'])) - 1",
    "open(os.environ['HEADROOM_PREDICTIONS'], 'w').write('prediction\\n' + 'setosa\\n' * rows)",
    "",
  ].join("\n"),
);
const trainers: [string, string][] = [
  ["majority.sh (sh + awk)", `sh ${join(packageRoot, "examples/majority.sh")}`],
  ["constant.py (python3)", `/usr/bin/python3 ${constant}`],
];

// Files of the sizes headroom writes: 60 training rows (the larger size) and 30 test rows.
const lines = readFileSync(iris, "utf8").trim().split(/\r?\n/);
const train = join(work, "train.csv");
const test = join(work, "test.csv");
writeFileSync(train, `${[lines[0], ...lines.slice(1, 61)].join("\n")}\n`);
writeFileSync(
  test,
  `${[lines[0].replace(/,class$/, ""), ...lines.slice(61, 91).map((l) => l.replace(/,[^,]*$/, ""))].join("\n")}\n`,
);
const env = {
  ...process.env,
  HEADROOM_TRAIN: train,
  HEADROOM_TEST: test,
  HEADROOM_PREDICTIONS: join(work, "predictions.csv"),
  HEADROOM_LABEL: "class",
  HEADROOM_TASK: "classification",
  HEADROOM_SEED: "1",
};

function seconds(action: () => void): number {
  const start = process.hrtime.bigint();
  action();
  return Number(process.hrtime.bigint() - start) / 1e9;
}

function bare(command: string): number {
  const loop = `i=0; while [ $i -lt ${fits} ]; do ${command} || exit 1; i=$((i + 1)); done`;
  return seconds(() => {
    const result = spawnSync("/bin/sh", ["-c", loop], { env, stdio: "inherit" });
    if (result.status !== 0) throw new Error(`bare loop failed: ${command}`);
  });
}

function headroom(command: string): number {
  const out = join(work, "curve.json");
  rmSync(out, { force: true });
  const argv = [join(packageRoot, "dist/src/bin/headroom.js"), "measure", iris, "--label", "class"];
  argv.push("--repeats", "40", "--sizes", "30,60", "--workers", "1", "--quiet", "--trainer", command, "--out", out);
  return seconds(() => {
    const result = spawnSync(process.execPath, argv, { stdio: "inherit" });
    if (result.status !== 0) throw new Error(`headroom measure failed with ${command}`);
  });
}

process.stdout.write(
  `per-fit cost around a trivial trainer, ${fits} fits, best of ${runs}; load average ${loadavg()[0].toFixed(2)}\n`,
);
process.stdout.write("trainer | bare s | headroom s | ratio | headroom ms per fit beyond bare\n");
for (const [name, command] of trainers) {
  let bareBest = Infinity;
  let headroomBest = Infinity;
  for (let run = 0; run < runs; run++) {
    bareBest = Math.min(bareBest, bare(command));
    headroomBest = Math.min(headroomBest, headroom(command));
  }
  const extra = ((headroomBest - bareBest) / fits) * 1000;
  process.stdout.write(
    `${name} | ${bareBest.toFixed(2)} | ${headroomBest.toFixed(2)} | ${(headroomBest / bareBest).toFixed(2)} | ${extra.toFixed(1)}\n`,
  );
}
rmSync(work, { recursive: true, force: true });
