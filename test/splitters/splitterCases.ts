/**
 * The cases of the splitters' golden file (test/splitters/golden/splits.json): small inputs, a seed,
 * and what every splitter makes of them, with the stream's next draw afterwards (a splitter that
 * moved one row, or drew once more, changes the file). Written by scripts/update-splitter-golden.ts,
 * checked by test/splitters/golden.test.ts.
 */
import { createHash } from "node:crypto";
import { RandomStream } from "../../src/random.js";
import { groupKFold } from "../../src/splitters/groupKFold.js";
import { kFold } from "../../src/splitters/kFold.js";
import { leaveOneGroupOut } from "../../src/splitters/leaveOneGroupOut.js";
import { nestedRandomOrder, nestedRunOrder, nestedStratifiedOrder } from "../../src/splitters/nestedSubsamples.js";
import type { Split } from "../../src/splitters/split.js";
import { stratifiedKFold } from "../../src/splitters/stratifiedKFold.js";

export interface SplitterCase {
  seed: number;
  rows: number;
  classes: number;
  /** Class 0 takes about 90% of the rows. */
  skewed: boolean;
  /** Label values spread out, some negative, instead of 0 .. classes − 1. */
  sparse: boolean;
  /** Share of the rows in the training pool, and whether the pool is in a shuffled order. */
  poolShare: number;
  poolShuffled: boolean;
  folds: number;
  /** Levels of coarse uniform draws, so that sort keys tie and tie-breaks decide (0: full draws). */
  levels: number;
}

export const splitterCases: SplitterCase[] = [
  {
    seed: 1,
    rows: 30,
    classes: 2,
    skewed: false,
    sparse: false,
    poolShare: 1,
    poolShuffled: false,
    folds: 3,
    levels: 0,
  },
  {
    seed: 2,
    rows: 47,
    classes: 3,
    skewed: true,
    sparse: false,
    poolShare: 0.8,
    poolShuffled: true,
    folds: 5,
    levels: 0,
  },
  {
    seed: 3,
    rows: 60,
    classes: 5,
    skewed: false,
    sparse: true,
    poolShare: 0.8,
    poolShuffled: false,
    folds: 4,
    levels: 0,
  },
  {
    seed: 4,
    rows: 40,
    classes: 4,
    skewed: false,
    sparse: false,
    poolShare: 1,
    poolShuffled: true,
    folds: 2,
    levels: 2,
  },
  {
    seed: 5,
    rows: 55,
    classes: 6,
    skewed: true,
    sparse: true,
    poolShare: 0.3,
    poolShuffled: true,
    folds: 5,
    levels: 5,
  },
  {
    seed: 20261202,
    rows: 36,
    classes: 1,
    skewed: false,
    sparse: false,
    poolShare: 1,
    poolShuffled: false,
    folds: 6,
    levels: 0,
  },
  {
    seed: 987654321,
    rows: 58,
    classes: 12,
    skewed: false,
    sparse: false,
    poolShare: 0.8,
    poolShuffled: true,
    folds: 3,
    levels: 5,
  },
];

/** The benchmark's largest shape, kept as a digest: 20,000 rows × 26 classes, an 80% pool. */
export const largeCase: SplitterCase = {
  seed: 20261202,
  rows: 20000,
  classes: 26,
  skewed: false,
  sparse: false,
  poolShare: 0.8,
  poolShuffled: false,
  folds: 5,
  levels: 0,
};

/** A stream whose uniform draws take only `levels` values (0: the stream as it is). */
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

/** Per-row values (classes or runs) of a case, from a stream of its own. */
export function valuesOf(c: SplitterCase): Int32Array {
  const random = new RandomStream(c.seed, 1);
  const spread = (k: number) => (c.sparse ? (k - 3) * 1_000_003 : k);
  return Int32Array.from({ length: c.rows }, () =>
    spread(c.skewed && random.uniform() < 0.9 ? 0 : random.integer(c.classes)),
  );
}

export function poolOf(c: SplitterCase): Int32Array {
  const random = new RandomStream(c.seed, 2);
  const rows = Array.from({ length: c.rows }, (_, i) => i).filter(() => random.uniform() < c.poolShare);
  return Int32Array.from(c.poolShuffled ? random.shuffle(rows) : rows);
}

/** A splitter's result and the stream's next 32-bit draw after it. */
function withNextDraw<T>(c: SplitterCase, make: (random: RandomStream) => T): { result: T; next: number } {
  const random = new CoarseStream(c.levels, c.seed);
  const result = make(random);
  return { result, next: random.nextUint32() };
}

/** The fold of each row (each row is in exactly one test fold). */
function foldOfRow(splits: Split[], rows: number): number[] {
  const fold = new Array<number>(rows).fill(-1);
  splits.forEach((split, f) => split.test.forEach((row) => (fold[row] = f)));
  return fold;
}

export interface SplitterOutputs {
  stratifiedKFold: { foldOfRow: number[]; next: number } | null;
  kFold: { foldOfRow: number[]; next: number };
  groupKFold: { foldOfRow: number[]; next: number } | null;
  leaveOneGroupOut: number[];
  nestedStratifiedOrder: { order: number[]; next: number };
  nestedRandomOrder: { order: number[]; next: number };
  nestedRunOrder: { order: number[]; runEnds: number[]; next: number };
}

/** What every splitter makes of the case (labels double as run labels for the grouped splitters). */
export function splitterOutputs(c: SplitterCase): SplitterOutputs {
  const values = valuesOf(c);
  const pool = poolOf(c);
  const folds = (make: (random: RandomStream) => Split[]) => {
    const { result, next } = withNextDraw(c, make);
    return { foldOfRow: foldOfRow(result, c.rows), next };
  };
  const order = (make: (random: RandomStream) => Int32Array) => {
    const { result, next } = withNextDraw(c, make);
    return { order: Array.from(result), next };
  };
  const runs = withNextDraw(c, (random) => nestedRunOrder(pool, values, random));
  const counts = new Map<number, number>();
  for (const v of values) counts.set(v, (counts.get(v) ?? 0) + 1);
  return {
    stratifiedKFold: c.folds <= c.rows ? folds((random) => stratifiedKFold(values, c.folds, random)) : null,
    kFold: folds((random) => kFold(c.rows, c.folds, random)),
    groupKFold: counts.size >= c.folds ? folds((random) => groupKFold(values, c.folds, random)) : null,
    leaveOneGroupOut: foldOfRow(leaveOneGroupOut(values), c.rows),
    nestedStratifiedOrder: order((random) => nestedStratifiedOrder(pool, values, random)),
    nestedRandomOrder: order((random) => nestedRandomOrder(pool, random)),
    nestedRunOrder: { order: Array.from(runs.result.rows), runEnds: runs.result.runEnds, next: runs.next },
  };
}

/** SHA-256 of the outputs' JSON, for the large case. */
export function digestOf(outputs: SplitterOutputs): string {
  return createHash("sha256").update(JSON.stringify(outputs)).digest("hex");
}

/** The whole golden file's content. */
export function goldenContent(): {
  cases: { input: SplitterCase; outputs: SplitterOutputs }[];
  large: { input: SplitterCase; sha256: string };
} {
  return {
    cases: splitterCases.map((input) => ({ input, outputs: splitterOutputs(input) })),
    large: { input: largeCase, sha256: digestOf(splitterOutputs(largeCase)) },
  };
}
