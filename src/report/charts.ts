/**
 * The report's charts as Vega-Lite specs: plain JSON objects typed against vega-lite's own
 * `TopLevelSpec`, with the data inlined as `values`. These functions are pure; drawing and writing
 * files happen elsewhere (the HTML page embeds the specs and vega-embed draws them in the browser).
 *
 * Two charts:
 * - `learningCurveChart`: the measured learning curve, the fitted curve, its projection band, the sizes
 *   further runs would reach, and the target;
 * - `valueChart`: for each number of further runs, the expected net value, the expected score with its
 *   interval, and the chance of reaching the target.
 *
 * Each chart carries a title and a `description`, the text alternative a screen reader announces.
 */
import type { TopLevelSpec } from "vega-lite";
import type { CurveFile } from "../curve/curveFile.js";
import type { ForecastFile } from "../forecast/forecastFile.js";
import type { DecisionFile, DecisionRow } from "../weigh/decisionFile.js";
import {
  describeMetric,
  formatCount,
  formatExactScore,
  formatLevel,
  formatMoney,
  formatProbability,
  formatScore,
  scoreStyle,
  type MetricInfo,
} from "./format.js";
import { chartConfig, chartSize, palette } from "./theme.js";

/** The Vega-Lite schema the specs follow (vega-lite 6). */
export const vegaLiteSchema = "https://vega.github.io/schema/vega-lite/v6.json";

/** One layer of a layered spec, as vega-lite types it. */
type Layer = Extract<TopLevelSpec, { layer: unknown }>["layer"][number];
/** One panel of a vertically concatenated spec. */
type Panel = Extract<TopLevelSpec, { vconcat: unknown }>["vconcat"][number];

export interface ChartOptions {
  /**
   * Width of the plotting area in pixels.
   * @default 640
   */
  width?: number;
  /**
   * Height of the learning-curve plot in pixels (each panel of the value chart is about half).
   * @default 360
   */
  height?: number;
  /** Currency of costs and values ("EUR"), shown in axis titles and tooltips. */
  currency?: string;
  /**
   * Lowest and highest possible score, for `valueChart` (decision.json does not carry it); the
   * learning-curve chart reads it from the forecast or curve. [0, 1] shows scores as percent.
   */
  metricRange?: [number, number];
}

interface ResolvedChartOptions {
  width: number;
  height: number;
  panelHeight: number;
  currency: string | undefined;
  metricRange: [number, number] | undefined;
}

/** Fills in the defaults of `ChartOptions`; the only place they live. */
export function resolveChartOptions(options: ChartOptions = {}): ResolvedChartOptions {
  const width = options.width ?? chartSize.width;
  const height = options.height ?? chartSize.height;
  return {
    width,
    height,
    panelHeight: Math.round((height * chartSize.panelHeight) / chartSize.height),
    currency: options.currency,
    metricRange: options.metricRange,
  };
}

/** The Vega-Lite number format for scores on an axis: percent when the metric is a fraction. */
function axisFormat(info: MetricInfo, values: readonly number[]): string | undefined {
  if (!info.isFraction) return undefined;
  const finite = values.filter(Number.isFinite);
  const spread = finite.length > 0 ? Math.max(...finite) - Math.min(...finite) : 1;
  return spread < 0.05 ? ".1%" : ".0%";
}

/** The labels of the sizes marked on the learning curve: "+1 run", "+2 runs". */
function runsLabel(runs: number): string {
  return `+${runs} ${runs === 1 ? "run" : "runs"}`;
}

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
  const levelText = formatLevel(forecast.level);
  const target = decision?.plan.target;

  // The series of the legend, each named in the `series` field of its layer's data.
  const series = {
    fits: "Each fit",
    measured: "Mean ± 1 sd",
    curve: "Fitted curve",
    band: `${levelText} projection band`,
  };

  // Data, one array per layer.
  const fits = curve.points.flatMap((point) =>
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
  const tooltipFormat = info.isFraction ? ".1%" : `.${style.decimals}f`;

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
  const colour = {
    field: "series",
    type: "nominal" as const,
    scale: {
      domain: [series.fits, series.measured, series.curve, series.band],
      range: [palette.fit, palette.ink, palette.curve, palette.band],
    },
    legend: { title: null },
  };

  const markerRule = (values: typeof markers, color: string, strokeDash?: number[]): Layer => ({
    data: { values },
    mark: { type: "rule", strokeWidth: 1.25, color, ...(strokeDash ? { strokeDash } : {}) },
    encoding: {
      x: { field: "trainingSize", type: "quantitative" },
      tooltip: [
        { field: "label", type: "nominal", title: "Mark" },
        { field: "trainingSize", type: "quantitative", title: "Training samples", format: ",.0f" },
      ],
    },
  });

  const layers: Layer[] = [
    {
      data: { values: band },
      mark: { type: "area", aria: false, opacity: 0.28 },
      encoding: { x, y: y("lower"), y2: { field: "upper" }, color: colour },
    },
    markerRule(todayMarkers, palette.muted),
    ...(runMarkers.length > 0 ? [markerRule(runMarkers, palette.runs, [4, 3])] : []),
    {
      data: { values: markers },
      mark: { type: "text", aria: false, angle: 270, align: "right", baseline: "bottom", dx: -4, dy: -3, fontSize: 11 },
      encoding: {
        x: { field: "trainingSize", type: "quantitative" },
        y: { value: 0 },
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
        color: colour,
        tooltip: [
          { field: "trainingSize", type: "quantitative", title: "Training samples", format: ",.0f" },
          { field: "score", type: "quantitative", title: info.title, format: tooltipFormat },
        ],
      },
    },
    {
      data: { values: fittedPart },
      mark: { type: "line", aria: false, strokeWidth: 2.25 },
      encoding: { x, y: y("expected"), color: colour },
    },
    {
      data: { values: projectedPart },
      mark: { type: "line", aria: false, strokeWidth: 2.25, strokeDash: [6, 4] },
      encoding: {
        x,
        y: y("expected"),
        color: colour,
      },
    },
    {
      data: { values: measured },
      mark: { type: "rule", aria: false, strokeWidth: 1.5 },
      encoding: { x, y: y("low"), y2: { field: "high" }, color: colour },
    },
    {
      data: { values: measured },
      mark: { type: "point", filled: true, size: 55, opacity: 1 },
      encoding: {
        x,
        y: y("mean"),
        color: colour,
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
          `dashed: projection with its ${levelText} band.`,
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
        `(${formatLevel(forecast.level)} band ${score(end.lower)} to ${score(end.upper)}).`,
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
  }
  return parts.join(" ");
}

/**
 * What further runs buy, in two or three panels sharing the x axis "Further runs" (Now, +1, +2, ...):
 * 1. the expected net value of each number of runs as bars, green above zero and vermillion below,
 *    the recommended one outlined, rows over budget faded;
 * 2. the expected score with its interval, and the target as a dotted rule;
 * 3. when the plan has a target, the chance of reaching it, with the required confidence as a rule.
 *
 * @param decision the weighed runs (decision.json)
 * @example
 * const spec = valueChart(decision, { currency: "EUR" });
 * // "vconcat" in spec → true; three panels when decision.plan.target is set
 */
export function valueChart(decision: DecisionFile, options: ChartOptions = {}): TopLevelSpec {
  const resolved = resolveChartOptions(options);
  const info = describeMetric(decision.metric, decision.higherIsBetter, resolved.metricRange);
  const levelText = formatLevel(decision.level);
  const target = decision.plan.target;
  const currencyNote = resolved.currency ? ` (${resolved.currency})` : "";
  const anyOverBudget = decision.table.some((row) => !row.affordable);

  const rows = [...decision.table]
    .sort((a, b) => a.runs - b.runs)
    .map((row) => ({
      ...row,
      step: row.runs === 0 ? "Now" : `+${row.runs}`,
      sign: row.expectedNetValue < 0 ? "loss" : "gain",
      opacity: row.affordable ? 0.9 : 0.35,
      recommended: row.runs === decision.recommendedRuns,
    }));
  const steps = rows.map((row) => row.step);
  const scores = rows.flatMap((row) => [row.expected, row.lower, row.upper, ...(target !== undefined ? [target] : [])]);
  const format = axisFormat(info, scores);
  const style = scoreStyle(info, scores);
  const tooltipFormat = info.isFraction ? ".1%" : `.${style.decimals}f`;

  const x = {
    field: "step",
    type: "ordinal" as const,
    scale: { domain: steps },
    axis: { title: "Further runs", labelAngle: 0 },
  };
  const rowTooltip = [
    { field: "runs", type: "quantitative" as const, title: "Further runs" },
    { field: "trainingSize", type: "quantitative" as const, title: "Training samples", format: ",.0f" },
    { field: "expected", type: "quantitative" as const, title: `Expected ${info.inSentence}`, format: tooltipFormat },
    { field: "cost", type: "quantitative" as const, title: `Cost${currencyNote}`, format: ",.0f" },
    {
      field: "expectedNetValue",
      type: "quantitative" as const,
      title: `Expected net value${currencyNote}`,
      format: ",.0f",
    },
  ];

  const valuePanel: Panel = {
    title: { text: `Expected net value${currencyNote}`, fontSize: 13 },
    width: resolved.width,
    height: resolved.panelHeight,
    data: { values: rows },
    layer: [
      {
        mark: { type: "bar", cornerRadiusEnd: 2 },
        encoding: {
          x,
          y: { field: "expectedNetValue", type: "quantitative", axis: { title: null, format: ",.0f" } },
          color: {
            field: "sign",
            type: "nominal",
            scale: { domain: ["gain", "loss"], range: [palette.gain, palette.loss] },
            legend: null,
          },
          opacity: { field: "opacity", type: "quantitative", scale: null, legend: null },
          tooltip: rowTooltip,
        },
      },
      {
        transform: [{ filter: { field: "recommended", equal: true } }],
        mark: { type: "bar", aria: false, fillOpacity: 0, stroke: palette.ink, strokeWidth: 2 },
        encoding: { x, y: { field: "expectedNetValue", type: "quantitative" } },
      },
      {
        transform: [{ filter: { field: "recommended", equal: true } }],
        mark: { type: "text", aria: false, baseline: "bottom", dy: -4, fontWeight: 600, color: palette.ink },
        encoding: {
          x,
          y: { field: "expectedNetValue", type: "quantitative" },
          text: { value: "Recommended" },
        },
      },
      {
        data: { values: [{ zero: 0 }] },
        mark: { type: "rule", aria: false, color: palette.muted, strokeWidth: 1 },
        encoding: { y: { field: "zero", type: "quantitative" } },
      },
    ],
  };

  const scoreY = (field: string) => ({
    field,
    type: "quantitative" as const,
    scale: { zero: false, nice: true },
    axis: { title: null, ...(format ? { format } : {}), tickCount: 5 },
  });
  const scoreLayers: Layer[] = [
    {
      mark: { type: "rule", aria: false, strokeWidth: 2, color: palette.band },
      encoding: { x, y: scoreY("lower"), y2: { field: "upper" } },
    },
    {
      mark: {
        type: "line",
        strokeWidth: 2,
        color: palette.curve,
        point: { filled: true, size: 50, color: palette.curve },
      },
      encoding: { x, y: scoreY("expected"), tooltip: rowTooltip },
    },
  ];
  if (target !== undefined) {
    scoreLayers.push({
      data: { values: [{ target }] },
      mark: { type: "rule", aria: false, strokeDash: [2, 3], strokeWidth: 1.5, color: palette.target },
      encoding: { y: scoreY("target") },
    });
  }
  const scorePanel: Panel = {
    title: {
      text: `Expected ${info.inSentence} with ${levelText} interval`,
      ...(target !== undefined ? { subtitle: "Dotted: target" } : {}),
      fontSize: 13,
    },
    width: resolved.width,
    height: resolved.panelHeight,
    data: { values: rows },
    layer: scoreLayers,
  };

  const panels: Panel[] = [valuePanel, scorePanel];
  if (target !== undefined) {
    const confidence = decision.plan.targetConfidence;
    panels.push({
      title: {
        text: `Chance of reaching the target of ${formatExactScore(target, info)}`,
        subtitle: `Dotted: the ${formatProbability(confidence)} chance the plan asks for`,
        fontSize: 13,
      },
      width: resolved.width,
      height: resolved.panelHeight,
      data: { values: rows.filter((row) => row.probabilityOfTarget !== null) },
      layer: [
        {
          mark: {
            type: "line",
            strokeWidth: 2,
            color: palette.probability,
            point: { filled: true, size: 50, color: palette.probability },
          },
          encoding: {
            x,
            y: {
              field: "probabilityOfTarget",
              type: "quantitative",
              scale: { domain: [0, 1] },
              axis: { title: null, format: ".0%", tickCount: 5 },
            },
            tooltip: [
              { field: "runs", type: "quantitative", title: "Further runs" },
              { field: "probabilityOfTarget", type: "quantitative", title: "Chance of reaching target", format: ".0%" },
            ],
          },
        },
        {
          data: { values: [{ confidence }] },
          mark: { type: "rule", aria: false, strokeDash: [2, 3], strokeWidth: 1.5, color: palette.muted },
          encoding: { y: { field: "confidence", type: "quantitative" } },
        },
      ],
    });
  }

  return {
    $schema: vegaLiteSchema,
    title: {
      text: "What further runs are expected to buy",
      subtitle: anyOverBudget
        ? ["Outlined: recommended; faded bars: over budget or past the deadline."]
        : ["Outlined: recommended."],
    },
    description: describeValue(decision, info, resolved.currency),
    config: chartConfig,
    spacing: 28,
    vconcat: panels,
  };
}

/** The text alternative of the value chart. */
function describeValue(decision: DecisionFile, info: MetricInfo, currency: string | undefined): string {
  const rows = [...decision.table].sort((a, b) => a.runs - b.runs);
  if (rows.length === 0) return "No further runs were weighed.";
  const style = scoreStyle(
    info,
    rows.flatMap((row) => [row.expected, row.lower, row.upper]),
    true,
  );
  const first = rows[0];
  const last = rows[rows.length - 1];
  const best = rows.reduce((a, b) => (b.expectedNetValue > a.expectedNetValue ? b : a));
  const parts = [
    `Expected net value of 0 to ${last.runs} further runs; it is highest at ${best.runs} ` +
      `(${formatMoney(best.expectedNetValue, currency)}). The recommendation is ${decision.recommendedRuns}.`,
    `Expected ${info.inSentence} goes from ${formatScore(first.expected, style)} now to ` +
      `${formatScore(last.expected, style)} after ${last.runs} runs ` +
      `(${formatLevel(decision.level)} interval ${formatScore(last.lower, style)} to ${formatScore(last.upper, style)}).`,
  ];
  if (decision.plan.target !== undefined && last.probabilityOfTarget !== null) {
    parts.push(
      `The chance of reaching the target of ${formatExactScore(decision.plan.target, info)} is ` +
        `${formatProbability(first.probabilityOfTarget ?? 0)} now and ${formatProbability(last.probabilityOfTarget)} ` +
        `after ${last.runs} runs.`,
    );
  }
  return parts.join(" ");
}
