import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import {
  clopperPearsonInterval,
  clopperPearsonLowerBound,
  heldOutNeededExact,
  heldOutNeededWilson,
  wilsonInterval,
  wilsonLowerBound,
} from "../../src/weigh/validationSize.js";

/** SciPy's beta.ppf and the Wilson formula, from scripts/reference/scipy_intervals.py (Debian python3-scipy). */
const reference = JSON.parse(
  readFileSync(new URL("../../fixtures/reference/scipy-intervals.json", import.meta.url), "utf8"),
) as {
  clopperPearson: { successes: number; n: number; level: number; lower: number; upper: number }[];
  clopperPearsonLower: { successes: number; n: number; confidence: number; lower: number }[];
  wilson: { observed: number; n: number; level: number; lower: number; upper: number }[];
  heldOutNeeded: { expected: number; target: number; confidence: number; wilson: number; exact: number }[];
};

describe("the check values of the issue (computed with the formulas and SciPy's beta quantiles)", () => {
  // Rounded to three decimals, as the issue gives them.
  it.each([
    { name: "Wilson, 0.90 on 100", interval: wilsonInterval(0.9, 100, 0.95), lower: 0.826, upper: 0.945 },
    { name: "Clopper–Pearson, 90 of 100", interval: clopperPearsonInterval(90, 100, 0.95), lower: 0.824, upper: 0.951 },
    { name: "Wilson, 0.90 on 25", interval: wilsonInterval(0.9, 25, 0.95), lower: 0.725, upper: 0.968 },
  ])("$name → $lower–$upper", ({ interval, lower, upper }) => {
    expect(Math.abs(interval.lower - lower)).toBeLessThan(5e-4);
    expect(Math.abs(interval.upper - upper)).toBeLessThan(5e-4);
  });
});

describe("against SciPy to 1e-9 (fixtures/reference/scipy-intervals.json)", () => {
  it.each(reference.clopperPearson)("Clopper–Pearson $successes of $n at $level", (row) => {
    const interval = clopperPearsonInterval(row.successes, row.n, row.level);
    expect(Math.abs(interval.lower - row.lower)).toBeLessThan(1e-9);
    expect(Math.abs(interval.upper - row.upper)).toBeLessThan(1e-9);
  });

  it.each(reference.clopperPearsonLower)("one-sided Clopper–Pearson $successes of $n at $confidence", (row) => {
    expect(Math.abs(clopperPearsonLowerBound(row.successes, row.n, row.confidence) - row.lower)).toBeLessThan(1e-9);
  });

  it.each(reference.wilson)("Wilson $observed on $n at $level", (row) => {
    const interval = wilsonInterval(row.observed, row.n, row.level);
    expect(Math.abs(interval.lower - row.lower)).toBeLessThan(1e-9);
    expect(Math.abs(interval.upper - row.upper)).toBeLessThan(1e-9);
  });
});

describe("held-out samples needed for a one-sided 95% lower bound above the target", () => {
  // SciPy reference: scanning n = 1, 2, ... with the Wilson formula and scipy.stats.beta.ppf
  // (scripts/reference/scipy_intervals.py).
  it.each(reference.heldOutNeeded)("expected $expected, target $target → $wilson (Wilson), $exact (exact)", (row) => {
    const n = heldOutNeededWilson(row.expected, row.target, row.confidence) as number;
    expect(n).toBe(row.wilson);
    expect(wilsonLowerBound(row.expected, n, 0.95)).toBeGreaterThan(row.target);
    expect(wilsonLowerBound(row.expected, n - 1, 0.95)).toBeLessThanOrEqual(row.target);
    expect(heldOutNeededExact(row.expected, row.target, row.confidence)).toBe(row.exact);
  });

  it("gives null when the expected score does not exceed the target", () => {
    expect(heldOutNeededWilson(0.8, 0.8)).toBeNull();
    expect(heldOutNeededWilson(0.7, 0.8)).toBeNull();
    expect(heldOutNeededExact(0.7, 0.8)).toBeNull();
  });
});
