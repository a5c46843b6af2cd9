import { describe, expect, it } from "vitest";
import type { ForecastFile, Projection } from "../../src/forecast/forecastFile.js";
import { planSchema } from "../../src/weigh/plan.js";
import { weighRuns } from "../../src/weigh/weigh.js";

/** A forecast whose projections are given by hand: expected score and draws at each size. */
function forecast(projections: [number, number, number[]][], higherIsBetter = true): ForecastFile {
  return {
    kind: "headroom-forecast",
    version: 1,
    metric: "accuracy",
    higherIsBetter,
    rows: 100,
    family: "pow3",
    parameters: {},
    measured: [],
    largestMeasuredSize: 80,
    level: 0.8,
    projections: projections.map(([trainingSize, expected, draws]): Projection => ({
      trainingSize,
      expected,
      lower: Math.min(...draws),
      upper: Math.max(...draws),
      level: 0.8,
      draws,
    })),
    band: [],
    warnings: [],
    seed: 0,
  };
}

const projections: [number, number, number[]][] = [
  [100, 0.8, [0.78, 0.8, 0.82, 0.8]],
  [150, 0.85, [0.83, 0.85, 0.88, 0.84]],
  [200, 0.87, [0.84, 0.87, 0.9, 0.87]],
  [250, 0.88, [0.85, 0.88, 0.91, 0.9]],
];

describe("weighRuns", () => {
  it("computes cost, months and net value as valuePerPoint × 100 × gain − cost", () => {
    const plan = planSchema.parse({
      samplesPerRun: 50,
      costPerRun: 10000,
      monthsPerRun: 3,
      maxRuns: 3,
      valuePerPoint: 4000,
      target: 0.87,
    });
    const decision = weighRuns(forecast(projections), plan);
    expect(decision.table.map((r) => r.trainingSize)).toEqual([100, 150, 200, 250]);
    expect(decision.table.map((r) => r.cost)).toEqual([0, 10000, 20000, 30000]);
    expect(decision.table.map((r) => r.months)).toEqual([0, 3, 6, 9]);
    // Gains of 5, 7 and 8 points at 4000 a point, minus the cost.
    const net = decision.table.map((r) => r.expectedNetValue);
    [0, 10000, 8000, 2000].forEach((value, i) => expect(net[i]).toBeCloseTo(value, 6));
    expect(decision.recommendedRuns).toBe(1);
    // Share of draws at or above 0.87: 0, 1/4, 3/4, 3/4.
    expect(decision.table.map((r) => r.probabilityOfTarget)).toEqual([0, 0.25, 0.75, 0.75]);
  });

  it("respects the budget and finds the runs that reach the target with the asked confidence", () => {
    const plan = planSchema.parse({
      samplesPerRun: 50,
      costPerRun: 1000,
      maxRuns: 3,
      valuePerPoint: 4000,
      budget: 2000,
      target: 0.87,
      targetConfidence: 0.7,
    });
    const decision = weighRuns(forecast(projections), plan);
    expect(decision.table.map((r) => r.affordable)).toEqual([true, true, true, false]);
    expect(decision.recommendedRuns).toBe(2);
    expect(decision.runsToTarget).toBe(2);
  });

  it("counts a fall in a lower-is-better metric as a gain", () => {
    const plan = planSchema.parse({ samplesPerRun: 50, costPerRun: 0, maxRuns: 1, valuePerPoint: 1000, target: 0.2 });
    const decision = weighRuns(
      forecast(
        [
          [100, 0.3, [0.3]],
          [150, 0.25, [0.19]],
        ],
        false,
      ),
      plan,
    );
    expect(decision.table[1].expectedNetValue).toBeCloseTo(5000, 6);
    expect(decision.table[1].probabilityOfTarget).toBe(1);
  });

  it("names the training sizes the forecast lacks", () => {
    const plan = planSchema.parse({ samplesPerRun: 60, costPerRun: 1, maxRuns: 2, valuePerPoint: 1 });
    expect(() => weighRuns(forecast(projections), plan, "f.json")).toThrow(
      "f.json: the forecast has no projection at training sizes 160, 220; rerun headroom forecast with --at 100,160,220",
    );
  });
});
