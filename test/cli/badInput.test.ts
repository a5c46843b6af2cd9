/**
 * Bad input, through the in-process command line: each case gets exactly one line on stderr saying
 * what is wrong and where, the exit code of its kind (usage 64, data 65, missing input 66, I/O 74;
 * see src/errors.ts), no stack trace, and no output file.
 *
 * The data files are written by the test; the expected lines are the messages of src/messages.ts
 * written out, so a change of wording shows here.
 */
import { existsSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { run } from "../../src/cli/program.js";
import { ExitCode } from "../../src/errors.js";
import { metrics } from "../../src/curve/metrics.js";
import { curveFamilies, findCurveFamily } from "../../src/fit/families.js";
import { learnerNames } from "../../src/learners/registry.js";
import { RandomStream } from "../../src/random.js";
import { capture } from "../helpers/captureIo.js";

const dir = mkdtempSync(join(tmpdir(), "headroom-bad-input-"));
const path = (name: string) => join(dir, name);
const iris = readFileSync(new URL("../../fixtures/open-data/iris.csv", import.meta.url));

/** Rows of a two-class CSV with one feature: `count` rows, classes alternating a, b. */
function twoClasses(count: number, firstClassShare = 0.5): string {
  const lines = ["x,y"];
  for (let i = 0; i < count; i++) lines.push(`${i},${i < count * firstClassShare ? "a" : "b"}`);
  return `${lines.join("\n")}\n`;
}

const goodPlan = { samplesPerRun: 30, costPerRun: 500, maxRuns: 2, valuePerPoint: 100 };

/** The files every case may use, written once. */
const files: Record<string, string | Buffer> = {
  "iris.csv": iris,
  "empty.csv": "",
  "header.csv": "x,y\n",
  "binary.csv": Buffer.from("x,y\n1,a\n2,b\n3,\u0000b\n"),
  "latin1.csv": Buffer.concat([Buffer.from("x,y\n1,a\n"), Buffer.from([0x32, 0x2c, 0x63, 0xe9, 0x0a])]),
  "ragged.csv": "x,y\n1,a\n2,b\n3\n",
  "duplicate.csv": "x,y,x\n1,a,2\n2,b,3\n",
  "one-class.csv": "x,y\n1,a\n2,a\n3,a\n",
  "rare-class.csv": twoClasses(20, 0.9),
  "nan.csv": "x,y\n1,a\n2,b\nNaN,a\n",
  "infinity.csv": "x,y\n1,a\n2,b\n3,a\n-Infinity,b\n",
  "huge.csv": "x,y\n1,a\n2,b\n3e300,a\n",
  "tiny.csv": twoClasses(12),
  "bad-curve.json": '{\n  "kind": "headroom-curve",\n  "version": 1,,\n  "points": []\n}\n',
  "cut-curve.json": '{\n  "kind": "headroom-curve",\n  "points": [\n',
  "one-size-curve.csv": "trainingSize,score\n40,0.81\n40,0.84\n40,0.79\n",
  "bad-forecast.json": '{ "kind": "headroom-forecast", "level": 0.8 ',
  "bad-plan.json": '{\n  "samplesPerRun": 30\n  "costPerRun": 500\n}\n',
  "negative-cost-plan.json": JSON.stringify({ ...goodPlan, costPerRun: -1 }),
  "zero-yield-plan.json": JSON.stringify({ ...goodPlan, samplesPerRun: 0 }),
  "percent-target-plan.json": JSON.stringify({ ...goodPlan, target: 86 }),
  "no-yield-plan.json": JSON.stringify({ costPerRun: 500, maxRuns: 2, valuePerPoint: 100 }),
  "bad-study.json": '{ "data": "iris.csv", "label": "class" "plan": {} }',
  "missing-data-study.json": JSON.stringify({ data: "gone.csv", label: "class", plan: goodPlan }),
  "unknown-learner-study.json": JSON.stringify({
    data: "iris.csv",
    label: "class",
    measure: { learner: "oracle", repeats: 1 },
    plan: goodPlan,
  }),
  "unknown-family-study.json": JSON.stringify({
    data: "iris.csv",
    label: "class",
    measure: { repeats: 1 },
    forecast: { family: "pow9" },
    plan: goodPlan,
  }),
  "a-file": "not a folder\n",
};

beforeAll(async () => {
  for (const [name, content] of Object.entries(files)) writeFileSync(path(name), content);
  // A valid forecast.json, for the plan cases: measured and forecast from iris.
  const measureIris = (out: string, ...more: string[]) => [
    ...["measure", path("iris.csv"), "--label", "class", "--repeats", "1", "--workers", "1", "--quiet"],
    ...more,
    ...["--out", path(out)],
  ];
  for (const argv of [
    measureIris("curve.json"),
    ["forecast", path("curve.json"), "--at", "150,180,210", "--out", path("forecast.json")],
    // Another curve of the same data, for the report's check that the forecast is of its curve.
    measureIris("other-curve.json", "--sizes", "20,40,60"),
  ]) {
    const c = capture();
    expect(await run(argv, c.io), c.stderr()).toBe(ExitCode.ok);
  }
});

interface BadCase {
  name: string;
  argv: string[];
  exitCode: number;
  /** The whole of stderr, without the "headroom: " prefix and the newline. */
  line: string;
}

const out = path("out.json");
const measure = (data: string, ...more: string[]) => [
  "measure",
  path(data),
  "--label",
  "y",
  ...more,
  "--workers",
  "1",
  "--out",
  out,
];
const onIris = (...more: string[]) => [
  "measure",
  path("iris.csv"),
  "--label",
  "class",
  "--repeats",
  "1",
  ...more,
  "--workers",
  "1",
  "--out",
  out,
];

const cases: BadCase[] = [
  // Files that are missing, empty or not CSV text.
  {
    name: "a missing file",
    argv: measure("gone.csv"),
    exitCode: ExitCode.noInput,
    line: `${path("gone.csv")}: no such file`,
  },
  {
    name: "an empty file",
    argv: measure("empty.csv"),
    exitCode: ExitCode.data,
    line: `${path("empty.csv")}: the file is empty`,
  },
  {
    name: "a header only",
    argv: measure("header.csv"),
    exitCode: ExitCode.data,
    line: `${path("header.csv")}: the file has a header but no data rows`,
  },
  {
    name: "binary content",
    argv: measure("binary.csv"),
    exitCode: ExitCode.data,
    line: `${path("binary.csv")}:4: the file contains binary data (a NUL byte); expected CSV text`,
  },
  {
    name: "non-UTF-8 content",
    argv: measure("latin1.csv"),
    exitCode: ExitCode.data,
    line: `${path("latin1.csv")}:3: the file is not UTF-8 text`,
  },
  {
    name: "a ragged row",
    argv: measure("ragged.csv"),
    exitCode: ExitCode.data,
    line: `${path("ragged.csv")}:4: expected 2 fields as in the header, found 1`,
  },
  {
    name: "a duplicate column name",
    argv: measure("duplicate.csv"),
    exitCode: ExitCode.data,
    line: `${path("duplicate.csv")}:1:3: duplicate column name 'x' (also column 1)`,
  },
  // Data that cannot support a curve.
  {
    name: "a label column that is not there",
    argv: ["measure", path("iris.csv"), "--label", "species", "--out", out],
    exitCode: ExitCode.usage,
    line: `${path("iris.csv")}: --label column 'species' is not in the header (columns: 'sepal_length_(cm)', 'sepal_width_(cm)', 'petal_length_(cm)', 'petal_width_(cm)', 'class')`,
  },
  {
    name: "the label column given as the run column",
    argv: ["measure", path("iris.csv"), "--label", "class", "--group", "class", "--out", out],
    exitCode: ExitCode.usage,
    line: `${path("iris.csv")}: --group column 'class' is already the --label column; each column has one role`,
  },
  {
    name: "the label column ignored",
    argv: ["measure", path("iris.csv"), "--label", "class", "--ignore", "class", "--out", out],
    exitCode: ExitCode.usage,
    line: `${path("iris.csv")}: --ignore column 'class' is already the --label column; each column has one role`,
  },
  {
    name: "one class only",
    argv: measure("one-class.csv"),
    exitCode: ExitCode.data,
    line: `${path("one-class.csv")}: the label column 'y' has only one class ('a'); a learning curve needs at least two`,
  },
  {
    name: "a class with fewer rows than folds",
    argv: measure("rare-class.csv"),
    exitCode: ExitCode.data,
    line: `${path("rare-class.csv")}: class 'b' has 2 rows, fewer than --folds 5; lower --folds or collect more of that class`,
  },
  {
    name: "NaN in a feature",
    argv: measure("nan.csv"),
    exitCode: ExitCode.data,
    line: `${path("nan.csv")}:4:1: 'NaN' in column 'x' is not a finite number; leave the cell empty for a missing value`,
  },
  {
    name: "Infinity in a feature",
    argv: measure("infinity.csv"),
    exitCode: ExitCode.data,
    line: `${path("infinity.csv")}:5:1: '-Infinity' in column 'x' is not a finite number; leave the cell empty for a missing value`,
  },
  {
    name: "a feature too large to compute with",
    argv: measure("huge.csv"),
    exitCode: ExitCode.data,
    line: `${path("huge.csv")}:4:1: '3e300' in column 'x' is too large to compute with (above 1e150 in size); rescale the column`,
  },
  {
    // 12 rows, 5 folds: pools of 9 rows, below the smallest sensible size of 10, so no 3 sizes fit.
    name: "too few rows for any curve",
    argv: measure("tiny.csv"),
    exitCode: ExitCode.data,
    line: `${path("tiny.csv")}: 12 rows are too few for a learning curve (at least 15 needed)`,
  },
  // Options.
  {
    name: "training sizes larger than the data",
    argv: onIris("--sizes", "10,500"),
    exitCode: ExitCode.usage,
    line: "--sizes: training size 500 is larger than the smallest training pool (120 rows after holding out a fold)",
  },
  {
    name: "folds < 2",
    argv: onIris("--folds", "1"),
    exitCode: ExitCode.usage,
    line: "--folds: '1' is neither a whole number of at least 2 nor 'loo'",
  },
  {
    name: "negative repeats",
    argv: onIris("--repeats", "-3"),
    exitCode: ExitCode.usage,
    line: "--repeats: '-3' is not a whole number of at least 1",
  },
  {
    name: "a seed that is not an integer",
    argv: onIris("--seed", "1.5"),
    exitCode: ExitCode.usage,
    line: "--seed: '1.5' is not a whole number of at least 0",
  },
  {
    name: "zero workers",
    argv: ["measure", path("iris.csv"), "--label", "class", "--workers", "0", "--out", out],
    exitCode: ExitCode.usage,
    line: "--workers: '0' is not a whole number of at least 1",
  },
  {
    name: "an unknown learner",
    argv: onIris("--learner", "oracle"),
    exitCode: ExitCode.usage,
    line: `--learner: unknown name 'oracle' (known: ${learnerNames().join(", ")})`,
  },
  {
    name: "an unknown metric",
    argv: onIris("--metric", "happiness"),
    exitCode: ExitCode.usage,
    line: `--metric: unknown name 'happiness' (known: ${metrics.map((m) => m.name).join(", ")})`,
  },
  {
    name: "an unknown option",
    argv: onIris("--fodls", "3"),
    exitCode: ExitCode.usage,
    line: "unknown option '--fodls'",
  },
  // Outputs.
  {
    name: "--out equal to the input",
    argv: ["measure", path("iris.csv"), "--label", "class", "--repeats", "1", "--out", path("iris.csv")],
    exitCode: ExitCode.io,
    line: `${path("iris.csv")}: refusing to overwrite an input file`,
  },
  {
    name: "--out under a regular file",
    argv: ["measure", path("iris.csv"), "--label", "class", "--repeats", "1", "--out", join(path("a-file"), "c.json")],
    exitCode: ExitCode.io,
    line: `${join(path("a-file"), "c.json")}: cannot be written (${path("a-file")} is a file, not a folder)`,
  },
  // Curves and forecasts.
  {
    name: "a curve with a single training size",
    argv: ["forecast", path("one-size-curve.csv"), "--out", out],
    exitCode: ExitCode.data,
    line: "forecast: the curve has 1 distinct training size; at least 3 are needed to fit a curve",
  },
  {
    name: "malformed curve JSON",
    argv: ["forecast", path("bad-curve.json"), "--out", out],
    exitCode: ExitCode.data,
    line: `${path("bad-curve.json")}:3:16: malformed JSON: expected a double-quoted property name`,
  },
  {
    name: "curve JSON cut short",
    argv: ["forecast", path("cut-curve.json"), "--out", out],
    exitCode: ExitCode.data,
    line: `${path("cut-curve.json")}:4:1: malformed JSON: expected a value (object, array, string, number, true, false or null) (the file ends too early)`,
  },
  {
    name: "malformed forecast JSON",
    argv: ["weigh", path("bad-forecast.json"), "--plan", path("negative-cost-plan.json"), "--out", out],
    exitCode: ExitCode.data,
    line: `${path("bad-forecast.json")}:1:45: malformed JSON: expected ',' or '}' after a property (the file ends too early)`,
  },
  // Plans.
  {
    name: "malformed plan JSON",
    argv: ["weigh", path("forecast.json"), "--plan", path("bad-plan.json"), "--out", out],
    exitCode: ExitCode.data,
    line: `${path("bad-plan.json")}:3:3: malformed JSON: expected ',' or '}' after a property`,
  },
  {
    name: "a negative cost",
    argv: ["weigh", path("forecast.json"), "--plan", path("negative-cost-plan.json"), "--out", out],
    exitCode: ExitCode.data,
    line: `${path("negative-cost-plan.json")}: costPerRun: Too small: expected number to be >=0`,
  },
  {
    name: "a zero yield",
    argv: ["weigh", path("forecast.json"), "--plan", path("zero-yield-plan.json"), "--out", out],
    exitCode: ExitCode.data,
    line: `${path("zero-yield-plan.json")}: samplesPerRun: Too small: expected number to be >0`,
  },
  {
    name: "a missing yield",
    argv: ["weigh", path("forecast.json"), "--plan", path("no-yield-plan.json"), "--out", out],
    exitCode: ExitCode.data,
    line: `${path("no-yield-plan.json")}: samplesPerRun: missing: give samplesPerRun, or samplesPerRunRange [fewest, most] when the yield is uncertain`,
  },
  {
    // The curve's metric is accuracy, a share between 0 and 1: 86 is a percentage.
    name: "a target outside the metric's range",
    argv: ["weigh", path("forecast.json"), "--plan", path("percent-target-plan.json"), "--out", out],
    exitCode: ExitCode.data,
    line: `${path("percent-target-plan.json")}: target: 86 is outside the accuracy range [0, 1] (give accuracy as a fraction, e.g. 0.9)`,
  },
  // Study files.
  {
    name: "malformed study JSON",
    argv: ["study", path("bad-study.json"), "--workers", "1", "--out", path("study-out")],
    exitCode: ExitCode.data,
    line: `${path("bad-study.json")}:1:40: malformed JSON: expected ',' or '}' after a property`,
  },
  {
    name: "a study naming a missing CSV",
    argv: ["study", path("missing-data-study.json"), "--workers", "1", "--out", path("study-out")],
    exitCode: ExitCode.noInput,
    line: `${path("gone.csv")}: no such file`,
  },
  {
    name: "a study naming an unknown learner",
    argv: ["study", path("unknown-learner-study.json"), "--workers", "1", "--out", path("study-out")],
    exitCode: ExitCode.data,
    line: `${path("unknown-learner-study.json")}: measure.learner: unknown name 'oracle' (known: ${learnerNames().join(", ")})`,
  },
  {
    name: "unknown curve family in a study",
    argv: ["study", path("unknown-family-study.json"), "--workers", "1", "--out", path("study-out")],
    exitCode: ExitCode.data,
    line: `${path("unknown-family-study.json")}: forecast.family: unknown name 'pow9' (known: ${curveFamilies.map((f) => f.name).join(", ")})`,
  },
];

describe("bad input gives one line, its exit code, no stack trace and no output", () => {
  it.each(cases.map((c) => [c.name, c] as const))("%s", async (_, { argv, exitCode, line }) => {
    const c = capture();
    const code = await run(argv, c.io);
    const lines = c.stderr().split("\n");
    expect(lines.at(-1)).toBe(""); // the message ends with a newline
    expect(lines).toHaveLength(2); // one line, no stack trace
    expect(lines[0].startsWith("headroom: ")).toBe(true);
    expect(lines[0].slice("headroom: ".length)).toEqual(line);
    expect(c.stderr()).not.toMatch(/\n\s+at /);
    expect(code).toBe(exitCode);
    expect(existsSync(out)).toBe(false);
    expect(existsSync(`${out}.checkpoint.jsonl`)).toBe(false);
    expect(existsSync(path("study-out"))).toBe(false);
  });

  it("refuses a report of a curve with the forecast of another", async () => {
    const c = capture();
    const page = path("mixed-report.html");
    const argv = ["report", "--curve", path("other-curve.json"), "--forecast", path("forecast.json"), "--out", page];
    expect(await run(argv, c.io)).toBe(ExitCode.data);
    const forecastSizes = (
      JSON.parse(readFileSync(path("forecast.json"), "utf8")) as { measured: { trainingSize: number }[] }
    ).measured
      .map((point) => point.trainingSize)
      .join(", ");
    expect(c.stderr()).toBe(
      `headroom: ${path("forecast.json")}: not a forecast of ${path("other-curve.json")} (it was fitted to training ` +
        `sizes ${forecastSizes}, the curve has 20, 40, 60); run headroom forecast on it again\n`,
    );
    expect(existsSync(page)).toBe(false);
    // The same sizes with one score changed: the means differ.
    const changed = JSON.parse(readFileSync(path("curve.json"), "utf8")) as { points: { scores: number[] }[] };
    changed.points[0].scores[0] = changed.points[0].scores[0] > 0.5 ? 0 : 1;
    writeFileSync(path("changed-curve.json"), JSON.stringify(changed));
    const d = capture();
    const changedArgv = ["report", "--curve", path("changed-curve.json"), "--forecast", path("forecast.json")];
    expect(await run([...changedArgv, "--out", page], d.io)).toBe(ExitCode.data);
    expect(d.stderr()).toMatch(
      /\(at training size \d+ it records a mean score of [\d.]+ from \d+ fits, the curve [\d.]+ from \d+\)/,
    );
    expect(existsSync(page)).toBe(false);
    // The forecast's own curve passes the check (the page is written).
    expect(
      await run(
        [
          "report",
          "--curve",
          path("curve.json"),
          "--forecast",
          path("forecast.json"),
          "--quiet",
          "--no-chart-files",
          "--out",
          page,
        ],
        capture().io,
      ),
    ).toBe(ExitCode.ok);
    expect(existsSync(page)).toBe(true);
  });

  it("refuses a forecast whose learned continuation is not numbers, naming the key", async () => {
    const forecast = JSON.parse(readFileSync(path("forecast.json"), "utf8")) as {
      continuation: Record<string, unknown>;
    };
    forecast.continuation.guessError = "half";
    writeFileSync(path("bad-continuation-forecast.json"), JSON.stringify(forecast));
    const c = capture();
    const page = path("bad-continuation-report.html");
    const argv = ["report", "--curve", path("curve.json"), "--forecast", path("bad-continuation-forecast.json")];
    expect(await run([...argv, "--out", page], c.io)).toBe(ExitCode.data);
    expect(c.stderr()).toBe(
      `headroom: ${path("bad-continuation-forecast.json")}: continuation.guessError: Invalid input: expected number, received string\n`,
    );
    expect(existsSync(page)).toBe(false);
  });

  it("refuses a forecast whose slope reliability is negative, naming the key", async () => {
    const forecast = JSON.parse(readFileSync(path("forecast.json"), "utf8")) as {
      continuation: Record<string, unknown>;
    };
    // A negative r would make L / (L + r) exceed 1, or divide by zero at L = −r.
    forecast.continuation.reliabilitySize = -100;
    writeFileSync(path("bad-reliability-forecast.json"), JSON.stringify(forecast));
    const c = capture();
    const page = path("bad-reliability-report.html");
    const argv = ["report", "--curve", path("curve.json"), "--forecast", path("bad-reliability-forecast.json")];
    expect(await run([...argv, "--out", page], c.io)).toBe(ExitCode.data);
    const [line, ...rest] = c.stderr().split("\n");
    expect(line.startsWith(`headroom: ${path("bad-reliability-forecast.json")}: continuation.reliabilitySize: `)).toBe(
      true,
    );
    expect(rest).toEqual([""]);
    expect(existsSync(page)).toBe(false);
  });

  it("prints the stack trace only with --debug", async () => {
    const c = capture();
    expect(await run(["--debug", ...measure("nan.csv")], c.io)).toBe(ExitCode.data);
    const lines = c.stderr().trimEnd().split("\n");
    expect(lines[0]).toBe(
      `headroom: ${path("nan.csv")}:4:1: 'NaN' in column 'x' is not a finite number; leave the cell empty for a missing value`,
    );
    expect(lines.length).toBeGreaterThan(2);
    expect(lines.slice(1).some((l) => /^\s+at /.test(l))).toBe(true);
  });

  it("names the known families for an unknown --family", async () => {
    const curve = path("family-curve.csv");
    writeFileSync(curve, "trainingSize,score\n10,0.6\n20,0.7\n40,0.75\n80,0.78\n");
    const out = path("family-forecast.json");
    const c = capture();
    expect(await run(["forecast", curve, "--family", "exp9", "--out", out], c.io)).toBe(ExitCode.usage);
    expect(c.stderr()).toBe(
      "headroom: --family: unknown name 'exp9' (known: pow3, pow4, mmf4, wbl4, exp3, ilog2, last)\n",
    );
    expect(existsSync(out)).toBe(false);
    expect(() => findCurveFamily("exp9")).toThrow("known families: pow3, pow4, mmf4, wbl4, exp3, ilog2, last");
  });
});

describe("data that looks odd but is fine", () => {
  /** A CSV of `rows` rows: `features` random normal features, a constant column and a label. */
  function oddData(rows: number, features: number, seed: number): string {
    const random = new RandomStream(seed);
    const header = [...Array.from({ length: features }, (_, j) => `f${j}`), "constant", "y"];
    const lines = [header.join(",")];
    for (let i = 0; i < rows; i++) {
      const x = Array.from({ length: features }, () => random.normal());
      // The class depends on the first feature, so the curve has something to learn.
      const label = x[0] + 0.5 * random.normal() > 0 ? "yes" : "no";
      lines.push([...x.map((v) => v.toFixed(4)), "7", label].join(","));
    }
    return `${lines.join("\n")}\n`;
  }

  it.each([
    // A constant column: standardization gives it scale 1, so it only adds a zero coefficient.
    ["a constant column", 200, 3],
    // More features (120) than training rows (at most 48): the L2 penalty keeps the fit defined.
    ["more features than rows", 60, 120],
  ])("measures %s", async (name, rows, features) => {
    const data = path(`${name.replace(/ /g, "-")}.csv`);
    writeFileSync(data, oddData(rows, features, rows + features));
    const curveFile = path(`${name.replace(/ /g, "-")}.json`);
    const c = capture();
    const code = await run(
      ["measure", data, "--label", "y", "--repeats", "2", "--workers", "1", "--quiet", "--out", curveFile],
      c.io,
    );
    expect(c.stderr()).toBe("");
    expect(code).toBe(ExitCode.ok);
    const curve = JSON.parse(readFileSync(curveFile, "utf8")) as {
      points: { trainingSize: number; scores: number[] }[];
    };
    expect(curve.points.length).toBeGreaterThanOrEqual(3);
    for (const point of curve.points) {
      expect(point.scores).toHaveLength(10);
      for (const score of point.scores) expect(score >= 0 && score <= 1).toBe(true);
    }
    // The largest size does better than chance (0.5) on average: the fits learned something.
    const last = curve.points.at(-1)!.scores;
    expect(last.reduce((a, b) => a + b, 0) / last.length).toBeGreaterThan(0.6);
  });
});

describe("nothing lost", () => {
  it("leaves an existing output file unchanged when a run fails", async () => {
    const existing = path("kept.json");
    writeFileSync(existing, "the previous result\n");
    for (const argv of [
      ["measure", path("nan.csv"), "--label", "y", "--out", existing],
      ["forecast", path("one-size-curve.csv"), "--out", existing],
      ["weigh", path("forecast.json"), "--plan", path("negative-cost-plan.json"), "--out", existing],
    ]) {
      const c = capture();
      expect(await run(argv, c.io)).not.toBe(ExitCode.ok);
      expect(readFileSync(existing, "utf8")).toBe("the previous result\n");
    }
  });

  it("never overwrites an input, even when --out names it by another path", async () => {
    const before = readFileSync(path("iris.csv"));
    mkdirSync(path("sub"), { recursive: true });
    const c = capture();
    const sameFile = join(path("sub"), "..", "iris.csv");
    expect(await run(["measure", path("iris.csv"), "--label", "class", "--out", sameFile], c.io)).toBe(ExitCode.io);
    expect(c.stderr()).toBe(`headroom: ${sameFile}: refusing to overwrite an input file\n`);
    expect(readFileSync(path("iris.csv")).equals(before)).toBe(true);
  });
});
