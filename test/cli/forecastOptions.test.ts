/**
 * `headroom forecast`'s options, through the in-process command line: --family, --target,
 * --confidence, --test-size and --classes reach forecast.json, the text summary labels both intervals, and bad
 * values give one line and the usage exit code.
 */
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { run } from "../../src/cli/program.js";
import { ExitCode } from "../../src/errors.js";
import { reliabilityOf, shippedCalibrations } from "../../src/forecast/gainCorrection.js";
import { capture } from "../helpers/captureIo.js";

const dir = mkdtempSync(join(tmpdir(), "headroom-forecast-options-"));
const curveFile = join(dir, "curve.csv");
// Exact points of 0.92 − 1.5·n^(−0.55), three repeats of one score each.
const lines = ["trainingSize,score,repeat"];
for (const n of [25, 50, 100, 200, 400, 800]) {
  for (let r = 0; r < 3; r++) lines.push(`${n},${(0.92 - 1.5 * Math.pow(n, -0.55)).toFixed(12)},${r}`);
}
writeFileSync(curveFile, `${lines.join("\n")}\n`);

describe("headroom forecast options", () => {
  it("passes --family, --target, --confidence and --test-size to forecast.json", async () => {
    const out = join(dir, "forecast.json");
    const c = capture();
    const argv = ["forecast", curveFile, "--at", "1600,3200", "--family", "pow3", "--target", "0.88"];
    expect(await run([...argv, "--confidence", "0.9", "--test-size", "250", "--out", out], c.io)).toBe(ExitCode.ok);
    const forecast = JSON.parse(readFileSync(out, "utf8"));
    expect(forecast.family).toBe("pow3");
    expect(forecast.familyWeights).toEqual({ pow3: 1 });
    expect(forecast.testSize).toBe(250);
    // 0.92 − 1.5·n^(−0.55) = 0.88 at n = (1.5/0.04)^(1/0.55) ≈ 727.5, so 728 rows.
    expect(forecast.targetSize).toMatchObject({ target: 0.88, confidence: 0.9, expected: 728, withConfidence: 728 });
    expect(forecast.projections.map((p: { trainingSize: number }) => p.trainingSize)).toEqual([1600, 3200]);
  });

  it("prints a table labeling both intervals, the family weights and the target's answer", async () => {
    const c = capture();
    expect(await run(["forecast", curveFile, "--at", "1600", "--target", "0.88", "--test-size", "250"], c.io)).toBe(
      ExitCode.ok,
    );
    const text = c.stdout();
    expect(text).toContain("80% interval (expected score)");
    expect(text).toContain("80% interval (one model, 250 test rows)");
    // The expected score is pow3's at L = 800, 0.8820, plus the pooled continuation over ln 2:
    // (s · λ · 0.55 · 1.5 · 800^(−0.55) + h · (1 − λ) · 1/2 · 0.1180) · ln 2 with λ = 800 / (800 + r),
    // 0.0105 (a CSV curve has no classes). The interval of the expected score holds it, and the one
    // of a single model tested on 250 rows is wider by the test rows' binomial spread.
    const row = /^1600\t2\.0\t(0\.\d+)\t\[(0\.\d+), (0\.\d+)\]\t\[(0\.\d+), (0\.\d+)\]$/m.exec(text);
    const [expected, lower, upper, modelLower, modelUpper] = (row ?? []).slice(1).map(Number);
    const { slopeWeight, headroomWeight, reliabilitySize } = shippedCalibrations.pooled;
    const trust = reliabilityOf(reliabilitySize, 800);
    const atLargest = 0.92 - 1.5 * Math.pow(800, -0.55);
    const gain =
      (slopeWeight * trust * 0.55 * 1.5 * Math.pow(800, -0.55) + headroomWeight * (1 - trust) * 0.5 * (1 - atLargest)) *
      Math.log(2);
    expect(expected).toBeCloseTo(atLargest + gain, 3);
    expect(lower).toBeLessThanOrEqual(expected);
    expect(upper).toBeGreaterThanOrEqual(expected);
    expect(modelLower).toBeLessThan(lower - 0.01);
    expect(modelUpper).toBeGreaterThan(upper + 0.01);
    expect(text).toMatch(/^families: pow3 \d+%/m);
    expect(text).toContain("target 0.88: expected score reaches it at training size 728");
    // The CSV does not say its folds: the assumption is a warning on stderr, not on stdout.
    expect(c.stderr()).toMatch(/^warning: The curve does not say how large its test folds were/m);
  });

  it("--quiet prints nothing, and forecast.json still holds the warnings", async () => {
    const out = join(dir, "quiet.json");
    const c = capture();
    expect(await run(["forecast", curveFile, "--at", "1600", "--quiet", "--out", out], c.io)).toBe(ExitCode.ok);
    expect(c.stdout()).toBe("");
    expect(c.stderr()).toBe("");
    const forecast = JSON.parse(readFileSync(out, "utf8"));
    expect(forecast.warnings.join("\n")).toMatch(/The curve does not say how large its test folds were/);
  });

  it("--classes counts the distance left of a CSV curve by 1 − 1/K", async () => {
    const expectedAt = async (extra: string[]): Promise<number> => {
      const c = capture();
      expect(await run(["forecast", curveFile, "--at", "1600", "--json", ...extra], c.io)).toBe(ExitCode.ok);
      const forecast = JSON.parse(c.stdout());
      expect(forecast.continuation.guessError).toBeCloseTo(extra.length === 0 ? 0.5 : 1 - 1 / Number(extra[1]), 12);
      return forecast.projections[0].expected;
    };
    // Only the distance-left term changes: h · c/(800 + c) · (0.9 − 0.5) · (1 − 0.8820) · ln 2 more
    // with ten classes (pow3 at L = 800 is 0.92 − 1.5 · 800^(−0.55) = 0.8820).
    const { headroomWeight } = shippedCalibrations.pooled;
    const share = 1 - reliabilityOf(shippedCalibrations.pooled.reliabilitySize, 800);
    const left = 1 - (0.92 - 1.5 * Math.pow(800, -0.55));
    expect((await expectedAt(["--classes", "10"])) - (await expectedAt([]))).toBeCloseTo(
      headroomWeight * share * 0.4 * left * Math.log(2),
      6,
    );
    expect(await expectedAt(["--classes", "2"])).toBeCloseTo(await expectedAt([]), 12);
  });

  it("--classes is refused for a curve.json recording another number of classes, or a numeric target", async () => {
    const json = (overrides: Record<string, unknown>): string => {
      const file = join(dir, `curve-${Object.keys(overrides).join("-")}.json`);
      const points = [25, 50, 100, 200, 400, 800].map((n) => ({
        trainingSize: n,
        scores: [0.92 - 1.5 * Math.pow(n, -0.55)],
      }));
      const curve = { kind: "headroom-curve", version: 1, metric: "accuracy", higherIsBetter: true, rows: 1000 };
      writeFileSync(file, JSON.stringify({ ...curve, metricRange: [0, 1], points, ...overrides }));
      return file;
    };
    const c = capture();
    const threeClasses = json({ task: "classification", classNames: ["a", "b", "c"] });
    expect(await run(["forecast", threeClasses, "--classes", "4"], c.io)).toBe(ExitCode.usage);
    expect(c.stderr()).toBe(
      "headroom: --classes: is 4, but the curve records 3 classes; leave it out for a curve.json\n",
    );
    const d = capture();
    expect(await run(["forecast", json({ task: "regression" }), "--classes", "3"], d.io)).toBe(ExitCode.usage);
    expect(d.stderr()).toBe("headroom: --classes: is for a classification curve; this curve has a numeric target\n");
    // The number it records is accepted.
    expect(await run(["forecast", threeClasses, "--classes", "3", "--quiet"], capture().io)).toBe(ExitCode.ok);
  });

  it.each([
    [["--classes", "1"], /^headroom: --classes: '1' is not a whole number of at least 2$/m],
    [
      ["--family", "pow9"],
      /^headroom: --family: unknown name .pow9. \(known: pow3, pow4, mmf4, wbl4, exp3, ilog2, last\)\n$/,
    ],
    [["--target", "high"], /^headroom: --target: 'high' is not a number$/m],
    [["--target", "85"], /^headroom: --target: 85 is outside the score range \[0, 1\]/],
    [["--confidence", "1.5"], /^headroom: --confidence: '1.5' is not a probability between 0 and 1$/m],
    [["--test-size", "0"], /^headroom: --test-size: '0' is not a whole number of at least 1$/m],
  ])("%j gives one line and the usage exit code", async (extra, line) => {
    const c = capture();
    expect(await run(["forecast", curveFile, "--at", "1600", ...extra], c.io)).toBe(ExitCode.usage);
    expect(c.stderr()).toMatch(line);
    expect(c.stderr().trimEnd().split("\n")).toHaveLength(1);
  });
});
