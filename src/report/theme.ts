/**
 * The report's visual identity, defined once: a color-blind-safe palette and the Vega-Lite config
 * every chart shares.
 *
 * The hues are those of Okabe and Ito (2008, "Color Universal Design"), chosen so that the eight
 * colors stay distinguishable under the common forms of color-vision deficiency. Each role in the
 * charts gets one named color, so a reader sees the same meaning in the same color throughout.
 */
import type { Config } from "vega-lite";

/** The Okabe–Ito hues by their usual names. */
export const okabeIto = {
  black: "#000000",
  orange: "#E69F00",
  skyBlue: "#56B4E9",
  bluishGreen: "#009E73",
  yellow: "#F0E442",
  blue: "#0072B2",
  vermillion: "#D55E00",
  reddishPurple: "#CC79A7",
} as const;

/** Colors by role in the charts. */
export const palette = {
  /** Text, measured means and their error bars. */
  ink: "#1f2328",
  /** Secondary text, axis labels, reference rules. */
  muted: "#5c6370",
  /** Grid lines and the zero line. */
  grid: "#e4e6ea",
  /** Single fits, drawn faint. */
  fit: "#7a8290",
  /** The fitted curve and the expected score. */
  curve: okabeIto.blue,
  /** The projection band around the fitted curve. */
  band: okabeIto.skyBlue,
  /** Sizes reached after further runs. */
  runs: okabeIto.orange,
  /** The target score. */
  target: okabeIto.vermillion,
  /** Positive expected net value. */
  gain: okabeIto.bluishGreen,
  /** Negative expected net value. */
  loss: okabeIto.vermillion,
  /** The probability of reaching the target. */
  probability: okabeIto.reddishPurple,
} as const;

/** System fonts only: the report must not fetch any. */
export const fontStack =
  'system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, "Noto Sans", "Liberation Sans", sans-serif';

/** Default chart size in pixels (the page scales charts down to fit, and to fit a printed page). */
export const chartSize = { width: 640, height: 360, panelHeight: 170 } as const;

/** The Vega-Lite config shared by every chart: quiet axes, no frame, readable type. */
export const chartConfig: Config = {
  font: fontStack,
  background: "#ffffff",
  padding: 8,
  view: { stroke: null },
  title: {
    anchor: "start",
    fontSize: 16,
    fontWeight: 600,
    color: palette.ink,
    subtitleFontSize: 12,
    subtitleColor: palette.muted,
    offset: 10,
  },
  axis: {
    labelFontSize: 12,
    titleFontSize: 13,
    titleFontWeight: 500,
    labelColor: palette.muted,
    titleColor: palette.ink,
    domainColor: palette.muted,
    tickColor: palette.muted,
    gridColor: palette.grid,
    titlePadding: 8,
  },
  axisX: { grid: false },
  legend: {
    labelFontSize: 12,
    titleFontSize: 12,
    labelColor: palette.ink,
    orient: "bottom",
    direction: "horizontal",
    symbolSize: 90,
    symbolOpacity: 1,
  },
  text: { font: fontStack, fontSize: 11, color: palette.muted },
};
