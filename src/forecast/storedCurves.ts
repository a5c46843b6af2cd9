/**
 * The forecast's curves as forecast.json stores them, and their evaluation at any training size.
 *
 * A forecast writes its projections at a few sizes, but `weigh` needs the score after any number of
 * runs of any yield. So the file also keeps, compactly, what the projections were computed from: each
 * drawn curve (family by name, parameters in oriented units, shared shift, extrapolation error) and
 * each family's point fit with its weight. Both `forecast` and `weigh` evaluate them through the same
 * functions (`drawnValue` in drawCurves.ts for a drawn curve, `expectedValue` here for the point
 * forecast), so a size the forecast did not project to gets exactly the value it would have had.
 *
 * A stored curve is the drawn curve with its family replaced by the family's name and without its
 * continuation, which every draw shares and the file keeps once (`continuation`); any other field the
 * draw gains travels with it unchanged.
 */
import { bestScore, findMetric } from "../curve/metrics.js";
import { findCurveFamily, orientationSign, orientedRange, type CurveFamily } from "../fit/families.js";
import { drawnValue, type DrawnCurve } from "./drawCurves.js";
import type { ForecastFile, StoredCurve, StoredFit } from "./forecastFile.js";
import { continuationFor, type Continuation } from "./gainCorrection.js";

/** A family's point fit with its weight in the combined forecast, in oriented units. */
export interface WeightedFit {
  family: CurveFamily;
  weight: number;
  parameters: number[];
}

/**
 * The oriented expected score at a size: the weighted mean of the families' point fits, each
 * evaluated as a draw with no shift or extrapolation error (so by the same function as the draws),
 * clamped to the range.
 */
export function expectedValue(
  fits: readonly WeightedFit[],
  trainingSize: number,
  largestMeasured: number,
  continuation: Continuation | null,
  range?: [number, number],
): number {
  const value = fits.reduce(
    (sum, f) =>
      sum +
      f.weight *
        drawnValue(
          { family: f.family, parameters: f.parameters, shift: 0, extrapolation: 0, continuation, gainError: 0 },
          trainingSize,
          largestMeasured,
        ),
    0,
  );
  return range === undefined ? value : Math.min(range[1], Math.max(range[0], value));
}

/**
 * The oriented range a forecast clamps to, and the metric's best value in its own units: the
 * metric's range, or, for a metric without a finite range, up to its best value (R² 1, an error 0).
 */
export function scoreLimits(orientation: { metric: string; higherIsBetter: boolean; metricRange?: [number, number] }): {
  best: number | undefined;
  range: [number, number] | undefined;
} {
  const { metricRange, higherIsBetter } = orientation;
  const metric = findMetric(orientation.metric);
  const best =
    metric !== undefined
      ? bestScore(metric, metricRange)
      : metricRange === undefined
        ? undefined
        : higherIsBetter
          ? metricRange[1]
          : metricRange[0];
  const sign = orientationSign(orientation);
  const range =
    orientedRange(orientation) ?? (best === undefined ? undefined : ([-Infinity, sign * best + 0] as [number, number]));
  return { best, range };
}

/** A drawn curve as stored: its family by name, without the continuation (stored once, beside the curves). */
export function storeCurve(curve: DrawnCurve): StoredCurve {
  const { family, continuation: _continuation, ...rest } = curve;
  return { ...rest, family: family.name, parameters: [...curve.parameters] };
}

export function storeFit(fit: WeightedFit): StoredFit {
  return { family: fit.family.name, weight: fit.weight, parameters: [...fit.parameters] };
}

/** The forecast's curves, evaluated in the metric's own units at any training size. */
export interface ForecastCurves {
  drawCount: number;
  /** Draw j's score at `trainingSize`. */
  drawAt(trainingSize: number, draw: number): number;
  /** The point forecast's expected score at `trainingSize`. */
  expectedAt(trainingSize: number): number;
}

/**
 * The stored curves of a forecast, ready to evaluate; undefined for a forecast file written before
 * forecasts kept their curves (or without them).
 * @throws FitError when a stored family is unknown
 */
export function forecastCurves(forecast: ForecastFile): ForecastCurves | undefined {
  const stored = forecast.curves;
  if (stored === undefined || stored.drawn.length === 0 || stored.fits.length === 0) return undefined;
  const sign = orientationSign(forecast);
  const { range } = scoreLimits(forecast);
  const largest = forecast.largestMeasuredSize;
  const c = forecast.continuation;
  const continuation: Continuation | null =
    c === undefined
      ? null
      : continuationFor(
          { ...c, gainSpread: c.gainSpread ?? 0, reliabilitySize: c.reliabilitySize ?? null },
          c.smallestSize,
          c.best === null ? null : sign * c.best,
          c.guessError ?? 1,
        );
  const drawn: DrawnCurve[] = stored.drawn.map((curve) => ({
    ...curve,
    family: findCurveFamily(curve.family),
    continuation,
    // A file written before the learned gain had its own error stores none.
    gainError: curve.gainError ?? 0,
  }));
  const fits: WeightedFit[] = stored.fits.map((fit) => ({ ...fit, family: findCurveFamily(fit.family) }));
  return {
    drawCount: drawn.length,
    drawAt: (trainingSize, draw) => sign * drawnValue(drawn[draw], trainingSize, largest, range) + 0,
    expectedAt: (trainingSize) => sign * expectedValue(fits, trainingSize, largest, continuation, range) + 0,
  };
}
