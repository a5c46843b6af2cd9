/**
 * The report: one self-contained HTML page for people who read one page and decide (a grant
 * committee, a lab head, a finance lead). `renderReportHtml` is pure and returns the page as a
 * string; writing it to a file is the caller's job. The same input always gives the same bytes: the
 * page carries no timestamp and formats numbers without the locale.
 *
 * The page, top to bottom: title; a one-sentence headline; what this means; the charts; the table of
 * further runs; assumptions; cautions (with the forecast's warnings); methods; a reproducibility
 * footer.
 *
 * Safety and offline use:
 * - every string that comes from the user's files (title, file, column and class names, metric,
 *   learner, warnings) passes through `escapeHtml`;
 * - the chart specs travel as JSON in `<script type="application/json">` with `<`, `>` and `&`
 *   written as `\u003c`, `\u003e`, `\u0026`, so no data can close the element;
 * - vega, vega-lite and vega-embed are inlined (see ./bundles.ts), and a Content-Security-Policy
 *   forbids every outside request; as the policy allows no `eval`, vega-embed runs with its
 *   expression interpreter (`ast: true`).
 */
import type { CurveFile } from "../curve/curveFile.js";
import type { ForecastFile, Projection } from "../forecast/forecastFile.js";
import type { DecisionFile, DecisionRow } from "../weigh/decisionFile.js";
import { chartBundles } from "./bundles.js";
import { learningCurveChart, valueChart } from "./charts.js";
import {
  countInWords,
  describeMetric,
  formatCount,
  formatExactScore,
  formatLevel,
  formatMoney,
  formatMonths,
  formatNumber,
  formatProbability,
  formatScore,
  moreRuns,
  scoreStyle,
  type MetricInfo,
  type ScoreStyle,
} from "./format.js";
import { fontStack, palette } from "./theme.js";

/** Everything the report shows. */
export interface ReportInput {
  curve: CurveFile;
  forecast: ForecastFile;
  /** The weighed runs; without it the report shows the projection only. */
  decision?: DecisionFile;
  /** Page title (default: "<Metric> learning curve"). */
  title?: string;
  /** Field of use ("clinical", "public-health", "safety", ...); any value adds a caution about people's health and safety. */
  domain?: string;
  /** Currency of costs and values ("EUR"). */
  currency?: string;
  reproducibility: {
    toolVersion: string;
    /** Seed of the run (default: the forecast's seed). */
    seed?: number;
    /** SHA-256 of the input data (default: the curve's source checksum). */
    inputSha256?: string;
    /** The command line that made the report. */
    command?: string;
    /** Not allowed: the report must be byte-deterministic, so it carries no time of creation. */
    generatedAt?: never;
  };
}

/** The Content-Security-Policy of the page: nothing may be fetched; inline scripts and styles run. */
export const contentSecurityPolicy =
  "default-src 'none'; script-src 'unsafe-inline'; style-src 'unsafe-inline'; img-src data: blob:; " +
  "font-src 'none'; connect-src 'none'; base-uri 'none'; form-action 'none'";

/**
 * Escapes text for HTML element content and quoted attribute values: `&`, `<`, `>`, `"` and `'`
 * become character references. The one function every user string passes through.
 */
export function escapeHtml(text: string): string {
  return text
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;")
    .replace(/'/g, "&#39;");
}

/**
 * JSON for a `<script type="application/json">` element: `<`, `>` and `&` as `\u003c`, `\u003e` and
 * `\u0026`, which `JSON.parse` reads back unchanged but which cannot end the element.
 */
export function jsonForScript(value: unknown): string {
  return JSON.stringify(value).replace(/</g, "\\u003c").replace(/>/g, "\\u003e").replace(/&/g, "\\u0026");
}

// ---------------------------------------------------------------------------------------------------
// Words shared by the sections

/** The report's metric in words, with its direction and whether it is a fraction. */
function metricOf(input: ReportInput): MetricInfo {
  const { forecast, curve } = input;
  return describeMetric(forecast.metric, forecast.higherIsBetter, forecast.metricRange ?? curve.metricRange);
}

/**
 * Headline style: whole percent, or one decimal when whole percent would show `from` and `to` alike
 * though they differ.
 */
function headlineStyle(info: MetricInfo, from: number, to: number, others: number[] = []): ScoreStyle {
  const values = [from, to, ...others];
  const whole = scoreStyle(info, values, true);
  if (from === to || formatScore(from, whole) !== formatScore(to, whole)) return whole;
  return scoreStyle(info, values, false);
}

function sortedRows(decision: DecisionFile): DecisionRow[] {
  return [...decision.table].sort((a, b) => a.runs - b.runs);
}

/** "66,000 EUR, 9 months" (months left out when runs take no calendar time). */
function costAndTime(row: DecisionRow, currency?: string): string {
  const cost = formatMoney(row.cost, currency);
  return row.months > 0 ? `${cost}, ${formatMonths(row.months)}` : cost;
}

/** The change of the score in words: "lift accuracy from 81% to 86%", or "keep ... at about 81%". */
function changeInWords(info: MetricInfo, from: string, to: string, improves: boolean): string {
  if (from === to) return `keep ${info.inSentence} at about ${from}`;
  if (improves) return `${info.higherIsBetter ? "lift" : "lower"} ${info.inSentence} from ${from} to ${to}`;
  return `change ${info.inSentence} from ${from} to ${to}`;
}

function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** The projection at the largest projected size (or the end of the band when there are none). */
function largestProjection(
  forecast: ForecastFile,
): Pick<Projection, "trainingSize" | "expected" | "lower" | "upper"> | undefined {
  const candidates = forecast.projections.length > 0 ? forecast.projections : forecast.band;
  return candidates.reduce<(typeof candidates)[number] | undefined>(
    (best, p) => (best === undefined || p.trainingSize > best.trainingSize ? p : best),
    undefined,
  );
}

/**
 * The report's headline: one plain-language sentence (or two) saying what further runs are expected
 * to buy, in the reader's terms (runs, money, months, the score in percent).
 *
 * With a decision: what the recommended number of runs costs and is expected to do to the score, with
 * its interval, and how the chance of reaching the target stands. Without one: the projection at the
 * largest projected size against the score measured at the largest measured size.
 *
 * The text is plain (not HTML); escape it before placing it in a page.
 *
 * @example
 * headline(input)
 * // → "Two more runs (44,000 EUR, 6 months) are expected to lift accuracy from 84% to 85% (80% interval
 * //    84% to 87%); the chance of reaching the target of 85% goes from 20% to 61%. ..."
 */
export function headline(input: ReportInput): string {
  const info = metricOf(input);
  const { decision, forecast, currency } = input;
  if (decision && decision.table.length > 0) {
    const rows = sortedRows(decision);
    const now = rows.find((row) => row.runs === 0) ?? rows[0];
    const chosen = rows.find((row) => row.runs === decision.recommendedRuns) ?? now;
    const target = decision.plan.target;
    const sentences: string[] = [];
    if (chosen.runs > now.runs) {
      const style = headlineStyle(info, now.expected, chosen.expected, [chosen.lower, chosen.upper]);
      const score = (v: number) => formatScore(v, style);
      const improves = info.higherIsBetter ? chosen.expected > now.expected : chosen.expected < now.expected;
      let sentence =
        `${moreRuns(chosen.runs)} (${costAndTime(chosen, currency)}) ${chosen.runs === 1 ? "is" : "are"} expected to ` +
        `${changeInWords(info, score(now.expected), score(chosen.expected), improves)} ` +
        `(${formatLevel(decision.level)} interval ${score(chosen.lower)} to ${score(chosen.upper)})`;
      if (target !== undefined && now.probabilityOfTarget !== null && chosen.probabilityOfTarget !== null) {
        sentence +=
          `; the chance of reaching the target of ${formatExactScore(target, info)} ` +
          `goes from ${formatProbability(now.probabilityOfTarget)} to ${formatProbability(chosen.probabilityOfTarget)}`;
      }
      sentences.push(sentence + ".");
    } else {
      const next = rows.find((row) => row.runs > now.runs);
      const style = headlineStyle(info, now.expected, next?.expected ?? now.expected, [now.lower, now.upper]);
      const score = (v: number) => formatScore(v, style);
      let sentence =
        `No further run is recommended: with today's ${formatCount(now.trainingSize)} samples, ` +
        `${info.inSentence} is expected to be ${score(now.expected)} ` +
        `(${formatLevel(decision.level)} interval ${score(now.lower)} to ${score(now.upper)})`;
      if (next) {
        sentence +=
          ` and ${countInWords(next.runs)} more ${next.runs === 1 ? "run" : "runs"} (${costAndTime(next, currency)}) ` +
          `would take it to ${score(next.expected)}`;
      }
      sentences.push(sentence + ".");
    }
    if (target !== undefined) sentences.push(targetSentence(info, decision, target, rows, currency));
    return sentences.join(" ");
  }

  const projection = largestProjection(forecast);
  const measured = forecast.measured.reduce<ForecastFile["measured"][number] | undefined>(
    (best, m) => (best === undefined || m.trainingSize > best.trainingSize ? m : best),
    undefined,
  );
  if (!projection) return `${capitalise(info.inSentence)} was measured; no projection was made.`;
  const style = headlineStyle(info, measured?.mean ?? projection.expected, projection.expected, [
    projection.lower,
    projection.upper,
  ]);
  const score = (v: number) => formatScore(v, style);
  let sentence =
    `At ${formatCount(projection.trainingSize)} training samples, ${info.inSentence} is projected to be ` +
    `${score(projection.expected)} (${formatLevel(forecast.level)} interval ${score(projection.lower)} to ` +
    `${score(projection.upper)})`;
  if (measured) {
    sentence += `, against ${score(measured.mean)} measured at ${formatCount(measured.trainingSize)} samples`;
  }
  return sentence + ".";
}

/** The second headline sentence: how many runs reach the target with the confidence the plan asks. */
function targetSentence(
  info: MetricInfo,
  decision: DecisionFile,
  target: number,
  rows: DecisionRow[],
  currency?: string,
): string {
  const targetText = formatExactScore(target, info);
  const confidence = formatProbability(decision.plan.targetConfidence);
  if (decision.runsToTarget === null) {
    const most = rows[rows.length - 1]?.runs ?? 0;
    return `No number of runs up to ${formatCount(most)} reaches the target of ${targetText} with ${confidence} confidence.`;
  }
  if (decision.runsToTarget === 0) {
    return `The target of ${targetText} is already reached with ${confidence} confidence.`;
  }
  const row = rows.find((r) => r.runs === decision.runsToTarget);
  const cost = row ? ` (${costAndTime(row, currency)}${row.affordable ? "" : ", over budget"})` : "";
  const runs = `${countInWords(decision.runsToTarget)} ${decision.runsToTarget === 1 ? "run" : "runs"}`;
  return `Reaching the target of ${targetText} with ${confidence} confidence takes ${runs}${cost}.`;
}

// ---------------------------------------------------------------------------------------------------
// Sections, one template each. Every argument that holds user text is escaped here.

function headerSection(title: string, headlineText: string): string {
  return `<header>
<h1>${escapeHtml(title)}</h1>
<p class="headline">${escapeHtml(headlineText)}</p>
</header>`;
}

function meaningSection(input: ReportInput, info: MetricInfo): string {
  const { forecast, decision, currency } = input;
  const level = formatLevel(forecast.level);
  const sentences = [
    `Each faint dot in the first chart is the ${info.inSentence} of one model trained on a random subsample ` +
      `of the data and scored on rows it did not see (cross-validation). The curve fitted through them shows ` +
      `how ${info.inSentence} grows with more training samples; to the right of the largest measured size ` +
      `(${formatCount(forecast.largestMeasuredSize)} samples) it is a projection, not a measurement.`,
    `The ${level} interval is the range in which the expected ${info.inSentence} at that size lies with ` +
      `${level} confidence, given how much the measurements scatter; one particular model can land outside it.`,
  ];
  if (decision) {
    const plan = decision.plan;
    const unit = info.isFraction ? "each percentage point" : "each 0.01";
    sentences.push(
      `Each further run adds ${formatCount(plan.samplesPerRun)} labelled samples and costs ` +
        `${formatMoney(plan.costPerRun, currency)}. The expected net value counts ${unit} of ` +
        `${info.inSentence} gained as worth ${formatMoney(plan.valuePerPoint, currency)} and subtracts the cost ` +
        `of the runs.`,
      decision.reasons.recommendedRuns,
    );
    if (decision.reasons.runsToTarget) sentences.push(decision.reasons.runsToTarget);
  }
  return `<section id="meaning">
<h2>What this means</h2>
<p>${sentences.map(escapeHtml).join(" ")}</p>
</section>`;
}

/** One chart: an empty container that the bootstrap script fills, and the text alternative as caption. */
function chartFigure(id: string, description: string): string {
  return `<figure class="chart-figure">
<div class="chart" id="${escapeHtml(id)}"></div>
<figcaption>${escapeHtml(description)}</figcaption>
</figure>`;
}

function chartsSection(charts: ChartEntry[]): string {
  return `<section id="charts">
<h2>Charts</h2>
${charts.map((chart) => chartFigure(chart.id, chart.description)).join("\n")}
<noscript><p class="note">The charts need JavaScript; the captions above say what they show.</p></noscript>
</section>`;
}

function decisionSection(input: ReportInput, info: MetricInfo): string {
  const { decision, currency } = input;
  if (!decision) return "";
  const rows = sortedRows(decision);
  const hasTarget = decision.plan.target !== undefined;
  const style = scoreStyle(
    info,
    rows.flatMap((row) => [row.expected, row.lower, row.upper]),
  );
  const score = (v: number) => formatScore(v, style);
  const level = formatLevel(decision.level);
  const money = currency ? ` (${escapeHtml(currency)})` : "";
  const head = [
    "Further runs",
    "Training samples",
    `Expected ${escapeHtml(info.inSentence)}`,
    `${level} interval`,
    ...(hasTarget ? ["Chance of reaching target"] : []),
    `Cost${money}`,
    "Months",
    `Expected net value${money}`,
  ];
  const body = rows.map((row) => {
    const recommended = row.runs === decision.recommendedRuns;
    const tags = [
      recommended ? `<span class="tag recommended-tag">recommended</span>` : "",
      row.affordable ? "" : `<span class="tag over-tag">over budget</span>`,
    ].join("");
    const cells = [
      `<th scope="row">${row.runs === 0 ? "0 (now)" : formatCount(row.runs)}${tags}</th>`,
      `<td>${formatCount(row.trainingSize)}</td>`,
      `<td>${score(row.expected)}</td>`,
      `<td>${score(row.lower)} to ${score(row.upper)}</td>`,
      ...(hasTarget
        ? [`<td>${row.probabilityOfTarget === null ? "–" : formatProbability(row.probabilityOfTarget)}</td>`]
        : []),
      `<td>${formatMoney(row.cost)}</td>`,
      `<td>${formatNumber(row.months, Number.isInteger(row.months) ? 0 : 1)}</td>`,
      `<td>${formatMoney(row.expectedNetValue)}</td>`,
    ];
    const classes = [recommended ? "recommended" : "", row.affordable ? "" : "over-budget"].filter(Boolean);
    const classAttribute = classes.length > 0 ? ` class="${classes.join(" ")}"` : "";
    return `<tr${classAttribute}>${cells.join("")}</tr>`;
  });
  const budget = decision.plan.budget;
  const caption =
    `Each row: what the final model would be trained on after that many further runs, its expected ` +
    `${info.inSentence}, and what the runs cost.` +
    (budget !== undefined ? ` Budget: ${formatMoney(budget, currency)}.` : "");
  return `<section id="decision">
<h2>Each further run</h2>
<table>
<caption>${escapeHtml(caption)}</caption>
<thead><tr>${head.map((h) => `<th scope="col">${h}</th>`).join("")}</tr></thead>
<tbody>
${body.join("\n")}
</tbody>
</table>
</section>`;
}

function assumptionsSection(input: ReportInput, info: MetricInfo): string {
  const { curve, forecast, decision, currency } = input;
  const sizes = forecast.measured.map((m) => m.trainingSize);
  const items = [
    `The learning curve keeps the shape fitted to the measured sizes (${formatCount(Math.min(...sizes))} to ` +
      `${formatCount(Math.max(...sizes))} samples) beyond them.`,
    `Samples from further runs are like those measured so far: the same population, the same way of ` +
      `labelling, the same mix of classes.`,
    `The learner and its settings stay as they were${curve.learner ? ` (${curve.learner})` : ""}.`,
    `The score is ${info.inSentence} cross-validated on this data set (${formatCount(curve.rows)} rows` +
      `${curve.folds ? `, ${curve.folds}-fold` : ""}${curve.repeats ? `, ${curve.repeats} repeats` : ""}); ` +
      `a model trained on more data is judged the same way.`,
  ];
  if (decision) {
    const plan = decision.plan;
    items.push(
      `Each run yields ${formatCount(plan.samplesPerRun)} samples and costs ${formatMoney(plan.costPerRun, currency)}` +
        `${plan.monthsPerRun > 0 ? ` and ${formatMonths(plan.monthsPerRun)}` : ""}, as planned.`,
      `A ${info.isFraction ? "percentage point" : "gain of 0.01"} of ${info.inSentence} is worth ` +
        `${formatMoney(plan.valuePerPoint, currency)}; benefits outside the score are not counted.`,
    );
  }
  return `<section id="assumptions">
<h2>Assumptions</h2>
<ul>
${items.map((item) => `<li>${escapeHtml(item)}</li>`).join("\n")}
</ul>
</section>`;
}

/** The field a domain concerns, for the caution about people: "health", "safety" or both. */
function domainConcern(domain: string): string {
  const d = domain.toLowerCase();
  if (/safety/.test(d)) return "safety";
  if (/clinic|health|medic|care|hospital|patient/.test(d)) return "health";
  return "health or safety";
}

function cautionsSection(input: ReportInput): string {
  const { forecast, domain } = input;
  const cautions = [
    `Projections are not validation. The projected scores extend a curve fitted up to ` +
      `${formatCount(forecast.largestMeasuredSize)} training samples, and the further they reach past it, ` +
      `the more they rest on the assumptions above. A model trained on more data still has to be scored on ` +
      `data it has not seen before anyone relies on it.`,
    `Cross-validated scores describe data like this data set; another site, period or population can ` + `score lower.`,
  ];
  if (domain !== undefined && domain.trim() !== "") {
    cautions.push(
      `This model informs decisions about people's ${domainConcern(domain)} (field: ${domain.trim()}). ` +
        `Projections are not validation: independent validation, the applicable regulatory requirements and ` +
        `licensed professional practice decide whether and how such a model may be used.`,
    );
  }
  const warnings =
    forecast.warnings.length > 0
      ? `<h3>Warnings from the forecast</h3>
<ul class="warnings">
${forecast.warnings.map((w) => `<li>${escapeHtml(w)}</li>`).join("\n")}
</ul>`
      : "";
  return `<section id="cautions">
<h2>Cautions</h2>
<ul>
${cautions.map((c) => `<li>${escapeHtml(c)}</li>`).join("\n")}
</ul>
${warnings}
</section>`;
}

/** Fitted parameters as "a = 0.9012, b = 2.03, c = 0.4987" (four significant digits). */
function parametersInWords(parameters: Record<string, number>): string {
  return Object.entries(parameters)
    .map(([name, value]) => `${name} = ${Number.isFinite(value) ? Number(value.toPrecision(4)) : value}`)
    .join(", ");
}

function methodsSection(input: ReportInput, info: MetricInfo): string {
  const { curve, forecast } = input;
  const sizes = forecast.measured.map((m) => m.trainingSize);
  const design =
    curve.folds && curve.repeats
      ? `${curve.repeats} times repeated ${curve.folds}-fold cross-validation`
      : "cross-validation";
  const source = curve.source ? `, file ${curve.source.file}` : "";
  const sentences = [
    `${capitalise(info.inSentence)} was measured by ${design} on subsamples of ${sizes.length} training sizes ` +
      `from ${formatCount(Math.min(...sizes))} to ${formatCount(Math.max(...sizes))} samples, drawn from a ` +
      `data set of ${formatCount(curve.rows)} rows${source}` +
      `${curve.learner ? `, with the learner ${curve.learner}` : ""}` +
      `${curve.label ? `, predicting the column ${curve.label}` : ""}` +
      `${curve.group ? `, keeping groups of ${curve.group} together` : ""}.`,
  ];
  if (curve.classNames && curve.classNames.length > 0) {
    sentences.push(`Classes: ${curve.classNames.join(", ")}.`);
  }
  const draws = forecast.projections[0]?.draws.length ?? 0;
  const model = /power/i.test(forecast.family)
    ? "An inverse power law, score = a − b·n^(−c) with n the number of training samples,"
    : `The learning-curve model "${forecast.family}"`;
  sentences.push(
    `${model} was fitted to the scores by weighted least squares, each size weighted by the spread of its ` +
      `scores; fitted parameters: ${parametersInWords(forecast.parameters)}.`,
    `Intervals are central ${formatLevel(forecast.level)} intervals from a bootstrap over repeats: whole ` +
      `repeats were resampled with replacement and the curve refitted` +
      `${draws > 0 ? ` ${formatCount(draws)} times` : ""}.`,
  );
  return `<section id="methods">
<h2>Methods</h2>
<p>${sentences.map(escapeHtml).join(" ")}</p>
</section>`;
}

function reproducibilityFooter(input: ReportInput): string {
  const { reproducibility, forecast, curve } = input;
  const seed = reproducibility.seed ?? forecast.seed;
  const sha = reproducibility.inputSha256 ?? curve.source?.sha256;
  const items = [
    `<dt>Tool</dt><dd>headroom ${escapeHtml(reproducibility.toolVersion)}</dd>`,
    `<dt>Seed</dt><dd>${escapeHtml(String(seed))}</dd>`,
    ...(sha ? [`<dt>Input SHA-256</dt><dd><code>${escapeHtml(sha)}</code></dd>`] : []),
    ...(reproducibility.command
      ? [`<dt>Command</dt><dd><code>${escapeHtml(reproducibility.command)}</code></dd>`]
      : []),
  ];
  return `<footer id="reproducibility">
<h2>Reproducibility</h2>
<dl>
${items.join("\n")}
</dl>
<p class="note">This page is self-contained: it loads nothing from the network.</p>
</footer>`;
}

// ---------------------------------------------------------------------------------------------------
// Page frame

/** Neutral, readable styles of our own, with a print stylesheet (charts fit the page). */
const styles = `
:root { color-scheme: light; --ink: ${palette.ink}; --muted: ${palette.muted}; --line: ${palette.grid}; --accent: ${palette.curve}; }
* { box-sizing: border-box; }
body { margin: 0; background: #f6f7f9; color: var(--ink); font: 16px/1.55 ${fontStack}; }
main { max-width: 60rem; margin: 0 auto; padding: 2rem 1.5rem 3rem; background: #fff; }
h1 { font-size: 1.75rem; line-height: 1.25; margin: 0 0 0.75rem; }
h2 { font-size: 1.2rem; margin: 2.25rem 0 0.6rem; padding-bottom: 0.25rem; border-bottom: 1px solid var(--line); }
h3 { font-size: 1rem; margin: 1.25rem 0 0.4rem; }
.headline { font-size: 1.2rem; line-height: 1.45; margin: 0; padding: 0.9rem 1.1rem; border-left: 4px solid var(--accent); background: #f1f6fb; }
.chart-figure { margin: 1.5rem 0; }
.chart svg { display: block; max-width: 100%; height: auto; }
figcaption, .note, caption { color: var(--muted); font-size: 0.875rem; }
caption { text-align: left; caption-side: top; padding-bottom: 0.4rem; }
table { border-collapse: collapse; width: 100%; font-size: 0.9rem; font-variant-numeric: tabular-nums; }
th, td { padding: 0.4rem 0.55rem; border-bottom: 1px solid var(--line); text-align: right; vertical-align: top; }
tbody td { white-space: nowrap; }
thead th { border-bottom: 2px solid var(--ink); font-weight: 600; vertical-align: bottom; }
tbody th { font-weight: 500; white-space: nowrap; }
tr.recommended { background: #eef6f1; font-weight: 600; }
tr.recommended th { border-left: 4px solid ${palette.gain}; }
tr.over-budget td { color: var(--muted); }
.tag { display: inline-block; margin-left: 0.4rem; padding: 0 0.35rem; border-radius: 3px; font-size: 0.75rem; font-weight: 600; }
.recommended-tag { background: ${palette.gain}; color: #fff; }
.over-tag { border: 1px solid var(--muted); color: var(--muted); }
ul { padding-left: 1.25rem; }
li { margin: 0.3rem 0; }
.warnings li { color: ${palette.loss}; }
code { font-family: ui-monospace, "SFMono-Regular", Menlo, Consolas, "Liberation Mono", monospace; font-size: 0.85em; overflow-wrap: anywhere; }
dl { display: grid; grid-template-columns: max-content 1fr; gap: 0.2rem 1rem; font-size: 0.875rem; }
dt { color: var(--muted); }
dd { margin: 0; }
@media print {
  @page { margin: 15mm; }
  body { background: #fff; font-size: 10.5pt; }
  main { max-width: none; padding: 0; }
  h2 { break-after: avoid; }
  .chart-figure, tr, .headline { break-inside: avoid; }
  .chart svg { width: 100% !important; height: auto !important; }
  .vega-actions, #vg-tooltip-element, noscript { display: none !important; }
  tr.recommended { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
}
`;

/** The script that draws every chart from the JSON block, with no `eval` (see the module comment). */
const bootstrapScript = `(function () {
  "use strict";
  var specs = JSON.parse(document.getElementById("chart-specs").textContent);
  var options = { ast: true, expr: vegaEmbed.expressionInterpreter, actions: false, renderer: "svg", mode: "vega-lite" };
  Object.keys(specs).forEach(function (id) {
    var element = document.getElementById(id);
    vegaEmbed(element, specs[id], options).catch(function (error) {
      element.textContent = "This chart could not be drawn: " + error.message;
    });
  });
})();`;

interface ChartEntry {
  id: string;
  description: string;
  spec: object;
}

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
  const chartOptions = {
    currency: input.currency,
    metricRange: input.forecast.metricRange ?? input.curve.metricRange,
  };
  const charts: ChartEntry[] = [];
  const curveSpec = learningCurveChart(input.curve, input.forecast, input.decision, chartOptions);
  charts.push({ id: "chart-learning-curve", description: curveSpec.description ?? "", spec: curveSpec });
  if (input.decision) {
    const valueSpec = valueChart(input.decision, chartOptions);
    charts.push({ id: "chart-value", description: valueSpec.description ?? "", spec: valueSpec });
  }
  const title = input.title ?? `${info.title} learning curve`;
  const specs = Object.fromEntries(charts.map((chart) => [chart.id, chart.spec]));

  const body = [
    headerSection(title, headline(input)),
    meaningSection(input, info),
    chartsSection(charts),
    decisionSection(input, info),
    assumptionsSection(input, info),
    cautionsSection(input),
    methodsSection(input, info),
    reproducibilityFooter(input),
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

// ---------------------------------------------------------------------------------------------------
// Spreadsheet export

/**
 * One CSV field after RFC 4180 §2 (rules 5–7): enclosed in double quotes when it holds a comma, a
 * double quote, CR or LF, with each double quote inside doubled; `null` is an empty field.
 *
 * @example
 * csvField('say "hi", then go') // → '"say ""hi"", then go"'
 */
export function csvField(value: string | number | boolean | null): string {
  const text = value === null ? "" : String(value);
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** Columns of the decision table as CSV, named as in decision.json. */
const csvColumns = [
  "runs",
  "trainingSize",
  "expected",
  "lower",
  "upper",
  "probabilityOfTarget",
  "cost",
  "months",
  "expectedNetValue",
  "affordable",
] as const;

/**
 * The decision table as CSV for a spreadsheet, following RFC 4180: a header line, one line per row
 * (sorted by runs), CRLF line ends, fields quoted only when needed. Numbers are written in full
 * precision without separators, so a spreadsheet reads them as numbers; a missing probability is an
 * empty field. A last column `recommended` says which row the decision recommends.
 *
 * @example
 * decisionTableCsv(decision).split("\r\n")[0]
 * // → "runs,trainingSize,expected,lower,upper,probabilityOfTarget,cost,months,expectedNetValue,affordable,recommended"
 */
export function decisionTableCsv(decision: DecisionFile): string {
  const header = [...csvColumns, "recommended"].map(csvField).join(",");
  const lines = sortedRows(decision).map((row) =>
    [...csvColumns.map((column) => csvField(row[column])), csvField(row.runs === decision.recommendedRuns)].join(","),
  );
  return [header, ...lines].join("\r\n") + "\r\n";
}
