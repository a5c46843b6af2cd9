/**
 * The sensitivity chart (a tornado): how far the expected net value of the recommendation moves, and
 * whether the recommended number of runs changes, when one assumption at a time is set lower or
 * higher.
 */
import type { TopLevelSpec } from "vega-lite";
import type { DecisionFile } from "../weigh/decisionFile.js";
import {
  moneyAxisTitle,
  moneyLabelExpression,
  moneyUnit,
  resolveChartOptions,
  vegaLiteSchema,
  type ChartOptions,
  type Layer,
} from "./chartOptions.js";
import { formatMoney } from "../format.js";
import { chartConfig, palette } from "./theme.js";

/** The recommendation and its expected net value when one factor is moved. */
export interface SensitivityOutcome {
  /** The relative change of the factor (−0.25 for 25% lower), when stated. */
  change?: number;
  recommendedRuns: number;
  /** Expected net value of the runs then recommended. */
  netValue: number;
}

/**
 * One factor of the sensitivity analysis (decision.json's `sensitivity` entries): the outcome with
 * the factor set lower and higher; a side is null when it could not be computed.
 */
export interface SensitivityFactor {
  /** The plan key or curve parameter moved ("costPerRun", "asymptote", ...). */
  factor: string;
  low: SensitivityOutcome | null;
  high: SensitivityOutcome | null;
  /** How the factor was moved, or why a side is missing. */
  note?: string;
}

/** The factors' names in words; an unknown key is spelled out from its camelCase. */
const factorWords: Record<string, string> = {
  costPerRun: "Cost per run",
  samplesPerRun: "Samples per run",
  valuePerPoint: "Value per point",
  asymptote: "Room left to improve",
  monthsPerRun: "Months per run",
  fixedCost: "Fixed cost",
  passRate: "Share passing quality control",
};

/** "costPerRun" → "Cost per run"; "value_per_point" → "Value per point". */
export function factorInWords(factor: string): string {
  const known = factorWords[factor];
  if (known) return known;
  const words = factor
    .replace(/([a-z0-9])([A-Z])/g, "$1 $2")
    .replace(/[_-]+/g, " ")
    .trim()
    .toLowerCase();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/**
 * The legend's words for one side: "25% lower" when every factor moved by the same stated change,
 * otherwise "Set lower" / "Set higher".
 */
function directionWords(factors: readonly SensitivityFactor[], side: "low" | "high"): string {
  const changes = new Set(factors.map((f) => f[side]?.change).filter((c): c is number => typeof c === "number"));
  if (changes.size === 1) {
    const [change] = [...changes];
    const percent = Number((100 * Math.abs(change)).toPrecision(3));
    return `${percent}% ${side === "low" ? "lower" : "higher"}`;
  }
  return side === "low" ? "Set lower" : "Set higher";
}

/** "2 runs", "1 run", "no run". */
function runsShort(runs: number): string {
  return runs === 0 ? "no run" : `${runs} ${runs === 1 ? "run" : "runs"}`;
}

/**
 * A tornado chart: one row per factor, widest swing on top; from the expected net value of the
 * recommendation at the plan's values (a vertical rule) a bar reaches to the net value with the
 * factor set lower (sky blue) and one to the value with it set higher (orange). The label at each
 * bar's end names the number of runs recommended then, so a reader sees at once which assumption
 * can change the advice.
 *
 * @param factors the sensitivity analysis (decision.json's `sensitivity`)
 * @param baseNetValue the expected net value of the recommendation at the plan's values
 * @example
 * const spec = sensitivityChart(decision.sensitivity, decision, { currency: "EUR" });
 * // one row per factor, ordered by |high.netValue − low.netValue|, largest first
 */
export function sensitivityChart(
  factors: readonly SensitivityFactor[],
  decision: DecisionFile,
  options: ChartOptions = {},
): TopLevelSpec {
  const resolved = resolveChartOptions(options);
  const recommended = decision.table.find((row) => row.runs === decision.recommendedRuns);
  const base = recommended?.expectedNetValue ?? 0;
  const swing = (f: SensitivityFactor) =>
    Math.max(base, f.low?.netValue ?? base, f.high?.netValue ?? base) -
    Math.min(base, f.low?.netValue ?? base, f.high?.netValue ?? base);
  const ordered = [...factors].sort((a, b) => swing(b) - swing(a));
  const order = ordered.map((f) => factorInWords(f.factor));
  const direction = { low: directionWords(factors, "low"), high: directionWords(factors, "high") };
  const values = ordered.flatMap((f) =>
    (["low", "high"] as const).flatMap((side) => {
      const outcome = f[side];
      if (outcome === null) return [];
      return [
        {
          factor: factorInWords(f.factor),
          direction: direction[side],
          base,
          netValue: outcome.netValue,
          recommendedRuns: outcome.recommendedRuns,
          label: runsShort(outcome.recommendedRuns),
          // Which way the label goes: values within rounding of the base count as equal to it.
          side: outcome.netValue < base - 1e-6 * Math.max(1, Math.abs(base)) ? "below" : "above",
          changed: outcome.recommendedRuns !== decision.recommendedRuns,
        },
      ];
    }),
  );
  const unit = moneyUnit([base, ...values.map((v) => v.netValue)]);
  const currencyLabel = resolved.currency ? ` (${resolved.currency})` : "";
  const x = {
    field: "netValue",
    type: "quantitative" as const,
    axis: {
      title: moneyAxisTitle("Expected net value of the recommendation", unit, resolved.currency),
      labelExpr: moneyLabelExpression(unit),
      tickCount: 6,
    },
  };
  const y = { field: "factor", type: "nominal" as const, sort: order, axis: { title: null, labelLimit: 320 } };
  // The labels at the bars' ends: right of bars above the base, left of those below; bold when the
  // recommendation changes. A layer is added only when it has labels (an empty layer has no extent).
  const endLabels: Layer[] = [];
  for (const side of ["above", "below"] as const) {
    for (const changed of [false, true]) {
      if (!values.some((v) => v.side === side && v.changed === changed)) continue;
      endLabels.push({
        transform: [{ filter: `datum.side === '${side}' && datum.changed === ${changed}` }],
        mark: {
          type: "text",
          aria: false,
          align: side === "above" ? "left" : "right",
          dx: side === "above" ? 4 : -4,
          baseline: "middle",
          fontSize: 11,
          fontWeight: changed ? 700 : 400,
          color: changed ? palette.ink : palette.muted,
        },
        encoding: { x, y, text: { field: "label" } },
      });
    }
  }

  return {
    $schema: vegaLiteSchema,
    title: {
      text: "What could change the advice",
      subtitle: [
        "Each assumption set lower and higher, one at a time.",
        `Labels: the runs then recommended, bold when they differ from ${runsShort(decision.recommendedRuns)}.`,
      ],
    },
    description: describeSensitivity(ordered, decision, base, resolved.currency),
    width: resolved.width,
    height: { step: 34 },
    config: chartConfig,
    data: { values },
    layer: [
      {
        mark: { type: "bar", height: { band: 0.62 } },
        encoding: {
          x,
          x2: { field: "base" },
          y,
          color: {
            field: "direction",
            type: "nominal",
            scale: { domain: [direction.low, direction.high], range: [palette.band, palette.runs] },
            legend: { title: null },
          },
          tooltip: [
            { field: "factor", type: "nominal", title: "Assumption" },
            { field: "direction", type: "nominal", title: "Moved" },
            { field: "netValue", type: "quantitative", title: `Expected net value${currencyLabel}`, format: ",.0f" },
            { field: "recommendedRuns", type: "quantitative", title: "Runs recommended" },
          ],
        },
      },
      ...endLabels,
      {
        data: { values: [{ base }] },
        mark: { type: "rule", aria: false, color: palette.ink, strokeWidth: 1.5 },
        encoding: { x: { field: "base", type: "quantitative" } },
      },
    ],
  };
}

/** The text alternative of the tornado chart. */
function describeSensitivity(
  ordered: readonly SensitivityFactor[],
  decision: DecisionFile,
  base: number,
  currency: string | undefined,
): string {
  if (ordered.length === 0) return "No sensitivity analysis was made.";
  const parts = [
    `At the plan's values ${runsShort(decision.recommendedRuns)} ${decision.recommendedRuns > 1 ? "are" : "is"} ` +
      `recommended, with an expected net value of ${formatMoney(base, currency)}.`,
  ];
  for (const f of ordered) {
    const words = factorInWords(f.factor).toLowerCase();
    const side = (name: string, outcome: SensitivityOutcome | null) =>
      outcome === null
        ? `${name}: not computed`
        : `${name}: ${runsShort(outcome.recommendedRuns)}, ${formatMoney(outcome.netValue, currency)}`;
    parts.push(`With ${words} ${side("lower", f.low)}; ${side("higher", f.high)}.`);
  }
  return parts.join(" ");
}
