/**
 * The report's charts: each a Vega-Lite spec built by a pure function (one file each), and
 * `reportCharts`, which picks the charts a report's input supports, in the order the page shows them:
 *
 * 1. `learningCurveChart`: the measured curve, the fitted curve with its band, the sizes further runs
 *    reach, the target;
 * 2. `scoreChart`: expected score and chance of the target against further runs (needs a decision);
 * 3. `netValueChart`: expected net value against further runs, with cost and value sliders (needs a
 *    decision);
 * 4. `backtestChart`: how well earlier points predicted later ones (needs the forecast's backtest);
 * 5. `sensitivityChart`: the tornado of the decision's sensitivity analysis (needs it).
 *
 * Each chart comes with its text alternatives: the spec's `description` (shown as the figure's
 * caption and announced by screen readers) and a table of the numbers it draws.
 */
import type { TopLevelSpec } from "vega-lite";
import type { ForecastFile } from "../forecast/forecastFile.js";
import type { DecisionFile, DecisionRow } from "../weigh/decisionFile.js";
import { backtestChart, familyLabel, type BacktestInput } from "./backtestChart.js";
import type { ChartOptions } from "./chartOptions.js";
import {
  describeMetric,
  formatChance,
  formatCount,
  capitalize,
  likelyRange,
  formatMoney,
  formatScore,
  scoreStyle,
  type MetricInfo,
} from "../format.js";
import { learningCurveChart } from "./learningCurveChart.js";
import { netValueChart } from "./netValueChart.js";
import type { ReportInput } from "./reportInput.js";
import { scoreChart, type SingleModelInterval } from "./scoreChart.js";
import { factorInWords, sensitivityChart, type SensitivityFactor } from "./sensitivityChart.js";

export { backtestChart, backtestErrors, type BacktestInput } from "./backtestChart.js";
export { vegaLiteSchema, type ChartOptions } from "./chartOptions.js";
export { learningCurveChart } from "./learningCurveChart.js";
export { netValueChart, sliderStep, whatIfParameters } from "./netValueChart.js";
export { scoreChart, type SingleModelInterval } from "./scoreChart.js";
export { factorInWords, sensitivityChart, type SensitivityFactor } from "./sensitivityChart.js";

/** The numbers a chart draws, as a table for readers who cannot see it. Cells are plain text. */
export interface ChartTable {
  caption: string;
  columns: string[];
  rows: string[][];
}

/** One chart of the report. */
export interface ReportChart {
  /** Element id in the page ("chart-learning-curve"), also the stem of its SVG and PNG files. */
  id: string;
  spec: TopLevelSpec;
  /** The chart's title, its accessible name. */
  title: string;
  /** The text alternative (the spec's description). */
  description: string;
  table: ChartTable;
}

/** The text of a spec's title, whether given as a string, lines or `{ text }`. */
function titleText(spec: TopLevelSpec): string {
  const title = spec.title;
  const text = typeof title === "object" && title !== null && !Array.isArray(title) ? title.text : title;
  return Array.isArray(text) ? text.join(" ") : typeof text === "string" ? text : "";
}

/** The assumptions whose ±25% change moves the recommendation away from the decision's. */
export function adviceChanges(factors: readonly SensitivityFactor[], decision: DecisionFile): SensitivityFactor[] {
  return factors.filter((f) =>
    [f.low, f.high].some((outcome) => outcome !== null && outcome.recommendedRuns !== decision.recommendedRuns),
  );
}

/** decision.json's sensitivity analysis, when the file carries one. */
export function sensitivityOf(decision: DecisionFile): SensitivityFactor[] | undefined {
  const sensitivity = decision.sensitivity;
  return Array.isArray(sensitivity) && sensitivity.length > 0 ? sensitivity : undefined;
}

/** The forecast's wider single-model interval at its projected sizes, when forecast.json carries it. */
export function singleModelOf(forecast: ForecastFile): SingleModelInterval | undefined {
  if (forecast.testSize === undefined) return undefined;
  const bounds = forecast.projections.flatMap((p) =>
    p.singleModelLower !== undefined && p.singleModelUpper !== undefined
      ? [{ trainingSize: p.trainingSize, lower: p.singleModelLower, upper: p.singleModelUpper }]
      : [],
  );
  return bounds.length > 0 ? { testSize: forecast.testSize, bounds } : undefined;
}

/** The forecast's backtest in the chart's terms, when forecast.json carries one. */
export function backtestOf(forecast: ForecastFile): BacktestInput | undefined {
  const predictions = forecast.backtest?.predictions;
  if (!Array.isArray(predictions) || predictions.length === 0) return undefined;
  return {
    metric: forecast.metric,
    higherIsBetter: forecast.higherIsBetter,
    metricRange: forecast.metricRange,
    predictions,
    familyWeights: forecast.familyWeights,
    rootMeanSquareError: forecast.backtest?.rootMeanSquareError,
  };
}

/**
 * The charts a report's input supports, in page order, each with its id, spec, text alternative and
 * table. Pure.
 */
export function reportCharts(input: ReportInput): ReportChart[] {
  const { curve, forecast, decision } = input;
  const metricRange = forecast.metricRange ?? curve.metricRange;
  const options: ChartOptions = { currency: input.currency, metricRange };
  const info = describeMetric(forecast.metric, forecast.higherIsBetter, metricRange);
  const charts: ReportChart[] = [];
  const add = (id: string, spec: TopLevelSpec, table: ChartTable) =>
    charts.push({ id, spec, title: titleText(spec), description: spec.description ?? "", table });

  add(
    "chart-learning-curve",
    learningCurveChart(curve, forecast, decision, options),
    learningCurveTable(forecast, info),
  );
  if (decision && decision.table.length > 0) {
    add("chart-score", scoreChart(decision, options, singleModelOf(forecast)), scoreTable(decision, info));
    add("chart-net-value", netValueChart(decision, options), netValueTable(decision, input.currency));
  }
  const backtest = backtestOf(forecast);
  if (backtest) add("chart-backtest", backtestChart(backtest, options), backtestTable(backtest, info));
  const sensitivity = decision ? sensitivityOf(decision) : undefined;
  // A chart of bars that all say "no change" shows nothing: the page says so in a sentence instead.
  if (decision && sensitivity && adviceChanges(sensitivity, decision).length > 0) {
    add(
      "chart-sensitivity",
      sensitivityChart(sensitivity, decision, options),
      sensitivityTable(sensitivity, input.currency),
    );
  }
  return charts;
}

// ---------------------------------------------------------------------------------------------------
// The tables behind the charts

function sortedRows(decision: DecisionFile): DecisionRow[] {
  return [...decision.table].sort((a, b) => a.runs - b.runs);
}

function learningCurveTable(forecast: ForecastFile, info: MetricInfo): ChartTable {
  const style = scoreStyle(info, [
    ...forecast.measured.map((m) => m.mean),
    ...forecast.projections.map((p) => p.expected),
  ]);
  const score = (value: number) => formatScore(value, style);
  const level = likelyRange(forecast.level);
  return {
    caption: `The learning curve's numbers: mean ${info.inSentence} measured at each training size, and the projection.`,
    columns: ["Training samples", "Kind", info.title, "Range"],
    rows: [
      ...[...forecast.measured]
        .sort((a, b) => a.trainingSize - b.trainingSize)
        .map((m) => [
          formatCount(m.trainingSize),
          `measured, mean of ${m.fits} fits`,
          score(m.mean),
          `typical spread: ${score(m.mean - m.standardDeviation)} to ${score(m.mean + m.standardDeviation)}`,
        ]),
      ...[...forecast.projections]
        .filter((p) => p.trainingSize > forecast.largestMeasuredSize)
        .sort((a, b) => a.trainingSize - b.trainingSize)
        .map((p) => [
          formatCount(p.trainingSize),
          "projected",
          score(p.expected),
          `${level}: ${score(p.lower)} to ${score(p.upper)}`,
        ]),
    ],
  };
}

function scoreTable(decision: DecisionFile, info: MetricInfo): ChartTable {
  const rows = sortedRows(decision);
  const style = scoreStyle(
    info,
    rows.flatMap((row) => [row.expected, row.lower, row.upper]),
  );
  const score = (value: number) => formatScore(value, style);
  const hasTarget = decision.plan.target !== undefined;
  return {
    caption: `Expected ${info.inSentence} after each number of further runs.`,
    columns: [
      "Further runs",
      "Training samples",
      `Expected ${info.inSentence}`,
      capitalize(likelyRange(decision.level)),
      ...(hasTarget ? ["Chance of reaching target"] : []),
    ],
    rows: rows.map((row) => [
      formatCount(row.runs),
      formatCount(row.trainingSize),
      score(row.expected),
      `${score(row.lower)} to ${score(row.upper)}`,
      ...(hasTarget
        ? [
            row.probabilityOfTarget === null
              ? "–"
              : formatChance(row.probabilityOfTarget, decision.plan.targetConfidence),
          ]
        : []),
    ]),
  };
}

function netValueTable(decision: DecisionFile, currency: string | undefined): ChartTable {
  const rows = sortedRows(decision);
  const hasInterval = rows.every((row) => row.netValueLower !== undefined && row.netValueUpper !== undefined);
  return {
    caption: "Expected net value of each number of further runs at the plan's cost and value.",
    columns: [
      "Further runs",
      "Cost",
      "Expected net value",
      ...(hasInterval ? [capitalize(likelyRange(decision.level))] : []),
      "Within budget and deadline",
    ],
    rows: rows.map((row) => [
      formatCount(row.runs),
      formatMoney(row.cost, currency),
      formatMoney(row.expectedNetValue, currency),
      ...(hasInterval
        ? [`${formatMoney(row.netValueLower!, currency)} to ${formatMoney(row.netValueUpper!, currency)}`]
        : []),
      row.affordable ? "yes" : "no",
    ]),
  };
}

function backtestTable(backtest: BacktestInput, info: MetricInfo): ChartTable {
  const style = scoreStyle(info, [...backtest.predictions.map((p) => p.predicted)]);
  const score = (value: number) => formatScore(value, style);
  return {
    caption: "Backtest: each family fitted to the smaller sizes, predicting the larger ones.",
    columns: ["Family", "Fitted up to", "Training samples", "Predicted", "Measured"],
    rows: backtest.predictions.map((p) => [
      familyLabel(p.family),
      formatCount(p.fittedUpTo),
      formatCount(p.trainingSize),
      score(p.predicted),
      score(p.measured),
    ]),
  };
}

function sensitivityTable(factors: readonly SensitivityFactor[], currency: string | undefined): ChartTable {
  const runs = (outcome: SensitivityFactor["low"]) => (outcome === null ? "–" : formatCount(outcome.recommendedRuns));
  const money = (outcome: SensitivityFactor["low"]) =>
    outcome === null ? "–" : formatMoney(outcome.netValue, currency);
  return {
    caption: "Sensitivity: the recommendation with each assumption set lower and higher, one at a time.",
    columns: ["Assumption", "Lower: runs", "Lower: net value", "Higher: runs", "Higher: net value", "Note"],
    rows: factors.map((f) => [
      factorInWords(f.factor),
      runs(f.low),
      money(f.low),
      runs(f.high),
      money(f.high),
      f.note ?? "",
    ]),
  };
}
