import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { FitError } from "../../src/errors.js";
import {
  curveFamilies,
  findCurveFamily,
  fitCurveFamily,
  orientedRange,
  pow3,
  type Orientation,
  type OrientedPoint,
} from "../../src/fit/families.js";

const relativeError = (actual: number, expected: number): number => Math.abs(actual - expected) / Math.abs(expected);

/** Exact points of `score = a ∓ b·n^(−c)` in oriented units, equal weights. */
function exactPoints(truth: number[], sizes: number[]): OrientedPoint[] {
  return sizes.map((trainingSize) => ({ trainingSize, value: pow3.model(trainingSize, truth), weight: 1 }));
}

describe("pow3 recovers its parameters from exact points", () => {
  // Truths span slow and fast decay, small and large gaps, and size grids from 10 to 12800; the
  // fitter starts only from pow3's own initial guesses. Tolerance 1e-8 relative.
  const sizeGrids = {
    "doubling from 20": [20, 40, 80, 160, 320, 640],
    "doubling from 50 to 12800": [50, 100, 200, 400, 800, 1600, 3200, 6400, 12800],
    "×1.5 from 10": [10, 15, 23, 35, 52, 78],
  };
  const truths = [
    { a: 0.9, b: 2, c: 0.5 },
    { a: 0.95, b: 0.8, c: 0.3 },
    { a: 0.7, b: 5, c: 1.2 },
    { a: 0.99, b: 30, c: 1 },
    { a: 0.8, b: 0.5, c: 0.1 },
    { a: -0.2, b: 3, c: 0.7 },
    { a: 0.6, b: 1000, c: 2.5 },
  ];
  const cases = truths.flatMap((truth) =>
    Object.entries(sizeGrids).map(([grid, sizes]) => ({ ...truth, grid, sizes })),
  );

  it.each(cases)("a = $a, b = $b, c = $c on sizes $grid", ({ a, b, c, sizes }) => {
    const fit = fitCurveFamily(pow3, exactPoints([a, b, c], sizes), { higherIsBetter: true });
    expect(relativeError(fit.parameters[0], a)).toBeLessThan(1e-8);
    expect(relativeError(fit.parameters[1], b)).toBeLessThan(1e-8);
    expect(relativeError(fit.parameters[2], c)).toBeLessThan(1e-8);
    expect(fit.startsConverged).toBeGreaterThan(0);
  });
});

describe("pow3 orientation", () => {
  it("fits a lower-is-better curve as score = a + b·n^(−c) with a the asymptote in score units", () => {
    // Log loss falling as 0.25 + 1.8·n^(−0.6): oriented values are −score.
    const sizes = [25, 50, 100, 200, 400, 800];
    const logLoss = (n: number) => 0.25 + 1.8 * Math.pow(n, -0.6);
    const orientation: Orientation = { higherIsBetter: false };
    const points = sizes.map((n) => ({ trainingSize: n, value: -logLoss(n), weight: 1 }));
    const fit = fitCurveFamily(pow3, points, orientation);
    const inScoreUnits = pow3.scoreParameters(fit.parameters, orientation);
    expect(inScoreUnits.a).toBeCloseTo(0.25, 9);
    expect(inScoreUnits.b).toBeCloseTo(1.8, 8);
    expect(inScoreUnits.c).toBeCloseTo(0.6, 9);
    // The model, turned back by the sign, reproduces the score at a new size.
    expect(-pow3.model(5000, fit.parameters)).toBeCloseTo(logLoss(5000), 10);
  });

  it.each([
    { higherIsBetter: true, metricRange: [0, 1] as [number, number], expected: [0, 1] },
    { higherIsBetter: false, metricRange: [0, 1] as [number, number], expected: [-1, 0] },
    { higherIsBetter: false, metricRange: [0, 5] as [number, number], expected: [-5, 0] },
    { higherIsBetter: true, metricRange: undefined, expected: undefined },
  ])(
    "oriented range of $metricRange with higherIsBetter $higherIsBetter is $expected",
    ({ higherIsBetter, metricRange, expected }) => {
      expect(orientedRange({ higherIsBetter, metricRange })).toEqual(expected);
    },
  );

  it("keeps the asymptote inside a bounded metric's range", () => {
    // Points on 1.05 − 0.5·n^(−0.3): the unconstrained asymptote 1.05 is impossible for accuracy.
    const points = exactPoints([1.05, 0.5, 0.3], [20, 40, 80, 160, 320, 640]);
    const fit = fitCurveFamily(pow3, points, { higherIsBetter: true, metricRange: [0, 1] });
    expect(fit.parameters[0]).toBeLessThanOrEqual(1);
    expect(fit.parameters[0]).toBeCloseTo(1, 12);
    expect(fit.parameters[1]).toBeGreaterThanOrEqual(0);
    const unbounded = fitCurveFamily(pow3, points, { higherIsBetter: true });
    expect(unbounded.parameters[0]).toBeCloseTo(1.05, 8);
  });

  it("bounds b ≥ 0 and c in (0, 3]", () => {
    const { lower, upper } = pow3.bounds([], { higherIsBetter: true });
    expect(lower[1]).toBe(0);
    expect(lower[2]).toBeGreaterThan(0);
    expect(upper[2]).toBe(3);
  });

  it("fits a flat (non-rising) curve without failing, with b on its bound 0", () => {
    const points = [100, 200, 400, 800].map((n, i) => ({ trainingSize: n, value: 0.8 - 0.001 * i, weight: 1 }));
    const fit = fitCurveFamily(pow3, points, { higherIsBetter: true, metricRange: [0, 1] });
    expect(fit.parameters[1]).toBe(0);
    expect(fit.parameters.every(Number.isFinite)).toBe(true);
  });
});

describe("pow3 against SciPy on weighted points", () => {
  // Reference: SciPy 1.10.1 curve_fit(method="lm", sigma) (MINPACK) from Debian python3-scipy;
  // scripts/reference/scipy_pow3_fit.py → fixtures/reference/scipy-pow3-fit.json. The optimum is
  // inside pow3's bounds, so the bounded multi-start fit must find the same point (1e-6 relative).
  const reference = JSON.parse(
    readFileSync(new URL("../../fixtures/reference/scipy-pow3-fit.json", import.meta.url), "utf8"),
  ) as { sizes: number[]; values: number[]; sigmas: number[]; parameters: number[]; residualSumOfSquares: number };

  it("finds SciPy's parameters from its own starting points", () => {
    const points = reference.sizes.map((trainingSize, i) => ({
      trainingSize,
      value: reference.values[i],
      weight: 1 / reference.sigmas[i] ** 2,
    }));
    const fit = fitCurveFamily(pow3, points, { higherIsBetter: true, metricRange: [0, 1] });
    fit.parameters.forEach((value, j) => expect(relativeError(value, reference.parameters[j])).toBeLessThan(1e-6));
    expect(relativeError(fit.residualSumOfSquares, reference.residualSumOfSquares)).toBeLessThan(1e-9);
  });
});

describe("curve family registry and errors", () => {
  it("lists pow3 and finds it by name", () => {
    expect(curveFamilies.map((f) => f.name)).toContain("pow3");
    expect(findCurveFamily("pow3")).toBe(pow3);
    expect(pow3.parameterNames).toEqual(["a", "b", "c"]);
  });

  it("throws FitError naming the known families for an unknown one", () => {
    expect(() => findCurveFamily("pow9")).toThrow(FitError);
    expect(() => findCurveFamily("pow9")).toThrow(/known families: pow3/);
  });

  it("throws FitError with fewer points than parameters", () => {
    const points = exactPoints([0.9, 1, 0.5], [10, 20]);
    expect(() => fitCurveFamily(pow3, points, { higherIsBetter: true })).toThrow(
      /2 training sizes cannot determine 3 parameters/,
    );
  });

  it("throws FitError for a non-finite point", () => {
    const points = exactPoints([0.9, 1, 0.5], [10, 20, 40]);
    points[1].value = NaN;
    expect(() => fitCurveFamily(pow3, points, { higherIsBetter: true })).toThrow(FitError);
  });

  it("gives finite starting vectors, one per starting exponent", () => {
    const starts = pow3.initialGuesses(exactPoints([0.9, 1, 0.5], [10, 20, 40, 80]));
    expect(starts.length).toBeGreaterThanOrEqual(3);
    for (const start of starts) {
      expect(start).toHaveLength(3);
      expect(start.every(Number.isFinite)).toBe(true);
    }
  });
});
