/**
 * The forecast's continuation beyond the largest measured size, learned from a corpus of measured
 * learning curves (fixtures/forecast-corpus; its README says what they are and how they were
 * measured).
 *
 * Why. Families fitted to a short, noisy pilot curve misjudge the gain still to come: saturating
 * forms (exponential, Weibull, MMF) level off too early far out, the no-gain baseline predicts none,
 * and a family that bends up at a lucky last point over-forecasts (the learning-curve literature
 * reports the same: Mohr, Viering, Loog and van Rijn 2022, "LCDB 1.0"; Viering and Loog 2022, "The
 * shape of learning curves: a review"). On the corpus, the gain the families' weighted fit forecasts
 * from the largest measured size L was 0.7 of the gain measured later.
 *
 * What. Beyond L a draw (and the point forecast) continues from its family's value at L by
 *
 *     gain(n) = o · (m(n) − m(L)) + (c · chord + s · λ · slope + h · (1 − λ) · q · (best − m(L))) · ln(n / L)
 *
 * where m(n) − m(L) is the gain its family's own formula forecasts, chord = (m(L) − m(n₁)) / ln(L / n₁)
 * its average rise per unit of ln n over the measured range (n₁ the smallest measured size), slope
 * its rise per unit of ln n at L, and best − m(L) the distance left to the metric's best value
 * (accuracy 1, R² 1, an error 0), counted by q = 1 − 1/K for a curve of K classes (the error of a
 * guess among K equally likely classes; 1/2 for any other curve, as for two classes; see
 * `guessError`), and λ = L / (L + r) the slope's reliability, which grows with the pilot (see
 * `reliabilityOf`). The weights are a stacked regression (Wolpert 1992, "Stacked
 * generalization"; Breiman 1996, "Stacked regressions") fitted to the corpus's classification
 * curves by weighted least squares (each data set weighing the same), constrained so that the
 * summed forecast gain equals the summed gain measured later (calibration in the large: a least
 * squares fit alone shrinks the gain, because a pilot whose last sizes happened to score high also
 * shows a steep end). Two terms widen the draws so that the 80% intervals hold about 80% of the later
 * scores: `spread` multiplies every family's extrapolation error, which shrinks as the pilot grows,
 * and `gainSpread` is the learned gain's own error (a data set's curve goes on rising faster or
 * slower than the corpus taught), which does not shrink with the pilot, so that large pilots do not
 * get intervals too narrow for it. scripts/forecast-corpus/calibrate.ts learns them and compares the
 * variants leave-one-data-set-out; the one shipped keeps the slope at L and the distance left
 * (o = c = 0): the family's own gain and the chord did not lower the error further.
 *
 * The weights and the spread are learned once per learner the corpus measured (logistic regression
 * and random forest: their curves differ in shape, the forest's keeping its slope longer, and one
 * spread for both left one learner's intervals too wide and the other's too narrow), and once from
 * every classification curve of the corpus, for any other learner and for `--trainer`.
 *
 * A family chosen with `--family` is used as it extrapolates, without this continuation.
 */
import { corpusCalibration } from "./corpusCalibration.js";

export interface GainCalibration {
  /** o: weight of the family's own gain m(n) − m(L). */
  ownWeight: number;
  /** c: weight of the chord (the measured rise per unit of ln n). */
  chordWeight: number;
  /** s: weight of the family's own slope per unit of ln n at the largest measured size. */
  slopeWeight: number;
  /** h: share of the distance left to the best value gained per unit of ln n. */
  headroomWeight: number;
  /** Multiplier of every family's extrapolation error τ. */
  spread: number;
  /**
   * Standard deviation of the learned gain's own error, per unit of ln(n / L): each draw's
   * continuation is off by this times one standard normal (see `drawCurves`).
   */
  gainSpread: number;
  /**
   * r, in rows (the forecast restates a curve measured in whole runs in rows first): the slope's
   * weight is multiplied by λ = L / (L + r) and the distance left's by 1 − λ, L the largest measured
   * size (see `reliabilityOf`); null: both whole.
   */
  reliabilitySize: number | null;
  /** The learner whose corpus curves these were learned from; absent: every classification curve. */
  learner?: string;
}

/** The continuations learned from the corpus: one per learner it measured, one from all its curves. */
export interface CalibrationSet {
  /** Learned from the classification curves of every learner: for a learner the corpus lacks. */
  pooled: GainCalibration;
  /** Learned from one learner's curves, by the learner's name (curve.json's `learner`). */
  byLearner: Record<string, GainCalibration>;
}

/** The calibration for a curve of `learner`: its own when the corpus measured it, else the pooled one. */
export function calibrationFor(set: CalibrationSet, learner: string | undefined): GainCalibration {
  return (
    (learner !== undefined && Object.hasOwn(set.byLearner, learner) ? set.byLearner[learner] : undefined) ?? set.pooled
  );
}

/**
 * q, the factor of the distance left in the continuation: 1 − 1/K for a curve of K ≥ 2 classes, 1/2
 * for any other curve (a numeric target, or classes not recorded).
 *
 * Why. On the corpus, the share of the distance left that more data wins back differs with the
 * number of classes: with two classes much of a pilot's distance left is class overlap that no
 * amount of data removes (fair, birthwt, credit), while with many classes more of it is classes seen
 * too rarely at the pilot's size (vowel, letter, segment). Counting the distance by 1 − 1/K lowered
 * the leave-one-data-set-out error of both learners (README, "How far the forecast can be trusted"),
 * and it did so in 71% (logistic) and 88% (random forest) of 200 random halvings of the data sets
 * into those learned from and those forecast. It is an empirical factor, not a law: a two-class
 * problem without overlap is under-forecast by it. Numeric targets take the two-class value, so the
 * R² forecasts (out of the corpus's sample) keep the distance term they had when it was unscaled;
 * with 1 they over-forecast the gain further (mean error on the R² check 14.2 points, against 13.0
 * with 1/2).
 */
export function guessError(curve: { task?: string; classNames?: readonly string[] }): number {
  const classes = curve.classNames?.length ?? 0;
  return curve.task !== "regression" && classes >= 2 ? 1 - 1 / classes : 0.5;
}

/** A draw's continuation beyond the largest measured size (see the file comment). */
export interface Continuation {
  ownWeight: number;
  chordWeight: number;
  slopeWeight: number;
  headroomWeight: number;
  /** Standard deviation of the learned gain's error per unit of ln(n / L) ({@link GainCalibration}). */
  gainSpread: number;
  /** n₁: the smallest measured size. */
  smallestSize: number;
  /** The metric's best value in oriented units; null when unknown (the distance term is then left out). */
  best: number | null;
  /** q: the factor of the distance left (`guessError`). */
  guessError: number;
  /**
   * r of `reliabilityOf`; null in forecast.json files written before it, whose continuation took the
   * slope and the distance left whole.
   */
  reliabilitySize: number | null;
}

/** The numbers of a continuation that a calibration (or forecast.json's `continuation`) carries. */
export type ContinuationWeights = Pick<
  GainCalibration,
  "ownWeight" | "chordWeight" | "slopeWeight" | "headroomWeight" | "gainSpread" | "reliabilitySize"
>;

/**
 * The continuation of one curve: the learned numbers, its smallest measured size n₁, its metric's
 * best value in oriented units (null when unknown) and the factor of its distance left
 * (`guessError`).
 */
export function continuationFor(
  weights: ContinuationWeights,
  smallestSize: number,
  best: number | null,
  guessError: number,
): Continuation {
  const { ownWeight, chordWeight, slopeWeight, headroomWeight, gainSpread, reliabilitySize } = weights;
  return {
    ownWeight,
    chordWeight,
    slopeWeight,
    headroomWeight,
    gainSpread,
    smallestSize,
    best,
    guessError,
    reliabilitySize,
  };
}

/** The calibrations shipped with headroom (learned from the whole corpus). */
export const shippedCalibrations: CalibrationSet = corpusCalibration;

/**
 * λ = L / (L + r), the share of its weight that the slope at L gets in the continuation (the
 * distance left gets 1 − λ of its own); 1 when r is null (forecast.json files written before it,
 * which took both terms whole, the distance left too: the weights in them were learned so).
 *
 * Why. The slope of a pilot's curve at L is an estimate whose sampling error falls as the pilot
 * grows (its variance about as 1/L: the pilot's rows, not the repeats, make it noisy), so a least
 * squares fit that gives it one weight for every pilot size shrinks it by the noise of the smallest
 * pilots (regression dilution). On the corpus the random forest's slope weight, learned separately
 * for each pilot size, rose from 0.16 at 50 rows to 1.0 at 800 while the distance left's fell from
 * 0.19 to 0; logistic regression's did the same more slowly. λ is the reliability ratio
 * τ² / (τ² + σ²/L) of a measured slope whose sampling variance is σ²/L, τ² the variance of the true
 * slopes across data sets, so r = σ²/τ² (the classical errors-in-variables correction, as in Fuller
 * 1987, "Measurement error models"); 1 − λ gives the rest to the distance left, the prior the slope
 * is shrunk toward. r is learned with the weights (scripts/forecast-corpus/calibrate.ts: of a grid,
 * the value whose weighted least squares fits of both learners' curves leave the least squared
 * error). It is in rows, as the corpus's curves are: `forecastCurve` restates a curve measured in
 * whole runs in rows (`sizesInRows`) before this applies. A CSV curve's sizes are taken as rows.
 */
export function reliabilityOf(reliabilitySize: number | null, largestMeasured: number): number {
  return reliabilitySize === null ? 1 : largestMeasured / (largestMeasured + reliabilitySize);
}

/** The share of its weight the distance left gets: 1 − λ, or 1 when r is null (`reliabilityOf`). */
export function distanceLeftShare(reliabilitySize: number | null, largestMeasured: number): number {
  return reliabilitySize === null ? 1 : 1 - reliabilityOf(reliabilitySize, largestMeasured);
}

/** Step in ln n of the central difference that gives a family's slope at L. */
const slopeStep = 0.01;

/**
 * The learned gain of a curve from the largest measured size L to n: `model(n)` is the family's
 * value at size n.
 */
export function continuedGain(
  continuation: Continuation,
  model: (trainingSize: number) => number,
  largestMeasured: number,
  trainingSize: number,
): number {
  const atLargest = model(largestMeasured);
  const atSmallest = model(continuation.smallestSize);
  const slope =
    (model(largestMeasured * Math.exp(slopeStep)) - model(largestMeasured * Math.exp(-slopeStep))) / (2 * slopeStep);
  const chord =
    largestMeasured > continuation.smallestSize
      ? (atLargest - atSmallest) / Math.log(largestMeasured / continuation.smallestSize)
      : 0;
  const left = continuation.best === null ? 0 : continuation.guessError * Math.max(0, continuation.best - atLargest);
  const slopeShare = reliabilityOf(continuation.reliabilitySize, largestMeasured);
  const leftShare = distanceLeftShare(continuation.reliabilitySize, largestMeasured);
  return (
    continuation.ownWeight * (model(trainingSize) - atLargest) +
    (continuation.chordWeight * chord +
      continuation.slopeWeight * slopeShare * slope +
      continuation.headroomWeight * leftShare * left) *
      Math.log(trainingSize / largestMeasured)
  );
}
