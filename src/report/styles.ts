/** The page's stylesheet: our own look, and a print stylesheet. */
import { fontStack, palette } from "./theme.js";

/** Our own look: a white sheet on a soft grey, a blue accent rule, tabular figures; and a print stylesheet. */
export const styles = `
:root { color-scheme: light; --ink: ${palette.ink}; --muted: ${palette.muted}; --line: ${palette.grid}; --accent: ${palette.curve}; }
* { box-sizing: border-box; }
body { margin: 0; background: #f3f4f6; color: var(--ink); font: 16px/1.55 ${fontStack}; }
main { max-width: 62rem; margin: 0 auto; padding: 2rem 1.75rem 3rem; background: #fff; border-top: 6px solid var(--accent); }
.eyebrow { margin: 0 0 0.25rem; color: var(--accent); font-size: 0.8rem; font-weight: 700; letter-spacing: 0.08em; text-transform: uppercase; }
h1 { font-size: 1.75rem; line-height: 1.25; margin: 0 0 0.9rem; }
h2 { font-size: 1.2rem; margin: 2.25rem 0 0.6rem; padding-bottom: 0.25rem; border-bottom: 1px solid var(--line); }
h3 { font-size: 1rem; margin: 1.25rem 0 0.4rem; }
.headline { font-size: 1.2rem; line-height: 1.45; margin: 0; padding: 0.9rem 1.1rem; border-left: 4px solid var(--accent); background: #eef4fa; }
.chart-figure { margin: 1.75rem 0 2.25rem; }
.chart svg { display: block; max-width: 100%; height: auto; }
.chart-note { margin: 0.5rem 0 0; font-size: 0.9rem; }
figcaption, .note, caption { color: var(--muted); font-size: 0.875rem; }
figcaption { margin-top: 0.5rem; }
caption { text-align: left; caption-side: top; padding-bottom: 0.4rem; }
.vega-bindings:empty { display: none; }
.vega-bindings { display: flex; flex-wrap: wrap; gap: 0.4rem 2rem; margin: 0.75rem 0 0; padding: 0.6rem 0.8rem; background: #f6f8fa; border: 1px solid var(--line); border-radius: 4px; font-size: 0.875rem; }
.vega-bind label { display: flex; align-items: center; gap: 0.5rem; }
.vega-bind-name { font-weight: 600; }
.vega-bind input[type="range"] { width: 11rem; accent-color: var(--accent); }
details.chart-data { margin-top: 0.5rem; font-size: 0.875rem; }
details.chart-data summary { cursor: pointer; color: var(--accent); }
details.chart-data table { margin-top: 0.5rem; }
.table-wrap { overflow-x: auto; }
table { border-collapse: collapse; width: 100%; font-size: 0.9rem; font-variant-numeric: tabular-nums; }
th, td { padding: 0.4rem 0.55rem; border-bottom: 1px solid var(--line); text-align: right; vertical-align: top; }
tbody td { white-space: nowrap; }
.range { display: block; color: var(--muted); font-size: 0.8em; font-weight: 400; }
.decision-table { font-size: 0.875rem; }
thead th { border-bottom: 2px solid var(--ink); font-weight: 600; vertical-align: bottom; }
tbody th { font-weight: 500; white-space: nowrap; }
details.chart-data th, details.chart-data td { text-align: left; }
tr.recommended { background: #eaf5ef; font-weight: 600; }
tr.recommended th { border-left: 4px solid ${palette.gain}; }
tr.over-budget td { color: var(--muted); }
.tag { display: inline-block; margin-left: 0.4rem; padding: 0 0.35rem; border-radius: 3px; font-size: 0.75rem; font-weight: 600; }
.recommended-tag { background: #00775a; color: #fff; }
.over-tag { border: 1px solid var(--muted); color: var(--muted); }
ul, ol { padding-left: 1.25rem; }
li { margin: 0.3rem 0; }
.warnings li { color: #a64200; }
.references { font-size: 0.875rem; }
code { font-family: ui-monospace, "SFMono-Regular", Menlo, Consolas, "Liberation Mono", monospace; font-size: 0.85em; overflow-wrap: anywhere; }
dl { display: grid; grid-template-columns: max-content 1fr; gap: 0.2rem 1rem; font-size: 0.875rem; }
dt { color: var(--muted); }
dd { margin: 0; }
@media print {
  @page { margin: 15mm; }
  body { background: #fff; font-size: 10.5pt; }
  main { max-width: none; padding: 0; border-top: 0; }
  h2 { break-after: avoid; }
  .chart-figure, tr, .headline { break-inside: avoid; }
  .chart svg { width: 100% !important; height: auto !important; }
  .vega-actions, .vega-bindings, .chart-note, details.chart-data, #vg-tooltip-element, noscript { display: none !important; }
  .table-wrap { overflow: visible; }
  tr.recommended, .headline { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
}
`;

/**
 * The script that draws every chart from the JSON block, with no `eval` (see the module comment).
 * A drawn chart's container gets `data-drawn="true"`, so a test (or a printing script) can wait for it.
 */
