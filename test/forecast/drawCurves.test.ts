import { describe, expect, it } from "vitest";
import { shareDraws } from "../../src/forecast/drawCurves.js";
import { quantileSorted } from "../../src/forecast/quantile.js";

describe("shareDraws: draws shared out among families by weight", () => {
  it.each([
    // Largest remainder (Hamilton's method): 0.5·7 = 3.5, 0.3·7 = 2.1, 0.2·7 = 1.4 → floors 3, 2, 1
    // and the one draw left goes to the largest remainder (0.5, the first family).
    { weights: [0.5, 0.3, 0.2], draws: 7, counts: [4, 2, 1] },
    { weights: [1], draws: 5, counts: [5] },
    { weights: [0.25, 0.25, 0.25, 0.25], draws: 10, counts: [3, 3, 2, 2] },
    { weights: [0.999, 0.001], draws: 200, counts: [200, 0] },
  ])("gives $counts of $draws draws for weights $weights", ({ weights, draws, counts }) => {
    const assignment = shareDraws(weights, draws);
    expect(assignment).toHaveLength(draws);
    expect(counts.map((_, k) => assignment.filter((a) => a === k).length)).toEqual(counts);
  });

  it("interleaves the families so that every prefix keeps the proportions within one draw", () => {
    const weights = [0.6, 0.3, 0.1];
    const assignment = shareDraws(weights, 100);
    for (let prefix = 1; prefix <= 100; prefix++) {
      weights.forEach((w, k) => {
        const given = assignment.slice(0, prefix).filter((a) => a === k).length;
        expect(Math.abs(given - w * prefix)).toBeLessThanOrEqual(1);
      });
    }
  });
});

describe("quantileSorted (Hyndman and Fan 1996, definition 7)", () => {
  // Values as numpy.quantile(x, p) gives them with its default linear method (from memory; the
  // definition: position (n − 1)·p, linear interpolation between the neighboring order statistics).
  it.each([
    { values: [1, 2, 3, 4], p: 0.5, expected: 2.5 },
    { values: [1, 2, 3, 4], p: 0.1, expected: 1.3 },
    { values: [1, 2, 3, 4], p: 0.9, expected: 3.7 },
    { values: [5], p: 0.3, expected: 5 },
    { values: [0, 10], p: 0.25, expected: 2.5 },
  ])("quantile $p of $values is $expected", ({ values, p, expected }) => {
    expect(quantileSorted(values, p)).toBeCloseTo(expected, 12);
  });
});
