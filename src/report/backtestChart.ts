/**
 * The backtest chart: how well a curve fitted to the smaller measured sizes predicted the larger
 * sizes measured later, per learning-curve family. It is the evidence behind the family weights and
 * the best available hint of how far to trust the projection.
 */
import type { TopLevelSpec } from "vega-lite";
import type { BacktestPrediction } from "../forecast/forecastFile.js";
import {
  axisFormat,
  resolveChartOptions,
  tooltipScoreFormat,
  vegaLiteSchema,
  type ChartOptions,
  type Panel,
} from "./chartOptions.js";
import { describeMetric, formatCount, formatNumber, formatScore, scoreStyle, type MetricInfo } from "../format.js";
import { chartConfig, okabeIto, palette } from "./theme.js";

/** What the backtest chart shows: the predictions and, when known, each family's weight. */
export interface BacktestInput {
  metric: string;
  higherIsBetter: boolean;
  metricRange?: [number, number];
  predictions: readonly BacktestPrediction[];
  /** Weight of each family in the combined forecast (summing to 1), by family name. */
  familyWeights?: Readonly<Record<string, number>>;
  /**
   * Root mean square prediction error of each family, by name, as the forecast computed it (its
   * weights follow from it); without it the chart shows the mean absolute error of `predictions`.
   */
  rootMeanSquareError?: Readonly<Record<string, number>>;
}

/** Colors of up to eight families, in order of first appearance (Okabe–Ito, black last). */
const familyColors = [
  okabeIto.blue,
  okabeIto.orange,
  okabeIto.bluishGreen,
  okabeIto.reddishPurple,
  okabeIto.vermillion,
  okabeIto.skyBlue,
  okabeIto.yellow,
  palette.ink,
];

/**
 * The learning-curve families in words, beside the codes forecast.json uses (src/fit/families.ts has
 * each formula).
 */
const familyWords: Record<string, string> = {
  pow3: "power law",
  pow4: "power law, shifted",
  mmf4: "Morgan–Mercer–Flodin",
  wbl4: "Weibull",
  exp3: "exponential",
  ilog2: "logarithmic",
  last: "no further gain",
};

/** A family's code with its name in words: "pow3 (power law)"; an unknown code as it is. */
export function familyLabel(code: string): string {
  const words = familyWords[code];
  return words === undefined ? code : `${code} (${words})`;
}

/** The error each family's bar shows, and its name in words. */
interface FamilyErrors {
  kind: "Typical miss" | "Average miss";
  errors: Array<{ family: string; error: number }>;
}

/** The forecast's root mean square errors when given (in the order of the predictions), else the mean absolute errors. */
function familyErrors(input: BacktestInput): FamilyErrors {
  const rmse = input.rootMeanSquareError;
  const computed = backtestErrors(input.predictions);
  if (rmse && computed.every((e) => Number.isFinite(rmse[e.family]))) {
    return {
      kind: "Typical miss",
      errors: computed.map((e) => ({ family: e.family, error: rmse[e.family] })),
    };
  }
  return { kind: "Average miss", errors: computed };
}

/** Mean absolute error of each family's predictions, in the metric's units, in input order. */
export function backtestErrors(
  predictions: readonly BacktestPrediction[],
): Array<{ family: string; error: number; count: number }> {
  const byFamily = new Map<string, { sum: number; count: number }>();
  for (const p of predictions) {
    const entry = byFamily.get(p.family) ?? { sum: 0, count: 0 };
    entry.sum += Math.abs(p.predicted - p.measured);
    entry.count += 1;
    byFamily.set(p.family, entry);
  }
  return [...byFamily].map(([family, { sum, count }]) => ({ family, error: sum / count, count }));
}

/**
 * Two panels:
 * 1. the measured mean score per training size (dark points) and, for each family, what a fit to the
 *    smaller sizes predicted at each larger one (open points, one line per family and cut-off);
 * 2. each family's mean absolute error over those predictions (in percentage points when the metric
 *    is a fraction), labeled with its weight in the combined forecast when known.
 *
 * @example
 * const spec = backtestChart({ metric: "accuracy", higherIsBetter: true, predictions });
 * // spec.vconcat.length → 2
 */
export function backtestChart(input: BacktestInput, options: ChartOptions = {}): TopLevelSpec {
  const resolved = resolveChartOptions(options);
  const info = describeMetric(input.metric, input.higherIsBetter, input.metricRange ?? resolved.metricRange);
  const families = [...new Set(input.predictions.map((p) => familyLabel(p.family)))];
  const color = {
    field: "family",
    type: "nominal" as const,
    scale: { domain: families, range: familyColors.slice(0, Math.max(1, families.length)) },
    legend: { title: "Family", labelLimit: 280 },
  };
  const measuredBySize = new Map(input.predictions.map((p) => [p.trainingSize, p.measured]));
  const measured = [...measuredBySize]
    .sort((a, b) => a[0] - b[0])
    .map(([trainingSize, mean]) => ({ trainingSize, mean }));
  const predictions = input.predictions.map((p) => ({
    ...p,
    family: familyLabel(p.family),
    series: `${p.family} up to ${p.fittedUpTo}`,
    error: p.predicted - p.measured,
  }));
  const scores = [...predictions.map((p) => p.predicted), ...measured.map((m) => m.mean)];
  const format = axisFormat(info, scores);
  const style = scoreStyle(info, scores);
  const tooltipFormat = tooltipScoreFormat(info, style.decimals);
  const x = {
    field: "trainingSize",
    type: "quantitative" as const,
    scale: { type: "log" as const, nice: false, padding: 12 },
    axis: { title: "Training samples", format: ",.0f", tickCount: 6 },
  };
  const y = (field: string) => ({
    field,
    type: "quantitative" as const,
    scale: { zero: false, nice: true },
    axis: { title: info.title, ...(format ? { format } : {}), tickCount: 5 },
  });

  const errorKind = familyErrors(input);
  const errors = errorKind.errors.map((e) => {
    const weight = input.familyWeights?.[e.family];
    return {
      family: familyLabel(e.family),
      error: info.isFraction ? 100 * e.error : e.error,
      label: weight === undefined ? "" : `weight ${formatNumber(100 * weight, 0)}%`,
    };
  });
  const errorUnit = info.isFraction ? "points" : `${info.inSentence} units`;

  const predictionPanel: Panel = {
    title: { text: "Predicted from the smaller sizes, against what was measured", fontSize: 13 },
    width: resolved.width,
    height: resolved.panelHeight + 40,
    layer: [
      {
        data: { values: measured },
        mark: { type: "line", aria: false, color: palette.ink, strokeWidth: 1, opacity: 0.5 },
        encoding: { x, y: y("mean") },
      },
      {
        data: { values: measured },
        mark: { type: "point", filled: true, size: 55, color: palette.ink },
        encoding: {
          x,
          y: y("mean"),
          tooltip: [
            { field: "trainingSize", type: "quantitative", title: "Training samples", format: ",.0f" },
            { field: "mean", type: "quantitative", title: `Measured ${info.inSentence}`, format: tooltipFormat },
          ],
        },
      },
      {
        data: { values: predictions },
        mark: { type: "line", aria: false, strokeWidth: 1.5, strokeDash: [4, 3] },
        encoding: { x, y: y("predicted"), color: color, detail: { field: "series" } },
      },
      {
        data: { values: predictions },
        mark: { type: "point", filled: false, size: 60, strokeWidth: 2 },
        encoding: {
          x,
          y: y("predicted"),
          color: color,
          tooltip: [
            { field: "family", type: "nominal", title: "Family" },
            { field: "fittedUpTo", type: "quantitative", title: "Fitted up to", format: ",.0f" },
            { field: "trainingSize", type: "quantitative", title: "Training samples", format: ",.0f" },
            { field: "predicted", type: "quantitative", title: "Predicted", format: tooltipFormat },
            { field: "measured", type: "quantitative", title: "Measured", format: tooltipFormat },
          ],
        },
      },
    ],
  };
  const errorPanel: Panel = {
    title: { text: `${errorKind.kind} of each family's predictions (${errorUnit})`, fontSize: 13 },
    width: resolved.width,
    height: { step: 26 },
    data: { values: errors },
    encoding: {
      y: { field: "family", type: "nominal", sort: families, axis: { title: null } },
      x: {
        field: "error",
        type: "quantitative",
        axis: { title: `${errorKind.kind} (${errorUnit})`, format: info.isFraction ? ",.1~f" : "~g", tickCount: 5 },
      },
    },
    layer: [
      {
        mark: { type: "bar", height: { band: 0.6 } },
        encoding: {
          color: color,
          tooltip: [
            { field: "family", type: "nominal", title: "Family" },
            {
              field: "error",
              type: "quantitative",
              title: `${errorKind.kind} (${errorUnit})`,
              format: info.isFraction ? ".2f" : ".4~g",
            },
          ],
        },
      },
      {
        mark: { type: "text", aria: false, align: "left", dx: 4, baseline: "middle", color: palette.muted },
        encoding: { text: { field: "label" } },
      },
    ],
  };

  return {
    $schema: vegaLiteSchema,
    title: {
      text: "Backtest: how well earlier points predicted later ones",
      subtitle: ["Each family was fitted to the smaller measured sizes only and extended to the larger ones."],
    },
    description: describeBacktest(input, info),
    config: chartConfig,
    spacing: 28,
    vconcat: [predictionPanel, errorPanel],
  };
}

/** The text alternative of the backtest chart. */
function describeBacktest(input: BacktestInput, info: MetricInfo): string {
  const { kind, errors } = familyErrors(input);
  if (errors.length === 0) return "No backtest was made.";
  const sizes = [...new Set(input.predictions.map((p) => p.trainingSize))].sort((a, b) => a - b);
  const unit = info.isFraction ? " points" : "";
  const errorText = (e: { error: number }) =>
    info.isFraction ? formatNumber(100 * e.error, 1) : formatScore(e.error, scoreStyle(info, [e.error]));
  const best = errors.reduce((a, b) => (b.error < a.error ? b : a));
  return (
    `Backtest of ${errors.length} learning-curve ${errors.length === 1 ? "family" : "families"}: each was fitted to the ` +
    `smaller measured sizes and predicted the held-back sizes from ${formatCount(sizes[0])} to ` +
    `${formatCount(sizes[sizes.length - 1])} samples. ${kind} of each: ` +
    errors.map((e) => `${familyLabel(e.family)} ${errorText(e)}${unit}`).join(", ") +
    `. The smallest is that of ${familyLabel(best.family)}.`
  );
}
