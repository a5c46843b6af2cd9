/**
 * Seeded random numbers. Library code never calls Math.random: every stochastic function takes a
 * `RandomStream`. Streams derive from (seed, index) so that work split over worker threads gives the
 * same numbers whatever the number of workers.
 *
 * Written by hand because the npm choices either lack normal draws or need subpath imports; the
 * generators are a few lines each: splitmix32 (for seeding) and xoshiro128** (Blackman and Vigna
 * 2018, "Scrambled linear pseudorandom number generators").
 */

/** One step of splitmix32: mixes a 32-bit state into a well-spread 32-bit value. */
function splitmix32(state: number): [next: number, value: number] {
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
    let state = seed | 0;
    let v: number;
    // Fold the high bits of large seeds in too.
    [state, v] = splitmix32(state ^ Math.floor(seed / 4294967296));
    state ^= v;
    for (const p of path) {
      [state, v] = splitmix32(state ^ Math.imul(p + 1, 0x27d4eb2d));
      state = (state ^ v) | 0;
    }
    [state, this.s0] = splitmix32(state);
    [state, this.s1] = splitmix32(state);
    [state, this.s2] = splitmix32(state);
    [, this.s3] = splitmix32(state);
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) this.s0 = 1;
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

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k));
}
