/**
 * Invariant checks for splitters, after scikit-learn's `check_valid_split` idea: test folds are
 * disjoint, cover every row exactly once, and each fold's training part is the complement of its
 * test part.
 */
import { expect } from "vitest";
import type { Split } from "../../src/splitters/split.js";

export function expectValidKFold(splits: Split[], rows: number): void {
  const seen = new Int32Array(rows);
  for (const { train, test } of splits) {
    expect(train.length + test.length).toBe(rows);
    const inTest = new Set(test);
    for (const row of train) expect(inTest.has(row)).toBe(false);
    for (const row of test) seen[row]++;
  }
  expect([...seen].every((count) => count === 1)).toBe(true);
}

/** Each test fold holds each class's count divided by the folds, to within one row. */
export function expectStratified(splits: Split[], labels: Int32Array): void {
  const classes = Math.max(...labels) + 1;
  const total = new Array<number>(classes).fill(0);
  for (const label of labels) total[label]++;
  for (const { test } of splits) {
    const counts = new Array<number>(classes).fill(0);
    for (const row of test) counts[labels[row]]++;
    counts.forEach((count, k) => expect(Math.abs(count - total[k] / splits.length)).toBeLessThanOrEqual(1));
  }
}

/**
 * Runs (groups) are kept whole: no split has a group on both its training and its test side, and each
 * group's rows are all held out together in exactly one split.
 */
export function expectGroupsWhole(splits: Split[], groups: Int32Array): void {
  const heldOutIn = new Map<number, number>();
  splits.forEach(({ train, test }, s) => {
    const testGroups = new Set(Array.from(test, (row) => groups[row]));
    const straddling = Array.from(train).filter((row) => testGroups.has(groups[row]));
    expect(straddling, `split ${s}: training rows whose run is held out`).toEqual([]);
    for (const group of testGroups) {
      expect(heldOutIn.has(group), `group ${group} held out in two splits`).toBe(false);
      heldOutIn.set(group, s);
    }
  });
  expect(heldOutIn.size).toBe(new Set(groups).size);
}

/** Folds' row counts differ by at most the largest group's row count (the longest-processing-time bound). */
export function expectBalancedByRows(splits: Split[], groups: Int32Array): void {
  const rowsOf = new Map<number, number>();
  for (const group of groups) rowsOf.set(group, (rowsOf.get(group) ?? 0) + 1);
  const largest = Math.max(...rowsOf.values());
  const sizes = splits.map((split) => split.test.length);
  expect(Math.max(...sizes) - Math.min(...sizes)).toBeLessThanOrEqual(largest);
}
