/**
 * The trainer protocol (`--trainer`): every failure the protocol names stops the measurement with one
 * line naming the fit, the problem and the end of the program's stderr; the files and environment a
 * trainer sees; the temporary folder's removal; a crash on the third fit, kept in the checkpoint and
 * resumed after the fix to the same curve as a run that never crashed.
 *
 * Data: Fisher's iris (fixtures/open-data/iris.csv, see its README). The trainers here are small
 * shell scripts (Debian's dash), so the tests start no Python.
 */
import {
  copyFileSync,
  existsSync,
  mkdirSync,
  mkdtempSync,
  readdirSync,
  readFileSync,
  rmSync,
  writeFileSync,
} from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { run } from "../../src/cli/program.js";
import { ExitCode } from "../../src/errors.js";
import { capture } from "../helpers/captureIo.js";

const root = fileURLToPath(new URL("../../", import.meta.url));
const dir = mkdtempSync(join(tmpdir(), "headroom-trainer-test-"));
const iris = join(dir, "iris.csv");
copyFileSync(join(root, "fixtures/open-data/iris.csv"), iris);
const majority = join(root, "examples/majority.sh");
/** Where the trainers' temporary folders go during these tests, to check they are removed. */
const scratch = join(dir, "tmp");
let savedTmp: string | undefined;

beforeAll(() => {
  mkdirSync(scratch);
  savedTmp = process.env.TMPDIR;
  process.env.TMPDIR = scratch;
});
afterAll(() => {
  if (savedTmp === undefined) delete process.env.TMPDIR;
  else process.env.TMPDIR = savedTmp;
  rmSync(dir, { recursive: true, force: true });
});

/** 1 repeat × 5 folds at sizes 30 and 60: 10 fits, one process each. */
const design = ["--label", "class", "--repeats", "1", "--sizes", "30,60", "--quiet", "--workers", "1"];

/** Writes a shell trainer and returns the command running it. */
function trainer(name: string, body: string): string {
  const file = join(dir, `${name}.sh`);
  writeFileSync(file, `set -eu\n${body}\n`);
  return `sh ${file}`;
}

async function measure(command: string, out: string, extra: string[] = [], signal?: AbortSignal) {
  const c = capture();
  const code = await run(["measure", iris, ...design, "--trainer", command, "--out", join(dir, out), ...extra], {
    ...c.io,
    signal,
  });
  return { code, stderr: c.stderr() };
}

/** Test rows as class names: the first class of the training file for every test row. */
const writeClass = (name: string) =>
  `awk 'NR == 1 { print "prediction"; next } { print "${name}" }' "$HEADROOM_TEST" >"$HEADROOM_PREDICTIONS"`;

describe("trainer failures: one line naming the fit, the problem and the end of stderr", () => {
  const fit = "--trainer failed on fit (repeat 1, fold 1, size 30)";
  it.each([
    [
      "a non-zero exit",
      'echo "reading the training file" >&2\necho "ValueError: could not convert" >&2\nexit 3',
      `headroom: ${fit}: the trainer exited with code 3; its stderr ended: reading the training file | ValueError: could not convert`,
    ],
    ["a missing predictions file", "exit 0", `headroom: ${fit}: the trainer wrote no predictions file (expected `],
    [
      "a wrong row count",
      'printf "prediction\\nsetosa\\n" >"$HEADROOM_PREDICTIONS"',
      `headroom: ${fit}: the predictions file has 1 row, but the test file has 30`,
    ],
    [
      "an unknown class name",
      writeClass("tulip"),
      `headroom: ${fit}: predictions line 2: 'tulip' is not a class of the label (classes: 'setosa', 'versicolor', 'virginica')`,
    ],
    [
      "an unknown class column",
      `awk 'NR == 1 { print "setosa,tulip"; next } { print "0.5,0.5" }' "$HEADROOM_TEST" >"$HEADROOM_PREDICTIONS"`,
      `headroom: ${fit}: predictions header: column 'tulip' is neither 'prediction' nor a class of the label`,
    ],
    [
      "a non-number",
      `awk 'NR == 1 { print "setosa,versicolor,virginica"; next } { print "0.2,high,0.3" }' "$HEADROOM_TEST" >"$HEADROOM_PREDICTIONS"`,
      `headroom: ${fit}: predictions line 2, column 'versicolor': 'high' is not a number`,
    ],
    [
      "a NaN",
      `awk 'NR == 1 { print "setosa,versicolor,virginica"; next } { print "0.2,0.5,NaN" }' "$HEADROOM_TEST" >"$HEADROOM_PREDICTIONS"`,
      `headroom: ${fit}: predictions line 2, column 'virginica': 'NaN' is not a number`,
    ],
    [
      "negative probabilities",
      `awk 'NR == 1 { print "setosa,versicolor,virginica"; next } { print "-0.2,0.6,0.6" }' "$HEADROOM_TEST" >"$HEADROOM_PREDICTIONS"`,
      `headroom: ${fit}: predictions line 2: class probabilities must be at least 0 with a positive sum`,
    ],
  ])("%s", async (name, body, expected) => {
    const { code, stderr } = await measure(trainer(name.replace(/\W+/g, "-"), body), `${name}.json`);
    expect(code).toBe(ExitCode.trainer);
    expect(stderr.split("\n").filter((line) => line !== "")).toHaveLength(1);
    expect(stderr).toContain(expected);
    expect(existsSync(join(dir, `${name}.json`))).toBe(false);
    expect(readdirSync(scratch)).toEqual([]);
  });

  it("a fit that runs longer than --trainer-timeout", async () => {
    const started = Date.now();
    const { code, stderr } = await measure(trainer("slow", "sleep 30"), "slow.json", ["--trainer-timeout", "0.5"]);
    expect(code).toBe(ExitCode.trainer);
    expect(stderr).toBe(`headroom: ${fit}: the trainer ran longer than --trainer-timeout 0.5 s and was stopped\n`);
    // The shell's `sleep` child was stopped with it, not waited for.
    expect(Date.now() - started).toBeLessThan(10_000);
  });

  it("a metric that needs probabilities, given class names only, is a usage error", async () => {
    const { code, stderr } = await measure(trainer("labels", writeClass("setosa")), "labels.json", [
      "--metric",
      "roc_auc",
    ]);
    expect(code).toBe(ExitCode.usage);
    expect(stderr).toBe(
      "headroom: --metric roc_auc needs class probabilities, but the trainer wrote only a 'prediction' column of class names; write one column per class holding probabilities, or choose --metric accuracy, balanced_accuracy, f1_macro\n",
    );
  });

  it("--learner and --tune cannot be used with --trainer; --trainer-timeout must be positive", async () => {
    expect((await measure("true", "x.json", ["--learner", "knn"])).stderr).toContain(
      "--learner cannot be used with --trainer",
    );
    expect((await measure("true", "x.json", ["--tune"])).stderr).toContain("--tune cannot be used with --trainer");
    expect((await measure("true", "x.json", ["--trainer-timeout", "0"])).stderr).toBe(
      "headroom: --trainer-timeout: '0' is not a positive number of seconds\n",
    );
  });
});

describe("the protocol as a trainer sees it", () => {
  it("passes the files and the environment the protocol names", async () => {
    const seen = join(dir, "seen");
    mkdirSync(seen);
    const body = [
      `n=$(ls ${seen} | wc -l)`,
      `d=${seen}/fit-$n; mkdir "$d"`,
      `cp "$HEADROOM_TRAIN" "$d/train.csv"; cp "$HEADROOM_TEST" "$d/test.csv"`,
      `printf '%s\\n' "$HEADROOM_LABEL" "$HEADROOM_TASK" "$HEADROOM_SEED" "$HEADROOM_PREDICTIONS" >"$d/env"`,
      `sh ${majority}`,
    ].join("\n");
    const { code, stderr } = await measure(trainer("spy", body), "spy.json");
    expect(code, stderr).toBe(ExitCode.ok);
    const fits = readdirSync(seen).sort();
    expect(fits).toHaveLength(10);
    const irisLines = readFileSync(iris, "utf8").trim().split(/\r?\n/);
    const header = irisLines[0];
    const seeds = new Set<string>();
    for (const fit of fits) {
      const train = readFileSync(join(seen, fit, "train.csv"), "utf8")
        .trim()
        .split("\n");
      const test = readFileSync(join(seen, fit, "test.csv"), "utf8")
        .trim()
        .split("\n");
      const [label, task, seed, predictions] = readFileSync(join(seen, fit, "env"), "utf8")
        .trim()
        .split("\n");
      expect([label, task]).toEqual(["class", "classification"]);
      expect(seed).toMatch(/^\d+$/);
      seeds.add(seed);
      expect(predictions.startsWith(scratch)).toBe(true);
      // Training rows: the header and cells as in the input, label included; 30 or 60 of them.
      expect(train[0]).toBe(header);
      expect([31, 61]).toContain(train.length);
      for (const line of train.slice(1)) expect(irisLines).toContain(line);
      // Test rows: the label column removed; 30 rows (5 folds of 150).
      expect(test[0]).toBe(header.replace(/,class$/, ""));
      expect(test).toHaveLength(31);
    }
    // One seed per fit, derived from --seed, the repeat, the fold and the size.
    expect(seeds.size).toBe(10);
    expect(readdirSync(scratch)).toEqual([]);
  });

  it("renormalises probabilities that do not sum to 1, with a warning in the curve", async () => {
    const body = `awk 'NR == 1 { print "virginica,setosa,versicolor"; next } { print "1,0.5,0.25" }' "$HEADROOM_TEST" >"$HEADROOM_PREDICTIONS"`;
    const { code, stderr } = await measure(trainer("unnormalised", body), "unnormalised.json");
    expect(code, stderr).toBe(ExitCode.ok);
    const curve = JSON.parse(readFileSync(join(dir, "unnormalised.json"), "utf8"));
    expect(curve.warnings).toEqual([
      "the trainer's class probabilities did not sum to 1 (within 1e-6) in 10 of 10 fits; they were renormalised",
    ]);
    expect(curve.learner).toBe("trainer");
    // Every row predicts virginica (the column with the largest probability): its share of each test fold.
    const testFolds = curve.points[0].scores as number[];
    expect(testFolds.reduce((a: number, b: number) => a + b, 0) / 5).toBeCloseTo(50 / 150, 12);
  });

  it("reads numeric predictions for a regression target", async () => {
    const data = join(dir, "target.csv");
    writeFileSync(data, ["x,y", ...Array.from({ length: 40 }, (_, i) => `${i},${2 * i + 1}`)].join("\n") + "\n");
    // Predicts the training rows' mean target for every test row.
    const body = [
      `test "$HEADROOM_TASK" = regression`,
      `m=$(awk -F, 'NR > 1 { s += $2; n++ } END { printf "%.17g", s / n }' "$HEADROOM_TRAIN")`,
      `awk -v m="$m" 'NR == 1 { print "prediction"; next } { print m }' "$HEADROOM_TEST" >"$HEADROOM_PREDICTIONS"`,
    ].join("\n");
    const c = capture();
    const argv = ["measure", data, "--label", "y", "--task", "regression", "--repeats", "1", "--sizes", "10,30"];
    const code = await run(
      [...argv, "--trainer", trainer("mean", body), "--out", join(dir, "mean.json"), "--quiet"],
      c.io,
    );
    expect(code, c.stderr()).toBe(ExitCode.ok);
    const curve = JSON.parse(readFileSync(join(dir, "mean.json"), "utf8"));
    expect(curve.task).toBe("regression");
    // Predicting a constant, the RMSE is at least the test targets' own spread: y = 2x + 1 on 8 rows
    // spaced at least 1 apart in x has a standard deviation above 2 (2·sqrt((8² − 1)/12) = 4.58 at best).
    for (const point of curve.points) for (const score of point.scores) expect(score).toBeGreaterThan(4.5);
  });
});

describe("a trainer that crashes on its third fit", () => {
  const count = join(dir, "count");
  const broken = join(dir, "broken");
  const body = [
    `n=$(($(cat ${count} 2>/dev/null || echo 0) + 1)); echo $n >${count}`,
    `if [ -f ${broken} ] && [ $n -eq 3 ]; then echo "Traceback: crash on fit 3" >&2; exit 1; fi`,
    `sh ${majority}`,
  ].join("\n");

  it("stops with one line and a checkpoint; --resume after the fix gives the never-crashed curve", async () => {
    const command = trainer("crashing", body);
    writeFileSync(broken, "");
    const first = await measure(command, "crashed.json");
    expect(first.code).toBe(ExitCode.trainer);
    expect(first.stderr).toBe(
      "headroom: --trainer failed on fit (repeat 1, fold 2, size 30): the trainer exited with code 1; its stderr ended: Traceback: crash on fit 3\n",
    );
    const checkpoint = readFileSync(join(dir, "crashed.json.checkpoint.jsonl"), "utf8").trim().split("\n");
    // The header and the first (repeat, fold) task, whose two fits finished before the crash.
    expect(checkpoint).toHaveLength(2);
    expect(JSON.parse(checkpoint[1]).task).toBe(0);

    rmSync(broken);
    const resumed = await measure(command, "crashed.json", ["--resume"]);
    expect(resumed.code, resumed.stderr).toBe(ExitCode.ok);
    // Fits run: 3 before the crash, then the 8 of the four tasks left.
    expect(readFileSync(count, "utf8").trim()).toBe("11");
    const clean = await measure(command, "clean.json");
    expect(clean.code, clean.stderr).toBe(ExitCode.ok);
    expect(readFileSync(join(dir, "crashed.json"), "utf8")).toBe(readFileSync(join(dir, "clean.json"), "utf8"));
    expect(existsSync(join(dir, "crashed.json.checkpoint.jsonl"))).toBe(false);
  });
});

describe("Ctrl-C", () => {
  it("stops the running program and removes the temporary folder", async () => {
    const started = join(dir, "started");
    const stop = new AbortController();
    const body = `touch ${started}; sleep 30`;
    const pending = measure(trainer("sleeper", body), "stopped.json", [], stop.signal);
    while (!existsSync(started)) await new Promise((resolve) => setTimeout(resolve, 20));
    const before = Date.now();
    stop.abort();
    const { code, stderr } = await pending;
    expect(code).toBe(ExitCode.interrupted);
    expect(stderr).toContain("interrupted after 0 of 5 fits");
    expect(Date.now() - before).toBeLessThan(5000);
    expect(readdirSync(scratch)).toEqual([]);
  });
});
