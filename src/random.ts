/**
 * Seeded random numbers. Library code never calls Math.random: every stochastic function takes a
 * `RandomStream`. Streams derive from (seed, index) so that work split over worker threads gives the
 * same numbers whatever the number of workers.
 *
 * Written by hand because the npm choices either lack normal draws or need subpath imports; the
 * generators are a few lines each: splitmix32 (for seeding) and xoshiro128** (Blackman and Vigna
 * 2018, "Scrambled linear pseudorandom number generators").
 */

/**
 * Every purpose a stream serves, once. A stream's path starts with its purpose
 * (`streamFor(seed, StreamPurpose.curveDraw, j)`), so streams of different purposes never share a
 * path, whatever their other indices. Add a purpose here rather than choosing a tag in the file that
 * uses it; the values of existing purposes are part of every saved result's numbers.
 */
export const StreamPurpose = {
  /** The outer folds of repeat r: (r). */
  folds: 1,
  /** The nested training order of (repeat, fold). */
  order: 2,
  /** A learner's own randomness at (repeat, fold, size). */
  learner: 3,
  /** The inner folds that tune a learner at (repeat, fold, size). */
  tuningFolds: 4,
  /** A tuning candidate's learner at (repeat, fold, size, setting, inner fold). */
  tuningLearner: 5,
  /** The forecast backtest's bootstrap resample r: (r). */
  backtestResample: 6,
  /** The forecast's drawn curve j: its resample, shift and extrapolation error (j). */
  curveDraw: 7,
  /** A single model's deviates around drawn curve j at projection p: (j, p). */
  singleModel: 8,
  /** The runs' yields (samples per run) of decision draw j: (j). */
  runYield: 9,
  /** The value-of-information simulations for a pilot of k runs: (k). */
  pilotValue: 10,
} as const;

export type StreamPurpose = (typeof StreamPurpose)[keyof typeof StreamPurpose];

/** The stream for `purpose` at `indices` (see `StreamPurpose`): the one way library code makes a stream. */
export function streamFor(seed: number, purpose: StreamPurpose, ...indices: number[]): RandomStream {
  return new RandomStream(seed, purpose, ...indices);
}

/**
 * One step of splitmix32: advances a Weyl sequence by 0x9e3779b9 and returns the new state through
 * MurmurHash3's 32-bit finalizer (Appleby), as SplitMix (Steele, Lea and Flood 2014) does with 64-bit
 * words. Tested against fixtures/reference/random.
 */
export function splitmix32(state: number): [next: number, value: number] {
  const next = (state + 0x9e3779b9) | 0;
  let z = next;
  z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
  z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
  z ^= z >>> 16;
  return [next, z >>> 0];
}

/** A xoshiro128** generator with uniform, integer, normal and shuffle draws. */
export class RandomStream {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;
  private spareNormal: number | null = null;

  /**
   * @param seed any integer (the user's `--seed`)
   * @param path indices naming this stream (e.g. repeat, fold, size); the same seed and path always
   *   give the same stream, different paths give independent-looking streams.
   */
  constructor(seed: number, ...path: number[]) {
    // Two hash chains over (seed, path) with different keys: one 32-bit chain maps two of some
    // thousands of paths to the same state (a birthday collision, as test/random.test.ts found),
    // two together make a 64-bit name for the stream.
    const a = deriveState(seed, path, 0, 0x27d4eb2d);
    const b = deriveState(seed, path, 0x6a09e667, 0x165667b1);
    let state: number;
    [state, this.s0] = splitmix32(a);
    [, this.s1] = splitmix32(state);
    [state, this.s2] = splitmix32(b);
    [, this.s3] = splitmix32(state);
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) this.s0 = 1;
  }

  /** A generator at the given xoshiro128** state (not all zero), for tests against reference outputs. */
  static fromState(s0: number, s1: number, s2: number, s3: number): RandomStream {
    const stream = new RandomStream(0);
    stream.s0 = s0 | 0;
    stream.s1 = s1 | 0;
    stream.s2 = s2 | 0;
    stream.s3 = s3 | 0;
    return stream;
  }

  /** A uniform 32-bit unsigned integer. */
  nextUint32(): number {
    const result = Math.imul(rotl(Math.imul(this.s1, 5), 7), 9) >>> 0;
    const t = this.s1 << 9;
    this.s2 ^= this.s0;
    this.s3 ^= this.s1;
    this.s1 ^= this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = rotl(this.s3, 11);
    return result;
  }

  /** A uniform number in [0, 1) with 53 random bits. */
  uniform(): number {
    const hi = this.nextUint32() >>> 5; // 27 bits
    const lo = this.nextUint32() >>> 6; // 26 bits
    return (hi * 67108864 + lo) / 9007199254740992;
  }

  /** A uniform integer in [0, n). */
  integer(n: number): number {
    return Math.floor(this.uniform() * n);
  }

  /** A standard normal draw (Marsaglia polar method). */
  normal(): number {
    if (this.spareNormal !== null) {
      const z = this.spareNormal;
      this.spareNormal = null;
      return z;
    }
    let u: number, v: number, s: number;
    do {
      u = 2 * this.uniform() - 1;
      v = 2 * this.uniform() - 1;
      s = u * u + v * v;
    } while (s >= 1 || s === 0);
    const m = Math.sqrt((-2 * Math.log(s)) / s);
    this.spareNormal = v * m;
    return u * m;
  }

  /** Shuffles an array in place (Fisher–Yates) and returns it. */
  shuffle<T>(items: T[]): T[] {
    for (let i = items.length - 1; i > 0; i--) {
      const j = this.integer(i + 1);
      const tmp = items[i];
      items[i] = items[j];
      items[j] = tmp;
    }
    return items;
  }
}

/** One 32-bit hash chain over the seed (both its halves) and the path, keyed by `key` and `multiplier`. */
function deriveState(seed: number, path: readonly number[], key: number, multiplier: number): number {
  let state: number;
  let v: number;
  [state, v] = splitmix32((seed | 0) ^ key);
  state ^= v;
  // Fold the high bits of large seeds in too.
  [state, v] = splitmix32(state ^ Math.floor(seed / 4294967296));
  state ^= v;
  for (const p of path) {
    [state, v] = splitmix32(state ^ Math.imul(p + 1, multiplier));
    state = (state ^ v) | 0;
  }
  return state;
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k));
}
