import { describe, it, expect } from "vitest";
import fc from "fast-check";
import {
  choleskyInPlace,
  choleskySolveInPlace,
  gramMatrix,
  minimumNormSolve,
  symmetricEigen,
} from "../../src/numerics/linearAlgebra.js";
import { releaseKernelMemory } from "../../src/numerics/wasm.js";
import { RandomStream } from "../../src/random.js";

/** A·B for row-major square matrices. */
function multiply(a: Float64Array, b: Float64Array, n: number): Float64Array {
  const out = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) for (let k = 0; k < n; k++) out[i * n + j] += a[i * n + k] * b[k * n + j];
  return out;
}

/** A random symmetric positive-definite matrix GᵀG + I from integer entries. */
const spd = fc
  .integer({ min: 1, max: 6 })
  .chain((n) =>
    fc.tuple(fc.constant(n), fc.array(fc.integer({ min: -5, max: 5 }), { minLength: n * n, maxLength: n * n })),
  )
  .map(([n, entries]) => {
    const g = Float64Array.from(entries);
    const a = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        let s = i === j ? 1 : 0;
        for (let k = 0; k < n; k++) s += g[k * n + i] * g[k * n + j];
        a[i * n + j] = s;
      }
    }
    return { n, a };
  });

describe("Cholesky", () => {
  it("factors and solves a hand-worked 3 × 3 system", () => {
    // A = [[4, 12, −16], [12, 37, −43], [−16, −43, 98]] = L Lᵀ with L = [[2, 0, 0], [6, 1, 0], [−8, 5, 3]]
    // (the classic example of the Cholesky factorization); A·(1, 2, 3) = (−20, −43, 192).
    const a = Float64Array.of(4, 12, -16, 12, 37, -43, -16, -43, 98);
    const factor = a.slice();
    expect(choleskyInPlace(factor, 3)).toBe(true);
    expect([factor[0], factor[3], factor[4], factor[6], factor[7], factor[8]]).toEqual([2, 6, 1, -8, 5, 3]);
    const x = choleskySolveInPlace(factor, 3, Float64Array.of(-20, -43, 192));
    [1, 2, 3].forEach((v, i) => expect(x[i]).toBeCloseTo(v, 12));
  });

  it("reports a matrix that is not positive definite", () => {
    expect(choleskyInPlace(Float64Array.of(1, 2, 2, 1), 2)).toBe(false);
    expect(choleskyInPlace(Float64Array.of(1, 1, 1, 1), 2)).toBe(false);
  });

  it("solves random positive-definite systems to a small residual", () => {
    fc.assert(
      fc.property(spd, fc.array(fc.integer({ min: -9, max: 9 }), { minLength: 6, maxLength: 6 }), ({ n, a }, rhs) => {
        const b = Float64Array.from(rhs.slice(0, n));
        const factor = a.slice();
        expect(choleskyInPlace(factor, n)).toBe(true);
        const x = choleskySolveInPlace(factor, n, b.slice());
        for (let i = 0; i < n; i++) {
          let s = 0;
          for (let j = 0; j < n; j++) s += a[i * n + j] * x[j];
          expect(Math.abs(s - b[i])).toBeLessThan(1e-9 * (1 + Math.abs(b[i])));
        }
      }),
      { numRuns: 200, seed: 20261201 },
    );
  });
});

describe("symmetricEigen and minimumNormSolve", () => {
  it("reconstructs random symmetric matrices as V Λ Vᵀ with orthonormal V", () => {
    fc.assert(
      fc.property(spd, ({ n, a }) => {
        const { values, vectors } = symmetricEigen(a, n);
        const scaled = new Float64Array(n * n);
        const transposed = new Float64Array(n * n);
        for (let i = 0; i < n; i++) {
          for (let j = 0; j < n; j++) {
            scaled[i * n + j] = vectors[i * n + j] * values[j];
            transposed[j * n + i] = vectors[i * n + j];
          }
        }
        const back = multiply(scaled, transposed, n);
        const identity = multiply(transposed, vectors, n);
        let norm = 0;
        for (let i = 0; i < n * n; i++) norm = Math.max(norm, Math.abs(a[i]));
        for (let i = 0; i < n * n; i++) {
          expect(Math.abs(back[i] - a[i])).toBeLessThan(1e-10 * norm);
          expect(Math.abs(identity[i] - (i % (n + 1) === 0 ? 1 : 0))).toBeLessThan(1e-10);
        }
      }),
      { numRuns: 100, seed: 20261201 },
    );
  });

  it("gives the minimum-norm solution of a singular system", () => {
    // [[1, 1], [1, 1]] x = (2, 2): every x with x₁ + x₂ = 2 solves it; the shortest is (1, 1).
    const x = minimumNormSolve(Float64Array.of(1, 1, 1, 1), 2, Float64Array.of(2, 2));
    expect(x[0]).toBeCloseTo(1, 12);
    expect(x[1]).toBeCloseTo(1, 12);
    // The zero matrix: the least-squares solution of minimum norm is 0.
    expect(Array.from(minimumNormSolve(new Float64Array(4), 2, Float64Array.of(1, 2)))).toEqual([0, 0]);
  });
});

describe("gramMatrix (WebAssembly SIMD kernel)", () => {
  /** X Xᵀ summed as the kernel documents: even columns in order, plus odd columns in order. */
  function evenPlusOdd(x: Float64Array, n: number, p: number): Float64Array {
    const out = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      for (let k = 0; k < n; k++) {
        let even = 0;
        let odd = 0;
        for (let j = 0; j < p; j += 2) even += x[i * p + j] * x[k * p + j];
        for (let j = 1; j < p; j += 2) odd += x[i * p + j] * x[k * p + j];
        out[i * n + k] = even + odd;
      }
    }
    return out;
  }

  it("gives every product to the last bit, whatever the padding of rows and columns", () => {
    // Sizes with every remainder of rows mod 4 and of columns mod 2, the larger blocks first, so that
    // the smaller ones reuse memory holding the larger ones' values (the padding must be zeroed again).
    const random = new RandomStream(20261203);
    for (const [n, p] of [
      [37, 301],
      [12, 64],
      [1, 1],
      [2, 3],
      [3, 2],
      [5, 7],
      [6, 1],
      [7, 10],
    ]) {
      const x = Float64Array.from({ length: n * p }, () => random.normal() * 10);
      const found = gramMatrix(x, n, p);
      expect(Array.from(found)).toEqual(Array.from(evenPlusOdd(x, n, p)));
    }
  });

  it("is exact on integers and works again after its memory is released", () => {
    // Small integers: every product and sum is exact, so the matrix is the textbook X Xᵀ.
    const x = Float64Array.of(1, 2, 3, 4, 5, 6); // rows (1, 2, 3) and (4, 5, 6)
    expect(Array.from(gramMatrix(x, 2, 3))).toEqual([14, 32, 32, 77]);
    releaseKernelMemory();
    expect(Array.from(gramMatrix(x, 2, 3))).toEqual([14, 32, 32, 77]);
  });
});
