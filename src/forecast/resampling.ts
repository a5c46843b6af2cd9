/**
 * The bootstrap over repeats (Efron and Tibshirani 1993, "An Introduction to the Bootstrap"): whole
 * repeats of the cross-validation are drawn with replacement, the same repeats at every training
 * size, and each size's mean is recomputed. Whole repeats, because the scores of one repeat share
 * its folds and are not independent; the same repeats at every size, because a curve's sizes share
 * them too. A size whose scores carry no repeat structure resamples its individual scores.
 */
import type { OrientedPoint } from "../fit/families.js";
import type { RandomStream } from "../random.js";
import type { MeasuredCurve } from "./measuredCurve.js";

/** The distinct repeat labels of a curve, sorted. */
export function repeatLabels(measured: MeasuredCurve): number[] {
  const labels = new Set<number>();
  for (const unit of measured.units)
    if (unit.kind === "repeats") for (const r of unit.scoresOfRepeat.keys()) labels.add(r);
  return [...labels].sort((p, q) => p - q);
}

/**
 * One bootstrap resample of the oriented means, aligned with `measured.oriented` (weights kept); a
 * size none of whose repeats was drawn is null. Draws the repeats first, then any loose scores.
 */
export function resampledPoints(
  measured: MeasuredCurve,
  labels: readonly number[],
  random: RandomStream,
): (OrientedPoint | null)[] {
  const { oriented, units, sign } = measured;
  const drawn = labels.map(() => labels[random.integer(labels.length)]);
  return units.map((unit, i) => {
    let sum = 0;
    let count = 0;
    if (unit.kind === "repeats") {
      for (const repeat of drawn) {
        const scores = unit.scoresOfRepeat.get(repeat);
        if (scores === undefined) continue;
        for (const score of scores) sum += score;
        count += scores.length;
      }
    } else {
      for (let s = 0; s < unit.scores.length; s++) sum += unit.scores[random.integer(unit.scores.length)];
      count = unit.scores.length;
    }
    return count > 0 ? { ...oriented[i], value: (sign * sum) / count } : null;
  });
}
