/**
 * L-BFGS (src/numerics/lbfgs.ts) on the Rosenbrock function, a standard test problem (Moré, Garbow
 * and Hillstrom 1981, problem 1), against SciPy 1.10's L-BFGS-B from Debian python3-scipy:
 * scripts/reference/scipy_lbfgs.py (fixtures/reference/scipy-lbfgs.json). The two line searches
 * differ, so the iterates do; the minima must agree.
 */
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { maxAbs, minimizeLbfgs, type Objective } from "../../src/numerics/lbfgs.js";

interface Problem {
  start: number[];
  solution: number[];
  value: number;
}
const reference: { problems: Record<string, Problem> } = JSON.parse(
  readFileSync(new URL("../../fixtures/reference/scipy-lbfgs.json", import.meta.url), "utf8"),
);

/** scipy.optimize.rosen and rosen_der: Σ 100 (x[i+1] − x[i]²)² + (1 − x[i])². */
class Rosenbrock implements Objective {
  evaluations = 0;
  evaluate(x: Float64Array, gradient: Float64Array): number {
    this.evaluations++;
    gradient.fill(0);
    let f = 0;
    for (let i = 0; i + 1 < x.length; i++) {
      const a = x[i + 1] - x[i] * x[i];
      const b = 1 - x[i];
      f += 100 * a * a + b * b;
      gradient[i] += -400 * x[i] * a - 2 * b;
      gradient[i + 1] += 200 * a;
    }
    return f;
  }
}

describe("minimizeLbfgs against SciPy's L-BFGS-B", () => {
  it.each(Object.keys(reference.problems))("%s: the same minimum, to 1e-8", (name) => {
    const problem = reference.problems[name];
    const objective = new Rosenbrock();
    const result = minimizeLbfgs(objective, Float64Array.from(problem.start), {
      gradientTolerance: 1e-10,
      relativeDecrease: 0,
      maxIterations: 10_000,
    });
    expect(result.converged).toBe(true);
    const gradient = new Float64Array(problem.start.length);
    expect(objective.evaluate(result.solution, gradient)).toBeCloseTo(result.value, 20);
    expect(maxAbs(gradient)).toBeLessThanOrEqual(1e-10);
    expect(result.value).toBeLessThan(1e-18);
    problem.solution.forEach((v, i) => expect(Math.abs(result.solution[i] - v)).toBeLessThan(1e-8));
    console.log(`${name}: ${result.iterations} iterations, ${objective.evaluations} evaluations`);
  });

  it("stops on the relative decrease of the objective when asked, short of the gradient tolerance", () => {
    const objective = new Rosenbrock();
    const tight = minimizeLbfgs(objective, Float64Array.of(-1.2, 1), {
      gradientTolerance: 1e-12,
      relativeDecrease: 1e-3,
      maxIterations: 10_000,
    });
    expect(tight.converged).toBe(true);
    const gradient = new Float64Array(2);
    objective.evaluate(tight.solution, gradient);
    expect(maxAbs(gradient)).toBeGreaterThan(1e-12);
  });

  it("judges the gradient by its Euclidean length when asked (never looser than its largest entry)", () => {
    const objective = new Rosenbrock();
    const result = minimizeLbfgs(objective, Float64Array.of(-1.2, 1), {
      gradientTolerance: 1e-6,
      euclidean: true,
      relativeDecrease: 0,
      maxIterations: 10_000,
    });
    const gradient = new Float64Array(2);
    objective.evaluate(result.solution, gradient);
    expect(Math.hypot(gradient[0], gradient[1])).toBeLessThanOrEqual(1e-6);
  });
});
