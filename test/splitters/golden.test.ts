/**
 * The same seed must give the same folds and orderings, and leave the stream at the same draw, or a
 * curve.json written before could no longer be repeated. test/splitters/golden/splits.json holds, for
 * a few small cases and a digest of one 20,000-row case, what every splitter makes of them.
 *
 * Source of the expected values: the file was written by scripts/update-splitter-golden.ts from the
 * splitters as of this file's first commit, and checked then to equal the output of the previous
 * implementations (maps of plain arrays and one object per row, src/splitters/*.ts as of commit
 * d802d68), which test/splitters/sameAsReference.test.ts had proved the typed ones equal to on
 * generated inputs.
 */
import { readFileSync } from "node:fs";
import { fc, test } from "@fast-check/vitest";
import { describe, expect, it } from "vitest";
import { RandomStream } from "../../src/random.js";
import { groupKFold } from "../../src/splitters/groupKFold.js";
import { rowsByValue } from "../../src/splitters/rowsByValue.js";
import { shuffleRows } from "../../src/splitters/shuffleRows.js";
import {
  digestOf,
  largeCase,
  splitterCases,
  splitterOutputs,
  type SplitterCase,
  type SplitterOutputs,
} from "./splitterCases.js";

const golden = JSON.parse(readFileSync(new URL("./golden/splits.json", import.meta.url), "utf8")) as {
  cases: { input: SplitterCase; outputs: SplitterOutputs }[];
  large: { input: SplitterCase; sha256: string };
};

describe("splitters against the golden seed → folds file", () => {
  it("has the cases of splitterCases.ts", () => {
    expect(golden.cases.map((c) => c.input)).toEqual(splitterCases);
    expect(golden.large.input).toEqual(largeCase);
  });

  it.each(golden.cases.map((c, i) => [i, c] as const))("case %i gives the same folds, orders and next draw", (_, c) => {
    expect(splitterOutputs(c.input)).toEqual(c.outputs);
  });

  it("gives the same folds and orders on 20,000 rows × 26 classes (digest)", () => {
    expect(digestOf(splitterOutputs(golden.large.input))).toBe(golden.large.sha256);
  });

  it("groupKFold refuses fewer groups than folds", () => {
    expect(() => groupKFold(Int32Array.from([4, 4, 9, 9, 9]), 3, new RandomStream(1))).toThrow(RangeError);
  });
});

describe("shuffleRows", () => {
  test.prop([fc.integer({ min: 0, max: 500 }), fc.integer({ min: 0, max: 1e9 })])(
    "leaves the same order and stream as RandomStream.shuffle on a plain array",
    (length, seed) => {
      const expected = new RandomStream(seed).shuffle(Array.from({ length }, (_, i) => i * 7 - 3));
      const stream = new RandomStream(seed);
      const items = Int32Array.from({ length: length + 4 }, (_, i) => (i - 2) * 7 - 3);
      shuffleRows(items, stream, 2, length + 2);
      expect(Array.from(items.subarray(2, length + 2))).toEqual(expected);
      // The rows outside the stretch stay where they were.
      expect([items[0], items[1], items[length + 2], items[length + 3]]).toEqual([
        -17,
        -10,
        length * 7 - 3,
        length * 7 + 4,
      ]);
      const after = new RandomStream(seed);
      after.shuffle(Array.from({ length }, (_, i) => i));
      expect(stream.nextUint32()).toBe(after.nextUint32());
    },
  );
});

describe("rowsByValue", () => {
  const arbitrary = fc.record({
    values: fc.array(fc.integer({ min: -5, max: 5 }), { maxLength: 300 }),
    seed: fc.integer({ min: 0, max: 1e9 }),
  });
  test.prop([arbitrary])("groups rows as a map from value to rows in given order would", ({ values, seed }) => {
    const typed = Int32Array.from(values);
    const pool = Int32Array.from(new RandomStream(seed).shuffle(values.map((_, i) => i)).slice(0, values.length - 3));
    const byValue = new Map<number, number[]>();
    for (const row of pool) {
      const list = byValue.get(typed[row]);
      if (list) list.push(row);
      else byValue.set(typed[row], [row]);
    }
    const sortedValues = [...byValue.keys()].sort((a, b) => a - b);
    const grouped = rowsByValue(typed, pool);
    expect(Array.from(grouped.values)).toEqual(sortedValues);
    expect(Array.from(grouped.rows)).toEqual(sortedValues.flatMap((v) => byValue.get(v) as number[]));
    expect(Array.from(grouped.starts.subarray(1))).toEqual(
      sortedValues.map((_, k) =>
        sortedValues.slice(0, k + 1).reduce((n, v) => n + (byValue.get(v) as number[]).length, 0),
      ),
    );
    expect(Array.from(grouped.valueIndex, (k) => sortedValues[k])).toEqual(Array.from(pool, (row) => typed[row]));
  });
});
