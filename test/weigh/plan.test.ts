import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { DataError } from "../../src/errors.js";
import { validate } from "../../src/io/validate.js";
import { costOfRuns, monthsOfRuns, planSchema, resolvePlan } from "../../src/weigh/plan.js";
import { readPlan } from "../../src/weigh/readPlan.js";

const base = { samplesPerRun: 50, costPerRun: 1000, valuePerPoint: 500 };

describe("plan validation: one line naming the file and the key", () => {
  it.each([
    [{ ...base, costPerRun: -1 }, "plan.json: costPerRun: Too small: expected number to be >=0"],
    [{ ...base, samplesPerRun: 0 }, "plan.json: samplesPerRun: Too small: expected number to be >0"],
    [
      { costPerRun: 1, valuePerPoint: 1 },
      "plan.json: samplesPerRun: missing: give samplesPerRun, or samplesPerRunRange [fewest, most] when the yield is uncertain",
    ],
    [{ ...base, passRate: 0 }, "plan.json: passRate: Too small: expected number to be >0"],
    [{ ...base, passRate: 1.2 }, "plan.json: passRate: Too big: expected number to be <=1"],
    [
      { costPerRun: 1, valuePerPoint: 1, samplesPerRunRange: [60, 40] },
      "plan.json: samplesPerRunRange: the fewest samples (60) is larger than the most (40); write [fewest, most]",
    ],
    [
      { ...base, samplesPerRunRange: [40, 60] },
      "plan.json: samplesPerRunRange: give samplesPerRun or samplesPerRunRange, not both",
    ],
    [
      { samplesPerRun: 50, costPerRun: 1 },
      "plan.json: valuePerPoint: missing: give valuePerPoint, or casesPerYear, costPerError and yearsInUse, or a target score to reach",
    ],
    [
      { samplesPerRun: 50, costPerRun: 1, casesPerYear: 1000, costPerError: 20 },
      "plan.json: yearsInUse: missing: the value of a point is derived from casesPerYear, costPerError and yearsInUse together (yearsInUse is not given)",
    ],
    [
      { ...base, casesPerYear: 1000, costPerError: 20, yearsInUse: 3 },
      "plan.json: valuePerPoint: give valuePerPoint or casesPerYear, costPerError and yearsInUse, not both",
    ],
    [{ ...base, parallelRuns: 0 }, "plan.json: parallelRuns: Too small: expected number to be >0"],
    [{ ...base, fixedCost: -5 }, "plan.json: fixedCost: Too small: expected number to be >=0"],
    [{ ...base, deadlineMonths: -1 }, "plan.json: deadlineMonths: Too small: expected number to be >=0"],
    [
      { ...base, clinical: { predictorParameters: 10, anticipatedCoxSnellR2: 0.7, prevalence: 0.174 } },
      "plan.json: clinical.anticipatedCoxSnellR2: 0.7 is not below 0.6032, the largest Cox–Snell R² a binary outcome with this prevalence allows",
    ],
    [
      { ...base, clinical: { predictorParameters: 10, anticipatedCoxSnellR2: 0.2 } },
      "plan.json: clinical.prevalence: Invalid input: expected number, received undefined",
    ],
    [{ ...base, costPerRnu: 3 }, `plan.json: (top level): Unrecognized key: "costPerRnu"`],
  ])("%j → %s", (plan, text) => {
    let caught: unknown;
    try {
      validate(planSchema, plan, "plan.json");
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(DataError);
    expect((caught as Error).message).toBe(text);
  });

  it("reads a plan file and names it in errors", () => {
    const dir = mkdtempSync(join(tmpdir(), "headroom-plan-"));
    const file = join(dir, "plan.json");
    writeFileSync(file, JSON.stringify({ ...base, costPerRun: -3 }));
    expect(() => readPlan(file)).toThrow(`${file}: costPerRun: Too small: expected number to be >=0`);
    writeFileSync(file, JSON.stringify({ ...base, target: 0.9 }));
    expect(readPlan(file).targetConfidence).toBe(0.8);
  });
});

describe("resolvePlan", () => {
  it("derives the value of a point from errors avoided: casesPerYear × yearsInUse × costPerError / 100", () => {
    // 2,000 cases a year for 5 years: one point of accuracy avoids 100 errors, at 30 each: 3,000.
    const plan = planSchema.parse({
      samplesPerRun: 50,
      costPerRun: 1000,
      casesPerYear: 2000,
      yearsInUse: 5,
      costPerError: 30,
    });
    const resolved = resolvePlan(plan);
    expect(resolved.valuePerPoint).toBe(3000);
    expect(resolved.valueBasis).toBe("consequences");
  });

  it("treats a target-only plan as putting no money on a point", () => {
    const resolved = resolvePlan(planSchema.parse({ samplesPerRun: 50, costPerRun: 1000, target: 0.9 }));
    expect(resolved.valuePerPoint).toBe(0);
    expect(resolved.valueBasis).toBe("target");
  });

  it.each([
    // [runs, parallelRuns, months]: ceil(runs / parallelRuns) × 3.
    [0, 2, 0],
    [1, 2, 3],
    [2, 2, 3],
    [3, 2, 6],
    [5, 3, 6],
    [5, 1, 15],
  ])("%i runs, %i at a time, take %i months at 3 a run", (runs, parallelRuns, months) => {
    const resolved = resolvePlan(planSchema.parse({ ...base, monthsPerRun: 3, parallelRuns }));
    expect(monthsOfRuns(resolved, runs)).toBe(months);
  });

  it.each([
    [0, 0],
    [1, 5000 + 1000],
    [3, 5000 + 3000],
  ])("%i runs cost %i with a fixed cost of 5,000 paid once", (runs, cost) => {
    const resolved = resolvePlan(planSchema.parse({ ...base, fixedCost: 5000 }));
    expect(costOfRuns(resolved, runs)).toBe(cost);
  });

  it("gives the expected yield after quality control and the middle of a range", () => {
    expect(resolvePlan(planSchema.parse({ ...base, passRate: 0.8 })).expectedYield).toBe(40);
    const range = resolvePlan(planSchema.parse({ costPerRun: 1, valuePerPoint: 1, samplesPerRunRange: [30, 50] }));
    expect(range.expectedYield).toBe(40);
    expect(range.yieldModel).toEqual({ kind: "range", fewest: 30, most: 50, passRate: 1 });
  });
});
