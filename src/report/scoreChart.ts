/**
 * The score chart: what each number of further runs is expected to do to the score, and to the
 * chance of reaching the plan's target.
 */
import type { TopLevelSpec } from "vega-lite";
import type { DecisionFile } from "../weigh/decisionFile.js";
import {
  axisFormat,
  resolveChartOptions,
  stepLabel,
  tooltipScoreFormat,
  vegaLiteSchema,
  type ChartOptions,
  type Layer,
  type Panel,
} from "./chartOptions.js";
import {
  describeMetric,
  formatChance,
  formatCount,
  formatExactScore,
  capitalize,
  formatOdds,
  likelyRange,
  formatProbability,
  formatScore,
  scoreStyle,
  type MetricInfo,
} from "../format.js";
import { chartConfig, palette } from "./theme.js";

/**
 * The wider interval of forecast.json: where the score of one model, trained at a size and scored on
 * a test set of `testSize` rows, is likely to land.
 */
export interface SingleModelInterval {
  testSize: number;
  bounds: ReadonlyArray<{ trainingSize: number; lower: number; upper: number }>;
}

/**
 * Expected score and chance of the target against further runs, in one or two panels sharing the
 * x axis "Further runs" (Now, +1, +2, ...):
 * 1. the expected score of the model trained after each number of runs, with its interval as a
 *    vertical bar, when known the wider single-model interval as a thin grey bar behind it, and the
 *    target as a dotted rule;
 * 2. when the plan has a target, the chance of reaching it (the share of the forecast's resampled
 *    curves that reach it), with the chance the plan asks for as a dotted rule.
 *
 * @param decision the weighed runs (decision.json)
 * @example
 * const spec = scoreChart(decision, { metricRange: [0, 1] });
 * // spec.vconcat.length → 2 when decision.plan.target is set, else 1
 */
export function scoreChart(
  decision: DecisionFile,
  options: ChartOptions = {},
  singleModel?: SingleModelInterval,
): TopLevelSpec {
  const resolved = resolveChartOptions(options);
  const info = describeMetric(decision.metric, decision.higherIsBetter, resolved.metricRange);
  const levelText = likelyRange(decision.level);
  const target = decision.plan.target;

  const singleBySize = new Map((singleModel?.bounds ?? []).map((b) => [b.trainingSize, b]));
  const rows = [...decision.table]
    .sort((a, b) => a.runs - b.runs)
    .map((row) => {
      const single = singleBySize.get(row.trainingSize);
      return {
        runs: row.runs,
        step: stepLabel(row.runs),
        trainingSize: row.trainingSize,
        expected: row.expected,
        lower: row.lower,
        upper: row.upper,
        ...(single ? { singleLower: single.lower, singleUpper: single.upper } : {}),
        probabilityOfTarget: row.probabilityOfTarget,
      };
    });
  const hasSingle = singleModel !== undefined && rows.some((row) => row.singleLower !== undefined);
  const steps = rows.map((row) => row.step);
  const scores = rows.flatMap((row) => [
    row.expected,
    row.lower,
    row.upper,
    ...(row.singleLower !== undefined && row.singleUpper !== undefined ? [row.singleLower, row.singleUpper] : []),
    ...(target !== undefined ? [target] : []),
  ]);
  const format = axisFormat(info, scores);
  const style = scoreStyle(info, scores);
  const tooltipFormat = tooltipScoreFormat(info, style.decimals);

  const x = {
    field: "step",
    type: "ordinal" as const,
    scale: { domain: steps },
    axis: { title: "Further runs", labelAngle: 0 },
  };
  const tooltip = [
    { field: "runs", type: "quantitative" as const, title: "Further runs" },
    { field: "trainingSize", type: "quantitative" as const, title: "Training samples", format: ",.0f" },
    { field: "expected", type: "quantitative" as const, title: `Expected ${info.inSentence}`, format: tooltipFormat },
    { field: "lower", type: "quantitative" as const, title: `${capitalize(levelText)}: from`, format: tooltipFormat },
    { field: "upper", type: "quantitative" as const, title: `${capitalize(levelText)}: to`, format: tooltipFormat },
  ];
  const scoreY = (field: string) => ({
    field,
    type: "quantitative" as const,
    scale: { zero: false, nice: true },
    axis: { title: info.title, ...(format ? { format } : {}), tickCount: 5 },
  });

  const scoreLayers: Layer[] = [
    ...(hasSingle
      ? [
          {
            transform: [{ filter: "isValid(datum.singleLower)" }],
            mark: { type: "rule" as const, aria: false, strokeWidth: 1.5, color: palette.fit, opacity: 0.8 },
            encoding: { x, y: scoreY("singleLower"), y2: { field: "singleUpper" } },
          },
        ]
      : []),
    {
      mark: { type: "rule", aria: false, strokeWidth: 3, color: palette.band },
      encoding: { x, y: scoreY("lower"), y2: { field: "upper" } },
    },
    {
      mark: {
        type: "line",
        strokeWidth: 2,
        color: palette.curve,
        point: { filled: true, size: 55, color: palette.curve },
      },
      encoding: { x, y: scoreY("expected"), tooltip },
    },
  ];
  if (target !== undefined) {
    const label = `Target ${formatExactScore(target, info)}`;
    scoreLayers.push(
      {
        data: { values: [{ target, label }] },
        mark: { type: "rule", aria: false, strokeDash: [2, 3], strokeWidth: 1.5, color: palette.target },
        encoding: { y: scoreY("target") },
      },
      {
        data: { values: [{ target, label }] },
        mark: { type: "text", aria: false, align: "left", baseline: "bottom", dx: 4, dy: -3, color: palette.target },
        encoding: { x: { value: 0 }, y: scoreY("target"), text: { field: "label" } },
      },
    );
  }
  const panels: Panel[] = [
    {
      title: { text: `Expected ${info.inSentence} with its ${levelText}`, fontSize: 13 },
      width: resolved.width,
      height: resolved.panelHeight,
      data: { values: rows },
      layer: scoreLayers,
    },
  ];

  if (target !== undefined) {
    const confidence = decision.plan.targetConfidence;
    panels.push({
      title: {
        text: `Chance of reaching the target of ${formatExactScore(target, info)}`,
        subtitle: `Dotted: the ${formatProbability(confidence)} chance the plan asks for`,
        fontSize: 13,
      },
      width: resolved.width,
      height: resolved.panelHeight,
      data: { values: rows.filter((row) => row.probabilityOfTarget !== null) },
      layer: [
        {
          mark: {
            type: "line",
            strokeWidth: 2,
            color: palette.probability,
            point: { filled: true, size: 55, color: palette.probability },
          },
          encoding: {
            x,
            y: {
              field: "probabilityOfTarget",
              type: "quantitative",
              scale: { domain: [0, 1] },
              axis: { title: "Chance", format: ".0%", tickCount: 5 },
            },
            tooltip: [
              { field: "runs", type: "quantitative", title: "Further runs" },
              { field: "probabilityOfTarget", type: "quantitative", title: "Chance of reaching target", format: ".0%" },
            ],
          },
        },
        {
          data: { values: [{ confidence }] },
          mark: { type: "rule", aria: false, strokeDash: [2, 3], strokeWidth: 1.5, color: palette.muted },
          encoding: { y: { field: "confidence", type: "quantitative" } },
        },
      ],
    });
  }

  return {
    $schema: vegaLiteSchema,
    title: {
      text: `What further runs are expected to do to ${info.inSentence}`,
      subtitle: [
        `Dots: expected ${info.inSentence}; blue bars: its ${levelText}.`,
        ...(hasSingle
          ? [
              `Thin grey bars: where one model, scored on ${formatCount(singleModel!.testSize)} test samples, ` +
                `lands ${formatOdds(decision.level)} times.`,
            ]
          : []),
      ],
    },
    description: describeScores(decision, info, hasSingle ? singleModel : undefined),
    config: chartConfig,
    spacing: 28,
    vconcat: panels,
  };
}

/** The text alternative of the score chart. */
function describeScores(decision: DecisionFile, info: MetricInfo, singleModel?: SingleModelInterval): string {
  const rows = [...decision.table].sort((a, b) => a.runs - b.runs);
  if (rows.length === 0) return "No further runs were weighed.";
  const style = scoreStyle(
    info,
    rows.flatMap((row) => [row.expected, row.lower, row.upper]),
    true,
  );
  const first = rows[0];
  const last = rows[rows.length - 1];
  const parts = [
    `Expected ${info.inSentence} goes from ${formatScore(first.expected, style)} now to ` +
      `${formatScore(last.expected, style)} after ${last.runs} further runs ` +
      `(likely between ${formatScore(last.lower, style)} and ${formatScore(last.upper, style)}, ${formatOdds(decision.level)}).`,
  ];
  const lastSingle = singleModel?.bounds.find((b) => b.trainingSize === last.trainingSize);
  if (singleModel && lastSingle) {
    parts.push(
      `One model trained then and scored on ${formatCount(singleModel.testSize)} test samples would likely score ` +
        `${formatScore(lastSingle.lower, style)} to ${formatScore(lastSingle.upper, style)}.`,
    );
  }
  if (decision.plan.target !== undefined && last.probabilityOfTarget !== null) {
    parts.push(
      `The chance of reaching the target of ${formatExactScore(decision.plan.target, info)} is ` +
        `${formatChance(first.probabilityOfTarget ?? 0, decision.plan.targetConfidence)} now and ` +
        `${formatChance(last.probabilityOfTarget, decision.plan.targetConfidence)} ` +
        `after ${last.runs} runs; the plan asks for ${formatProbability(decision.plan.targetConfidence)}.`,
    );
  }
  return parts.join(" ");
}
