import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { KNearestNeighbors, resolveKnnOptions } from "../../src/learners/knn.js";
import { nearestNeighbors } from "../../src/learners/neighbors.js";
import { predictClasses } from "../../src/learners/learner.js";
import { RandomStream } from "../../src/random.js";
import { UsageError } from "../../src/errors.js";
import { openDataNames } from "../helpers/openData.js";
import { classificationSplit, largestDifference } from "./sklearnReference.js";

/**
 * Reference: scikit-learn 1.2.1 (Debian python3-sklearn), scripts/reference/sklearn_learners.py:
 * make_pipeline(StandardScaler(), KNeighborsClassifier(n_neighbors=5)) fitted on the fixed training
 * rows (in the permuted order) of each open data set. scikit-learn searched with a k-d tree on iris
 * and wine (≤ 15 features) and by brute force on breast cancer and digits (recorded in the JSON).
 */
const random = new RandomStream(20261201);

describe("KNearestNeighbors against scikit-learn's KNeighborsClassifier(5)", () => {
  // Measured: identical predictions and probabilities (multiples of 1/5) on all four sets.
  it.each(openDataNames)("%s: identical test predictions and probabilities (to 1e-12)", (name) => {
    const { ref, training, testFeatures, testRows } = classificationSplit(name);
    const model = new KNearestNeighbors().fit(training, random);
    const probabilities = model.predictProbabilities(testFeatures, testRows.length);
    expect(Array.from(predictClasses(probabilities, testRows.length, ref.classes.length))).toEqual(ref.knn.predictions);
    expect(largestDifference(probabilities, ref.knn.probabilities!)).toBeLessThan(1e-12);
  });
});

/** Brute force by sorting: all distances, stable sort, first k. */
function sortedNeighbors(training: number[][], query: number[], k: number): number[] {
  const distances = training.map((row) => row.reduce((s, v, j) => s + (v - query[j]) ** 2, 0));
  return [...distances.keys()].sort((a, b) => distances[a] - distances[b] || a - b).slice(0, k);
}

/** nearestNeighbors on rows given as arrays, and what a stable sort of each query's distances gives. */
function searchAndSort(training: number[][], queries: number[][], columns: number, k: number) {
  const kept = Math.min(k, training.length);
  const found = nearestNeighbors(
    Float64Array.from(training.flat()),
    training.length,
    Float64Array.from(queries.flat()),
    queries.length,
    columns,
    kept,
  );
  return { found: Array.from(found), expected: queries.flatMap((query) => sortedNeighbors(training, query, kept)) };
}

describe("nearestNeighbors", () => {
  it("breaks ties in distance by training order: the earlier row wins", () => {
    // Rows at distance 1 from the query 0: indices 1, 2 and 3 (values −1, 1, −1); k = 2 keeps 1 and 2.
    const training = Float64Array.of(5, -1, 1, -1, 4);
    expect(Array.from(nearestNeighbors(training, 5, Float64Array.of(0), 1, 1, 2))).toEqual([1, 2]);
    expect(Array.from(nearestNeighbors(training, 5, Float64Array.of(0), 1, 1, 4))).toEqual([1, 2, 3, 4]);
  });

  it("agrees with a stable sort of all distances on random integer data (many ties)", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 4 }),
        fc.integer({ min: 1, max: 6 }),
        fc.array(fc.array(fc.integer({ min: -2, max: 2 }), { minLength: 4, maxLength: 4 }), {
          minLength: 6,
          maxLength: 30,
        }),
        (columns, k, table) => {
          const rows = table.map((row) => row.slice(0, columns));
          const { found, expected } = searchAndSort(rows.slice(1), [rows[0]], columns, k);
          expect(found).toEqual(expected);
        },
      ),
      { numRuns: 300, seed: 20261201 },
    );
  });

  it("agrees with a stable sort for several queries on narrow rows", () => {
    // The kernel takes queries eight at a time: 1 to 11 queries exercise a full group and a padded one.
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 20 }),
        fc.integer({ min: 1, max: 11 }),
        fc.integer({ min: 1, max: 6 }),
        fc.array(fc.array(fc.integer({ min: -2, max: 2 }), { minLength: 20, maxLength: 20 }), {
          minLength: 18,
          maxLength: 40,
        }),
        (columns, queryCount, k, table) => {
          const rows = table.map((row) => row.slice(0, columns));
          const { found, expected } = searchAndSort(rows.slice(queryCount), rows.slice(0, queryCount), columns, k);
          expect(found).toEqual(expected);
        },
      ),
      { numRuns: 300, seed: 20261203 },
    );
  });
});

describe("nearestNeighbors on wide rows", () => {
  it("agrees with a stable sort of all distances, ties included, for any number of queries", () => {
    // 1 to 19 queries exercise full groups of eight and a padded last one. Small integers make many
    // exact ties.
    fc.assert(
      fc.property(
        fc.integer({ min: 64, max: 80 }),
        fc.integer({ min: 1, max: 19 }),
        fc.integer({ min: 1, max: 6 }),
        fc.integer({ min: 1, max: 25 }),
        fc.integer({ min: 0, max: 2 ** 31 - 1 }),
        (columns, queryCount, k, trainingCount, seed) => {
          const random = new RandomStream(seed);
          const row = () => Array.from({ length: columns }, () => Math.floor(random.uniform() * 3) - 1);
          const training = Array.from({ length: trainingCount }, row);
          const queries = Array.from({ length: queryCount }, row);
          training.push(training[0].slice()); // an exact duplicate: the earlier row must win
          const { found, expected } = searchAndSort(training, queries, columns, k);
          expect(found).toEqual(expected);
        },
      ),
      { numRuns: 150, seed: 20261203 },
    );
  });

  it("gives the same neighbors as the plain search on non-integer rows", () => {
    // Standard normal values: the kernel's sums must be the column-by-column sums to the last bit, or
    // near ties would order differently; the stable sort's reference sums run in that order.
    const random = new RandomStream(7);
    const columns = 300;
    const row = () => Array.from({ length: columns }, () => random.normal());
    const training = Array.from({ length: 150 }, row);
    const queries = Array.from({ length: 21 }, row);
    const { found, expected } = searchAndSort(training, queries, columns, 7);
    expect(found).toEqual(expected);
  });
});

describe("KNearestNeighbors", () => {
  it("votes by class fractions and lets the lower class win a tied vote", () => {
    // 1-D training values 0, 1 (class 1) and 10, 11 (class 0); at x = 5.5 with k = 2 the nearest are
    // the values 1 and 10 (distance 4.5 each): one vote each, and class 0 wins the tied vote.
    const model = new KNearestNeighbors({ neighbors: 2 }).fit(
      {
        features: Float64Array.of(0, 1, 10, 11),
        rows: 4,
        columns: 1,
        labels: Int32Array.of(1, 1, 0, 0),
        classCount: 2,
      },
      random,
    );
    const p = model.predictProbabilities(Float64Array.of(5.5, 0.2), 2);
    expect(Array.from(p)).toEqual([0.5, 0.5, 0, 1]);
    expect(Array.from(predictClasses(p, 2, 2))).toEqual([0, 1]);
  });

  it("uses every training row when they are fewer than k", () => {
    const model = new KNearestNeighbors({ neighbors: 5 }).fit(
      { features: Float64Array.of(0, 1, 2), rows: 3, columns: 1, labels: Int32Array.of(0, 1, 1), classCount: 3 },
      random,
    );
    expect(model.neighbors).toBe(3);
    const p = model.predictProbabilities(Float64Array.of(100), 1);
    expect(p[0]).toBeCloseTo(1 / 3, 15);
    expect(p[1]).toBeCloseTo(2 / 3, 15);
    expect(p[2]).toBe(0);
  });

  it("resolves options and rejects bad ones", () => {
    expect(resolveKnnOptions()).toEqual({ neighbors: 5 });
    expect(() => resolveKnnOptions({ neighbors: 0 })).toThrow(UsageError);
    expect(() => resolveKnnOptions({ neighbors: 2.5 })).toThrow(UsageError);
    expect(new KNearestNeighbors().withOptions({ neighbors: 9 }).options.neighbors).toBe(9);
    expect(() => new KNearestNeighbors().withOptions({ k: 9 })).toThrow(UsageError);
  });
});
