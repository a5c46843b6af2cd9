/**
 * The learning-curve chart: what was measured, the curve fitted through it, and where further runs
 * would take it.
 */
import type { CurveFile } from "../curve/curveFile.js";
import { sizesInRows } from "../curve/sizesInRows.js";
import type { ForecastFile } from "../forecast/forecastFile.js";
import type { DecisionFile, DecisionRow } from "../weigh/decisionFile.js";
import type { TopLevelSpec } from "vega-lite";
import {
  axisFormat,
  resolveChartOptions,
  runsLabel,
  tooltipScoreFormat,
  vegaLiteSchema,
  type ChartOptions,
  type Layer,
} from "./chartOptions.js";
import {
  describeMetric,
  formatCount,
  formatExactScore,
  capitalize,
  formatOdds,
  likelyRange,
  formatScore,
  scoreStyle,
  type MetricInfo,
} from "../format.js";
import { chartConfig, palette } from "./theme.js";

/**
 * The rows of the decision table whose sizes are marked on the learning curve: all of them when there
 * are six or fewer further runs, otherwise the first, the recommended, the one reaching the target and
 * the last, so that the labels stay legible.
 */
function markedRows(decision: DecisionFile): DecisionRow[] {
  const further = decision.table.filter((row) => row.runs > 0);
  if (further.length <= 6) return further;
  const wanted = new Set([1, decision.recommendedRuns, decision.runsToTarget ?? 1, further[further.length - 1].runs]);
  return further.filter((row) => wanted.has(row.runs));
}

/**
 * The learning curve: each fit's score as a faint point, the mean per training size as a solid point
 * with ±1 standard deviation error bars, the fitted curve (solid over the measured sizes, dashed
 * beyond) inside its projection band, vertical rules at today's size and at the sizes reached after
 * further runs ("+1 run", ...), and a horizontal rule at the plan's target.
 *
 * The x axis is logarithmic ("Training samples"), as learning curves flatten on a linear scale; the y
 * axis is named after the metric and shows percent when the metric is a fraction in [0, 1].
 *
 * @param curve the measured curve (curve.json)
 * @param forecast the fitted curve and projections (forecast.json)
 * @param decision the weighed runs (decision.json); without it, the rule marks the largest measured size
 * @example
 * const spec = learningCurveChart(curve, forecast, decision, { currency: "EUR" });
 * // spec.title → { text: "Learning curve: accuracy against training samples", subtitle: [...] }
 */
export function learningCurveChart(
  curve: CurveFile,
  forecast: ForecastFile,
  decision?: DecisionFile,
  options: ChartOptions = {},
): TopLevelSpec {
  const resolved = resolveChartOptions(options);
  const info = describeMetric(forecast.metric, forecast.higherIsBetter, forecast.metricRange ?? curve.metricRange);
  const levelText = likelyRange(forecast.level);
  const target = decision?.plan.target;

  // The series of the legend, each named in the `series` field of its layer's data.
  const series = {
    fits: "One trial model",
    measured: "Average, with typical spread",
    curve: "Fitted curve",
    band: capitalize(levelText),
  };

  // Data, one array per layer.
  // A curve counted in whole runs is drawn in samples, the unit its forecast uses.
  const fits = sizesInRows(curve).curve.points.flatMap((point) =>
    point.scores
      .filter(Number.isFinite)
      .map((score) => ({ trainingSize: point.trainingSize, score, series: series.fits })),
  );
  const measured = forecast.measured.map((m) => ({
    series: series.measured,
    trainingSize: m.trainingSize,
    mean: m.mean,
    low: m.mean - m.standardDeviation,
    high: m.mean + m.standardDeviation,
    standardDeviation: m.standardDeviation,
    fits: m.fits,
  }));
  const band = [...forecast.band]
    .sort((a, b) => a.trainingSize - b.trainingSize)
    .map((point) => ({ ...point, series: series.band }));
  const curveLine = band.map((point) => ({ ...point, series: series.curve }));
  const lastFitted = band.reduce(
    (last, point, index) => (point.trainingSize <= forecast.largestMeasuredSize ? index : last),
    0,
  );
  const fittedPart = curveLine.slice(0, lastFitted + 1);
  const projectedPart = curveLine.slice(lastFitted);
  const todaySize = decision ? decision.table.find((row) => row.runs === 0)?.trainingSize : undefined;
  const todayMarkers = [
    todaySize !== undefined
      ? { trainingSize: todaySize, label: "Today" }
      : { trainingSize: forecast.largestMeasuredSize, label: "Largest measured" },
  ];
  const runMarkers = (decision ? markedRows(decision) : []).map((row) => ({
    trainingSize: row.trainingSize,
    label: runsLabel(row.runs),
  }));
  const markers = [...todayMarkers, ...runMarkers];

  const allScores = [
    ...fits.map((f) => f.score),
    ...measured.flatMap((m) => [m.low, m.high]),
    ...band.flatMap((b) => [b.lower, b.upper]),
    ...(target !== undefined ? [target] : []),
  ];
  const format = axisFormat(info, allScores);
  const style = scoreStyle(info, allScores);
  const tooltipFormat = tooltipScoreFormat(info, style.decimals);

  const x = {
    field: "trainingSize",
    type: "quantitative" as const,
    scale: { type: "log" as const, nice: false, padding: 12 },
    axis: { title: "Training samples", format: ",.0f", labelFlush: false, tickCount: 6 },
  };
  const y = (field: string) => ({
    field,
    type: "quantitative" as const,
    scale: { zero: false, nice: true },
    axis: { title: info.title, ...(format ? { format } : {}), tickCount: 6 },
  });
  const color = {
    field: "series",
    type: "nominal" as const,
    scale: {
      domain: [series.fits, series.measured, series.curve, series.band],
      range: [palette.fit, palette.ink, palette.curve, palette.band],
    },
    legend: { title: null, labelLimit: 280 },
  };

  const markerRule = (values: typeof markers, color: string, strokeDash?: number[]): Layer => ({
    data: { values },
    mark: { type: "rule", strokeWidth: 1.25, color, ...(strokeDash ? { strokeDash } : {}) },
    encoding: {
      x: { field: "trainingSize", type: "quantitative" },
      tooltip: [
        { field: "label", type: "nominal", title: "Size marked" },
        { field: "trainingSize", type: "quantitative", title: "Training samples", format: ",.0f" },
      ],
    },
  });

  const layers: Layer[] = [
    {
      data: { values: band },
      mark: { type: "area", aria: false, opacity: 0.28 },
      encoding: { x, y: y("lower"), y2: { field: "upper" }, color: color },
    },
    markerRule(todayMarkers, palette.muted),
    ...(runMarkers.length > 0 ? [markerRule(runMarkers, palette.runs, [4, 3])] : []),
    {
      data: { values: markers },
      // Written upwards from the foot of the plot, clear of the target line and the curve's label.
      mark: { type: "text", aria: false, angle: 270, align: "left", baseline: "bottom", dx: 4, dy: -3, fontSize: 11 },
      encoding: {
        x: { field: "trainingSize", type: "quantitative" },
        y: { value: resolved.height },
        text: { field: "label" },
        color: { value: palette.muted },
      },
    },
    {
      data: { values: fits },
      mark: { type: "circle", size: 22, opacity: 0.35 },
      encoding: {
        x,
        y: y("score"),
        color: color,
        tooltip: [
          { field: "trainingSize", type: "quantitative", title: "Training samples", format: ",.0f" },
          { field: "score", type: "quantitative", title: info.title, format: tooltipFormat },
        ],
      },
    },
    {
      data: { values: fittedPart },
      mark: { type: "line", aria: false, strokeWidth: 2.25 },
      encoding: { x, y: y("expected"), color: color },
    },
    {
      data: { values: projectedPart },
      mark: { type: "line", aria: false, strokeWidth: 2.25, strokeDash: [6, 4] },
      encoding: {
        x,
        y: y("expected"),
        color: color,
      },
    },
    {
      data: { values: measured },
      mark: { type: "rule", aria: false, strokeWidth: 1.5 },
      encoding: { x, y: y("low"), y2: { field: "high" }, color: color },
    },
    {
      data: { values: measured },
      mark: { type: "point", filled: true, size: 55, opacity: 1 },
      encoding: {
        x,
        y: y("mean"),
        color: color,
        tooltip: [
          { field: "trainingSize", type: "quantitative", title: "Training samples", format: ",.0f" },
          { field: "mean", type: "quantitative", title: `Mean ${info.inSentence}`, format: tooltipFormat },
          { field: "standardDeviation", type: "quantitative", title: "Standard deviation", format: tooltipFormat },
          { field: "fits", type: "quantitative", title: "Fits" },
        ],
      },
    },
  ];
  if (target !== undefined) {
    const targetLabel = `Target ${formatExactScore(target, info)}`;
    layers.push(
      {
        data: { values: [{ target, label: targetLabel }] },
        mark: { type: "rule", aria: false, strokeWidth: 1.5, strokeDash: [2, 3], color: palette.target },
        encoding: { y: y("target") },
      },
      {
        data: { values: [{ target, label: targetLabel }] },
        mark: {
          type: "text",
          aria: false,
          align: "left",
          baseline: "bottom",
          dx: 4,
          dy: -3,
          color: palette.target,
          fontSize: 11,
        },
        encoding: { x: { value: 0 }, y: y("target"), text: { field: "label" } },
      },
    );
  }

  return {
    $schema: vegaLiteSchema,
    title: {
      text: `Learning curve: ${info.inSentence} against training samples`,
      subtitle: [
        `Measured by cross-validation up to ${formatCount(forecast.largestMeasuredSize)} samples; ` +
          `dashed: projection with its ${levelText}.`,
      ],
    },
    description: describeLearningCurve(info, forecast, decision),
    width: resolved.width,
    height: resolved.height,
    config: chartConfig,
    layer: layers,
  };
}

/** The text alternative of the learning-curve chart: what a sighted reader takes from it. */
function describeLearningCurve(info: MetricInfo, forecast: ForecastFile, decision?: DecisionFile): string {
  const values = [
    ...forecast.measured.map((m) => m.mean),
    ...forecast.band.flatMap((b) => [b.expected, b.lower, b.upper]),
  ];
  const style = scoreStyle(info, values, true);
  const score = (value: number) => formatScore(value, style);
  const measured = [...forecast.measured].sort((a, b) => a.trainingSize - b.trainingSize);
  const parts: string[] = [];
  if (measured.length > 0) {
    const first = measured[0];
    const last = measured[measured.length - 1];
    parts.push(
      `Learning curve of ${info.inSentence}, measured at ${measured.length} training sizes from ` +
        `${formatCount(first.trainingSize)} to ${formatCount(last.trainingSize)} samples, ` +
        `where the mean ${info.inSentence} went from ${score(first.mean)} to ${score(last.mean)}.`,
    );
  }
  const band = [...forecast.band].sort((a, b) => a.trainingSize - b.trainingSize);
  const end = band[band.length - 1];
  if (end) {
    parts.push(
      `The fitted curve projects ${score(end.expected)} at ${formatCount(end.trainingSize)} samples ` +
        `(likely between ${score(end.lower)} and ${score(end.upper)}, ${formatOdds(forecast.level)}).`,
    );
  }
  if (decision) {
    const marked = markedRows(decision);
    if (marked.length > 0) {
      parts.push(
        `Marked sizes after further runs: ` +
          marked.map((row) => `${runsLabel(row.runs)} at ${formatCount(row.trainingSize)}`).join(", ") +
          ".",
      );
    }
    if (decision.plan.target !== undefined) {
      parts.push(`The target is ${formatExactScore(decision.plan.target, info)}.`);
    }
    const today = decision.table.find((row) => row.runs === 0)?.trainingSize;
    const largest = measured[measured.length - 1]?.trainingSize;
    if (today !== undefined && largest !== undefined && today > largest) {
      parts.push(
        `“Today” marks all ${formatCount(today)} samples in hand; the measured points stop at ` +
          `${formatCount(largest)} because each trial model is trained on part of the data and tested on the rest.`,
      );
    }
  }
  return parts.join(" ");
}
