/**
 * The decision table for 0..maxRuns further runs and the three rules read off it (recommended runs,
 * runs to the target, when to stop), computed draw by draw.
 *
 * Draw j of the forecast is one plausible learning curve s_j(n). In draw j the runs yield
 * Y_j1, Y_j2, ... samples (fixed, or sampled from the plan's yield model), so after k runs the model
 * trains on N_jk = today + Y_j1 + ... + Y_jk samples and scores s_j(N_jk). Every probability is a
 * share of draws, every interval a central quantile of draws at the forecast's level.
 *
 * Net value of k runs in draw j: valuePerPoint × 100 × sign × (s_j(N_jk) − s_j(today)) − cost(k),
 * sign = +1 when a higher score is better. The expected net value uses the point forecast's expected
 * score (averaged over the yields), as the foundation issue defined it.
 */
import { StreamPurpose, streamFor } from "../random.js";
import type { DecisionRow } from "./decisionFile.js";
import { costOfRuns, monthsOfRuns, type ResolvedPlan, type ValueBasis } from "./plan.js";
import type { ProjectionGrid } from "./projectionGrid.js";
import { runYield } from "./yields.js";
import { quantileSorted } from "../forecast/quantile.js";

/** What the table is computed from besides the plan. */
export interface TableContext {
  grid: ProjectionGrid;
  /** Samples behind today's model. */
  today: number;
  /** +1 when a higher score is better, −1 otherwise. */
  sign: number;
  /** Central probability of the intervals (the forecast's level). */
  level: number;
  /** Scores are clamped to this range after any change of the curve. */
  metricRange?: [number, number];
  /** Seed of the yield streams (the forecast's seed). */
  seed: number;
  /** Riley et al.'s minimum training size, when the plan gives clinical inputs. */
  clinicalMinimum?: number;
}

/** Changes to the curve, for sensitivity analysis. */
export interface CurveChange {
  /**
   * Every draw's gain over today's score is multiplied by this factor (1: unchanged). For the inverse
   * power law this is exactly a change of the gap between the asymptote and today's score by the same
   * factor, with the exponent and today's score kept (see sensitivity.ts).
   */
  gainScale: number;
}

export interface TableResult {
  rows: DecisionRow[];
  recommendedRuns: number;
  runsToTarget: number | null;
  stopAfterRuns: number | null;
  /** Why the stopping rule stops where it does. */
  stopBecause: "notWorthIt" | "overBudget" | "pastDeadline" | "lastRun" | "noValue";
  /** The clinical minimum moved the recommendation (to more runs than net value alone would choose). */
  recommendationFollowsClinicalMinimum: boolean;
  /** No affordable row reaches the clinical minimum. */
  clinicalMinimumUnaffordable: boolean;
}

/**
 * Training size of each draw after 0..maxRuns runs: sizes[j][k]. The same streams serve every call,
 * so a sensitivity run with a scaled yield meets the same luck (common random numbers).
 */
export function drawnSizes(resolved: ResolvedPlan, context: TableContext): number[][] {
  const { maxRuns } = resolved.plan;
  return Array.from({ length: context.grid.drawCount }, (_, j) => {
    const stream = streamFor(context.seed, StreamPurpose.runYield, j);
    const sizes = [context.today];
    for (let runs = 1; runs <= maxRuns; runs++) sizes.push(sizes[runs - 1] + runYield(resolved.yieldModel, stream));
    return sizes;
  });
}

/**
 * Computes the rows and the rules.
 * @param change a change of the curve (sensitivity); none by default
 */
export function weighTable(
  resolved: ResolvedPlan,
  context: TableContext,
  change: CurveChange = { gainScale: 1 },
): TableResult {
  const { plan, valuePerPoint } = resolved;
  const { grid, sign, today } = context;
  const draws = grid.drawCount;
  const sizes = drawnSizes(resolved, context);
  const fixedYield = resolved.yieldModel.kind === "fixed";
  const unchanged = change.gainScale === 1;
  const clamp = clampTo(context.metricRange);
  const todayDraws = Array.from({ length: draws }, (_, j) => grid.drawAt(today, j));
  const todayExpected = grid.expectedAt(today);
  const changed = (value: number, base: number) =>
    unchanged ? value : clamp(base + change.gainScale * (value - base));
  const lowerProbability = (1 - context.level) / 2;
  const upperProbability = (1 + context.level) / 2;

  const rows: DecisionRow[] = [];
  for (let runs = 0; runs <= plan.maxRuns; runs++) {
    const cost = costOfRuns(resolved, runs);
    const months = monthsOfRuns(resolved, runs);
    const scores = new Array<number>(draws);
    let expectedSum = 0;
    for (let j = 0; j < draws; j++) {
      const size = sizes[j][runs];
      scores[j] = changed(grid.drawAt(size, j), todayDraws[j]);
      if (!fixedYield) expectedSum += changed(grid.expectedAt(size), todayExpected);
    }
    const nominalSize = today + runs * resolved.expectedYield;
    // A fixed yield reaches one size in every draw: read the point forecast there, without averaging.
    const expected =
      runs === 0
        ? todayExpected
        : fixedYield
          ? changed(grid.expectedAt(nominalSize), todayExpected)
          : expectedSum / draws;
    let lower: number;
    let upper: number;
    const projection = fixedYield && unchanged ? grid.projectionAt(nominalSize) : undefined;
    if (projection !== undefined) {
      ({ lower, upper } = projection);
    } else {
      const sorted = scores.slice().sort((a, b) => a - b);
      lower = quantileSorted(sorted, lowerProbability);
      upper = quantileSorted(sorted, upperProbability);
    }
    const netValues = scores.map((score, j) => valuePerPoint * 100 * sign * (score - todayDraws[j]) - cost);
    const sortedNet = netValues.slice().sort((a, b) => a - b);
    const withinBudget = plan.budget === undefined || cost <= plan.budget;
    const withinDeadline = plan.deadlineMonths === undefined || months <= plan.deadlineMonths;
    const previous = rows[runs - 1];
    rows.push({
      runs,
      trainingSize: fixedYield ? nominalSize : Math.round(nominalSize),
      expected,
      lower,
      upper,
      probabilityOfTarget: plan.target === undefined ? null : shareAtLeast(scores, plan.target, sign),
      cost,
      months,
      expectedNetValue: valuePerPoint * 100 * sign * (expected - todayExpected) - cost,
      affordable: withinBudget && withinDeadline,
      marginalGain: previous === undefined ? 0 : sign * (expected - previous.expected),
      netValueLower: quantileSorted(sortedNet, lowerProbability),
      netValueUpper: quantileSorted(sortedNet, upperProbability),
      probabilityNetPositive: netValues.filter((v) => v > 0).length / draws,
      withinBudget,
      withinDeadline,
    });
  }
  return { rows, ...rules(rows, resolved, context) };
}

/** Recommended runs, runs to the target and the stopping rule, from the rows. */
function rules(rows: DecisionRow[], resolved: ResolvedPlan, context: TableContext): Omit<TableResult, "rows"> {
  const { plan } = resolved;
  const confidence = plan.targetConfidence;
  const reaching =
    plan.target === undefined ? undefined : rows.find((row) => (row.probabilityOfTarget as number) >= confidence);

  // The clinical minimum is a floor where an affordable row reaches it.
  const minimum = context.clinicalMinimum;
  const meetsMinimum = (row: DecisionRow) => minimum === undefined || row.trainingSize >= minimum;
  const affordable = rows.filter((row) => row.affordable);
  const floorHolds = minimum !== undefined && affordable.some(meetsMinimum);
  const candidates = floorHolds ? affordable.filter(meetsMinimum) : affordable;

  const choose = (among: DecisionRow[]): number => chooseRuns(among, resolved.valueBasis, confidence);
  const recommendedRuns = choose(candidates);

  // Stopping rule: after `runs` runs, stop when the next run is not affordable, or when no further
  // number of runs within the budget and deadline is expected to add a gain worth more than what it
  // adds to the cost. Looking past the next run matters when the first run carries a fixed cost (or
  // gains come late): one run may not pay for itself while three do. With expected gains that shrink
  // run by run and a constant cost per run it is the one-step look-ahead rule.
  let stopAfterRuns: number | null = null;
  let stopBecause: TableResult["stopBecause"] = "noValue";
  if (resolved.valueBasis !== "target") {
    stopAfterRuns = plan.maxRuns;
    stopBecause = "lastRun";
    for (let runs = 0; runs < plan.maxRuns; runs++) {
      const next = rows[runs + 1];
      if (!next.withinBudget || !next.withinDeadline) {
        stopAfterRuns = runs;
        stopBecause = next.withinBudget ? "pastDeadline" : "overBudget";
        break;
      }
      let gain = 0;
      let worthContinuing = false;
      for (let further = runs + 1; further <= plan.maxRuns; further++) {
        const row = rows[further];
        if (!row.withinBudget || !row.withinDeadline) break;
        gain += row.marginalGain as number;
        if (resolved.valuePerPoint * 100 * gain > row.cost - rows[runs].cost) {
          worthContinuing = true;
          break;
        }
      }
      if (!worthContinuing) {
        stopAfterRuns = runs;
        stopBecause = "notWorthIt";
        break;
      }
    }
  }
  return {
    recommendedRuns,
    runsToTarget: reaching ? reaching.runs : null,
    stopAfterRuns,
    stopBecause,
    recommendationFollowsClinicalMinimum: floorHolds && choose(affordable) !== recommendedRuns,
    clinicalMinimumUnaffordable: minimum !== undefined && !floorHolds,
  };
}

/**
 * The recommendation among some rows: with a value per point, the row of highest expected net value;
 * for a target-only plan, the fewest runs that reach the target with the asked confidence (else the
 * first row).
 */
export function chooseRuns(among: readonly DecisionRow[], valueBasis: ValueBasis, confidence: number): number {
  if (valueBasis === "target") {
    const first = among.find((row) => (row.probabilityOfTarget as number) >= confidence);
    return first?.runs ?? among[0]?.runs ?? 0;
  }
  let best: DecisionRow | undefined;
  for (const row of among) if (best === undefined || row.expectedNetValue > best.expectedNetValue) best = row;
  return best?.runs ?? 0;
}

/** Share of values at or past the target in the better direction. */
export function shareAtLeast(values: readonly number[], target: number, sign: number): number {
  let hits = 0;
  for (const value of values) if (sign * (value - target) >= 0) hits++;
  return hits / values.length;
}

function clampTo(range: [number, number] | undefined): (score: number) => number {
  if (range === undefined) return (score) => score;
  return (score) => Math.min(range[1], Math.max(range[0], score));
}
