/**
 * The page shell: the policy, the styles, the sections in order, the chart specs as JSON, the inlined
 * chart libraries and the script that draws the charts. `renderReportHtml` is pure.
 */
import { chartBundles } from "./bundles.js";
import { reportCharts } from "./charts.js";
import type { ReportInput } from "./reportInput.js";

import { contentSecurityPolicy, escapeHtml, jsonForScript } from "./pageSecurity.js";
import { styles } from "./styles.js";
import { headline, metricOf } from "./reportWords.js";
import { methodsSection } from "./methods.js";
import {
  assumptionsSection,
  cautionsSection,
  chartsSection,
  decisionSection,
  headerSection,
  meaningSection,
  reproducibilityFooter,
} from "./sections.js";

const bootstrapScript = `(function () {
  "use strict";
  var specs = JSON.parse(document.getElementById("chart-specs").textContent);
  var options = { ast: true, expr: vegaEmbed.expressionInterpreter, actions: false, renderer: "svg", mode: "vega-lite" };
  Object.keys(specs).forEach(function (id) {
    var element = document.getElementById(id);
    vegaEmbed(element, specs[id], options).then(function () {
      element.setAttribute("data-drawn", "true");
    }).catch(function (error) {
      element.textContent = "This chart could not be drawn: " + error.message;
    });
  });
})();`;

/**
 * Renders the whole report as one HTML page. Pure: the same input always gives the same string.
 *
 * Phases: describe the metric; build the chart specs; write each section; wrap them in the page
 * frame with the policy, styles, the specs as JSON and the inlined chart libraries.
 *
 * @example
 * const html = renderReportHtml({ curve, forecast, decision, currency: "EUR",
 *   reproducibility: { toolVersion: "0.1.0", seed: 7 } });
 * // html.startsWith("<!doctype html>") → true
 */
export function renderReportHtml(input: ReportInput): string {
  const info = metricOf(input);
  const charts = reportCharts(input);
  const backtestChartId = "chart-backtest";
  const title = input.title ?? `${info.title} learning curve`;
  const specs = Object.fromEntries(charts.map((chart) => [chart.id, chart.spec]));

  const body = [
    headerSection(title, headline(input)),
    meaningSection(input, info),
    chartsSection(
      charts.filter((chart) => chart.id !== backtestChartId),
      input,
    ),
    decisionSection(input, info),
    assumptionsSection(input, info),
    cautionsSection(input),
    methodsSection(
      input,
      info,
      charts.find((chart) => chart.id === backtestChartId),
    ),
    reproducibilityFooter(input, charts),
  ].filter((section) => section !== "");

  const scripts = [
    `<script type="application/json" id="chart-specs">${jsonForScript(specs)}</script>`,
    ...chartBundles.map((bundle) => `<script>/* ${bundle.packageName} */\n${bundle.text}\n</script>`),
    `<script>\n${bootstrapScript}\n</script>`,
  ];

  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${contentSecurityPolicy}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="headroom ${escapeHtml(input.reproducibility.toolVersion)}">
<title>${escapeHtml(title)}</title>
<style>${styles}</style>
</head>
<body>
<main>
${body.join("\n")}
</main>
${scripts.join("\n")}
</body>
</html>
`;
}
