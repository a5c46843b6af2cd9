/**
 * Weighs further runs: for 0..maxRuns more runs, what the model is expected to score, how likely it
 * is to reach the target, what it costs, and the expected net value; then the recommendation.
 *
 * Uncertainty comes from the forecast's draws: draw j of every projection is one plausible curve,
 * so a probability is the share of draws that meet a condition.
 */
import { DataError } from "../errors.js";
import type { ForecastFile, Projection } from "../forecast/forecastFile.js";
import { message } from "../messages.js";
import type { DecisionFile, DecisionRow } from "./decisionFile.js";
import type { Plan } from "./plan.js";

/** Samples behind today's model when the plan does not say: the curve's rows, else its largest size. */
export function currentSamples(plan: Plan, forecast: ForecastFile): number {
  return plan.currentSamples ?? forecast.rows ?? forecast.largestMeasuredSize;
}

/** Training sizes after 0..maxRuns further runs. */
export function plannedSizes(plan: Plan, forecast: ForecastFile): number[] {
  const today = currentSamples(plan, forecast);
  return Array.from({ length: plan.maxRuns + 1 }, (_, runs) => today + runs * plan.samplesPerRun);
}

/**
 * Builds the decision table and recommendation.
 * @param forecastFileName for messages
 * @throws DataError naming the training sizes the forecast lacks
 */
export function weighRuns(forecast: ForecastFile, plan: Plan, forecastFileName = "forecast"): DecisionFile {
  const sizes = plannedSizes(plan, forecast);
  const bySize = new Map(forecast.projections.map((p) => [p.trainingSize, p]));
  const missing = sizes.filter((size) => !bySize.has(size));
  if (missing.length > 0) throw new DataError(message.missingProjections(forecastFileName, missing, sizes));
  const projections = sizes.map((size) => bySize.get(size) as Projection);
  // Orientation: +1 when a higher score is better, so that `sign * difference` is always a gain.
  const sign = forecast.higherIsBetter ? 1 : -1;
  const today = projections[0];

  const table: DecisionRow[] = projections.map((p, runs) => {
    const cost = runs * plan.costPerRun;
    const months = runs * plan.monthsPerRun;
    const gain = sign * (p.expected - today.expected);
    return {
      runs,
      trainingSize: p.trainingSize,
      expected: p.expected,
      lower: p.lower,
      upper: p.upper,
      probabilityOfTarget: plan.target === undefined ? null : shareReaching(p, plan.target, sign),
      cost,
      months,
      expectedNetValue: plan.valuePerPoint * 100 * gain - cost,
      affordable: plan.budget === undefined || cost <= plan.budget,
    };
  });

  let recommended = table[0];
  for (const row of table) {
    if (row.affordable && row.expectedNetValue > recommended.expectedNetValue) recommended = row;
  }
  const reaching =
    plan.target === undefined
      ? undefined
      : table.find((row) => (row.probabilityOfTarget as number) >= plan.targetConfidence);

  return {
    kind: "headroom-decision",
    version: 1,
    metric: forecast.metric,
    higherIsBetter: forecast.higherIsBetter,
    level: forecast.level,
    plan,
    recommendedRuns: recommended.runs,
    runsToTarget: reaching ? reaching.runs : null,
    reasons: {
      recommendedRuns: recommendationReason(recommended, table, plan),
      runsToTarget: plan.target === undefined ? null : targetReason(reaching, plan),
    },
    table,
  };
}

function shareReaching(p: Projection, target: number, sign: number): number {
  if (p.draws.length === 0) return sign * (p.expected - target) >= 0 ? 1 : 0;
  let hits = 0;
  for (const value of p.draws) if (sign * (value - target) >= 0) hits++;
  return hits / p.draws.length;
}

function recommendationReason(row: DecisionRow, table: DecisionRow[], plan: Plan): string {
  if (row.runs === 0) {
    const next = table[1];
    return next && !next.affordable
      ? "No further run fits within the budget."
      : "No number of further runs is expected to add more value than it costs.";
  }
  const within = plan.budget === undefined ? `up to ${plan.maxRuns} runs` : "the runs the budget allows";
  return `${row.runs} further run${row.runs === 1 ? " gives" : "s give"} the highest expected net value (${Math.round(row.expectedNetValue)}) among ${within}.`;
}

function targetReason(row: DecisionRow | undefined, plan: Plan): string {
  const confidence = `${Math.round(plan.targetConfidence * 100)}%`;
  return row === undefined
    ? `Within ${plan.maxRuns} further runs the target is not reached with ${confidence} probability.`
    : `${row.runs} further run${row.runs === 1 ? "" : "s"} reach the target with at least ${confidence} probability (${Math.round((row.probabilityOfTarget as number) * 100)}%).`;
}
