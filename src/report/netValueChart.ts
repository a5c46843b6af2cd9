/**
 * The net-value chart with its cost and value sliders: the expected net value of each number of further
 * runs, recomputed in the page from the cost per run and the value per point the reader sets, and the
 * recommendation that follows from them.
 */
import type { TopLevelSpec } from "vega-lite";
import type { DecisionFile, DecisionRow } from "../weigh/decisionFile.js";
import {
  moneyAxisTitle,
  moneyLabelExpression,
  moneyUnit,
  resolveChartOptions,
  stepLabel,
  vegaLiteSchema,
  type ChartOptions,
  type Layer,
} from "./chartOptions.js";
import { capitalize, describeMetric, formatMoney, formatOdds, formatProbability, likelyRange } from "../format.js";
import { planFacts } from "./planFacts.js";
import { chartConfig, palette } from "./theme.js";

/** The names of the chart's two slider parameters, as the page's controls carry them. */
export const whatIfParameters = { costPerRun: "costPerRun", valuePerPoint: "valuePerPoint" } as const;

/** The name of the text mark that states the recommendation (Vega names its marks `<name>_marks`). */
export const recommendationMarkName = "recommendation";

/**
 * A slider step for a control running from 0 to `max` that starts at `initial`: the largest of
 * 1, 2, 5 × 10^k that is at most a hundredth of `max` and divides `initial`, so that the starting
 * value is one of the slider's positions.
 */
export function sliderStep(initial: number, max: number): number {
  const coarsest = max / 100;
  let exponent = Math.floor(Math.log10(coarsest));
  for (let tries = 0; tries < 12; tries++, exponent--) {
    for (const mantissa of [5, 2, 1]) {
      const step = mantissa * 10 ** exponent;
      if (step > coarsest) continue;
      const multiple = initial / step;
      if (Math.abs(multiple - Math.round(multiple)) < 1e-9) return Number(step.toPrecision(12));
    }
  }
  return Number((max / 1000).toPrecision(12));
}

/** The upper end of a slider that starts at `initial`: three times it, or `fallback` when it is 0. */
function sliderMax(initial: number, fallback: number): number {
  const max = initial > 0 ? 3 * initial : fallback > 0 ? fallback : 1000;
  // Round up to two significant digits so the slider's end reads cleanly.
  const scale = 10 ** (Math.floor(Math.log10(max)) - 1);
  return Math.ceil(max / scale) * scale;
}

/** "(EUR)" or "" for labels and the recommendation text. */
function currencySuffix(currency: string | undefined): string {
  return currency ? ` ${currency}` : "";
}

/**
 * The expected net value of 0, 1, 2, ... further runs as bars (bluish green above zero, vermillion
 * below, faded when over budget or past the deadline), with the net value's interval as a whisker
 * when decision.json carries it, the recommended number of runs outlined and stated in words above
 * the plot.
 *
 * Cost and value sliders: two Vega-Lite parameters bound to range inputs, `costPerRun` and
 * `valuePerPoint`, start at the plan's values. The chart does not carry net values; it carries, per
 * row, the score gain in points (from the row's own net value: (expectedNetValue + cost) ÷
 * valuePerPoint, or the expected score's gain over today when the value per point is 0), the cost
 * that does not scale with the cost per run, and whether the row is within the deadline. Vega then
 * recomputes, as decision.json defines them,
 *   cost = otherCost + runs × costPerRun,
 *   net value = valuePerPoint × gain in points − cost,
 *   affordable = within the deadline and cost ≤ budget,
 * and the recommendation by decision.json's rules: among affordable rows (those reaching a clinical
 * minimum size, when one is set and some affordable row reaches it), the highest net value (the
 * fewest runs among equals), or for a plan valued only by its target, while the value per point is 0,
 * the fewest runs reaching the target with the asked confidence. Moving a control redraws the bars
 * and restates the recommendation with no server; at the plan's values the recommendation is
 * decision.json's.
 *
 * @param decision the weighed runs (decision.json)
 * @example
 * const spec = netValueChart(decision, { currency: "EUR" });
 * // spec.params.map((p) => p.name) → ["costPerRun", "valuePerPoint"]
 */
export function netValueChart(decision: DecisionFile, options: ChartOptions = {}): TopLevelSpec {
  const resolved = resolveChartOptions(options);
  const info = describeMetric(decision.metric, decision.higherIsBetter, resolved.metricRange);
  const plan = decision.plan;
  const sign = decision.higherIsBetter ? 1 : -1;
  const sorted = [...decision.table].sort((a, b) => a.runs - b.runs);
  const today = sorted.find((row) => row.runs === 0) ?? sorted[0];
  const valuePerPoint = planFacts(plan).valuePerPoint;
  const hasInterval =
    sorted.length > 0 && sorted.every((row) => row.netValueLower !== undefined && row.netValueUpper !== undefined);
  const suffix = currencySuffix(resolved.currency);

  /** Points of score gained when a row's value is `value` (money) at the plan's value per point. */
  const points = (value: number, row: DecisionRow) =>
    valuePerPoint > 0
      ? (value + row.cost) / valuePerPoint
      : 100 * sign * (row.expected - (today?.expected ?? row.expected));

  const rows = sorted.map((row) => {
    const budgetOk = plan.budget === undefined || row.cost <= plan.budget;
    return {
      runs: row.runs,
      step: stepLabel(row.runs),
      trainingSize: row.trainingSize,
      gain: points(row.expectedNetValue, row),
      ...(hasInterval
        ? { gainLower: points(row.netValueLower!, row), gainUpper: points(row.netValueUpper!, row) }
        : {}),
      otherCost: row.cost - row.runs * plan.costPerRun,
      // A row the plan rules out for a reason other than money (the deadline) stays ruled out.
      withinDeadline: row.withinDeadline ?? (row.affordable || !budgetOk),
      reachesTarget: row.probabilityOfTarget !== null && row.probabilityOfTarget >= plan.targetConfidence,
      ...(row.probabilityNetPositive !== undefined ? { probabilityNetPositive: row.probabilityNetPositive } : {}),
      currencySuffix: suffix,
    };
  });
  const steps = rows.map((row) => row.step);

  const costMax = sliderMax(plan.costPerRun, valuePerPoint);
  const valueMax = sliderMax(valuePerPoint, plan.costPerRun);
  const moneyValues = sorted.flatMap((row) => [
    row.expectedNetValue,
    ...(hasInterval ? [row.netValueLower!, row.netValueUpper!] : []),
  ]);
  const unit = moneyUnit(moneyValues);
  const currencyLabel = resolved.currency ? ` (${resolved.currency})` : "";
  const pointWords = info.isFraction ? "percentage point" : "0.01";

  // The rules of decision.json's recommendation (src/weigh/decisionTable.ts), restated for Vega:
  // affordable = within the deadline and the budget; a clinical minimum size is a floor when some
  // affordable row reaches it; then the highest net value (the fewest runs among equals), or, for a
  // plan valued by its target alone while the value per point stays 0, the fewest runs reaching the
  // target with the asked confidence (else the fewest runs).
  const budgetTest =
    plan.budget === undefined ? "" : ` && datum.cost <= ${plan.budget} + 1e-9 * max(1, ${plan.budget})`;
  const minimum = decision.clinical?.participants;
  const byTarget = decision.valueBasis === "target" && plan.target !== undefined;
  const transform = [
    { calculate: `datum.otherCost + datum.runs * ${whatIfParameters.costPerRun}`, as: "cost" },
    { calculate: `${whatIfParameters.valuePerPoint} * datum.gain - datum.cost`, as: "netValue" },
    ...(hasInterval
      ? [
          { calculate: `${whatIfParameters.valuePerPoint} * datum.gainLower - datum.cost`, as: "netValueLower" },
          { calculate: `${whatIfParameters.valuePerPoint} * datum.gainUpper - datum.cost`, as: "netValueUpper" },
        ]
      : []),
    { calculate: `datum.withinDeadline${budgetTest}`, as: "affordable" },
    {
      calculate: minimum === undefined ? "true" : `datum.trainingSize >= ${minimum}`,
      as: "meetsMinimum",
    },
    { calculate: "datum.affordable && datum.meetsMinimum ? 1 : 0", as: "affordableMinimum" },
    { joinaggregate: [{ op: "max" as const, field: "affordableMinimum", as: "floorHolds" }] },
    { calculate: "datum.affordable && (datum.floorHolds === 0 || datum.meetsMinimum)", as: "candidate" },
    { calculate: "datum.candidate ? datum.netValue : null", as: "candidateValue" },
    { calculate: "datum.candidate ? datum.runs : null", as: "candidateRuns" },
    { calculate: "datum.candidate && datum.reachesTarget ? datum.runs : null", as: "reachingRuns" },
    {
      joinaggregate: [
        { op: "max" as const, field: "candidateValue", as: "best" },
        { op: "min" as const, field: "candidateRuns", as: "fewestRuns" },
        { op: "min" as const, field: "reachingRuns", as: "fewestReaching" },
      ],
    },
    {
      calculate: "datum.candidate && datum.netValue >= datum.best - 1e-9 * max(1, abs(datum.best)) ? datum.runs : null",
      as: "bestRuns",
    },
    { joinaggregate: [{ op: "min" as const, field: "bestRuns", as: "bestValueRuns" }] },
    {
      calculate: byTarget
        ? `${whatIfParameters.valuePerPoint} <= 0 ? (isValid(datum.fewestReaching) ? datum.fewestReaching : datum.fewestRuns) : datum.bestValueRuns`
        : "datum.bestValueRuns",
      as: "recommendedRuns",
    },
    { calculate: "datum.runs === datum.recommendedRuns", as: "recommended" },
    { calculate: "datum.netValue < 0 ? 'loss' : 'gain'", as: "sign" },
  ];

  const x = {
    field: "step",
    type: "ordinal" as const,
    scale: { domain: steps },
    axis: { title: "Further runs", labelAngle: 0 },
  };
  const y = (field: string) => ({
    field,
    type: "quantitative" as const,
    axis: {
      title: moneyAxisTitle("Expected net value", unit, resolved.currency),
      labelExpr: moneyLabelExpression(unit),
      tickCount: 6,
    },
  });
  const tooltip = [
    { field: "runs", type: "quantitative" as const, title: "Further runs" },
    { field: "trainingSize", type: "quantitative" as const, title: "Training samples", format: ",.0f" },
    { field: "cost", type: "quantitative" as const, title: `Cost${currencyLabel}`, format: ",.0f" },
    { field: "netValue", type: "quantitative" as const, title: `Expected net value${currencyLabel}`, format: ",.0f" },
    ...(hasInterval
      ? [
          {
            field: "netValueLower",
            type: "quantitative" as const,
            title: `${capitalize(likelyRange(decision.level))}: from`,
            format: ",.0f",
          },
          {
            field: "netValueUpper",
            type: "quantitative" as const,
            title: `${capitalize(likelyRange(decision.level))}: to`,
            format: ",.0f",
          },
        ]
      : []),
    ...(rows.some((row) => "probabilityNetPositive" in row)
      ? [
          {
            field: "probabilityNetPositive",
            type: "quantitative" as const,
            title: "Chance the value exceeds the cost",
            format: ".0%",
          },
        ]
      : []),
  ];

  const layers: Layer[] = [
    {
      mark: { type: "bar", cornerRadiusEnd: 2, width: { band: 0.7 } },
      encoding: {
        x,
        y: y("netValue"),
        color: { condition: { test: "datum.sign === 'loss'", value: palette.loss }, value: palette.gain },
        opacity: { condition: { test: "datum.affordable", value: 0.9 }, value: 0.3 },
        tooltip,
      },
    },
  ];
  if (hasInterval) {
    layers.push({
      mark: { type: "rule", aria: false, strokeWidth: 1.5, color: palette.ink },
      encoding: { x, y: y("netValueLower"), y2: { field: "netValueUpper" } },
    });
  }
  layers.push(
    {
      transform: [{ filter: "datum.recommended" }],
      mark: { type: "bar", aria: false, fillOpacity: 0, stroke: palette.ink, strokeWidth: 2.5, width: { band: 0.7 } },
      encoding: { x, y: y("netValue") },
    },
    {
      data: { values: [{ zero: 0 }] },
      mark: { type: "rule", aria: false, color: palette.muted, strokeWidth: 1 },
      encoding: { y: { field: "zero", type: "quantitative" } },
    },
    {
      name: recommendationMarkName,
      transform: [
        { filter: "datum.recommended" },
        {
          calculate:
            "'Recommended: ' + (datum.runs === 0 ? 'no further run' : datum.runs + (datum.runs === 1 ? ' further run' : ' further runs'))" +
            " + ', expected net value ' + format(datum.netValue, ',.0f') + datum.currencySuffix",
          as: "recommendationText",
        },
      ],
      mark: {
        type: "text",
        align: "left",
        baseline: "bottom",
        dy: -10,
        fontSize: 14,
        fontWeight: 600,
        color: palette.ink,
      },
      encoding: { x: { value: 0 }, y: { value: 0 }, text: { field: "recommendationText" } },
    },
  );

  return {
    $schema: vegaLiteSchema,
    title: {
      text: "Expected net value of further runs",
      subtitle: [
        `Value of the expected gain in ${info.inSentence} minus the cost of the runs` +
          (hasInterval ? `; whiskers: ${likelyRange(decision.level)}.` : "."),
        "Outlined: recommended; faded: over budget or past the deadline.",
      ],
    },
    description: describeNetValue(decision, resolved.currency, pointWords),
    width: resolved.width,
    height: resolved.panelHeight + 50,
    config: chartConfig,
    params: [
      {
        name: whatIfParameters.costPerRun,
        value: plan.costPerRun,
        bind: {
          input: "range",
          min: 0,
          max: costMax,
          step: sliderStep(plan.costPerRun, costMax),
          name: `Cost per run${currencyLabel} `,
        },
      },
      {
        name: whatIfParameters.valuePerPoint,
        value: valuePerPoint,
        bind: {
          input: "range",
          min: 0,
          max: valueMax,
          step: sliderStep(valuePerPoint, valueMax),
          name: `Value of one ${pointWords} of ${info.inSentence}${currencyLabel} `,
        },
      },
    ],
    data: { values: rows },
    transform,
    layer: layers,
  };
}

/** The text alternative of the net-value chart. */
function describeNetValue(decision: DecisionFile, currency: string | undefined, pointWords: string): string {
  const rows = [...decision.table].sort((a, b) => a.runs - b.runs);
  if (rows.length === 0) return "No further runs were weighed.";
  const last = rows[rows.length - 1];
  const best = rows.reduce((a, b) => (b.expectedNetValue > a.expectedNetValue ? b : a));
  const recommended = rows.find((row) => row.runs === decision.recommendedRuns);
  const extras = recommended;
  const parts = [
    `Expected net value of 0 to ${last.runs} further runs at ${formatMoney(decision.plan.costPerRun, currency)} a run ` +
      `and ${formatMoney(planFacts(decision.plan).valuePerPoint, currency)} a ${pointWords}: highest at ${best.runs} ` +
      `(${formatMoney(best.expectedNetValue, currency)}).`,
    recommended && recommended.runs > 0
      ? `The recommendation is ${recommended.runs} (${formatMoney(recommended.expectedNetValue, currency)}` +
        (extras?.netValueLower !== undefined && extras.netValueUpper !== undefined
          ? `, likely between ${formatMoney(extras.netValueLower, currency)} and ${formatMoney(extras.netValueUpper, currency)} (${formatOdds(decision.level)})`
          : "") +
        `)` +
        (extras?.probabilityNetPositive !== undefined
          ? `, with a ${formatProbability(extras.probabilityNetPositive)} chance that the value exceeds the cost`
          : "") +
        "."
      : "The recommendation is no further run.",
    "Two sliders under the chart set the cost per run and the value per point; the bars and the recommendation follow them.",
  ];
  return parts.join(" ");
}
