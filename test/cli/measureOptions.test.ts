/**
 * `headroom measure`'s learner, metric, split and tuning options, end to end through the command line
 * on the open iris data (fixtures/open-data/iris.csv) and the invented demo data (fixtures/demo/).
 */
import { mkdtempSync, readFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { run } from "../../src/cli/program.js";
import { ExitCode } from "../../src/errors.js";

const dir = mkdtempSync(join(tmpdir(), "headroom-measure-"));
const iris = new URL("../../fixtures/open-data/iris.csv", import.meta.url).pathname;
const demo = new URL("../../fixtures/demo/water-samples.csv", import.meta.url).pathname;

async function measure(argv: string[]) {
  const err: string[] = [];
  const io = { stdout: () => {}, stderr: (t: string) => void err.push(t), stderrIsTerminal: false };
  const out = join(
    dir,
    `curve-${Math.abs(
      argv
        .join(" ")
        .split("")
        .reduce((h, c) => (h * 31 + c.charCodeAt(0)) | 0, 7),
    )}.json`,
  );
  const code = await run(["measure", ...argv, "--workers", "1", "--out", out], io);
  return {
    code,
    stderr: err.join(""),
    curve: code === ExitCode.ok ? JSON.parse(readFileSync(out, "utf8")) : undefined,
  };
}

describe("headroom measure options", () => {
  it("records the metric's direction and leaves an unbounded range out (--metric log_loss)", async () => {
    const { code, curve, stderr } = await measure([
      iris,
      "--label",
      "class",
      "--metric",
      "log_loss",
      "--folds",
      "3",
      "--repeats",
      "1",
      "--quiet",
    ]);
    expect(code, stderr).toBe(ExitCode.ok);
    expect(curve).toMatchObject({
      metric: "log_loss",
      higherIsBetter: false,
      task: "classification",
      learner: "logistic",
    });
    expect(curve.metricRange).toBeUndefined();
    for (const point of curve.points) for (const s of point.scores) expect(s).toBeGreaterThan(0);
  });

  it("measures a numeric target with ridge and RMSE, reading the text column as categories (--task regression)", async () => {
    // Petal width from the other measurements and the species (a text column, one-hot encoded by ridge).
    const { code, curve, stderr } = await measure([
      iris,
      "--label",
      "petal_width_(cm)",
      "--task",
      "regression",
      "--repeats",
      "2",
      "--quiet",
    ]);
    expect(code, stderr).toBe(ExitCode.ok);
    expect(curve).toMatchObject({
      task: "regression",
      learner: "ridge",
      metric: "rmse",
      higherIsBetter: false,
      splitter: "k-fold",
    });
    const means = curve.points.map((p: { scores: number[] }) => p.scores.reduce((a, b) => a + b, 0) / p.scores.length);
    // Petal width spans 0.1–2.5 cm (standard deviation 0.76): a fitted model's RMSE lies well below that.
    for (const mean of means) expect(mean).toBeGreaterThan(0);
    expect(means[means.length - 1]).toBeLessThan(0.3);
    expect(means[means.length - 1]).toBeLessThan(means[0]);
  });

  it("splits leave-one-out with --folds loo", async () => {
    const { code, curve, stderr } = await measure([
      iris,
      "--label",
      "class",
      "--folds",
      "loo",
      "--repeats",
      "1",
      "--sizes",
      "30,149",
      "--quiet",
    ]);
    expect(code, stderr).toBe(ExitCode.ok);
    expect(curve).toMatchObject({ splitter: "leave-one-out", folds: 150 });
    expect(curve.points[1].scores).toHaveLength(150);
  });

  it("measures against whole cruises with --group and --by-runs, and prints the fallback note", async () => {
    const { code, curve, stderr } = await measure([
      demo,
      "--label",
      "bloom_risk",
      "--group",
      "cruise",
      "--ignore",
      "sample_id",
      "--by-runs",
      "--repeats",
      "2",
    ]);
    expect(code, stderr).toBe(ExitCode.ok);
    // Four pilot cruises of 30 samples: leave-one-cruise-out, pools of 3 cruises, sizes 1, 2, 3 cruises.
    expect(curve).toMatchObject({ splitter: "leave-one-group-out", folds: 4, unit: "runs", runs: 4, rowsPerRun: 30 });
    expect(curve.points.map((p: { trainingSize: number }) => p.trainingSize)).toEqual([1, 2, 3]);
    expect(stderr).toContain("warning: 5 folds are more than the 4 runs in 'cruise'");
  });

  it.each([
    [["--folds", "one"], "headroom: --folds: 'one' is neither a whole number of at least 2 nor 'loo'"],
    [
      ["--metric", "auc"],
      "headroom: --metric: unknown name 'auc' (known: accuracy, balanced_accuracy, roc_auc, log_loss, brier, f1_macro, rmse, mae, r2)",
    ],
    [["--task", "ranking"], "headroom: --task: unknown name 'ranking' (known: classification, regression)"],
    [["--by-runs"], "headroom: --by-runs: needs --group"],
    [
      ["--metric", "rmse", "--learner", "logistic"],
      "headroom: --metric: 'rmse' is for regression, but the task is classification",
    ],
  ])("rejects %o with a usage error", async (extra, text) => {
    const { code, stderr } = await measure([iris, "--label", "class", "--quiet", ...extra]);
    expect(code).toBe(ExitCode.usage);
    expect(stderr).toContain(text);
  });
});
