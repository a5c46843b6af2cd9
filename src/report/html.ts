/**
 * The report: one self-contained HTML page for people who read one page and decide (a grant
 * committee, a lab head, a finance lead). `renderReportHtml` is pure and returns the page as a
 * string; writing it to a file is the caller's job. The same input always gives the same bytes: the
 * page carries no timestamp and formats numbers without the locale.
 *
 * The page, top to bottom: title; a one-sentence headline; what this means; the charts (with the cost
 * and value sliders on the net value); the table of further runs; assumptions; cautions (with the forecast's
 * warnings); a methods appendix for technical reviewers; a reproducibility footer.
 *
 * Safety and offline use:
 * - every string that comes from the user's files (title, file, column and class names, metric,
 *   learner, warnings) passes through `escapeHtml`;
 * - the chart specs travel as JSON in `<script type="application/json">` with `<`, `>` and `&`
 *   written as `\u003c`, `\u003e`, `\u0026`, so no data can close the element;
 * - vega, vega-lite and vega-embed are inlined (see ./bundles.ts), and a Content-Security-Policy
 *   forbids every outside request; as the policy allows no `eval`, vega-embed runs with its
 *   expression interpreter (`ast: true`).
 *
 * The page is built in parts that change for different reasons: pageSecurity.ts (policy and
 * escaping), reportWords.ts (shared words and the headline), sections.ts (the sections' templates),
 * methods.ts (the methods appendix and its references), styles.ts (the stylesheet), page.ts (the
 * shell that puts them together) and decisionCsv.ts (the spreadsheet export). This module is their
 * public face.
 */
export type { ReportInput } from "./reportInput.js";
export { contentSecurityPolicy, escapeHtml, jsonForScript } from "./pageSecurity.js";
export { gainInWords, headline } from "./reportWords.js";
export { reportDomain } from "./sections.js";
export { renderReportHtml } from "./page.js";
export { csvField, decisionTableCsv } from "./decisionCsv.js";
