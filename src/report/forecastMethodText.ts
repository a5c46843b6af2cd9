/**
 * The methods appendix's paragraph on what the forecast learned from and how it was checked (a
 * separate function so that the report's page builder only has to call it).
 */
import { formatSignificant } from "../format.js";
import type { ForecastFile } from "../forecast/forecastFile.js";
import { distanceLeftShare, reliabilityOf } from "../forecast/gainCorrection.js";

/** Plain text (the caller escapes it), or undefined when the forecast used no learned continuation. */
export function learnedForecastText(forecast: ForecastFile): string | undefined {
  const c = forecast.continuation;
  if (c === undefined) return undefined;
  // The weights as this curve's continuation used them (gainCorrection.ts, `reliabilityOf`).
  const reliabilitySize = c.reliabilitySize ?? null;
  const largest = forecast.largestMeasuredSize;
  const terms = [
    [c.chordWeight, "its average rise per unit of ln n over the measured sizes"],
    [c.slopeWeight * reliabilityOf(reliabilitySize, largest), "its slope at L"],
    [
      c.headroomWeight * distanceLeftShare(reliabilitySize, largest),
      `the distance left to the metric's best value${c.best === null ? " (unknown for this metric, so left out)" : guessText(c.guessError)}`,
    ],
  ] as const;
  const gain =
    terms
      .filter(([weight]) => weight !== 0)
      .map(([weight, what]) => `${weight.toFixed(3)} × ${what}`)
      .join(" + ") || "0";
  const own = c.ownWeight === 0 ? "" : `${c.ownWeight.toFixed(3)} × the gain its family's formula forecasts, plus `;
  return (
    `Beyond the largest measured size L the forecast does not follow the families' own formulas: each drawn ` +
    `curve, and the expected score, continues from its value at L by ${own}a gain per unit of ln(n / L) of ` +
    `${gain}; ${widthText(c.spread, c.gainSpread)}.` +
    `${reliabilityText(c.slopeWeight, c.headroomWeight, reliabilitySize, largest)} These numbers were learned by ` +
    `stacked regression from a ` +
    `corpus of learning curves measured by this tool on open data sets (pilots of 50 to 800 rows; the score ` +
    `measured later on the whole data set at 2 to 16 times the pilot), ${learnedFromText(c.learnedFrom)}, ` +
    `fitted so that the summed forecast gain matches the summed gain measured later. They were checked ` +
    `leave-one-data-set-out: each data set was forecast with numbers learned from the others only; the ` +
    `project's README gives the figures. Far beyond ` +
    `16 times the pilot the corpus gives no check.`
  );
}

/** How the distance left was counted (gainCorrection.ts, `guessError`); empty in earlier files. */
function guessText(guessError: number | undefined): string {
  if (guessError === undefined) return "";
  return (
    ` counted by ${Number(guessError.toFixed(3))} (one minus one over the number of classes, 1/2 when the ` +
    `curve has no classes: on the corpus, more data won back less of the distance left with two classes ` +
    `than with many)`
  );
}

/** How the slope's and the distance left's weights depend on L; empty in earlier files. */
function reliabilityText(
  slopeWeight: number,
  headroomWeight: number,
  reliabilitySize: number | null,
  largest: number,
): string {
  if (reliabilitySize === null) return "";
  const n = formatSignificant;
  return (
    ` These two weights depend on L: the slope counts ${n(slopeWeight)} × L / (L + ${n(reliabilitySize)}) ` +
    `and the distance left ${n(headroomWeight)} × ${n(reliabilitySize)} / (L + ${n(reliabilitySize)}), here ` +
    `with L = ${n(largest)} (a pilot's slope is noisier the smaller the pilot, so the larger the pilot, the ` +
    `more the forecast follows its slope).`
  );
}

/** How the draws are widened beyond L: the families' backtest error and the learned gain's own error. */
function widthText(spread: number, gainSpread: number | undefined): string {
  const backtest =
    spread === 0
      ? "the families' backtest extrapolation errors are left out"
      : `each family's extrapolation error is multiplied by ${spread}`;
  if (gainSpread === undefined || gainSpread === 0) return backtest;
  return (
    `each drawn curve's gain is off by a normal error with a standard deviation of ${gainSpread} per unit ` +
    `of ln(n / L) (what the learned gain missed on the corpus), and ${backtest}`
  );
}

/** Which of the corpus's curves the continuation was learned from. */
function learnedFromText(learner: string | null | undefined): string {
  if (learner === "logistic") return "from its logistic regression curves";
  if (learner === "forest") return "from its random forest curves";
  if (typeof learner === "string") return `from its curves of the learner "${learner}"`;
  // A file written before the continuation was learned per learner does not say.
  if (learner === undefined) return "from its classification curves";
  return (
    "from the classification curves of both learners it holds (logistic regression and random forest), " +
    "as it holds no curves of this learner"
  );
}
