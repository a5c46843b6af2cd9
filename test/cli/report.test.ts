/**
 * `headroom report`: the page goes where --out says and, in the same folder, each chart as SVG and
 * PNG and the decision table as CSV; --no-chart-files writes the page alone; --currency shows with
 * every amount. The inputs are the report tests' hand-made curve, forecast and decision, written as
 * the JSON files the earlier steps would write.
 */
import { existsSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { run } from "../../src/cli/program.js";
import { ExitCode } from "../../src/errors.js";
import { sampleCurve, sampleDecision, sampleForecast } from "../report/sampleInputs.js";
import { capture } from "../helpers/captureIo.js";

/** A folder holding curve.json, forecast.json and decision.json. */
function inputsFolder(): string {
  const folder = mkdtempSync(join(tmpdir(), "headroom-report-"));
  writeFileSync(join(folder, "curve.json"), JSON.stringify(sampleCurve));
  writeFileSync(join(folder, "forecast.json"), JSON.stringify(sampleForecast));
  writeFileSync(join(folder, "decision.json"), JSON.stringify(sampleDecision));
  return folder;
}

const chartFiles = ["chart-learning-curve", "chart-score", "chart-net-value", "chart-sensitivity"].flatMap((id) => [
  `${id}.png`,
  `${id}.svg`,
]);

describe("headroom report", () => {
  it("writes the page to --out and the chart files and decision.csv beside it", async () => {
    const folder = inputsFolder();
    const out = join(folder, "pages", "lab.html");
    const c = capture();
    const code = await run(
      [
        "report",
        ...["--curve", join(folder, "curve.json"), "--forecast", join(folder, "forecast.json")],
        ...["--decision", join(folder, "decision.json"), "--currency", "EUR", "--out", out],
      ],
      c.io,
    );
    expect(c.stderr()).not.toContain("headroom:");
    expect(code).toBe(ExitCode.ok);
    expect(readdirSync(join(folder, "pages")).sort()).toEqual(["decision.csv", "lab.html", ...chartFiles].sort());
    const html = readFileSync(out, "utf8");
    expect(html).toContain("Two more runs (44,000 EUR, 6 months)");
    expect(readFileSync(join(folder, "pages", "chart-net-value.svg"), "utf8")).toContain(
      ">Recommended: 2 further runs, expected net value 20,400 EUR</text>",
    );
    expect(c.stderr()).toContain(`wrote ${out}, ${join(folder, "pages", "decision.csv")}`);
  });

  it("writes the page alone with --no-chart-files", async () => {
    const folder = inputsFolder();
    const out = join(folder, "only.html");
    const c = capture();
    const code = await run(
      [
        "report",
        ...["--curve", join(folder, "curve.json"), "--forecast", join(folder, "forecast.json")],
        ...["--decision", join(folder, "decision.json"), "--no-chart-files", "--quiet", "--out", out],
      ],
      c.io,
    );
    expect(code).toBe(ExitCode.ok);
    expect(existsSync(out)).toBe(true);
    expect(readdirSync(folder).sort()).toEqual(["curve.json", "decision.json", "forecast.json", "only.html"]);
    expect(c.stderr()).toBe("");
  });
});
