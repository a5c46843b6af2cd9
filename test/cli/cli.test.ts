import { existsSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { run } from "../../src/cli/program.js";
import { ExitCode } from "../../src/errors.js";
import { capture } from "../helpers/captureIo.js";

const dir = mkdtempSync(join(tmpdir(), "headroom-cli-"));

describe("headroom demo, end to end", () => {
  it("writes the report and the JSON files, and recommends a number of runs", async () => {
    const out = join(dir, "demo");
    const c = capture();
    const code = await run(["demo", "--out", out, "--workers", "1"], c.io);
    expect(c.stderr()).not.toContain("headroom:");
    expect(code).toBe(ExitCode.ok);
    for (const name of ["curve.json", "forecast.json", "decision.json", "decision.csv", "report.html"]) {
      expect(existsSync(join(out, name))).toBe(true);
    }
    const curve = JSON.parse(readFileSync(join(out, "curve.json"), "utf8"));
    const decision = JSON.parse(readFileSync(join(out, "decision.json"), "utf8"));
    const html = readFileSync(join(out, "report.html"), "utf8");
    // The demo study's plan: up to 6 further runs of 45 samples on top of the data set's rows.
    expect(decision.table.map((r: { trainingSize: number }) => r.trainingSize)).toEqual(
      Array.from({ length: 7 }, (_, k) => curve.rows + 45 * k),
    );
    // The demo shows the whole decision: at least one run recommended, a target that becomes likely
    // within the plan, a budget that binds, and an assumption whose ±25% change moves the advice.
    expect(c.stdout()).toMatch(/^recommended: [1-9]\d* further run/);
    expect(decision.recommendedRuns).toBeGreaterThanOrEqual(1);
    expect(decision.runsToTarget).toBeGreaterThan(0);
    expect(decision.runsToTarget).toBeLessThanOrEqual(decision.plan.maxRuns);
    expect(decision.table.some((row: { affordable: boolean }) => !row.affordable)).toBe(true);
    expect(decision.reasons.stopAfterRuns).toMatch(/past the budget|after the deadline/);
    const changed = decision.sensitivity.filter(
      (f: { low: { recommendedRuns: number } | null; high: { recommendedRuns: number } | null }) =>
        [f.low, f.high].some((o) => o !== null && o.recommendedRuns !== decision.recommendedRuns),
    );
    expect(changed.length).toBeGreaterThanOrEqual(1);
    // Every caution of the decision is on the page.
    for (const caution of decision.cautions) expect(html).toContain(caution.replace(/'/g, "&#39;"));
    expect(html).toContain('id="chart-sensitivity"');
    expect(html).toContain("<html");
    expect(html).toContain("Content-Security-Policy");
  });
});

describe("the measure → forecast → weigh → report chain", () => {
  it("runs each step from the previous step's file", async () => {
    const data = join(dir, "iris.csv");
    writeFileSync(data, readFileSync(new URL("../../fixtures/open-data/iris.csv", import.meta.url)));
    const curveFile = join(dir, "curve.json");
    const forecastFile = join(dir, "forecast.json");
    const planFile = join(dir, "plan.json");
    const decisionFile = join(dir, "decision.json");
    writeFileSync(
      planFile,
      JSON.stringify({ samplesPerRun: 30, costPerRun: 500, maxRuns: 2, valuePerPoint: 100, target: 0.97 }),
    );
    const steps = [
      ["measure", data, "--label", "class", "--repeats", "2", "--workers", "1", "--quiet", "--out", curveFile],
      // The default sizes (150 × [1, 1.5, 2, 3, 5]) miss 180 and 210: weigh reads the stored curves there.
      ["forecast", curveFile, "--out", forecastFile],
      ["weigh", forecastFile, "--plan", planFile, "--out", decisionFile],
      [
        "report",
        "--curve",
        curveFile,
        "--forecast",
        forecastFile,
        "--decision",
        decisionFile,
        "--quiet",
        "--out",
        join(dir, "r.html"),
      ],
    ];
    for (const argv of steps) {
      const c = capture();
      expect(await run(argv, c.io), `${argv[0]}: ${c.stderr()}`).toBe(ExitCode.ok);
    }
    const decision = JSON.parse(readFileSync(decisionFile, "utf8"));
    expect(decision.table.map((row: { trainingSize: number }) => row.trainingSize)).toEqual([150, 180, 210]);
  });
});

describe("bad input", () => {
  it.each([
    [
      ["measure", "/nonexistent/x.csv", "--label", "y", "--out", "o.json"],
      ExitCode.noInput,
      "headroom: /nonexistent/x.csv: no such file\n",
    ],
    [
      ["measure", "x.csv", "--label", "y", "--folds", "two", "--out", "o.json"],
      ExitCode.usage,
      "headroom: --folds: 'two' is neither a whole number of at least 2 nor 'loo'\n",
    ],
    [
      ["measure", "x.csv", "--out", "o.json"],
      ExitCode.usage,
      "headroom: required option '--label <column>' not specified\n",
    ],
    [["frobnicate"], ExitCode.usage, "headroom: unknown command 'frobnicate'\n"],
  ])("%j gives one line and exit code %i", async (argv, exitCode, line) => {
    const c = capture();
    expect(await run(argv, c.io)).toBe(exitCode);
    expect(c.stderr()).toBe(line);
  });

  it("writes no output when the input is bad", async () => {
    const data = join(dir, "bad.csv");
    writeFileSync(data, "x,y\n1,a\n2,b\nNaN,a\n");
    const out = join(dir, "never.json");
    const c = capture();
    expect(await run(["measure", data, "--label", "y", "--out", out], c.io)).toBe(ExitCode.data);
    expect(c.stderr()).toBe(
      `headroom: ${data}:4:1: 'NaN' in column 'x' is not a finite number; leave the cell empty for a missing value\n`,
    );
    expect(existsSync(out)).toBe(false);
  });
});
