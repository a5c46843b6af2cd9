/**
 * The splitters keep rows in typed arrays (Int32Array, Float64Array, sorts of positions). Before that
 * they kept maps of plain arrays and, for the nested stratified order, one object per row. The change
 * must not move a single row: the same seed must give the same folds and orderings as before, and
 * leave the stream at the same draw, or every curve.json written before would no longer be repeatable.
 *
 * Source of the expected values: the previous implementations, copied below unchanged from
 * src/splitters/*.ts as of commit d802d68 (the `reference…` functions). Each check runs both on the
 * same generated inputs (class counts 1–60, 0–3,000 rows and a 20,000-row × 26-class case like the
 * benchmark's largest set, dense and sparse label values, pools sorted and shuffled, seeds) and
 * asserts identical outputs and the same next draw of the stream afterwards.
 */
import { fc, test } from "@fast-check/vitest";
import { describe, expect, it } from "vitest";
import { RandomStream } from "../../src/random.js";
import { groupKFold } from "../../src/splitters/groupKFold.js";
import { kFold } from "../../src/splitters/kFold.js";
import { leaveOneGroupOut } from "../../src/splitters/leaveOneGroupOut.js";
import { nestedRandomOrder, nestedRunOrder, nestedStratifiedOrder } from "../../src/splitters/nestedSubsamples.js";
import { rowsByValue } from "../../src/splitters/rowsByValue.js";
import { shuffleRows } from "../../src/splitters/shuffleRows.js";
import { splitsFromFoldOf, type Split } from "../../src/splitters/split.js";
import { stratifiedKFold } from "../../src/splitters/stratifiedKFold.js";

// ---- The previous implementations (commit d802d68), unchanged but for their names. ----

function referenceNestedStratifiedOrder(pool: Int32Array, labels: Int32Array, random: RandomStream): Int32Array {
  const byClass = new Map<number, number[]>();
  for (const row of pool) {
    const list = byClass.get(labels[row]);
    if (list) list.push(row);
    else byClass.set(labels[row], [row]);
  }
  const keyed: { row: number; key: number }[] = [];
  for (const cls of [...byClass.keys()].sort((a, b) => a - b)) {
    const rows = random.shuffle(byClass.get(cls) as number[]);
    rows.forEach((row, j) => keyed.push({ row, key: (j + random.uniform()) / rows.length }));
  }
  keyed.sort((a, b) => a.key - b.key || a.row - b.row);
  return Int32Array.from(keyed, (k) => k.row);
}

function referenceNestedRandomOrder(pool: Int32Array, random: RandomStream): Int32Array {
  return Int32Array.from(random.shuffle(Array.from(pool)));
}

function referenceNestedRunOrder(
  pool: Int32Array,
  groups: Int32Array,
  random: RandomStream,
): { rows: Int32Array; runEnds: number[] } {
  const rowsOf = new Map<number, number[]>();
  for (const row of pool) {
    const list = rowsOf.get(groups[row]);
    if (list) list.push(row);
    else rowsOf.set(groups[row], [row]);
  }
  const runs = random.shuffle([...rowsOf.keys()].sort((a, b) => a - b));
  const rows = new Int32Array(pool.length);
  const runEnds: number[] = [];
  let end = 0;
  for (const run of runs) {
    for (const row of (rowsOf.get(run) as number[]).sort((a, b) => a - b)) rows[end++] = row;
    runEnds.push(end);
  }
  return { rows, runEnds };
}

function referenceStratifiedKFold(labels: Int32Array, folds: number, random: RandomStream): Split[] {
  const rows = labels.length;
  const byClass = new Map<number, number[]>();
  for (let i = 0; i < rows; i++) {
    const list = byClass.get(labels[i]);
    if (list) list.push(i);
    else byClass.set(labels[i], [i]);
  }
  const foldOf = new Int32Array(rows);
  let next = random.integer(folds);
  for (const cls of [...byClass.keys()].sort((a, b) => a - b)) {
    for (const row of random.shuffle(byClass.get(cls) as number[])) {
      foldOf[row] = next;
      next = (next + 1) % folds;
    }
  }
  return splitsFromFoldOf(foldOf, folds);
}

function referenceKFold(rows: number, folds: number, random: RandomStream): Split[] {
  const order = random.shuffle(Array.from({ length: rows }, (_, i) => i));
  const foldOf = new Int32Array(rows);
  order.forEach((row, position) => (foldOf[row] = position % folds));
  return splitsFromFoldOf(foldOf, folds);
}

function referenceGroupKFold(groups: Int32Array, folds: number, random: RandomStream): Split[] {
  const rowsOf = new Map<number, number>();
  for (const group of groups) rowsOf.set(group, (rowsOf.get(group) ?? 0) + 1);
  if (rowsOf.size < folds) throw new RangeError(`groupKFold: ${rowsOf.size} groups cannot fill ${folds} folds`);
  const order = random.shuffle([...rowsOf.keys()].sort((a, b) => a - b));
  // Array.prototype.sort is stable: equal sizes keep their shuffled order.
  order.sort((a, b) => (rowsOf.get(b) as number) - (rowsOf.get(a) as number));
  const foldRank = random.shuffle(Array.from({ length: folds }, (_, f) => f));
  const load = new Array<number>(folds).fill(0);
  const foldOfGroup = new Map<number, number>();
  for (const group of order) {
    let best = foldRank[0];
    for (const f of foldRank) if (load[f] < load[best]) best = f;
    foldOfGroup.set(group, best);
    load[best] += rowsOf.get(group) as number;
  }
  return splitsFromFoldOf(
    Int32Array.from(groups, (group) => foldOfGroup.get(group) as number),
    folds,
  );
}

function referenceLeaveOneGroupOut(groups: Int32Array): Split[] {
  const present = [...new Set(groups)].sort((a, b) => a - b);
  const foldOfGroup = new Map(present.map((group, f) => [group, f]));
  return splitsFromFoldOf(
    Int32Array.from(groups, (group) => foldOfGroup.get(group) as number),
    present.length,
  );
}

// ---- Generated inputs. ----

/**
 * A stream whose uniform draws take only `levels` values, so that keys (j + u) / m of classes of equal
 * size collide and the tie-break on the row decides; `levels` 0 leaves the stream as it is.
 */
class CoarseStream extends RandomStream {
  constructor(
    private readonly levels: number,
    seed: number,
  ) {
    super(seed, 9);
  }
  override uniform(): number {
    const u = super.uniform();
    return this.levels === 0 ? u : Math.floor(u * this.levels) / this.levels;
  }
}

interface Case {
  rows: number;
  classes: number;
  /** 0: classes about equally frequent; 1: class 0 takes about 90% of the rows. */
  skew: number;
  /** Label values: 0 .. classes − 1, or spread out, some negative (the binary-search path). */
  sparse: boolean;
  /** Share of the rows in the pool, and whether the pool is in a shuffled order. */
  poolShare: number;
  poolShuffled: boolean;
  seed: number;
  /** Levels of the coarse uniform draws (0: full 53-bit draws). */
  levels: number;
}

/** Per-row values (classes or runs) of a case, drawn from a stream of its own. */
function valuesOf(c: Case): Int32Array {
  const random = new RandomStream(c.seed, 1);
  const spread = (k: number) => (c.sparse ? (k - 3) * 1_000_003 : k);
  return Int32Array.from({ length: c.rows }, () =>
    spread(c.skew === 1 && random.uniform() < 0.9 ? 0 : random.integer(c.classes)),
  );
}

function poolOf(c: Case): Int32Array {
  const random = new RandomStream(c.seed, 2);
  const rows = Array.from({ length: c.rows }, (_, i) => i).filter(() => random.uniform() < c.poolShare);
  return Int32Array.from(c.poolShuffled ? random.shuffle(rows) : rows);
}

const caseArbitrary: fc.Arbitrary<Case> = fc.record({
  rows: fc.oneof(fc.integer({ min: 0, max: 40 }), fc.integer({ min: 0, max: 3000 })),
  classes: fc.oneof(fc.integer({ min: 1, max: 4 }), fc.integer({ min: 1, max: 60 })),
  skew: fc.constantFrom(0, 1),
  sparse: fc.boolean(),
  poolShare: fc.constantFrom(0.3, 0.8, 1),
  poolShuffled: fc.boolean(),
  seed: fc.integer({ min: 0, max: 1e9 }),
  levels: fc.constantFrom(0, 0, 2, 5),
});

/** Runs `make` on a fresh stream of the case and returns its result and the stream's next draw after it. */
function withNextDraw<T>(c: Case, make: (random: RandomStream) => T): [T, number] {
  const random = new CoarseStream(c.levels, c.seed);
  const result = make(random);
  return [result, random.nextUint32()];
}

const asArrays = (splits: Split[]) => splits.map((s) => [Array.from(s.train), Array.from(s.test)]);

// ---- Checks. ----

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
  test.prop([caseArbitrary])("groups rows as a map from value to rows in given order would", (c) => {
    const values = valuesOf(c);
    const pool = poolOf(c);
    const byValue = new Map<number, number[]>();
    for (const row of pool) {
      const list = byValue.get(values[row]);
      if (list) list.push(row);
      else byValue.set(values[row], [row]);
    }
    const sortedValues = [...byValue.keys()].sort((a, b) => a - b);
    const grouped = rowsByValue(values, pool);
    expect(Array.from(grouped.values)).toEqual(sortedValues);
    expect(Array.from(grouped.rows)).toEqual(sortedValues.flatMap((v) => byValue.get(v) as number[]));
    expect(Array.from(grouped.starts.subarray(1))).toEqual(
      sortedValues.map((_, k) =>
        sortedValues.slice(0, k + 1).reduce((n, v) => n + (byValue.get(v) as number[]).length, 0),
      ),
    );
    expect(Array.from(grouped.valueIndex, (k) => sortedValues[k])).toEqual(Array.from(pool, (row) => values[row]));
  });
});

describe("typed splitters give the previous implementations' outputs", () => {
  const runs = { numRuns: 300 };

  test.prop([caseArbitrary], runs)("nestedStratifiedOrder", (c) => {
    const labels = valuesOf(c);
    const pool = poolOf(c);
    const [ours, oursNext] = withNextDraw(c, (random) => nestedStratifiedOrder(pool, labels, random));
    const [theirs, theirsNext] = withNextDraw(c, (random) => referenceNestedStratifiedOrder(pool, labels, random));
    expect(Array.from(ours)).toEqual(Array.from(theirs));
    expect(oursNext).toBe(theirsNext);
  });

  test.prop([caseArbitrary], runs)("nestedRandomOrder", (c) => {
    const pool = poolOf(c);
    const [ours, oursNext] = withNextDraw(c, (random) => nestedRandomOrder(pool, random));
    const [theirs, theirsNext] = withNextDraw(c, (random) => referenceNestedRandomOrder(pool, random));
    expect(Array.from(ours)).toEqual(Array.from(theirs));
    expect(oursNext).toBe(theirsNext);
  });

  test.prop([caseArbitrary], runs)("nestedRunOrder", (c) => {
    const groups = valuesOf(c);
    const pool = poolOf(c);
    const [ours, oursNext] = withNextDraw(c, (random) => nestedRunOrder(pool, groups, random));
    const [theirs, theirsNext] = withNextDraw(c, (random) => referenceNestedRunOrder(pool, groups, random));
    expect(Array.from(ours.rows)).toEqual(Array.from(theirs.rows));
    expect(ours.runEnds).toEqual(theirs.runEnds);
    expect(oursNext).toBe(theirsNext);
  });

  test.prop([caseArbitrary, fc.integer({ min: 2, max: 12 })], runs)("stratifiedKFold", (c, folds) => {
    fc.pre(folds <= c.rows);
    const labels = valuesOf(c);
    const [ours, oursNext] = withNextDraw(c, (random) => stratifiedKFold(labels, folds, random));
    const [theirs, theirsNext] = withNextDraw(c, (random) => referenceStratifiedKFold(labels, folds, random));
    expect(asArrays(ours)).toEqual(asArrays(theirs));
    expect(oursNext).toBe(theirsNext);
  });

  test.prop([caseArbitrary, fc.integer({ min: 2, max: 12 })], runs)("kFold", (c, folds) => {
    fc.pre(folds <= c.rows);
    const [ours, oursNext] = withNextDraw(c, (random) => kFold(c.rows, folds, random));
    const [theirs, theirsNext] = withNextDraw(c, (random) => referenceKFold(c.rows, folds, random));
    expect(asArrays(ours)).toEqual(asArrays(theirs));
    expect(oursNext).toBe(theirsNext);
  });

  test.prop([caseArbitrary, fc.integer({ min: 2, max: 8 })], runs)("groupKFold", (c, folds) => {
    const groups = valuesOf(c);
    fc.pre(new Set(groups).size >= folds);
    const [ours, oursNext] = withNextDraw(c, (random) => groupKFold(groups, folds, random));
    const [theirs, theirsNext] = withNextDraw(c, (random) => referenceGroupKFold(groups, folds, random));
    expect(asArrays(ours)).toEqual(asArrays(theirs));
    expect(oursNext).toBe(theirsNext);
  });

  it("groupKFold refuses fewer groups than folds, as before", () => {
    const groups = Int32Array.from([4, 4, 9, 9, 9]);
    expect(() => groupKFold(groups, 3, new RandomStream(1))).toThrow(RangeError);
    expect(() => referenceGroupKFold(groups, 3, new RandomStream(1))).toThrow(RangeError);
  });

  test.prop([caseArbitrary])("leaveOneGroupOut", (c) => {
    const groups = valuesOf(c);
    expect(asArrays(leaveOneGroupOut(groups))).toEqual(asArrays(referenceLeaveOneGroupOut(groups)));
  });

  // The benchmark's largest set: 20,000 rows, 26 classes, an 80% pool in fold order, several seeds.
  it.each([1, 2, 3, 20261202])(
    "nestedStratifiedOrder and stratifiedKFold on 20,000 rows × 26 classes, seed %i",
    (seed) => {
      const c: Case = {
        rows: 20000,
        classes: 26,
        skew: 0,
        sparse: false,
        poolShare: 0.8,
        poolShuffled: false,
        seed,
        levels: 0,
      };
      const labels = valuesOf(c);
      const pool = poolOf(c);
      const [ours, oursNext] = withNextDraw(c, (random) => nestedStratifiedOrder(pool, labels, random));
      const [theirs, theirsNext] = withNextDraw(c, (random) => referenceNestedStratifiedOrder(pool, labels, random));
      expect(Array.from(ours)).toEqual(Array.from(theirs));
      expect(oursNext).toBe(theirsNext);
      const [oursFolds] = withNextDraw(c, (random) => stratifiedKFold(labels, 5, random));
      const [theirsFolds] = withNextDraw(c, (random) => referenceStratifiedKFold(labels, 5, random));
      expect(asArrays(oursFolds)).toEqual(asArrays(theirsFolds));
    },
  );
});
