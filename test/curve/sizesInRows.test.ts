import { describe, expect, it } from "vitest";
import type { CurveFile } from "../../src/curve/curveFile.js";
import { sizesInRows } from "../../src/curve/sizesInRows.js";
import { forecastCurve } from "../../src/forecast/forecast.js";

/** A curve of 4 runs' worth of folds × 3 repeats whose mean follows 0.9 − 0.8·n^(−0.4) in rows. */
function curveInRuns(): CurveFile {
  const runs = [1, 2, 3, 4, 6, 8];
  return {
    kind: "headroom-curve",
    version: 1,
    metric: "accuracy",
    higherIsBetter: true,
    metricRange: [0, 1],
    rows: 450,
    folds: 4,
    repeats: 3,
    unit: "runs",
    runs: 10,
    rowsPerRun: 45,
    points: runs.map((r) => ({
      trainingSize: r,
      scores: Array.from({ length: 12 }, (_, i) => 0.9 - 0.8 * Math.pow(r * 45, -0.4) + ((i % 3) - 1) * 0.01),
    })),
  };
}

describe("sizesInRows", () => {
  it("restates sizes in runs as rows at the mean rows per run", () => {
    const { curve, converted } = sizesInRows(curveInRuns());
    expect(converted).toBe(true);
    expect(curve.unit).toBe("rows");
    expect(curve.points.map((p) => p.trainingSize)).toEqual([45, 90, 135, 180, 270, 360]);
  });

  it("leaves a curve in rows as it is", () => {
    const rows = sizesInRows(curveInRuns()).curve;
    expect(sizesInRows(rows)).toEqual({ curve: rows, converted: false });
  });

  it("forecasts a curve in runs exactly as the same curve in rows, and says so", () => {
    const options = { at: [450, 495, 540], seed: 3, draws: 50 };
    const fromRuns = forecastCurve(curveInRuns(), options);
    const fromRows = forecastCurve(sizesInRows(curveInRuns()).curve, options);
    expect(fromRuns.warnings[0]).toBe(
      "The curve was measured in whole runs; its sizes are restated in samples at the mean of 45 samples per run.",
    );
    expect({ ...fromRuns, warnings: fromRuns.warnings.slice(1) }).toEqual(fromRows);
    expect(fromRuns.measured.map((m) => m.trainingSize)).toEqual([45, 90, 135, 180, 270, 360]);
  });
});
