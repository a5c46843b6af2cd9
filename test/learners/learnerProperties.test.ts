/**
 * Property-based tests of every classification learner in the registry on awkward random data:
 * missing values (NaN) in training and test rows, constant columns, columns with no training value
 * at all, duplicated rows and subsamples lacking classes. Whatever the data, each row of predicted
 * probabilities is finite, within [0, 1] and sums to 1. (test/learners/logistic.test.ts checks the
 * same on clean data for logistic regression alone.)
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { createLearner, learnerNames } from "../../src/learners/registry.js";
import { RandomStream } from "../../src/random.js";

// Every learner the registry creates for classes (a regression learner, if listed, says so by `task`).
const classificationLearners = learnerNames().filter((name) => {
  const learner = createLearner(name) as { task?: string } | undefined;
  return learner !== undefined && learner.task !== "regression";
});

/** Each column is one kind: normal values, huge values, a constant, all missing, or some missing. */
const columnKind = fc.constantFrom("values", "huge", "constant", "missing", "some missing");

const problem = fc
  .record({
    classCount: fc.integer({ min: 2, max: 4 }),
    kinds: fc.array(columnKind, { minLength: 1, maxLength: 6 }),
    rows: fc.integer({ min: 1, max: 40 }),
    seed: fc.integer({ min: 0, max: 1_000_000 }),
  })
  .map(({ classCount, kinds, rows, seed }) => {
    const random = new RandomStream(seed);
    const columns = kinds.length;
    const cell = (kind: string, j: number) =>
      kind === "constant"
        ? 3 + j
        : kind === "missing"
          ? NaN
          : kind === "some missing" && random.uniform() < 0.3
            ? NaN
            : random.normal() * (kind === "huge" ? 1e15 : 10 ** (j - 2));
    const table = (n: number) => {
      const features = new Float64Array(n * columns);
      for (let i = 0; i < n; i++) kinds.forEach((kind, j) => (features[i * columns + j] = cell(kind, j)));
      return features;
    };
    // Random labels: small samples are often separable, sometimes hold one class only.
    const features = table(rows);
    const labels = Int32Array.from({ length: rows }, () => random.integer(classCount));
    const testRows = 7;
    return { classCount, columns, rows, features, labels, testFeatures: table(testRows), testRows };
  });

describe.each(classificationLearners)("learner %s on random data with NaN and constant columns", (name) => {
  it("predicts finite probabilities in [0, 1] summing to 1 for every row", () => {
    fc.assert(
      fc.property(problem, ({ classCount, columns, rows, features, labels, testFeatures, testRows }) => {
        const learner = createLearner(name)!;
        const model = learner.fit({ features, rows, columns, labels, classCount }, new RandomStream(1));
        for (const [x, n] of [
          [testFeatures, testRows],
          [features, rows],
        ] as const) {
          const probabilities = model.predictProbabilities(x, n);
          expect(probabilities.length).toBe(n * classCount);
          for (let i = 0; i < n; i++) {
            let sum = 0;
            for (let k = 0; k < classCount; k++) {
              const p = probabilities[i * classCount + k];
              expect(Number.isFinite(p) && p >= 0 && p <= 1).toBe(true);
              sum += p;
            }
            expect(Math.abs(sum - 1)).toBeLessThan(1e-9);
          }
        }
      }),
      { numRuns: 60, seed: 20261201 },
    );
  });
});
