/**
 * `weigh` reads a forecast at any training size: a forecast stores its drawn curves, so the sizes a
 * plan reaches need not be among its projections (issue 13). Checked against the forecast itself:
 * the value weigh computes at a size equals the projection a forecast at that size writes.
 */
import { describe, expect, it } from "vitest";
import type { CurveFile, CurvePoint } from "../../src/curve/curveFile.js";
import { forecastCurve } from "../../src/forecast/forecast.js";
import type { ForecastFile } from "../../src/forecast/forecastFile.js";
import { DataError } from "../../src/errors.js";
import { RandomStream } from "../../src/random.js";
import { planSchema } from "../../src/weigh/plan.js";
import { weighRuns } from "../../src/weigh/weigh.js";

/** A noisy pow3 accuracy curve (a = 0.9, b = 1.2, c = 0.5), 5 repeats × 5 folds at six sizes. */
function curve(): CurveFile {
  const random = new RandomStream(13);
  const shifts = Array.from({ length: 5 }, () => 0.01 * random.normal());
  const points: CurvePoint[] = [20, 40, 80, 160, 320, 640].map((trainingSize) => ({
    trainingSize,
    scores: Array.from(
      { length: 25 },
      (_, k) =>
        0.9 -
        1.2 * trainingSize ** -0.5 +
        shifts[Math.floor(k / 5)] +
        0.02 * random.normal() * Math.sqrt(100 / trainingSize),
    ),
  }));
  return {
    kind: "headroom-curve",
    version: 1,
    metric: "accuracy",
    higherIsBetter: true,
    metricRange: [0, 1],
    rows: 800,
    folds: 5,
    repeats: 5,
    points,
  };
}

const plan = planSchema.parse({ samplesPerRun: 37, costPerRun: 1000, valuePerPoint: 800, maxRuns: 4, target: 0.85 });
/** 800 + k × 37: none of them a default projection (800 × [1, 1.5, 2, 3, 5]) except 800. */
const planSizes = [800, 837, 874, 911, 948];
const measured = curve();

describe("weigh on a forecast made with the default sizes", () => {
  const forecast = forecastCurve(measured, { draws: 60 });

  it("the default projections miss the plan's sizes, and weigh still gives a decision", () => {
    const projected = forecast.projections.map((p) => p.trainingSize);
    expect(planSizes.slice(1).some((size) => projected.includes(size))).toBe(false);
    const decision = weighRuns(forecast, plan, "f.json", { simulations: 200 });
    expect(decision.table.map((row) => row.trainingSize)).toEqual(planSizes);
  });

  it("reads each size exactly as a forecast projecting to that size writes it", () => {
    const decision = weighRuns(forecast, plan, "f.json", { simulations: 200 });
    const exact = forecastCurve(measured, { draws: 60, at: planSizes });
    decision.table.forEach((row, k) => {
      const projection = exact.projections[k];
      expect(row.expected).toBeCloseTo(projection.expected, 12);
      const reached = projection.draws.filter((d) => d >= 0.85).length / projection.draws.length;
      expect(row.probabilityOfTarget).toBeCloseTo(reached, 12);
    });
  });

  it("gives the same decision as a forecast at exactly the plan's sizes", () => {
    const exact = forecastCurve(measured, { draws: 60, at: planSizes });
    const fromDefault = weighRuns(forecast, plan, "f.json", { simulations: 200 });
    const fromExact = weighRuns(exact, plan, "f.json", { simulations: 200 });
    expect(fromDefault.recommendedRuns).toBe(fromExact.recommendedRuns);
    expect(fromDefault.runsToTarget).toBe(fromExact.runsToTarget);
    fromDefault.table.forEach((row, k) => {
      expect(row.expectedNetValue).toBeCloseTo(fromExact.table[k].expectedNetValue, 6);
    });
  });

  it("decides as before on a matching forecast, with or without its stored curves", () => {
    const exact = forecastCurve(measured, { draws: 60, at: planSizes });
    const withoutCurves: ForecastFile = { ...exact, curves: undefined };
    const a = weighRuns(exact, plan, "f.json", { simulations: 200 });
    const b = weighRuns(withoutCurves, plan, "f.json", { simulations: 200 });
    expect(a.recommendedRuns).toBe(b.recommendedRuns);
    expect(a.table).toEqual(b.table);
  });

  it("an older forecast file without curves and without the sizes says to rerun forecast", () => {
    const older: ForecastFile = { ...forecast, curves: undefined };
    expect(() => weighRuns(older, plan, "f.json")).toThrow(DataError);
    expect(() => weighRuns(older, plan, "f.json")).toThrow(/rerun headroom forecast on the same curve/);
  });

  it("lower-is-better metrics are read in their own units", () => {
    const loss: CurveFile = {
      ...measured,
      metric: "log_loss",
      higherIsBetter: false,
      metricRange: [0, Infinity],
      points: measured.points.map((p) => ({ ...p, scores: p.scores.map((s) => 1.5 - s) })),
    };
    const lossPlan = planSchema.parse({ samplesPerRun: 37, costPerRun: 1000, valuePerPoint: 800, maxRuns: 4 });
    const decision = weighRuns(forecastCurve(loss, { draws: 40 }), lossPlan, "f.json", { simulations: 100 });
    const exact = forecastCurve(loss, { draws: 40, at: planSizes });
    decision.table.forEach((row, k) => expect(row.expected).toBeCloseTo(exact.projections[k].expected, 12));
  });
});
