import { fc, test } from "@fast-check/vitest";
import { describe, expect, it } from "vitest";
import { UsageError } from "../../src/errors.js";
import { RandomStream } from "../../src/random.js";
import { chooseDesign, type DesignInput } from "../../src/splitters/design.js";
import { groupKFold } from "../../src/splitters/groupKFold.js";
import { kFold } from "../../src/splitters/kFold.js";
import { leaveOneGroupOut } from "../../src/splitters/leaveOneGroupOut.js";
import { leaveOneOut } from "../../src/splitters/leaveOneOut.js";
import { nestedRandomOrder, nestedRunOrder } from "../../src/splitters/nestedSubsamples.js";
import {
  expectBalancedByRows,
  expectGroupsWhole,
  expectStratified,
  expectValidKFold,
} from "../helpers/splitInvariants.js";

/** Group ids of rows: between 1 and 12 groups of 1 to 30 rows each, rows in a shuffled order. */
const groupsArbitrary = fc
  .array(fc.integer({ min: 1, max: 30 }), { minLength: 1, maxLength: 12 })
  .chain((sizes) => {
    const groups = sizes.flatMap((size, g) => Array.from({ length: size }, () => g));
    return fc.shuffledSubarray(groups, { minLength: groups.length, maxLength: groups.length });
  })
  .map((groups) => Int32Array.from(groups));

const seedArbitrary = fc.integer({ min: 0, max: 1e6 });

describe("kFold", () => {
  test.prop([fc.integer({ min: 2, max: 200 }), fc.integer({ min: 2, max: 10 }), seedArbitrary])(
    "folds are disjoint, cover every row once and differ in size by at most one row",
    (rows, folds, seed) => {
      fc.pre(folds <= rows);
      const splits = kFold(rows, folds, new RandomStream(seed, 1));
      expect(splits).toHaveLength(folds);
      expectValidKFold(splits, rows);
      const sizes = splits.map((s) => s.test.length);
      expect(Math.max(...sizes) - Math.min(...sizes)).toBeLessThanOrEqual(1);
    },
  );
});

describe("leaveOneOut", () => {
  it.each([2, 3, 17])("holds out each of %i rows once, in row order", (rows) => {
    const splits = leaveOneOut(rows);
    expectValidKFold(splits, rows);
    expect(splits.map((s) => [...s.test])).toEqual(Array.from({ length: rows }, (_, i) => [i]));
  });
});

describe("groupKFold", () => {
  test.prop([groupsArbitrary, fc.integer({ min: 2, max: 6 }), seedArbitrary])(
    "keeps every group whole, covers every row once and balances fold rows within one largest group",
    (groups, folds, seed) => {
      fc.pre(new Set(groups).size >= folds);
      const splits = groupKFold(groups, folds, new RandomStream(seed, 1));
      expect(splits).toHaveLength(folds);
      expectValidKFold(splits, groups.length);
      expectGroupsWhole(splits, groups);
      expectBalancedByRows(splits, groups);
      for (const split of splits) expect(split.test.length).toBeGreaterThan(0);
    },
  );

  it("puts equal-sized groups in different folds for different seeds", () => {
    const groups = Int32Array.from({ length: 60 }, (_, i) => i % 6);
    const assignment = (seed: number) =>
      groupKFold(groups, 3, new RandomStream(seed, 1)).map((s) => [...new Set(s.test.map((r) => groups[r]))].sort());
    const seen = new Set([0, 1, 2, 3, 4, 5, 6, 7].map((seed) => JSON.stringify(assignment(seed))));
    expect(seen.size).toBeGreaterThan(1);
    expect(assignment(3)).toEqual(assignment(3));
  });

  it("refuses more folds than groups", () => {
    expect(() => groupKFold(Int32Array.from([0, 0, 1]), 3, new RandomStream(0))).toThrow(RangeError);
  });
});

describe("leaveOneGroupOut", () => {
  test.prop([groupsArbitrary])("holds out each group whole, once, in group order", (groups) => {
    const splits = leaveOneGroupOut(groups);
    const present = [...new Set(groups)].sort((a, b) => a - b);
    expect(splits).toHaveLength(present.length);
    expectValidKFold(splits, groups.length);
    expectGroupsWhole(splits, groups);
    splits.forEach((split, f) =>
      expect(new Set(Array.from(split.test, (r) => groups[r]))).toEqual(new Set([present[f]])),
    );
  });
});

describe("nested orders", () => {
  test.prop([fc.integer({ min: 1, max: 100 }), seedArbitrary])("nestedRandomOrder permutes the pool", (n, seed) => {
    const pool = Int32Array.from({ length: n }, (_, i) => 3 * i);
    const order = nestedRandomOrder(pool, new RandomStream(seed, 2));
    expect([...order].sort((a, b) => a - b)).toEqual([...pool]);
  });

  test.prop([groupsArbitrary, seedArbitrary])(
    "nestedRunOrder keeps each run's rows together and every run prefix is whole runs",
    (groups, seed) => {
      const pool = Int32Array.from({ length: groups.length }, (_, i) => i).filter((i) => i % 5 !== 0);
      fc.pre(pool.length > 0);
      const { rows, runEnds } = nestedRunOrder(pool, groups, new RandomStream(seed, 2));
      expect([...rows].sort((a, b) => a - b)).toEqual([...pool]);
      expect(runEnds[runEnds.length - 1]).toBe(pool.length);
      let start = 0;
      const seen = new Set<number>();
      for (const end of runEnds) {
        const runGroups = new Set(Array.from(rows.subarray(start, end), (r) => groups[r]));
        expect(runGroups.size).toBe(1);
        const [group] = runGroups;
        expect(seen.has(group)).toBe(false);
        seen.add(group);
        // The run is complete: every pool row of that group lies in this stretch.
        expect(end - start).toBe(pool.filter((r) => groups[r] === group).length);
        start = end;
      }
    },
  );
});

describe("chooseDesign", () => {
  const labels = Int32Array.from({ length: 40 }, (_, i) => i % 2);
  const runsOf = (runs: number) => Int32Array.from({ length: 40 }, (_, i) => i % runs);
  const base = { task: "classification" as const, rows: 40, labels, byRuns: false };

  it.each<[Partial<DesignInput> & Pick<DesignInput, "folds">, string, number]>([
    [{ folds: 5 }, "stratified-k-fold", 5],
    [{ folds: "loo" }, "leave-one-out", 40],
    [{ folds: 40 }, "leave-one-out", 40],
    [{ folds: 5, task: "regression" }, "k-fold", 5],
    [{ folds: 3, groups: runsOf(6) }, "grouped-k-fold", 3],
    [{ folds: "loo", groups: runsOf(6) }, "leave-one-group-out", 6],
    [{ folds: 6, groups: runsOf(6) }, "leave-one-group-out", 6],
    [{ folds: 5, groups: runsOf(4) }, "leave-one-group-out", 4],
    [{ folds: 5, groups: runsOf(2) }, "stratified-k-fold", 5],
  ])("%o → %s with %i folds", (input, splitter, folds) => {
    const design = chooseDesign({ ...base, ...input });
    expect(design.splitter).toBe(splitter);
    expect(design.folds).toBe(folds);
    const splits = design.splits(new RandomStream(1, 1));
    expect(splits).toHaveLength(folds);
    expectValidKFold(splits, 40);
    if (design.grouped) expectGroupsWhole(splits, input.groups!);
    if (splitter === "stratified-k-fold") expectStratified(splits, labels);
  });

  it("warns when the folds exceed the runs, and falls back to rows with fewer than 3 runs", () => {
    expect(chooseDesign({ ...base, folds: 5, groups: runsOf(4), groupColumn: "cruise" }).warnings).toEqual([
      "5 folds are more than the 4 runs in 'cruise': leave-one-run-out (4 folds) is used instead",
    ]);
    const fallback = chooseDesign({ ...base, folds: 5, groups: runsOf(2), groupColumn: "cruise", byRuns: true });
    expect(fallback).toMatchObject({ grouped: false, byRuns: false, runs: 2 });
    expect(fallback.warnings[0]).toContain("the run column 'cruise' has only 2 runs");
    expect(fallback.warnings[0]).toContain("training sizes count rows, not runs; scores may be optimistic");
  });

  it.each([
    [{ folds: 5, byRuns: true }, "byRuns: needs group"],
    [{ folds: 41 }, "folds: 41 is more than the 40 rows"],
  ])("refuses %o", (input, text) => {
    expect(() => chooseDesign({ ...base, ...input })).toThrow(UsageError);
    expect(() => chooseDesign({ ...base, ...input })).toThrow(text);
  });
});
