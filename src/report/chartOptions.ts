/**
 * What the report's charts share: the schema they follow, their options and the one resolver of
 * those options, score and money axis formats, and the labels of run counts.
 *
 * Every chart is a plain Vega-Lite spec typed against vega-lite's own `TopLevelSpec`, built by a pure
 * function with its data inlined as `values`.
 */
import type { TopLevelSpec } from "vega-lite";
import type { MetricInfo } from "../format.js";
import { chartSize } from "./theme.js";

/** The Vega-Lite schema the specs follow (vega-lite 6). */
export const vegaLiteSchema = "https://vega.github.io/schema/vega-lite/v6.json";

/** One layer of a layered spec, as vega-lite types it. */
export type Layer = Extract<TopLevelSpec, { layer: unknown }>["layer"][number];
/** One panel of a vertically concatenated spec. */
export type Panel = Extract<TopLevelSpec, { vconcat: unknown }>["vconcat"][number];

export interface ChartOptions {
  /**
   * Width of the plotting area in pixels.
   * @default 640
   */
  width?: number;
  /**
   * Height of the learning-curve plot in pixels (panels of the other charts are about half).
   * @default 360
   */
  height?: number;
  /** Currency of costs and values ("EUR"), shown in axis titles, controls and tooltips. */
  currency?: string;
  /**
   * Lowest and highest possible score, for the charts drawn from decision.json (which does not carry
   * it); the learning-curve chart reads it from the forecast or curve. [0, 1] shows scores as percent.
   */
  metricRange?: [number, number];
}

export interface ResolvedChartOptions {
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
export function axisFormat(info: MetricInfo, values: readonly number[]): string | undefined {
  if (!info.isFraction) return undefined;
  const finite = values.filter(Number.isFinite);
  const spread = finite.length > 0 ? Math.max(...finite) - Math.min(...finite) : 1;
  return spread < 0.05 ? ".1%" : ".0%";
}

/** The d3 format of a score in a tooltip: percent with one decimal, or `decimals` plain decimals. */
export function tooltipScoreFormat(info: MetricInfo, decimals: number): string {
  return info.isFraction ? ".1%" : `.${decimals}f`;
}

/** "+1 run", "+2 runs": the label of a size reached after further runs. */
export function runsLabel(runs: number): string {
  return `+${runs} ${runs === 1 ? "run" : "runs"}`;
}

/** "Now", "+1", "+2": the short step labels of the x axis "Further runs". */
export function stepLabel(runs: number): string {
  return runs === 0 ? "Now" : `+${runs}`;
}

/**
 * The unit in which an axis of money shows its ticks: plain units below 10,000, thousands up to
 * 10 million, millions beyond, chosen once from the largest magnitude the chart shows so that
 * every tick of one axis uses the same unit ("−20", "−10", "0" thousand EUR, never "−1e+4").
 */
export interface MoneyUnit {
  /** Amounts are divided by this before they are printed. */
  divisor: 1 | 1_000 | 1_000_000;
  /** The unit's word for the axis title: "", "thousand", "million". */
  word: "" | "thousand" | "million";
}

/** Picks the money unit for amounts up to `values`' largest magnitude (see `MoneyUnit`). */
export function moneyUnit(values: readonly number[]): MoneyUnit {
  const largest = Math.max(0, ...values.filter(Number.isFinite).map(Math.abs));
  if (largest >= 10_000_000) return { divisor: 1_000_000, word: "million" };
  if (largest >= 10_000) return { divisor: 1_000, word: "thousand" };
  return { divisor: 1, word: "" };
}

/**
 * A money axis title with its unit and currency: "Expected net value (thousand EUR)",
 * "Cost (EUR)", "Expected net value (thousands)" without a currency.
 */
export function moneyAxisTitle(base: string, unit: MoneyUnit, currency: string | undefined): string {
  if (currency) return `${base} (${unit.word ? `${unit.word} ` : ""}${currency})`;
  return unit.word ? `${base} (${unit.word}s)` : base;
}

/**
 * The Vega expression that prints a money tick in `unit`: thousands separators, no decimals for
 * whole numbers, at most one otherwise ("2.5" thousand), and a true minus sign (d3-format's default).
 */
export function moneyLabelExpression(unit: MoneyUnit): string {
  return unit.divisor === 1 ? "format(datum.value, ',.0f')" : `format(datum.value / ${unit.divisor}, ',.1~f')`;
}
