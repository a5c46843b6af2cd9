/**
 * Every file of a report, as data: report.html, the decision table as decision.csv, and each chart
 * as SVG and PNG for slides and documents. Writing them is the caller's job (`runStudy`, `headroom
 * report`), which keeps this step testable and lets the caller write all files only once all of
 * them have been made.
 */
import { chartPng, chartSvg, findChartFonts, type ChartFonts } from "./chartFiles.js";
import { reportCharts } from "./charts.js";
import { decisionTableCsv, renderReportHtml } from "./html.js";
import type { ReportInput } from "./reportInput.js";

/** One output file: its name (no folder) and content. */
export interface ReportFile {
  fileName: string;
  content: string | Buffer;
}

export interface ReportFilesOptions {
  /**
   * Whether to draw each chart as SVG and PNG.
   * @default true
   */
  chartFiles?: boolean;
  /** Fonts for the PNG files (default: DejaVu Sans when installed). */
  fonts?: ChartFonts;
}

/**
 * The report's files in the order they are listed to the user: report.html; decision.csv (when
 * there is a decision); then `<chart id>.svg` and `<chart id>.png` for each chart the page shows
 * (chart-learning-curve, chart-score, chart-net-value, and chart-backtest and chart-sensitivity
 * when their data are present). Deterministic: the same input and fonts give the same bytes.
 *
 * Phases: render the page; write the table as CSV; build the chart specs (the same the page embeds);
 * draw each to SVG in Node; rasterize each SVG to PNG.
 *
 * @example
 * const files = await reportFiles(input);
 * // files.map((f) => f.fileName) → ["report.html", "decision.csv", "chart-learning-curve.svg", ...]
 */
export async function reportFiles(input: ReportInput, options: ReportFilesOptions = {}): Promise<ReportFile[]> {
  const files: ReportFile[] = [{ fileName: "report.html", content: renderReportHtml(input) }];
  if (input.decision) files.push({ fileName: "decision.csv", content: decisionTableCsv(input.decision) });
  if (options.chartFiles === false) return files;
  const fonts = options.fonts ?? findChartFonts();
  for (const chart of reportCharts(input)) {
    const svg = await chartSvg(chart.spec);
    files.push({ fileName: `${chart.id}.svg`, content: svg });
    files.push({ fileName: `${chart.id}.png`, content: chartPng(svg, fonts) });
  }
  return files;
}
