/**
 * The page's sections, one template each, top to bottom: the header with the headline; what this
 * means; the charts; the table of further runs; assumptions; cautions (every caution of the decision,
 * with the forecast's warnings); the reproducibility footer. Every argument that holds user text is
 * escaped here.
 */
import type { ForecastFile } from "../forecast/forecastFile.js";
import type { DecisionFile } from "../weigh/decisionFile.js";
import { type ChartTable, type ReportChart } from "./charts.js";
import {
  countInWords,
  formatChance,
  formatCount,
  formatExactScore,
  formatOdds,
  formatMoney,
  formatMonths,
  formatNumber,
  formatProbability,
  formatScore,
  likelyRange,
  scoreStyle,
  type MetricInfo,
  type ScoreStyle,
} from "../format.js";
import {
  beyondLimitsTag,
  factsOfDecision,
  informationSentence,
  peopleCaution,
  recommendationSentence,
  stopSentence,
} from "../weigh/decisionWords.js";
import { planFacts } from "./planFacts.js";
import type { ReportInput } from "./reportInput.js";

import { escapeHtml } from "./pageSecurity.js";
import { factorInWords, sensitivityOf } from "./charts.js";
import { largestProjection, metricOf, sortedRows } from "./reportWords.js";

export function headerSection(title: string, headlineText: string): string {
  return `<header>
<p class="eyebrow">Is more data worth it?</p>
<h1>${escapeHtml(title)}</h1>
<p class="headline">${escapeHtml(headlineText)}</p>
</header>`;
}

export function meaningSection(input: ReportInput, info: MetricInfo): string {
  const { forecast, decision, currency } = input;
  const sentences = [
    `Each faint dot in the first chart is the ${info.inSentence} of one model trained on a random subsample ` +
      `of the data and scored on rows it did not see (cross-validation). The curve fitted through them shows ` +
      `how ${info.inSentence} changes with more training samples; to the right of the largest measured size ` +
      `(${formatCount(forecast.largestMeasuredSize)} samples) it is a projection, not a measurement.`,
    `“Likely” means the ${likelyRange(forecast.level)}: the expected ${info.inSentence} of a model trained at ` +
      `that size lies in it ${formatOdds(forecast.level)} times, given how much the measurements scatter; one ` +
      `particular model, scored on one particular test set, can land outside it.`,
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
    const words = factsOfDecision(decision);
    sentences.push(
      `Each further run adds ${formatCount(decision.expectedYieldPerRun ?? facts.samplesPerRun)} labelled samples and costs ` +
        `${formatMoney(plan.costPerRun, currency)}. The expected net value counts ${unit} of ` +
        `${info.inSentence} gained as worth ${formatMoney(facts.valuePerPoint, currency)} and subtracts the cost ` +
        `of the runs.`,
      recommendationSentence(words, { currency }),
    );
    const chance = rows.find((row) => row.runs === decision.recommendedRuns)?.probabilityNetPositive;
    if (decision.recommendedRuns > 0 && chance !== undefined) {
      sentences.push(`The chance that their value exceeds their cost is ${formatProbability(chance)}.`);
    }
    const stop = stopSentence(words, { currency });
    if (stop) sentences.push(stop);
    const information = informationSentence(decision.valueOfInformation, { currency });
    if (information) sentences.push(information);
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
    "Try other numbers: the cost and value sliders under this chart set the cost per run and the value of a point. The bars " +
    "and the recommendation follow at once; the table below stays at the plan's values.",
};

/** One chart: an empty container that the bootstrap script fills, its text alternative and its numbers. */
export function chartFigure(chart: ReportChart): string {
  const note = chartNotes[chart.id];
  return `<figure class="chart-figure" id="figure-${escapeHtml(chart.id)}">
<div class="chart" id="${escapeHtml(chart.id)}" role="img" aria-label="${escapeHtml(chart.title)}" aria-describedby="${escapeHtml(chart.id)}-caption"></div>
${note ? `<p class="chart-note">${escapeHtml(note)}</p>\n` : ""}<figcaption id="${escapeHtml(chart.id)}-caption">${escapeHtml(chart.description)}</figcaption>
${chartDataTable(chart.table)}
</figure>`;
}

export function chartsSection(charts: ReportChart[], input: ReportInput): string {
  const steady = steadyAdviceSentence(input, charts);
  return `<section id="charts">
<h2>Charts</h2>
${charts.map(chartFigure).join("\n")}${steady ? `\n<p id="sensitivity-note">${escapeHtml(steady)}</p>` : ""}
<noscript><p class="note">The charts need JavaScript; the captions and tables above say what they show.</p></noscript>
</section>`;
}

/**
 * When the decision has a sensitivity analysis but no assumption moved ±25% changes the advice (so
 * there is no chart of it), the sentence that says so.
 */
function steadyAdviceSentence(input: ReportInput, charts: readonly ReportChart[]): string | undefined {
  const { decision } = input;
  const factors = decision ? sensitivityOf(decision) : undefined;
  if (!decision || !factors || charts.some((chart) => chart.id === "chart-sensitivity")) return undefined;
  const tried = factors
    .filter((f) => f.low !== null || f.high !== null)
    .map((f) => factorInWords(f.factor).toLowerCase());
  if (tried.length === 0) return undefined;
  const list = tried.length === 1 ? tried[0] : `${tried.slice(0, -1).join(", ")} and ${tried[tried.length - 1]}`;
  const runs = decision.recommendedRuns;
  return (
    `What could change the advice: nothing within 25%. Setting the ${list} 25% lower or higher, one at a time, ` +
    `leaves the advice at ${runs === 0 ? "no further run" : `${countInWords(runs)} further ${runs === 1 ? "run" : "runs"}`}.`
  );
}

/** A gain in the metric's units as a signed amount: "+0.9 points" (percentage points) or "+0.004". */
function signedGain(gain: number, info: MetricInfo, style: ScoreStyle): string {
  const text = info.isFraction ? `${formatNumber(100 * Math.abs(gain), 1)} points` : formatScore(Math.abs(gain), style);
  const shownAsZero = /^[0.]+( points)?$/.test(text);
  return shownAsZero ? text : `${gain > 0 ? "+" : "\u2212"}${text}`;
}

/** A value with its interval on a second, quieter line. */
function withRange(value: string, lower: string, upper: string): string {
  return `${value}<span class="range">${lower} to ${upper}</span>`;
}

export function decisionSection(input: ReportInput, info: MetricInfo): string {
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
  const level = likelyRange(decision.level);
  const money = currency ? ` (${escapeHtml(currency)})` : "";
  const head = [
    "Further runs",
    "Training samples",
    `Expected ${escapeHtml(info.inSentence)}<span class="range">${level}</span>`,
    "Gain from this run",
    ...(hasTarget ? ["Chance of reaching target"] : []),
    `Cost${money}`,
    "Months",
    `Expected net value${money}${hasInterval ? `<span class="range">${level}</span>` : ""}`,
    ...(hasChance ? ["Chance value exceeds cost"] : []),
  ];
  const body = rows.map((row, index) => {
    const recommended = row.runs === decision.recommendedRuns;
    const tags = [
      recommended ? `<span class="tag recommended-tag">recommended</span>` : "",
      row.affordable ? "" : `<span class="tag over-tag">${beyondLimitsTag(row)}</span>`,
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
        ? [
            `<td>${row.probabilityOfTarget === null ? "–" : formatChance(row.probabilityOfTarget, decision.plan.targetConfidence)}</td>`,
          ]
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

export function assumptionsSection(input: ReportInput, info: MetricInfo): string {
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

/**
 * The field of use the page speaks of, in this order: the report's own (`--domain`, or the study's
 * context), else the decision's (`domain` in decision.json: the plan's, or the one weigh was given),
 * else the plan's as echoed in the decision.
 */
export function reportDomain(input: ReportInput): string | undefined {
  const candidates = [input.domain, input.decision?.domain, input.decision?.plan.domain];
  return candidates.find((d): d is string => d !== undefined && d.trim() !== "")?.trim();
}

export function cautionsSection(input: ReportInput): string {
  const { forecast, decision } = input;
  const ratio = extrapolationRatio(forecast, decision);
  const cautions = [
    `Projections are not validation. The projected scores extend a curve fitted up to ` +
      `${formatCount(forecast.largestMeasuredSize)} training samples` +
      (ratio !== undefined && ratio > 1 ? ` to ${formatNumber(ratio, ratio < 10 ? 1 : 0)} times that size` : "") +
      `, and the further they reach past it, the more they rest on the assumptions above. A model trained ` +
      `on more data still has to be scored on data it has not seen before anyone relies on it.`,
    `Cross-validated scores describe data like this data set; another site, period or population can ` + `score lower.`,
  ];
  // Every caution of the decision, word for word; then the caution about people when the decision
  // does not already carry it (no decision, or a field of use given to the report alone).
  for (const caution of decision?.cautions ?? []) if (!cautions.includes(caution)) cautions.push(caution);
  const people = peopleCaution(reportDomain(input), decision?.plan.clinical !== undefined);
  if (people !== null && !cautions.some((c) => c.startsWith("This model informs decisions about people"))) {
    cautions.push(people);
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

export function reproducibilityFooter(input: ReportInput, charts: ReportChart[]): string {
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
    ...(reportDomain(input) !== undefined
      ? [`<dt>Field of use</dt><dd>${escapeHtml(reportDomain(input) as string)}</dd>`]
      : []),
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
