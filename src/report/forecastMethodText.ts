/**
 * The methods appendix's paragraph on what the forecast learned from and how it was checked (a
 * separate function so that the report's page builder only has to call it).
 */
import type { ForecastFile } from "../forecast/forecastFile.js";

/** Plain text (the caller escapes it), or undefined when the forecast used no learned continuation. */
export function learnedForecastText(forecast: ForecastFile): string | undefined {
  const c = forecast.continuation;
  if (c === undefined) return undefined;
  return (
    `Beyond the largest measured size L the forecast does not follow the families' own formulas: each drawn ` +
    `curve, and the expected score, continues from its value at L by ${c.ownWeight.toFixed(3)} × the gain its ` +
    `family's formula forecasts, plus a gain per unit of ln(n / L) of ${c.chordWeight.toFixed(3)} × its average rise per unit of ln n over the measured sizes + ` +
    `${c.slopeWeight.toFixed(3)} × its slope at L + ${c.headroomWeight.toFixed(3)} × the distance left to the ` +
    `metric's best value${c.best === null ? " (unknown for this metric, so left out)" : ""}; each family's ` +
    `extrapolation error is multiplied by ${c.spread}. These numbers were learned by stacked regression from a ` +
    `corpus of learning curves measured by this tool on open data sets (classification and regression, ` +
    `logistic regression, random forest, ridge and nearest neighbours; pilots of 50 to 400 rows; the score ` +
    `measured later on the whole data set at 2 to 16 times the pilot), fitted so that the summed forecast gain ` +
    `matches the summed gain measured later. They were checked leave-one-data-set-out: each data set was ` +
    `forecast with numbers learned from the others only; the project's README gives the figures. Far beyond ` +
    `16 times the pilot the corpus gives no check.`
  );
}
