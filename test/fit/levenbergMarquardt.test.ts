import { readFileSync } from "node:fs";
import { fc, test } from "@fast-check/vitest";
import { describe, expect, it } from "vitest";
import { FitError } from "../../src/errors.js";
import { fitLeastSquares, type JacobianFunction, type ModelFunction } from "../../src/fit/levenbergMarquardt.js";

const fixture = (name: string): string => readFileSync(new URL(`../../fixtures/${name}`, import.meta.url), "utf8");

/** Reads a NIST StRD CSV copied into fixtures/nist-strd (columns `y,x`, as its header says). */
function readNist(file: string): { x: number[]; y: number[] } {
  const lines = fixture(`nist-strd/${file}`).trim().split(/\r?\n/);
  expect(lines[0].trim()).toBe("y,x");
  const rows = lines.slice(1).map((line) => line.split(",").map(Number));
  return { x: rows.map((r) => r[1]), y: rows.map((r) => r[0]) };
}

interface NistProblem {
  file: string;
  start1: number[];
  start2: number[];
  certified: number[];
  certifiedStdErrors: number[];
  residualSumOfSquares: number;
}
const certified = JSON.parse(fixture("nist-strd/certified.json")) as {
  problems: Record<string, NistProblem>;
};

/** The NIST models (as written in certified.json) with their analytic Jacobians. */
const nistModels: Record<string, { model: ModelFunction; jacobian: JacobianFunction }> = {
  // Bennett5: y = b1 * (b2 + x)^(-1/b3)
  bennett5: {
    model: (x, [b1, b2, b3]) => b1 * Math.pow(b2 + x, -1 / b3),
    jacobian: (x, [b1, b2, b3]) => {
      const u = Math.pow(b2 + x, -1 / b3);
      return [u, (-b1 * u) / (b3 * (b2 + x)), (b1 * u * Math.log(b2 + x)) / (b3 * b3)];
    },
  },
  // BoxBOD: y = b1 * (1 - exp(-b2 * x))
  boxbod: {
    model: (x, [b1, b2]) => b1 * (1 - Math.exp(-b2 * x)),
    jacobian: (x, [b1, b2]) => [1 - Math.exp(-b2 * x), b1 * x * Math.exp(-b2 * x)],
  },
  // Rat42: y = b1 / (1 + exp(b2 - b3 * x))
  rat42: {
    model: (x, [b1, b2, b3]) => b1 / (1 + Math.exp(b2 - b3 * x)),
    jacobian: (x, [b1, b2, b3]) => {
      const e = Math.exp(b2 - b3 * x);
      const d = (1 + e) ** 2;
      return [1 / (1 + e), (-b1 * e) / d, (b1 * x * e) / d];
    },
  },
};

const relativeError = (actual: number, expected: number): number => Math.abs(actual - expected) / Math.abs(expected);

describe("fitLeastSquares on NIST StRD nonlinear regression (higher difficulty)", () => {
  // Reference: NIST StRD certified parameters, certified standard errors and residual sums of
  // squares (fixtures/nist-strd/certified.json, copied unchanged). Tolerances from the fixture's
  // README: parameters 1e-6 relative, RSS 1e-9 relative; standard errors 1e-4 relative.
  const cases = Object.entries(certified.problems).flatMap(([name, problem]) =>
    (["start1", "start2"] as const).flatMap((start) =>
      (["analytic", "central differences"] as const).map((jacobian) => ({
        name,
        start,
        jacobian,
        problem,
      })),
    ),
  );

  it.each(cases)(
    "$name from NIST $start with the $jacobian Jacobian reaches the certified values",
    ({ name, start, jacobian, problem }) => {
      const { x, y } = readNist(problem.file);
      const fit = fitLeastSquares({
        model: nistModels[name].model,
        jacobian: jacobian === "analytic" ? nistModels[name].jacobian : undefined,
        x,
        y,
        start: problem[start],
      });
      expect(fit.converged).toBe(true);
      fit.parameters.forEach((value, j) => expect(relativeError(value, problem.certified[j])).toBeLessThan(1e-6));
      expect(relativeError(fit.residualSumOfSquares, problem.residualSumOfSquares)).toBeLessThan(1e-9);
      expect(fit.standardErrors).not.toBeNull();
      fit.standardErrors!.forEach((value, j) =>
        expect(relativeError(value, problem.certifiedStdErrors[j])).toBeLessThan(1e-4),
      );
      // The covariance is symmetric and its diagonal gives the standard errors.
      const covariance = fit.covariance!;
      covariance.forEach((row, j) => {
        expect(Math.sqrt(row[j])).toBeCloseTo(fit.standardErrors![j], 12);
        row.forEach((value, k) => expect(value).toBe(covariance[k][j]));
      });
    },
  );

  it("reports non-convergence, with finite parameters, when maxIterations runs out", () => {
    const problem = certified.problems.bennett5;
    const { x, y } = readNist(problem.file);
    const fit = fitLeastSquares({ ...nistModels.bennett5, x, y, start: problem.start1, maxIterations: 5 });
    expect(fit.converged).toBe(false);
    expect(fit.stopReason).toBe("maxIterations");
    expect(fit.iterations).toBe(5);
    expect(fit.parameters.every(Number.isFinite)).toBe(true);
  });
});

describe("fitLeastSquares on weighted data against SciPy", () => {
  // Reference: SciPy 1.10.1 curve_fit(method="lm", sigma, absolute_sigma=False), i.e. MINPACK lmder,
  // from Debian python3-scipy; script scripts/reference/scipy_pow3_fit.py, output
  // fixtures/reference/scipy-pow3-fit.json. SciPy stopped at a scaled gradient of 3e-10 (recorded in
  // the file), so parameters agree to about 1e-6, not to round-off.
  const reference = JSON.parse(fixture("reference/scipy-pow3-fit.json")) as {
    sizes: number[];
    values: number[];
    sigmas: number[];
    start: number[];
    parameters: number[];
    covariance: number[][];
    residualSumOfSquares: number;
  };
  const fit = fitLeastSquares({
    model: (n, [a, b, c]) => a - b * Math.pow(n, -c),
    x: reference.sizes,
    y: reference.values,
    weights: reference.sigmas.map((s) => 1 / s ** 2),
    start: reference.start,
  });

  it("matches the parameters and weighted RSS", () => {
    expect(fit.converged).toBe(true);
    fit.parameters.forEach((value, j) => expect(relativeError(value, reference.parameters[j])).toBeLessThan(1e-6));
    expect(relativeError(fit.residualSumOfSquares, reference.residualSumOfSquares)).toBeLessThan(1e-9);
  });

  it("matches the covariance s²·(JᵀWJ)⁻¹", () => {
    reference.covariance.forEach((row, j) =>
      row.forEach((value, k) => expect(relativeError(fit.covariance![j][k], value)).toBeLessThan(1e-5)),
    );
  });

  it("gives a different answer without the weights (the weights are used)", () => {
    const unweighted = fitLeastSquares({
      model: (n, [a, b, c]) => a - b * Math.pow(n, -c),
      x: reference.sizes,
      y: reference.values,
      start: reference.start,
    });
    expect(relativeError(unweighted.parameters[2], reference.parameters[2])).toBeGreaterThan(1e-3);
  });
});

describe("fitLeastSquares on exact synthetic data", () => {
  it("gives the result its doc comment's @example states", () => {
    const fit = fitLeastSquares({
      model: (x, [a, b]) => a * Math.exp(b * x),
      x: [0, 1, 2],
      y: [2, 2 * Math.E, 2 * Math.E ** 2],
      start: [1, 0.5],
    });
    expect(fit.converged).toBe(true);
    expect(fit.parameters[0]).toBeCloseTo(2, 10);
    expect(fit.parameters[1]).toBeCloseTo(1, 10);
  });

  const exactCases = [
    {
      name: "exponential decay to a floor, a·exp(−b·x) + c",
      model: ((x, [a, b, c]) => a * Math.exp(-b * x) + c) as ModelFunction,
      truth: [3, 0.7, 0.5],
      start: [1, 0.2, 0],
      x: [0, 0.5, 1, 1.5, 2, 3, 4, 6, 8],
    },
    {
      name: "inverse power law, a − b·x^(−c)",
      model: ((x, [a, b, c]) => a - b * Math.pow(x, -c)) as ModelFunction,
      truth: [0.91, 1.7, 0.45],
      start: [0.5, 1, 1],
      x: [20, 40, 80, 160, 320, 640],
    },
    {
      name: "Michaelis–Menten, a·x / (b + x)",
      model: ((x, [a, b]) => (a * x) / (b + x)) as ModelFunction,
      truth: [2.5, 40],
      start: [1, 1],
      x: [5, 10, 20, 40, 80, 160, 320],
    },
  ];

  it.each(exactCases)("recovers the parameters of $name to 1e-9", ({ model, truth, start, x }) => {
    const y = x.map((xi) => model(xi, truth));
    const fit = fitLeastSquares({ model, x, y, start });
    expect(fit.converged).toBe(true);
    fit.parameters.forEach((value, j) => expect(relativeError(value, truth[j])).toBeLessThan(1e-9));
    expect(fit.residualSumOfSquares).toBeLessThan(1e-20);
  });

  it("reproduces weighted linear least squares (closed form) and its covariance", () => {
    // Textbook weighted least squares: θ = (XᵀWX)⁻¹XᵀWy, covariance s²(XᵀWX)⁻¹, s² = RSS/(n − 2).
    const x = [1, 2, 3, 4, 5, 6, 7];
    const y = [2.1, 3.9, 6.2, 7.8, 10.5, 11.7, 14.4];
    const w = [1, 4, 0.5, 2, 1, 3, 0.25];
    let sw = 0;
    let swx = 0;
    let swy = 0;
    let swxx = 0;
    let swxy = 0;
    x.forEach((xi, i) => {
      sw += w[i];
      swx += w[i] * xi;
      swy += w[i] * y[i];
      swxx += w[i] * xi * xi;
      swxy += w[i] * xi * y[i];
    });
    const det = sw * swxx - swx * swx;
    const slope = (sw * swxy - swx * swy) / det;
    const intercept = (swxx * swy - swx * swxy) / det;
    const rss = x.reduce((s, xi, i) => s + w[i] * (intercept + slope * xi - y[i]) ** 2, 0);
    const s2 = rss / (x.length - 2);

    const fit = fitLeastSquares({ model: (xi, [p0, p1]) => p0 + p1 * xi, x, y, weights: w, start: [0, 0] });
    expect(fit.parameters[0]).toBeCloseTo(intercept, 10);
    expect(fit.parameters[1]).toBeCloseTo(slope, 10);
    expect(relativeError(fit.residualSumOfSquares, rss)).toBeLessThan(1e-12);
    expect(relativeError(fit.covariance![0][0], (s2 * swxx) / det)).toBeLessThan(1e-8);
    expect(relativeError(fit.covariance![1][1], (s2 * sw) / det)).toBeLessThan(1e-8);
    expect(relativeError(fit.covariance![0][1], (-s2 * swx) / det)).toBeLessThan(1e-8);
  });
});

describe("fitLeastSquares with bounds", () => {
  it("stops on the bound when the unconstrained optimum lies beyond it", () => {
    // Data on y = 1 + 2x; slope capped at 1.5. With the slope fixed at 1.5 the best intercept is
    // the mean of y − 1.5x (closed form).
    const x = [0, 1, 2, 3, 4, 5];
    const y = x.map((xi) => 1 + 2 * xi);
    const fit = fitLeastSquares({
      model: (xi, [a, b]) => a + b * xi,
      x,
      y,
      start: [0, 0],
      upperBounds: [Infinity, 1.5],
    });
    const expectedIntercept = y.reduce((s, yi, i) => s + yi - 1.5 * x[i], 0) / x.length;
    expect(fit.converged).toBe(true);
    expect(fit.parameters[1]).toBe(1.5);
    expect(fit.parameters[0]).toBeCloseTo(expectedIntercept, 10);
  });

  it("clamps a start outside the bounds into them", () => {
    const x = [1, 2, 3, 4];
    const fit = fitLeastSquares({
      model: (xi, [a]) => a * xi,
      x,
      y: x.map((xi) => 0.5 * xi),
      start: [10],
      lowerBounds: [0],
      upperBounds: [1],
    });
    expect(fit.parameters[0]).toBeCloseTo(0.5, 12);
  });
});

describe("fitLeastSquares errors", () => {
  const model: ModelFunction = (x, [a, b]) => a + b * x;
  it.each([
    {
      name: "lengths differ",
      options: { model, x: [1, 2, 3], y: [1, 2], start: [0, 0] },
      message: /x has 3 values but y has 2/,
    },
    {
      name: "a y is NaN",
      options: { model, x: [1, 2, 3], y: [1, NaN, 3], start: [0, 0] },
      message: /point 1 is not finite/,
    },
    {
      name: "too few points",
      options: { model, x: [1], y: [1], start: [0, 0] },
      message: /1 points cannot determine 2 parameters/,
    },
    {
      name: "a bound pair is reversed",
      options: { model, x: [1, 2, 3], y: [1, 2, 3], start: [0, 0], lowerBounds: [1, 0], upperBounds: [0, 1] },
      message: /lower bound 1 above upper bound 0/,
    },
    {
      name: "a weight is negative",
      options: { model, x: [1, 2, 3], y: [1, 2, 3], start: [0, 0], weights: [1, -1, 1] },
      message: /weight 1 is -1/,
    },
    {
      name: "the model is not finite at the start",
      options: { model: ((x, [a]) => Math.log(a) * x) as ModelFunction, x: [1, 2, 3], y: [1, 2, 3], start: [-1] },
      message: /not finite at the start/,
    },
    {
      name: "the model ignores its parameters",
      options: { model: (() => 1) as ModelFunction, x: [1, 2, 3], y: [1, 2, 3], start: [0] },
      message: /does not depend on any parameter/,
    },
  ])("throws FitError when $name", ({ options, message }) => {
    expect(() => fitLeastSquares(options)).toThrow(FitError);
    expect(() => fitLeastSquares(options)).toThrow(message);
  });

  it("returns a null covariance, not NaN, when a parameter has no effect at the solution", () => {
    // y = a + b·x^c with b → 0 leaves c undetermined: JᵀWJ is singular.
    const fit = fitLeastSquares({
      model: (xi, [a, b, c]) => a + b * Math.pow(xi, c),
      x: [1, 2, 3, 4, 5],
      y: [2, 2, 2, 2, 2],
      start: [1, 0, 1],
      lowerBounds: [-Infinity, 0, 0.1],
    });
    expect(fit.parameters[0]).toBeCloseTo(2, 10);
    expect(fit.covariance).toBeNull();
    expect(fit.standardErrors).toBeNull();
  });
});

describe("fitLeastSquares properties", () => {
  // Property: on exact exponential-decay data from random truths and random starts inside the box,
  // the fitter either throws FitError or returns finite numbers with a finite, non-negative RSS.
  test.prop(
    [
      fc.double({ min: 0.1, max: 10, noNaN: true }),
      fc.double({ min: 0.05, max: 3, noNaN: true }),
      fc.double({ min: 0.1, max: 10, noNaN: true }),
      fc.double({ min: 0.05, max: 3, noNaN: true }),
    ],
    { numRuns: 60, seed: 20261201 },
  )("never returns NaN", (a, b, startA, startB) => {
    const x = [0, 0.5, 1, 2, 3, 5];
    const model: ModelFunction = (xi, [p, q]) => p * Math.exp(-q * xi);
    try {
      const fit = fitLeastSquares({
        model,
        x,
        y: x.map((xi) => model(xi, [a, b])),
        start: [startA, startB],
        lowerBounds: [0, 0],
        upperBounds: [100, 10],
      });
      expect(fit.parameters.every(Number.isFinite)).toBe(true);
      expect(fit.residualSumOfSquares).toBeGreaterThanOrEqual(0);
      expect(Number.isFinite(fit.residualSumOfSquares)).toBe(true);
    } catch (error) {
      expect(error).toBeInstanceOf(FitError);
    }
  });
});
