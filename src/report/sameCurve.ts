/**
 * Whether a forecast was made from a given curve: the report draws both, and a forecast of another
 * curve (another data set, learner or seed) would put a projection beside measurements it did not
 * come from, with nothing on the page to show it.
 */
import type { CurveFile } from "../curve/curveFile.js";
import type { ForecastFile } from "../forecast/forecastFile.js";
import { measuredCurve } from "../forecast/measuredCurve.js";

/**
 * The first difference between what the forecast records of its curve (metric, training sizes, number
 * of fits and mean score at each) and the curve itself, in words; null when there is none. The means
 * may differ by round-off (1e-9 of their size, or of 1): a file written by hand or by another version
 * may have summed them in another order.
 */
export function forecastCurveDifference(curve: CurveFile, forecast: ForecastFile): string | null {
  if (curve.metric !== forecast.metric) return `its metric is ${forecast.metric}, the curve's ${curve.metric}`;
  const summaries = measuredCurve(curve).summaries;
  const sizes = (list: readonly { trainingSize: number }[]) => list.map((s) => s.trainingSize).join(", ");
  if (summaries.length !== forecast.measured.length || sizes(summaries) !== sizes(forecast.measured)) {
    return `it was fitted to training sizes ${sizes(forecast.measured)}, the curve has ${sizes(summaries)}`;
  }
  for (let i = 0; i < summaries.length; i++) {
    const ours = summaries[i];
    const theirs = forecast.measured[i];
    const roundOff = 1e-9 * Math.max(1, Math.abs(ours.mean));
    if (ours.fits !== theirs.fits || !(Math.abs(ours.mean - theirs.mean) <= roundOff)) {
      return `at training size ${ours.trainingSize} it records a mean score of ${theirs.mean} from ${theirs.fits} fits, the curve ${ours.mean} from ${ours.fits}`;
    }
  }
  return null;
}
