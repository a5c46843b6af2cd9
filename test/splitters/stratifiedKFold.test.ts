import { fc, test } from "@fast-check/vitest";
import { describe, expect, it } from "vitest";
import { RandomStream } from "../../src/random.js";
import { nestedStratifiedOrder } from "../../src/splitters/nestedSubsamples.js";
import { stratifiedKFold } from "../../src/splitters/stratifiedKFold.js";
import { expectStratified, expectValidKFold } from "../helpers/splitInvariants.js";

const labelsArbitrary = fc
  .array(fc.integer({ min: 0, max: 3 }), { minLength: 10, maxLength: 200 })
  .map((values) => Int32Array.from(values));

describe("stratifiedKFold", () => {
  test.prop([labelsArbitrary, fc.integer({ min: 2, max: 10 }), fc.integer({ min: 0, max: 1e6 })])(
    "folds are disjoint, cover every row once and keep class proportions",
    (labels, folds, seed) => {
      const splits = stratifiedKFold(labels, folds, new RandomStream(seed, 1));
      expect(splits).toHaveLength(folds);
      expectValidKFold(splits, labels.length);
      expectStratified(splits, labels);
      const sizes = splits.map((s) => s.test.length);
      expect(Math.max(...sizes) - Math.min(...sizes)).toBeLessThanOrEqual(1);
    },
  );

  it("gives the same folds for the same seed and different folds for another", () => {
    const labels = Int32Array.from({ length: 60 }, (_, i) => i % 3);
    const a = stratifiedKFold(labels, 5, new RandomStream(7, 1, 0));
    const b = stratifiedKFold(labels, 5, new RandomStream(7, 1, 0));
    const c = stratifiedKFold(labels, 5, new RandomStream(7, 1, 1));
    expect(a.map((s) => [...s.test])).toEqual(b.map((s) => [...s.test]));
    expect(a.map((s) => [...s.test])).not.toEqual(c.map((s) => [...s.test]));
  });
});

describe("nestedStratifiedOrder", () => {
  test.prop([labelsArbitrary, fc.integer({ min: 0, max: 1e6 })])(
    "is a permutation of the pool whose every prefix keeps the class proportions",
    (labels, seed) => {
      const pool = Int32Array.from({ length: labels.length }, (_, i) => i).filter((i) => i % 4 !== 0);
      const order = nestedStratifiedOrder(pool, labels, new RandomStream(seed, 2));
      expect([...order].sort((a, b) => a - b)).toEqual([...pool]);
      const classes = Math.max(...labels) + 1;
      const total = new Array<number>(classes).fill(0);
      for (const row of pool) total[labels[row]]++;
      const counts = new Array<number>(classes).fill(0);
      order.forEach((row, i) => {
        counts[labels[row]]++;
        const n = i + 1;
        // Class k's j-th row has key in [j/m_k, (j+1)/m_k), so at the n-th key t, count_k is within 1 of
        // t·m_k and n within K of t·N; hence |count_k − n·m_k/N| < 1 + K·m_k/N.
        counts.forEach((count, k) => {
          const share = total[k] / pool.length;
          expect(Math.abs(count - n * share)).toBeLessThan(1 + classes * share);
        });
      });
    },
  );
});
