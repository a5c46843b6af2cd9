/**
 * Draws of the learning curve: plausible curves whose spread at each size is the forecast's
 * uncertainty. Draw j is one curve, evaluated at every projected size, so differences between sizes
 * can be taken draw by draw.
 *
 * Draw j:
 * 1. takes a family: draws are shared out among the families in proportion to their weights
 *    (largest remainder), interleaved so that any prefix of the draws keeps the proportions. The
 *    mixture of families is Bayesian model averaging's predictive distribution with the backtest
 *    weights standing in for posterior model probabilities (Hoeting, Madigan, Raftery and Volinsky
 *    1999, "Bayesian model averaging: a tutorial");
 * 2. resamples whole repeats with replacement, the same repeats at every size (individual scores at a
 *    size with no repeat structure), recomputes the means and refits that family from its point
 *    fit's parameters (then from its usual starts; a draw whose refit fails both ways is dropped):
 *    the bootstrap of Efron and Tibshirani (1993) over the noise between splits;
 * 3. adds one normal shift shared by every size, for which samples were collected
 *    (`sampleShift`, Nadeau and Bengio 2003);
 * 4. adds the family's extrapolation error, τ · sqrt(ln(n / largest measured size)) times one
 *    standard normal shared by every size beyond the largest measured one (`assessFamilies`);
 * 5. carries the continuation learned from the corpus of measured curves (`gainCorrection.ts`):
 *    beyond the largest measured size L the draw continues from its value at L by the learned gain
 *    instead of its family's formula (none with `--family`), off by the learned gain's own error:
 *    the continuation's `gainSpread` times one standard normal, per unit of ln(n / L).
 *
 * Deterministic for a seed: draw j uses the stream `StreamPurpose.curveDraw` (j) for its repeats and normals.
 */
import { FitError } from "../errors.js";
import { message } from "../messages.js";
import {
  fitCurveFamily,
  orientedRange,
  type CurveFamily,
  type FamilyFit,
  type OrientedPoint,
} from "../fit/families.js";
import { StreamPurpose, streamFor } from "../random.js";
import type { AssessedFamily } from "./backtest.js";
import type { MeasuredCurve } from "./measuredCurve.js";
import { continuedGain, type Continuation } from "./gainCorrection.js";
import { repeatLabels, resampledPoints } from "./resampling.js";

/** One drawn curve in oriented units. */
export interface DrawnCurve {
  family: CurveFamily;
  parameters: number[];
  /** The shared shift for which samples were collected. */
  shift: number;
  /** τ times a standard normal: the extrapolation error at ln(n / largest measured size) = 1. */
  extrapolation: number;
  /** The learned continuation beyond the largest measured size, or null for the family's own ({@link drawnValue}). */
  continuation: Continuation | null;
  /** The learned gain's error per unit of ln(n / L): gainSpread times a standard normal (0 without a continuation). */
  gainError: number;
}

export interface DrawnCurves {
  curves: DrawnCurve[];
  requested: number;
  /** Refits that failed from the point fit's parameters and succeeded from the family's starts. */
  retried: number;
  dropped: number;
}

/** Steps 1–4 of the file comment. @throws FitError when every refit fails. */
export function drawCurves(
  measured: MeasuredCurve,
  families: readonly AssessedFamily[],
  shiftStandardDeviation: number,
  options: { seed: number; draws: number },
  continuation: Continuation | null,
): DrawnCurves {
  const { orientation } = measured;
  const assignment = shareDraws(
    families.map((f) => f.weight),
    options.draws,
  );
  const labels = repeatLabels(measured);
  const result: DrawnCurves = { curves: [], requested: options.draws, retried: 0, dropped: 0 };
  for (let j = 0; j < options.draws; j++) {
    const assessed = families[assignment[j]];
    const random = streamFor(options.seed, StreamPurpose.curveDraw, j);
    // A size none of whose repeats was drawn sits this refit out.
    const resampled = resampledPoints(measured, labels, random).filter((p): p is OrientedPoint => p !== null);
    const shift = shiftStandardDeviation * random.normal();
    const extrapolation = assessed.extrapolationError * random.normal();
    // Drawn after the draws above, so that they are the same with or without a continuation.
    const gainError = (continuation?.gainSpread ?? 0) * random.normal();
    const refit = refitFamily(assessed.family, resampled, orientation, assessed.fit, result);
    if (refit === null) {
      result.dropped++;
      continue;
    }
    result.curves.push({
      family: assessed.family,
      parameters: refit.parameters,
      shift,
      extrapolation,
      continuation,
      gainError,
    });
  }
  if (result.curves.length === 0) {
    throw new FitError(message.noRefitSucceeded(options.draws));
  }
  return result;
}

/**
 * A draw's oriented value at size n, clamped to the oriented range when there is one. Up to the
 * largest measured size L: the family's value m(n) plus the shift. Beyond it, with d = ln(n / L):
 * the family's value m(n), or with a continuation m(L) + the learned gain (`continuedGain`) + the
 * gain's error `gainError · d`, plus
 * the shift and `extrapolation · sqrt(d)`. The one function that evaluates a draw (the point
 * forecast is a draw with no shift or extrapolation error).
 */
export function drawnValue(
  curve: DrawnCurve,
  trainingSize: number,
  largestMeasured: number,
  range?: [number, number],
): number {
  let value: number;
  let distance = 0;
  if (trainingSize > largestMeasured) {
    distance = Math.sqrt(Math.log(trainingSize / largestMeasured));
    const { family, parameters, continuation } = curve;
    if (continuation === null) value = family.model(trainingSize, parameters);
    else {
      const model = (size: number): number => family.model(size, parameters);
      value =
        model(largestMeasured) +
        continuedGain(continuation, model, largestMeasured, trainingSize) +
        curve.gainError * Math.log(trainingSize / largestMeasured);
    }
  } else value = curve.family.model(trainingSize, curve.parameters);
  value += curve.shift + curve.extrapolation * distance;
  return range === undefined ? value : Math.min(range[1], Math.max(range[0], value));
}

/** The oriented range of a measured curve (for `drawnValue`). */
export function measuredRange(measured: MeasuredCurve): [number, number] | undefined {
  return orientedRange(measured.orientation);
}

function refitFamily(
  family: CurveFamily,
  points: readonly OrientedPoint[],
  orientation: MeasuredCurve["orientation"],
  pointFit: FamilyFit,
  result: DrawnCurves,
): FamilyFit | null {
  if (points.length < family.parameterNames.length) return null;
  try {
    return fitCurveFamily(family, points, orientation, { startsOnly: [pointFit.parameters] });
  } catch (error) {
    if (!(error instanceof FitError)) throw error;
  }
  try {
    const refit = fitCurveFamily(family, points, orientation);
    result.retried++;
    return refit;
  } catch (error) {
    if (!(error instanceof FitError)) throw error;
    return null;
  }
}

/**
 * Family index of each draw: counts by the largest-remainder method, interleaved by always giving
 * the next draw to the family furthest behind its share (so every prefix keeps the proportions).
 */
export function shareDraws(weights: readonly number[], draws: number): number[] {
  const exact = weights.map((w) => w * draws);
  const counts = exact.map(Math.floor);
  let missing = draws - counts.reduce((s, v) => s + v, 0);
  const byRemainder = exact
    .map((e, k) => ({ k, remainder: e - Math.floor(e) }))
    .sort((p, q) => q.remainder - p.remainder || p.k - q.k);
  for (const { k } of byRemainder) {
    if (missing <= 0) break;
    counts[k]++;
    missing--;
  }
  const given = counts.map(() => 0);
  const assignment: number[] = [];
  for (let j = 0; j < draws; j++) {
    let best = -1;
    let bestDeficit = -Infinity;
    counts.forEach((count, k) => {
      if (given[k] >= count) return;
      const deficit = (count * (j + 1)) / draws - given[k];
      if (deficit > bestDeficit) {
        bestDeficit = deficit;
        best = k;
      }
    });
    given[best]++;
    assignment.push(best);
  }
  return assignment;
}
