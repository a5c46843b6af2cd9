/**
 * The WebAssembly kernel of the multinomial logistic regression against the textbook formulas computed
 * row by row in plain JavaScript with Math.exp and Math.log: the summed log-loss
 * Σᵢ [log Σ_k e^{z_ik} − z_{i,yᵢ}] and its gradient sums Σᵢ (p_ik − [yᵢ = k]) (xᵢ, 1). The end-to-end
 * agreement of the fitted model with scikit-learn is tested in logistic.test.ts.
 */
import { describe, expect, it } from "vitest";
import { SoftmaxLoss } from "../../src/learners/softmaxKernel.js";
import { RandomStream } from "../../src/random.js";

interface Problem {
  features: Float64Array;
  labels: Int32Array;
  rows: number;
  columns: number;
  classes: number;
  theta: Float64Array;
}

function problem(rows: number, columns: number, classes: number, scale: number, seed: number): Problem {
  const random = new RandomStream(seed);
  return {
    features: Float64Array.from({ length: rows * columns }, () => 2 * random.normal()),
    labels: Int32Array.from({ length: rows }, () => random.integer(classes)),
    rows,
    columns,
    classes,
    theta: Float64Array.from({ length: classes * (columns + 1) }, () => scale * random.normal()),
  };
}

/** The formulas, one row at a time (with the largest score taken out before exponentiating). */
function reference({ features, labels, rows, columns, classes, theta }: Problem): { loss: number; gradient: number[] } {
  const stride = columns + 1;
  const gradient = new Array<number>(classes * stride).fill(0);
  let loss = 0;
  for (let i = 0; i < rows; i++) {
    const z = Array.from({ length: classes }, (_, k) => {
      let s = theta[k * stride + columns];
      for (let j = 0; j < columns; j++) s += theta[k * stride + j] * features[i * columns + j];
      return s;
    });
    const max = Math.max(...z);
    const sum = z.reduce((a, v) => a + Math.exp(v - max), 0);
    loss += max + Math.log(sum) - z[labels[i]];
    for (let k = 0; k < classes; k++) {
      const residual = Math.exp(z[k] - max) / sum - (k === labels[i] ? 1 : 0);
      for (let j = 0; j < columns; j++) gradient[k * stride + j] += residual * features[i * columns + j];
      gradient[k * stride + columns] += residual;
    }
  }
  return { loss, gradient };
}

function evaluate(p: Problem, kernel = new SoftmaxLoss(p.features, p.labels, p.rows, p.columns, p.classes)) {
  const gradient = new Float64Array(p.theta.length);
  const loss = kernel.evaluate(p.theta, gradient);
  return { loss, gradient };
}

/** Largest |actual − expected| / max(1, |expected|). */
function worstRelative(actual: ArrayLike<number>, expected: number[]): number {
  let worst = 0;
  expected.forEach((e, i) => (worst = Math.max(worst, Math.abs(actual[i] - e) / Math.max(1, Math.abs(e)))));
  return worst;
}

describe("SoftmaxLoss", () => {
  // Shapes: one row; rows not a multiple of the block of 8 (padding); no feature column; a digits-like
  // and a many-class problem; scores of several hundred (exponentials down to the −708 floor).
  // Measured: loss within 2e-16 relative, gradient within 4e-14.
  it.each([
    [1, 3, 3, 1],
    [7, 5, 4, 1],
    [13, 64, 10, 0.3],
    [50, 0, 3, 1],
    [1437, 64, 10, 0.1],
    [2001, 16, 26, 0.5],
    [30, 2, 3, 200],
  ])(
    "%i rows × %i columns × %i classes, coefficients of scale %s: loss and gradient match the formulas",
    (rows, columns, classes, scale) => {
      const p = problem(rows, columns, classes, scale, rows * 31 + columns);
      const expected = reference(p);
      const actual = evaluate(p);
      expect(Math.abs(actual.loss - expected.loss) / Math.max(1, expected.loss)).toBeLessThan(1e-13);
      expect(worstRelative(actual.gradient, expected.gradient)).toBeLessThan(1e-12);
    },
  );

  it("gives the same bits when two instances are evaluated in turn (they share one memory)", () => {
    const a = problem(100, 7, 4, 1, 1);
    const b = problem(333, 12, 5, 1, 2);
    const kernelA = new SoftmaxLoss(a.features, a.labels, a.rows, a.columns, a.classes);
    const first = evaluate(a, kernelA);
    const kernelB = new SoftmaxLoss(b.features, b.labels, b.rows, b.columns, b.classes);
    const onB = evaluate(b, kernelB);
    const again = evaluate(a, kernelA);
    expect(again.loss).toBe(first.loss);
    expect(Array.from(again.gradient)).toEqual(Array.from(first.gradient));
    expect(evaluate(b, kernelB).loss).toBe(onB.loss);
  });

  it("at coefficients 0 the loss is n·log K and the intercept sums are n/K − (count of class k)", () => {
    // Every probability is 1/K when all scores are equal.
    const p = { ...problem(203, 9, 6, 0, 3) };
    const { loss, gradient } = evaluate(p);
    expect(loss).toBeCloseTo(203 * Math.log(6), 10);
    for (let k = 0; k < 6; k++) {
      const count = p.labels.filter((label) => label === k).length;
      expect(gradient[k * 10 + 9]).toBeCloseTo(203 / 6 - count, 10);
    }
  });
});
