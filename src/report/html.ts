/**
 * The report: one self-contained HTML page for people who read one page and decide (a grant
 * committee, a lab head, a finance lead). `renderReportHtml` is pure and returns the page as a
 * string; writing it to a file is the caller's job. The same input always gives the same bytes: the
 * page carries no timestamp and formats numbers without the locale.
 *
 * The page, top to bottom: title; a one-sentence headline; what this means; the charts (with what-if
 * controls on the net value); the table of further runs; assumptions; cautions (with the forecast's
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
 */
import { learnedForecastText } from "./forecastMethodText.js";
import type { ForecastFile, Projection } from "../forecast/forecastFile.js";
import { curveFamilies } from "../fit/families.js";
import type { DecisionFile, DecisionRow } from "../weigh/decisionFile.js";
import { chartBundles } from "./bundles.js";
import { reportCharts, type ChartTable, type ReportChart } from "./charts.js";
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
  ordinalInWords,
  scoreStyle,
  type MetricInfo,
  type ScoreStyle,
} from "./format.js";
import { planFacts } from "./planFacts.js";
import type { ReportInput } from "./reportInput.js";
import { fontStack, palette } from "./theme.js";

export type { ReportInput } from "./reportInput.js";

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

/** A decision row. */
type Row = DecisionRow;

/** The report's metric in words, with its direction and whether it is a fraction. */
function metricOf(input: ReportInput): MetricInfo {
  const { forecast, curve } = input;
  return describeMetric(forecast.metric, forecast.higherIsBetter, forecast.metricRange ?? curve.metricRange);
}

/**
 * Headline style: whole percent, or one decimal when whole percent would show two numbers the
 * sentence contrasts as equal though they differ (the score before and after, or the expected score
 * and an end of its interval). `pairs` lists the numbers contrasted.
 */
function headlineStyle(info: MetricInfo, pairs: ReadonlyArray<readonly [number, number]>): ScoreStyle {
  const values = pairs.flat();
  const whole = scoreStyle(info, values, true);
  const text = (v: number) => formatScore(v, whole);
  const collides = pairs.some(([a, b]) => a !== b && text(a) === text(b));
  return collides ? scoreStyle(info, values, false) : whole;
}

function sortedRows(decision: DecisionFile): Row[] {
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

/**
 * What one more run adds, in words: "under half a point", "about 1.5 points" (percentage points of
 * a fraction metric), "a further 0.004" (other metrics), "nothing more" when it does not improve.
 *
 * @param gain the improvement in the metric's units, positive when the score gets better
 */
export function gainInWords(gain: number, info: MetricInfo): string {
  if (!(gain > 0)) return "nothing more";
  if (!info.isFraction) return `a further ${formatScore(gain, scoreStyle(info, [gain])).replace(/(\.\d*?)0+$/, "$1")}`;
  const points = 100 * gain;
  if (points < 0.05) return "almost nothing";
  if (points < 0.5) return "under half a point";
  const text = formatNumber(points, points < 10 ? 1 : 0).replace(/\.0$/, "");
  return `about ${text} ${text === "1" ? "point" : "points"}`;
}

/** The improvement from row `a` to row `b`, positive when the score gets better. */
function improvement(info: MetricInfo, a: DecisionRow, b: DecisionRow): number {
  return info.higherIsBetter ? b.expected - a.expected : a.expected - b.expected;
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
 * to buy, in the reader's terms (runs, money, months, the score in percent, rounded to whole percent
 * unless that would hide the difference).
 *
 * With a decision: what the recommended number of runs costs and is expected to do to the score,
 * where the expected score likely lies (the forecast's central interval), what one run more would
 * add, and how the chance of reaching the target stands. Without one: the projection at the largest
 * projected size against the score measured at the largest measured size.
 *
 * The text is plain (not HTML); escape it before placing it in a page.
 *
 * @example
 * headline(input)
 * // → "Two more runs (44,000 EUR, 6 months) are expected to lift accuracy from 84% to 85% (likely
 * //    between 84% and 87%); a third would add under half a point. ..."
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
      const style = headlineStyle(info, [
        [now.expected, chosen.expected],
        [chosen.expected, chosen.lower],
        [chosen.expected, chosen.upper],
      ]);
      const score = (v: number) => formatScore(v, style);
      const improves = improvement(info, now, chosen) > 0;
      let sentence =
        `${moreRuns(chosen.runs)} (${costAndTime(chosen, currency)}) ${chosen.runs === 1 ? "is" : "are"} expected to ` +
        `${changeInWords(info, score(now.expected), score(chosen.expected), improves)} ` +
        `(likely between ${score(chosen.lower)} and ${score(chosen.upper)})`;
      const next = rows.find((row) => row.runs === chosen.runs + 1);
      if (next)
        sentence += `; a ${ordinalInWords(next.runs)} would add ${gainInWords(improvement(info, chosen, next), info)}`;
      sentences.push(sentence + ".");
      if (target !== undefined && now.probabilityOfTarget !== null && chosen.probabilityOfTarget !== null) {
        const before = formatProbability(now.probabilityOfTarget);
        const after = formatProbability(chosen.probabilityOfTarget);
        if (before !== after) {
          sentences.push(
            `The chance of reaching the target of ${formatExactScore(target, info)} goes from ${before} to ${after}.`,
          );
        }
      }
    } else {
      const next = rows.find((row) => row.runs > now.runs);
      const style = headlineStyle(info, [
        [now.expected, now.lower],
        [now.expected, now.upper],
      ]);
      const score = (v: number) => formatScore(v, style);
      let sentence =
        `No further run is recommended: with today's ${formatCount(now.trainingSize)} samples, ` +
        `${info.inSentence} is expected to be ${score(now.expected)} ` +
        `(likely between ${score(now.lower)} and ${score(now.upper)})`;
      if (next) {
        sentence +=
          `, and ${countInWords(next.runs)} more ${next.runs === 1 ? "run" : "runs"} (${costAndTime(next, currency)}) ` +
          `would add ${gainInWords(improvement(info, now, next), info)}`;
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
  const style = headlineStyle(info, [
    [measured?.mean ?? projection.expected, projection.expected],
    [projection.expected, projection.lower],
    [projection.expected, projection.upper],
  ]);
  const score = (v: number) => formatScore(v, style);
  let sentence =
    `At ${formatCount(projection.trainingSize)} training samples, ${info.inSentence} is projected to be ` +
    `${score(projection.expected)} (likely between ${score(projection.lower)} and ${score(projection.upper)})`;
  if (measured) {
    sentence += `, against ${score(measured.mean)} measured at ${formatCount(measured.trainingSize)} samples`;
  }
  return sentence + ".";
}

/** The last headline sentence: how many runs reach the target with the confidence the plan asks. */
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

/** Why the recommendation is what it is, in one sentence with the money formatted. */
function recommendationReason(decision: DecisionFile, rows: Row[], currency?: string): string {
  const chosen = rows.find((row) => row.runs === decision.recommendedRuns);
  if (!chosen || chosen.runs === 0) {
    const next = rows.find((row) => row.runs === 1);
    return next && !next.affordable
      ? "No further run fits within the budget and deadline."
      : "No number of further runs is expected to add more value than it costs.";
  }
  let reason =
    `${capitalise(countInWords(chosen.runs))} further ${chosen.runs === 1 ? "run has" : "runs have"} the highest ` +
    `expected net value within the budget and deadline: ${formatMoney(chosen.expectedNetValue, currency)}`;
  if (chosen.netValueLower !== undefined && chosen.netValueUpper !== undefined) {
    reason += ` (likely between ${formatMoney(chosen.netValueLower, currency)} and ${formatMoney(chosen.netValueUpper, currency)})`;
  }
  reason += ".";
  if (chosen.probabilityNetPositive !== undefined) {
    reason += ` The chance that their value exceeds their cost is ${formatProbability(chosen.probabilityNetPositive)}.`;
  }
  return reason;
}

/**
 * The stopping rule in words: after how many runs to stop, because the next run's expected gain is
 * worth less than it costs and no further runs would pay for themselves (or the next run would not
 * fit the budget or deadline).
 */
function stoppingSentence(
  decision: DecisionFile,
  rows: Row[],
  info: MetricInfo,
  valuePerPoint: number,
  currency?: string,
): string | undefined {
  const stop = decision.stopAfterRuns;
  if (stop === undefined || stop === null) return undefined;
  const next = rows.find((row) => row.runs === stop + 1);
  const previous = rows.find((row) => row.runs === stop);
  const when = stop === 0 ? "stop now" : `stop after ${countInWords(stop)} ${stop === 1 ? "run" : "runs"}`;
  if (!next || !previous) return `By the stopping rule, ${when}.`;
  if (!next.affordable) {
    return `By the stopping rule, ${when}: a ${ordinalInWords(next.runs)} run would not fit the budget or deadline.`;
  }
  const gain = next.marginalGain ?? improvement(info, previous, next);
  const worth = valuePerPoint * 100 * gain;
  const marginalCost = next.cost - previous.cost;
  return (
    `By the stopping rule, ${when}: a ${ordinalInWords(next.runs)} run is expected to add a gain worth ` +
    `${formatMoney(worth, currency)}, ${worth < marginalCost ? "less" : "no more"} than the ` +
    `${formatMoney(marginalCost, currency)} it costs` +
    `${next.runs < decision.plan.maxRuns ? ", and no more runs would pay for themselves either" : ""}.`
  );
}

// ---------------------------------------------------------------------------------------------------
// Sections, one template each. Every argument that holds user text is escaped here.

function headerSection(title: string, headlineText: string): string {
  return `<header>
<p class="eyebrow">Is more data worth it?</p>
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
      `how ${info.inSentence} changes with more training samples; to the right of the largest measured size ` +
      `(${formatCount(forecast.largestMeasuredSize)} samples) it is a projection, not a measurement.`,
    `“Likely” means the central ${level} interval: the expected ${info.inSentence} of a model trained at that ` +
      `size lies in it with ${level} confidence, given how much the measurements scatter; one particular model, ` +
      `scored on one particular test set, can land outside it.`,
  ];
  const answer = forecast.targetSize;
  if (answer) {
    const target = formatExactScore(answer.target, info);
    const at = (size: number | null) =>
      size === null
        ? `not within ${formatCount(answer.searchedUpTo)} samples`
        : `at about ${formatCount(size)} samples`;
    sentences.push(
      `The expected ${info.inSentence} reaches ${target} ${at(answer.expected)}, and with ` +
        `${formatProbability(answer.confidence)} confidence ${at(answer.withConfidence)}.`,
    );
  }
  if (decision) {
    const plan = decision.plan;
    const facts = planFacts(plan, decision.valueBasis);
    const unit = info.isFraction ? "each percentage point" : "each 0.01";
    const rows = sortedRows(decision);
    sentences.push(
      `Each further run adds ${formatCount(decision.expectedYieldPerRun ?? facts.samplesPerRun)} labelled samples and costs ` +
        `${formatMoney(plan.costPerRun, currency)}. The expected net value counts ${unit} of ` +
        `${info.inSentence} gained as worth ${formatMoney(facts.valuePerPoint, currency)} and subtracts the cost ` +
        `of the runs.`,
      recommendationReason(decision, rows, currency),
    );
    const stop = stoppingSentence(decision, rows, info, facts.valuePerPoint, currency);
    if (stop) sentences.push(stop);
    if (decision.reasons.valueOfInformation) sentences.push(decision.reasons.valueOfInformation);
  }
  return `<section id="meaning">
<h2>What this means</h2>
<p>${sentences.map(escapeHtml).join(" ")}</p>
</section>`;
}

/** The numbers behind a chart, as a table inside a closed disclosure (open for screen readers on demand). */
function chartDataTable(table: ChartTable): string {
  return `<details class="chart-data">
<summary>The numbers behind this chart</summary>
<table>
<caption>${escapeHtml(table.caption)}</caption>
<thead><tr>${table.columns.map((c) => `<th scope="col">${escapeHtml(c)}</th>`).join("")}</tr></thead>
<tbody>
${table.rows.map((row) => `<tr>${row.map((cell) => `<td>${escapeHtml(cell)}</td>`).join("")}</tr>`).join("\n")}
</tbody>
</table>
</details>`;
}

/** Notes shown under particular charts. */
const chartNotes: Record<string, string> = {
  "chart-net-value":
    "Try other numbers: the sliders under this chart set the cost per run and the value of a point. The bars " +
    "and the recommendation follow at once; the table below stays at the plan's values.",
};

/** One chart: an empty container that the bootstrap script fills, its text alternative and its numbers. */
function chartFigure(chart: ReportChart): string {
  const note = chartNotes[chart.id];
  return `<figure class="chart-figure" id="figure-${escapeHtml(chart.id)}">
<div class="chart" id="${escapeHtml(chart.id)}" role="img" aria-label="${escapeHtml(chart.title)}" aria-describedby="${escapeHtml(chart.id)}-caption"></div>
${note ? `<p class="chart-note">${escapeHtml(note)}</p>\n` : ""}<figcaption id="${escapeHtml(chart.id)}-caption">${escapeHtml(chart.description)}</figcaption>
${chartDataTable(chart.table)}
</figure>`;
}

function chartsSection(charts: ReportChart[]): string {
  return `<section id="charts">
<h2>Charts</h2>
${charts.map(chartFigure).join("\n")}
<noscript><p class="note">The charts need JavaScript; the captions and tables above say what they show.</p></noscript>
</section>`;
}

/** A gain in the metric's units as a signed amount: "+0.9 pt" (percentage points) or "+0.004". */
function signedGain(gain: number, info: MetricInfo, style: ScoreStyle): string {
  const text = info.isFraction ? `${formatNumber(100 * Math.abs(gain), 1)} pt` : formatScore(Math.abs(gain), style);
  const shownAsZero = /^[0.]+( pt)?$/.test(text);
  return shownAsZero ? text : `${gain > 0 ? "+" : "\u2212"}${text}`;
}

/** A value with its interval on a second, quieter line. */
function withRange(value: string, lower: string, upper: string): string {
  return `${value}<span class="range">${lower} to ${upper}</span>`;
}

function decisionSection(input: ReportInput, info: MetricInfo): string {
  const { decision, currency } = input;
  if (!decision) return "";
  const rows = sortedRows(decision);
  const hasTarget = decision.plan.target !== undefined;
  const hasInterval = rows.every((row) => row.netValueLower !== undefined && row.netValueUpper !== undefined);
  const hasChance = rows.every((row) => row.probabilityNetPositive !== undefined);
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
    `Expected ${escapeHtml(info.inSentence)}<span class="range">${level} interval</span>`,
    "Gain from this run",
    ...(hasTarget ? ["Chance of reaching target"] : []),
    `Cost${money}`,
    "Months",
    `Expected net value${money}${hasInterval ? `<span class="range">${level} interval</span>` : ""}`,
    ...(hasChance ? ["Chance value exceeds cost"] : []),
  ];
  const body = rows.map((row, index) => {
    const recommended = row.runs === decision.recommendedRuns;
    const tags = [
      recommended ? `<span class="tag recommended-tag">recommended</span>` : "",
      row.affordable ? "" : `<span class="tag over-tag">over budget</span>`,
    ].join("");
    const previous = index > 0 ? rows[index - 1] : undefined;
    const gain =
      row.marginalGain ?? (previous ? (info.higherIsBetter ? 1 : -1) * (row.expected - previous.expected) : undefined);
    const cells = [
      `<th scope="row">${row.runs === 0 ? "0 (now)" : formatCount(row.runs)}${tags}</th>`,
      `<td>${formatCount(row.trainingSize)}</td>`,
      `<td>${withRange(score(row.expected), score(row.lower), score(row.upper))}</td>`,
      `<td>${row.runs === 0 || gain === undefined ? "–" : signedGain(gain, info, style)}</td>`,
      ...(hasTarget
        ? [`<td>${row.probabilityOfTarget === null ? "–" : formatProbability(row.probabilityOfTarget)}</td>`]
        : []),
      `<td>${formatMoney(row.cost)}</td>`,
      `<td>${formatNumber(row.months, Number.isInteger(row.months) ? 0 : 1)}</td>`,
      `<td>${
        hasInterval && row.runs > 0
          ? withRange(
              formatMoney(row.expectedNetValue),
              formatMoney(row.netValueLower!),
              formatMoney(row.netValueUpper!),
            )
          : formatMoney(row.expectedNetValue)
      }</td>`,
      ...(hasChance ? [`<td>${row.runs === 0 ? "–" : formatProbability(row.probabilityNetPositive!)}</td>`] : []),
    ];
    const classes = [recommended ? "recommended" : "", row.affordable ? "" : "over-budget"].filter(Boolean);
    const classAttribute = classes.length > 0 ? ` class="${classes.join(" ")}"` : "";
    return `<tr${classAttribute}>${cells.join("")}</tr>`;
  });
  const budget = decision.plan.budget;
  const caption =
    `Each row: what the final model would be trained on after that many further runs, its expected ` +
    `${info.inSentence}, and what the runs cost. Money in whole units.` +
    (budget !== undefined ? ` Budget: ${formatMoney(budget, currency)}.` : "");
  return `<section id="decision">
<h2>Each further run</h2>
<p class="note">${escapeHtml(caption)}</p>
<div class="table-wrap">
<table class="decision-table">
<thead><tr>${head.map((h) => `<th scope="col">${h}</th>`).join("")}</tr></thead>
<tbody>
${body.join("\n")}
</tbody>
</table>
</div>
<p class="note">The same table is in decision.csv next to this page, with every number in full precision.</p>
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
    const facts = planFacts(plan, decision.valueBasis);
    items.push(
      `Each run yields ${formatCount(decision.expectedYieldPerRun ?? facts.samplesPerRun)} samples and costs ${formatMoney(plan.costPerRun, currency)}` +
        `${plan.monthsPerRun > 0 ? ` and ${formatMonths(plan.monthsPerRun)}` : ""}, as planned` +
        `${facts.fixedCost > 0 ? `; any further run also incurs a fixed cost of ${formatMoney(facts.fixedCost, currency)}` : ""}` +
        `${facts.parallelRuns > 1 ? `; ${facts.parallelRuns} runs can go on at the same time` : ""}.`,
      facts.valueBasis === "target"
        ? `No money value is put on a gain in ${info.inSentence}; the plan asks only for its target.`
        : `A ${info.isFraction ? "percentage point" : "gain of 0.01"} of ${info.inSentence} is worth ` +
            `${formatMoney(facts.valuePerPoint, currency)}` +
            `${facts.valueBasis === "consequences" ? " (from the cases a year, the cost of an error and the years in use)" : ""}` +
            `; benefits outside the score are not counted.`,
    );
    if (plan.budget !== undefined || facts.deadlineMonths !== undefined) {
      items.push(
        `Runs must fit ` +
          [
            plan.budget !== undefined ? `a budget of ${formatMoney(plan.budget, currency)}` : "",
            facts.deadlineMonths !== undefined ? `a deadline of ${formatMonths(facts.deadlineMonths)}` : "",
          ]
            .filter(Boolean)
            .join(" and ") +
          ".",
      );
    }
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

/**
 * How far the report's projections reach: the largest size it speaks of (the plan's last row, else
 * the largest projection) as a multiple of the largest measured size.
 */
function extrapolationRatio(forecast: ForecastFile, decision: DecisionFile | undefined): number | undefined {
  if (!(forecast.largestMeasuredSize > 0)) return undefined;
  const planned = decision ? Math.max(...decision.table.map((row) => row.trainingSize)) : undefined;
  const largest =
    planned !== undefined && Number.isFinite(planned) ? planned : largestProjection(forecast)?.trainingSize;
  return largest === undefined ? undefined : largest / forecast.largestMeasuredSize;
}

function cautionsSection(input: ReportInput): string {
  const { forecast, domain, decision } = input;
  const ratio = extrapolationRatio(forecast, decision);
  const cautions = [
    `Projections are not validation. The projected scores extend a curve fitted up to ` +
      `${formatCount(forecast.largestMeasuredSize)} training samples` +
      (ratio !== undefined && ratio > 1 ? ` to ${formatNumber(ratio, ratio < 10 ? 1 : 0)} times that size` : "") +
      `, and the further they reach past it, the more they rest on the assumptions above. A model trained ` +
      `on more data still has to be scored on data it has not seen before anyone relies on it.`,
    `Cross-validated scores describe data like this data set; another site, period or population can ` + `score lower.`,
  ];
  if (domain !== undefined && domain.trim() !== "") {
    cautions.push(
      `This model informs decisions about people's ${domainConcern(domain)} (field: ${domain.trim()}). ` +
        `Projections are not validation: independent validation, the applicable regulatory requirements and ` +
        `licensed professional practice decide whether and how such a model may be used.`,
    );
  }
  // The weighing's own cautions, leaving out those that repeat "projections are not validation".
  for (const caution of decision?.cautions ?? []) {
    if (!/projections are not validation/i.test(caution) && !cautions.includes(caution)) cautions.push(caution);
  }
  if (decision?.reasons.clinical) cautions.push(decision.reasons.clinical);
  const warningList = (heading: string, list: readonly string[] | undefined) =>
    list && list.length > 0
      ? `<h3>${heading}</h3>
<ul class="warnings">
${list.map((w) => `<li>${escapeHtml(w)}</li>`).join("\n")}
</ul>
`
      : "";
  const warnings =
    warningList("Warnings from the measurement", input.curve.warnings) +
    warningList("Warnings from the forecast", forecast.warnings);
  return `<section id="cautions">
<h2>Cautions</h2>
<ul>
${cautions.map((c) => `<li>${escapeHtml(c)}</li>`).join("\n")}
</ul>
${validationBlock(input)}${warnings}
</section>`;
}

/** How large a held-out test set has to be to support the target (decision.json's `validation`). */
function validationBlock(input: ReportInput): string {
  const validation = input.decision?.validation;
  if (!validation) return "";
  const info = metricOf(input);
  const confidence = formatProbability(validation.confidence);
  const target = formatExactScore(validation.target, info);
  let text: string;
  if (validation.heldOutNeeded !== null) {
    text =
      `To show with ${confidence} confidence that the model reaches the target of ${target}, a held-out test set ` +
      `of at least ${formatCount(validation.heldOutNeeded)} samples is needed (Wilson lower bound` +
      (validation.heldOutNeededExact !== null
        ? `; ${formatCount(validation.heldOutNeededExact)} with the Clopper–Pearson exact bound)`
        : ")") +
      `, if the model scores the expected ${formatScore(validation.expectedScore, scoreStyle(info, [validation.expectedScore]))} on it.`;
  } else {
    text = input.decision?.reasons.validation ?? `No practical held-out set can support the target of ${target}.`;
  }
  return `<h3>How large a test set is needed</h3>
<p>${escapeHtml(text)} ${escapeHtml(validation.context)}</p>
`;
}

/** Fitted parameters as "a = 0.9012, b = 2.03, c = 0.4987" (four significant digits). */
function parametersInWords(parameters: Record<string, number>): string {
  return Object.entries(parameters)
    .map(([name, value]) => `${name} = ${Number.isFinite(value) ? Number(value.toPrecision(4)) : value}`)
    .join(", ");
}

/** The splitters of curve.json in words. */
const splitterWords: Record<string, string> = {
  "stratified-k-fold": "stratified k-fold cross-validation",
  "k-fold": "k-fold cross-validation",
  "leave-one-out": "leave-one-out cross-validation",
  "grouped-k-fold": "grouped k-fold cross-validation",
  "leave-one-group-out": "leave-one-group-out cross-validation",
};

/** "stratified k-fold cross-validation (5 folds, repeated 10 times)", as curve.json says it was measured. */
function designInWords(curve: ReportInput["curve"]): string {
  const method = (curve.splitter && splitterWords[curve.splitter]) || "cross-validation";
  const details = [
    ...(curve.folds ? [`${curve.folds} folds`] : []),
    ...(curve.repeats ? [`repeated ${curve.repeats} ${curve.repeats === 1 ? "time" : "times"}`] : []),
  ];
  return details.length > 0 ? `${method} (${details.join(", ")})` : method;
}

/** A family by name with its formula when the fitter knows it: "pow3 (score = a − b·n^(−c) ...)". */
function familyInWords(name: string): string {
  const family = curveFamilies.find((f) => f.name === name);
  return family ? `${name} (${family.formula})` : name;
}

/** The references the methods cite, by key; each is listed only when the text cites it. */
const references = {
  efron: "Efron, B. and Tibshirani, R. J. (1993). An Introduction to the Bootstrap. Chapman & Hall.",
  hyndman:
    "Hyndman, R. J. and Fan, Y. (1996). Sample quantiles in statistical packages. The American Statistician 50(4), 361–365.",
  marquardt:
    "Marquardt, D. W. (1963). An algorithm for least-squares estimation of nonlinear parameters. Journal of the Society for Industrial and Applied Mathematics 11(2), 431–441.",
  figueroa:
    "Figueroa, R. L., Zeng-Treitler, Q., Kandula, S. and Ngo, L. H. (2012). Predicting sample size required for classification performance. BMC Medical Informatics and Decision Making 12, 8.",
  mukherjee:
    "Mukherjee, S., Tamayo, P., Rogers, S. et al. (2003). Estimating dataset size requirements for classifying DNA microarray data. Journal of Computational Biology 10(2), 119–142.",
  mohr: "Mohr, F., Viering, T. J., Loog, M. and van Rijn, J. N. (2022). LCDB 1.0: An extensive learning curves database for classification tasks. ECML PKDD 2022.",
  domhan:
    "Domhan, T., Springenberg, J. T. and Hutter, F. (2015). Speeding up automatic hyperparameter optimization of deep neural networks by extrapolation of learning curves. IJCAI 2015.",
  bates:
    "Bates, J. M. and Granger, C. W. J. (1969). The combination of forecasts. Operational Research Quarterly 20(4), 451–468.",
  burkner:
    "Bürkner, P.-C., Gabry, J. and Vehtari, A. (2020). Approximate leave-future-out cross-validation for Bayesian time series models. Journal of Statistical Computation and Simulation 90(14), 2499–2523.",
  hoeting:
    "Hoeting, J. A., Madigan, D., Raftery, A. E. and Volinsky, C. T. (1999). Bayesian model averaging: a tutorial. Statistical Science 14(4), 382–417.",
  nadeau: "Nadeau, C. and Bengio, Y. (2003). Inference for the generalization error. Machine Learning 52(3), 239–281.",
  bousquet:
    "Bousquet, O. and Elisseeff, A. (2002). Stability and generalization. Journal of Machine Learning Research 2, 499–526.",
  raiffa: "Raiffa, H. and Schlaifer, R. (1961). Applied Statistical Decision Theory. Harvard University.",
  wilson:
    "Wilson, E. B. (1927). Probable inference, the law of succession, and statistical inference. Journal of the American Statistical Association 22(158), 209–212.",
  clopper:
    "Clopper, C. J. and Pearson, E. S. (1934). The use of confidence or fiducial limits illustrated in the case of the binomial. Biometrika 26(4), 404–413.",
  beleites:
    "Beleites, C., Neugebauer, U., Bocklitz, T., Krafft, C. and Popp, J. (2013). Sample size planning for classification models. Analytica Chimica Acta 760, 25–33.",
  okabe:
    "Okabe, M. and Ito, K. (2008). Color Universal Design (CUD): how to make figures and presentations that are friendly to colorblind people.",
} as const;

function methodsSection(input: ReportInput, info: MetricInfo): string {
  const { curve, forecast, decision } = input;
  const cited = new Set<keyof typeof references>();
  const sizes = forecast.measured.map((m) => m.trainingSize);
  const design = designInWords(curve);
  const source = curve.source ? `, file ${curve.source.file}` : "";
  const measurement = [
    `${capitalise(info.inSentence)} was measured by ${design} on subsamples of ${sizes.length} training sizes ` +
      `from ${formatCount(Math.min(...sizes))} to ${formatCount(Math.max(...sizes))} samples, drawn from a ` +
      `data set of ${formatCount(curve.rows)} rows${source}` +
      `${curve.learner ? `, with the learner ${curve.learner}` : ""}` +
      `${curve.label ? `, predicting the column ${curve.label}` : ""}` +
      `${curve.group ? `, keeping groups of ${curve.group} together` : ""}.`,
  ];
  if (curve.classNames && curve.classNames.length > 0) {
    measurement.push(`Classes: ${curve.classNames.join(", ")}.`);
  }
  if (curve.unit === "runs") {
    measurement.push(`Training sizes count whole runs (groups of ${curve.group ?? "rows"}), not rows.`);
  }
  if (curve.tuning) {
    measurement.push(
      `At every fit the learner's settings were chosen from ${curve.tuning.grid.length} candidates by an inner ` +
        `${curve.tuning.innerFolds}-fold cross-validation on the training rows only.`,
    );
  }

  const weighted = Object.entries(forecast.familyWeights ?? {}).filter(([, w]) => Number.isFinite(w) && w > 0);
  const backtest = forecast.backtest;
  const hasBacktest = backtest !== undefined && backtest.predictions.length > 0;
  const fitting: string[] = [];
  cited.add("marquardt");
  cited.add("figueroa");
  if (weighted.length > 1) {
    cited.add("mohr");
    cited.add("domhan");
    cited.add("bates");
    fitting.push(
      `${capitalise(countInWords(weighted.length))} learning-curve families were fitted (n is the number of training samples): ` +
        weighted
          .sort((a, b) => b[1] - a[1])
          .map(([name, w]) => `${familyInWords(name)}, weight ${formatNumber(100 * w, 0)}%`)
          .join("; ") +
        `.`,
      `Each was fitted to the mean score per training size by weighted least squares (Levenberg–Marquardt from ` +
        `several starting points, within bounds that keep the score in the metric's range), each size weighted by ` +
        `its number of fits over the variance of its scores, with a floor so that no size takes all the weight.`,
      `The weights are proportional to the inverse of each family's mean squared backtest error (Bates and ` +
        `Granger's combination of forecasts), the error floored at the noise of the held-back means; the ` +
        `expected score is the weighted mean of the families' curves. Fitted parameters of ${forecast.family}, ` +
        `the heaviest: ${parametersInWords(forecast.parameters)}.`,
    );
  } else {
    cited.add("mukherjee");
    fitting.push(
      `One learning-curve family was fitted: ${familyInWords(forecast.family)}, with n the number of training ` +
        `samples. It was fitted to the mean score per training size by weighted least squares (Levenberg–Marquardt ` +
        `from several starting points, within bounds that keep the score in the metric's range), each size ` +
        `weighted by its number of fits over the variance of its scores, with a floor so that no size takes all ` +
        `the weight. Fitted parameters: ${parametersInWords(forecast.parameters)}.`,
    );
  }

  const draws = forecast.projections[0]?.draws.length ?? 0;
  const level = formatLevel(forecast.level);
  cited.add("efron");
  cited.add("hyndman");
  const uncertainty: string[] = [];
  if (forecast.sampleStandardDeviation !== undefined) {
    cited.add("nadeau");
    if (weighted.length > 1) cited.add("hoeting");
    const shift = info.isFraction
      ? `${formatNumber(100 * forecast.sampleStandardDeviation, 1)} percentage points`
      : formatScore(forecast.sampleStandardDeviation, scoreStyle(info, [forecast.sampleStandardDeviation]));
    uncertainty.push(
      `Intervals are central ${level} intervals of ${draws > 0 ? formatCount(draws) : "the"} drawn curves ` +
        `(quantiles by linear interpolation, Hyndman and Fan's definition 7), widened when needed to contain the ` +
        `expected score. Each drawn curve ` +
        (weighted.length > 1 ? `takes a family in proportion to its weight (model averaging); ` : "") +
        `resamples whole repeats of the cross-validation with replacement and is refitted (the bootstrap); adds ` +
        `one shift shared by every size, for which samples the lab happened to collect, with a standard deviation ` +
        `of ${shift} (Nadeau and Bengio's correction for overlapping training sets, which resampling repeats ` +
        `cannot see); and, beyond the largest measured size, the family's extrapolation error, growing with the ` +
        `square root of the log of the distance (a random walk in log size) at the rate its backtest errors ` +
        `showed. Draw j of every size comes from the same ` +
        `curve, so differences between sizes are taken curve by curve.`,
    );
  } else {
    uncertainty.push(
      `Intervals are central ${level} intervals from a bootstrap over repeats: whole repeats of the ` +
        `cross-validation were resampled with replacement, the means recomputed and the curve refitted` +
        `${draws > 0 ? ` ${formatCount(draws)} times` : ""}; the interval's ends are quantiles of the refitted ` +
        `curves (linear interpolation, Hyndman and Fan's definition 7). Draw j of every training size comes from ` +
        `the same refit, so differences between sizes are taken curve by curve.`,
    );
  }
  if (forecast.testSize !== undefined && forecast.projections.some((p) => p.singleModelLower !== undefined)) {
    cited.add("bousquet");
    uncertainty.push(
      `The wider interval is for one model scored on a test set of ${formatCount(forecast.testSize)} samples: ` +
        `it adds to each drawn curve the test set's sampling error (binomial for a score between 0 and 1) and the ` +
        `spread between models trained on different samples of the same size, shrinking as 1/n beyond the ` +
        `largest measured size.`,
    );
  }

  const weighing: string[] = [];
  if (decision) {
    weighing.push(
      `The chance of reaching the target is the share of drawn curves that reach it at that size. The expected ` +
        `net value is the value of a point times the expected gain in points over today, minus the cost of the ` +
        `runs` +
        (decision.table.some((row) => row.netValueLower !== undefined)
          ? `; its interval and the chance that it is positive are taken draw by draw`
          : "") +
        `. The recommendation is the number of runs with the highest expected net value within the budget and ` +
        `deadline.`,
    );
    if (decision.stopAfterRuns !== undefined && decision.stopAfterRuns !== null) {
      weighing.push(
        `The stopping rule stops when no further number of runs within the budget and deadline is expected to add a gain worth more than it adds to the cost (so a fixed cost paid with the first run does not stop a programme that pays off over several runs).`,
      );
    }
    if (decision.valueOfInformation) {
      cited.add("raiffa");
      weighing.push(
        `The value of a pilot is the expected value of sample information of its cross-validated score for ` +
          `the decision to go on or stop, by Monte Carlo over the drawn curves (${formatCount(decision.valueOfInformation.simulations)} ` +
          `simulations).`,
      );
    }
    if (decision.validation?.heldOutNeeded !== undefined && decision.validation?.heldOutNeeded !== null) {
      cited.add("wilson");
      cited.add("clopper");
      cited.add("beleites");
      weighing.push(
        `The test-set size is the smallest for which a one-sided ${formatProbability(decision.validation.confidence)} ` +
          `lower bound (Wilson; Clopper–Pearson exact) of the expected score lies above the target.`,
      );
    }
    if (decision.sensitivity && decision.sensitivity.length > 0) {
      weighing.push(`The sensitivity chart moves one assumption at a time by 25% and weighs the runs again.`);
    }
  }

  let backtestText: string;
  if (hasBacktest) {
    cited.add("burkner");
    const errors = Object.entries(backtest.rootMeanSquareError)
      .filter(([, e]) => Number.isFinite(e))
      .sort((a, b) => a[1] - b[1])
      .map(([name, e]) =>
        info.isFraction
          ? `${name} ${formatNumber(100 * e, 1)} points`
          : `${name} ${formatScore(e, scoreStyle(info, [e]))}`,
      );
    const cuts = [...new Set(backtest.predictions.map((p) => p.fittedUpTo))].sort((a, b) => a - b);
    backtestText =
      `Each family was fitted to the smaller measured sizes only, up to ${cuts.map(formatCount).join(", ")} ` +
      `samples in turn, and asked to predict the larger measured sizes held back (leave-future-out, as for time ` +
      `series). Root mean square errors of the ${formatCount(backtest.predictions.length)} predictions: ` +
      `${errors.join(", ")}. The backtest chart shows every prediction against the measured mean.`;
  } else {
    backtestText =
      forecast.familyWeights !== undefined
        ? `No backtest was made: too few training sizes were measured to hold some back, so one family was used.`
        : `No backtest was made: with one family there is nothing to choose between.`;
  }

  cited.add("okabe");
  const paragraphs = [
    ["Measurement", measurement.join(" ")],
    ["Curve families and fitting", fitting.join(" ")],
    ["Backtest", backtestText],
    ...(learnedForecastText(forecast) !== undefined
      ? [["What the forecast learned from", learnedForecastText(forecast) as string]]
      : []),
    ["Uncertainty", uncertainty.join(" ")],
    ...(weighing.length > 0 ? [["Weighing the runs", weighing.join(" ")]] : []),
    [
      "Charts",
      "The charts' colours are Okabe and Ito's palette, chosen to stay distinct under the common forms of colour blindness.",
    ],
  ];
  const referenceList = (Object.keys(references) as Array<keyof typeof references>)
    .filter((key) => cited.has(key))
    .map((key) => `<li>${escapeHtml(references[key])}</li>`);
  return `<section id="methods">
<h2>Methods (for technical reviewers)</h2>
${paragraphs.map(([heading, text]) => `<h3>${escapeHtml(heading)}</h3>\n<p>${escapeHtml(text)}</p>`).join("\n")}
<h3>References</h3>
<ol class="references">
${referenceList.join("\n")}
</ol>
</section>`;
}

function reproducibilityFooter(input: ReportInput, charts: ReportChart[]): string {
  const { reproducibility, forecast, curve } = input;
  const seed = reproducibility.seed ?? forecast.seed;
  const sha = reproducibility.inputSha256 ?? curve.source?.sha256;
  const files = [
    ...(input.decision ? ["decision.csv"] : []),
    ...charts.flatMap((chart) => [`${chart.id}.svg`, `${chart.id}.png`]),
  ];
  const items = [
    `<dt>Tool</dt><dd>headroom ${escapeHtml(reproducibility.toolVersion)}</dd>`,
    `<dt>Seed</dt><dd>${escapeHtml(String(seed))}</dd>`,
    ...(sha ? [`<dt>Input SHA-256</dt><dd><code>${escapeHtml(sha)}</code></dd>`] : []),
    ...(reproducibility.command
      ? [`<dt>Command</dt><dd><code>${escapeHtml(reproducibility.command)}</code></dd>`]
      : []),
    `<dt>Files for slides and spreadsheets</dt><dd>${files.map((f) => `<code>${escapeHtml(f)}</code>`).join(", ")}</dd>`,
  ];
  return `<footer id="reproducibility">
<h2>Reproducibility</h2>
<dl>
${items.join("\n")}
</dl>
<p class="note">This page is self-contained: it loads nothing from the network. Rerunning the command with the same input and seed gives the same numbers.</p>
</footer>`;
}

// ---------------------------------------------------------------------------------------------------
// Page frame

/** Our own look: a white sheet on a soft grey, a blue accent rule, tabular figures; and a print stylesheet. */
const styles = `
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

// ---------------------------------------------------------------------------------------------------
// Spreadsheet export

/**
 * One CSV field after RFC 4180 §2 (rules 5–7): enclosed in double quotes when it holds a comma, a
 * double quote, CR or LF, with each double quote inside doubled; `null` is an empty field.
 *
 * @example
 * csvField('say "hi", then go') // → '"say ""hi"", then go"'
 */
export function csvField(value: string | number | boolean | null | undefined): string {
  const text = value === null || value === undefined ? "" : String(value);
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

/** Columns later versions of decision.json add; each is written when some row carries it. */
const optionalCsvColumns = [
  "marginalGain",
  "netValueLower",
  "netValueUpper",
  "probabilityNetPositive",
  "withinBudget",
  "withinDeadline",
] as const;

/**
 * The decision table as CSV for a spreadsheet, following RFC 4180: a header line, one line per row
 * (sorted by runs), CRLF line ends, fields quoted only when needed. Numbers are written in full
 * precision without separators, so a spreadsheet reads them as numbers; a missing value is an empty
 * field. The optional columns of later decision files (marginalGain, netValueLower, netValueUpper,
 * probabilityNetPositive, withinBudget, withinDeadline) follow when present, and a last column `recommended` says
 * which row the decision recommends.
 *
 * @example
 * decisionTableCsv(decision).split("\r\n")[0]
 * // → "runs,trainingSize,expected,lower,upper,probabilityOfTarget,cost,months,expectedNetValue,affordable,recommended"
 */
export function decisionTableCsv(decision: DecisionFile): string {
  const rows = sortedRows(decision) as Array<Row & Record<string, unknown>>;
  const optional = optionalCsvColumns.filter((column) => rows.some((row) => row[column] !== undefined));
  const header = [...csvColumns, ...optional, "recommended"].map(csvField).join(",");
  const lines = rows.map((row) =>
    [
      ...csvColumns.map((column) => csvField(row[column])),
      ...optional.map((column) => csvField(row[column] as number | boolean | undefined)),
      csvField(row.runs === decision.recommendedRuns),
    ].join(","),
  );
  return [header, ...lines].join("\r\n") + "\r\n";
}
