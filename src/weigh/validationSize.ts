/**
 * Validation-set size: how many held-out samples are needed before a claimed score is supported,
 * that is, before a one-sided lower confidence bound on the score lies above the target.
 *
 * The score is treated as a proportion of held-out samples scored correctly (exact for accuracy,
 * sensitivity and specificity; an approximation for other scores between 0 and 1). Two intervals
 * for a binomial proportion:
 * - Wilson score interval (Wilson 1927, JASA 22:209; Newcombe 1998, Stat Med 17:857, method 3):
 *   (p̂ + z²/2n ± z·√(p̂(1 − p̂)/n + z²/4n²)) / (1 + z²/n).
 * - Clopper–Pearson exact interval (Clopper and Pearson 1934, Biometrika 26:404), from beta
 *   quantiles: lower = B⁻¹(α/2; x, n − x + 1), upper = B⁻¹(1 − α/2; x + 1, n − x), using jStat's
 *   beta quantile (its incomplete beta stops at a relative step of 3e-7, which leaves the quantiles
 *   within about 1e-9 of SciPy's for the sizes tested in test/weigh/validationSize.test.ts).
 */
import jStat from "jstat";

export interface Interval {
  lower: number;
  upper: number;
}

/** The standard normal quantile. */
export function normalQuantile(p: number): number {
  return jStat.normal.inv(p, 0, 1);
}

/**
 * The two-sided Wilson score interval for an observed proportion `observed` on `n` samples.
 * @param level central probability of the interval, e.g. 0.95
 * @example
 * wilsonInterval(0.9, 100, 0.95) // → { lower: 0.8256..., upper: 0.9448... }
 */
export function wilsonInterval(observed: number, n: number, level = 0.95): Interval {
  const z = normalQuantile((1 + level) / 2);
  return { lower: wilsonBound(observed, n, -z), upper: wilsonBound(observed, n, z) };
}

/** The one-sided Wilson lower bound with the given confidence (e.g. 0.95: z = 1.645). */
export function wilsonLowerBound(observed: number, n: number, confidence = 0.95): number {
  return wilsonBound(observed, n, -normalQuantile(confidence));
}

function wilsonBound(p: number, n: number, z: number): number {
  const z2 = z * z;
  const center = p + z2 / (2 * n);
  const spread = z * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n));
  return (center + spread) / (1 + z2 / n);
}

/**
 * The two-sided Clopper–Pearson exact interval for `successes` out of `n`.
 * @example
 * clopperPearsonInterval(90, 100, 0.95) // → { lower: 0.8238..., upper: 0.9510... }
 */
export function clopperPearsonInterval(successes: number, n: number, level = 0.95): Interval {
  const alpha = 1 - level;
  return {
    lower: clopperPearsonLowerBound(successes, n, 1 - alpha / 2),
    upper: successes >= n ? 1 : jStat.beta.inv(1 - alpha / 2, successes + 1, n - successes),
  };
}

/** The one-sided Clopper–Pearson lower bound: B⁻¹(1 − confidence; x, n − x + 1), 0 when x = 0. */
export function clopperPearsonLowerBound(successes: number, n: number, confidence = 0.95): number {
  return successes <= 0 ? 0 : jStat.beta.inv(1 - confidence, successes, n - successes + 1);
}

/** Largest number of held-out samples searched for. */
const largestSearched = 10_000_000;

/**
 * The fewest held-out samples n for which the one-sided Wilson lower bound of an observed score equal
 * to `expectedScore` lies above `target`. The bound rises with n towards the observed score, so the
 * answer is found by doubling and bisection.
 * @returns null when the expected score does not exceed the target (no size supports the claim) or
 *   more than ten million samples would be needed
 */
export function heldOutNeededWilson(expectedScore: number, target: number, confidence = 0.95): number | null {
  if (!(expectedScore > target) || expectedScore > 1) return null;
  const passes = (n: number) => wilsonLowerBound(expectedScore, n, confidence) > target;
  let high = 1;
  while (!passes(high)) {
    high *= 2;
    if (high > largestSearched) return null;
  }
  let low = Math.floor(high / 2);
  // Invariant: passes(high), and low = 0 or !passes(low).
  while (high - low > 1) {
    const middle = Math.floor((low + high) / 2);
    if (passes(middle)) high = middle;
    else low = middle;
  }
  return high;
}

/**
 * The fewest held-out samples n for which the one-sided Clopper–Pearson lower bound, with
 * ⌊n × expectedScore⌋ samples scored correctly (never more than expected), lies above `target`.
 * Rounding down makes the bound rise in a saw-tooth, so a few sizes just above the answer can fall
 * short again. The exact bound is wider than Wilson's, so the search runs upward from half of
 * Wilson's answer.
 * @returns null when no size up to 200,000 (or none at all) supports the claim
 */
export function heldOutNeededExact(expectedScore: number, target: number, confidence = 0.95): number | null {
  const wilson = heldOutNeededWilson(expectedScore, target, confidence);
  if (wilson === null || wilson > 200_000) return null;
  for (let n = Math.max(1, Math.floor(wilson / 2)); n <= 4 * wilson + 100; n++) {
    // A small tolerance keeps 0.9 × 50 = 45.000000000000004 at 45 and 0.7 × 10 = 6.999... at 7.
    const successes = Math.floor(n * expectedScore + 1e-9);
    if (clopperPearsonLowerBound(successes, n, confidence) > target) return n;
  }
  return null;
}
