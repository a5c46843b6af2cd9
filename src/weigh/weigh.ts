/**
 * Weighs further runs: for 0..maxRuns more runs, what the model is expected to score, how likely it
 * is to reach the target, what it costs, and the expected net value; then the recommendation, the
 * stopping rule, the value of information, the sensitivity, the validation-set size, the clinical
 * minimum and the cautions.
 *
 * Uncertainty comes from the forecast's draws: draw j of every projection is one plausible curve,
 * so a probability is the share of draws that meet a condition and an interval a quantile of draws.
 */
import { findMetric } from "../curve/metrics.js";
import { DataError } from "../errors.js";
import type { ForecastFile } from "../forecast/forecastFile.js";
import { message } from "../messages.js";
import { StreamPurpose, streamFor } from "../random.js";
import { clinicalSampleSize } from "./clinicalSampleSize.js";
import type {
  ClinicalFloor,
  DecisionFile,
  DecisionRow,
  PilotInformation,
  ValidationSize,
  ValueOfInformation,
} from "./decisionFile.js";
import { weighTable, type TableContext, type TableResult } from "./decisionTable.js";
import {
  clinicalSentence,
  informationSentence,
  peopleCaution,
  recommendationSentence,
  stopSentence,
  targetSentence,
  validationSentence,
  type DecisionFacts,
} from "./decisionWords.js";
import { costOfRuns, resolvePlan, type Plan, type ResolvedPlan } from "./plan.js";
import { ProjectionGrid } from "./projectionGrid.js";
import { sensitivityOfRecommendation } from "./sensitivity.js";
import { heldOutNeededExact, heldOutNeededWilson } from "./validationSize.js";
import { sampleInformationValue } from "./valueOfInformation.js";
import { scaledYield, sizesToProject } from "./yields.js";
import { mean } from "../numerics/statistics.js";

export interface WeighOptions {
  /**
   * What the model's decisions touch (the study's `context.domain`), when the plan has no `domain`.
   */
  domain?: string;
  /**
   * Preposterior simulations per pilot size for the value of information.
   * @default 4000
   */
  simulations?: number;
  /**
   * How messages name a key of the plan: `plan.json: target` for a plan file, `study.json: plan.target`
   * for a study's plan.
   * @default (key) => `plan ${key}`
   */
  planKey?: (key: string) => string;
}

/** Samples behind today's model when the plan does not say: the curve's rows, else its largest size. */
export function currentSamples(plan: Plan, forecast: ForecastFile): number {
  return plan.currentSamples ?? forecast.rows ?? forecast.largestMeasuredSize;
}

/** Training sizes after 0..maxRuns further runs at the expected yield. */
export function plannedSizes(plan: Plan, forecast: ForecastFile): number[] {
  const today = currentSamples(plan, forecast);
  const resolved = resolvePlan(plan);
  return Array.from({ length: plan.maxRuns + 1 }, (_, runs) => today + runs * resolved.expectedYield);
}

/**
 * Training sizes a forecast must project to for `weighRuns`: today + k × (fewest, expected, most)
 * samples per run, k = 0..maxRuns (`required`), and with them the sizes the ±25% yield sensitivity
 * reads (`all`, what `headroom study` forecasts at).
 */
export function sizesForForecast(plan: Plan, today: number): { required: number[]; all: number[] } {
  const resolved = resolvePlan(plan);
  const required = sizesToProject(resolved.yieldModel, today, plan.maxRuns);
  const all = new Set(required);
  for (const factor of [0.75, 1.25]) {
    for (const size of sizesToProject(scaledYield(resolved.yieldModel, factor), today, plan.maxRuns)) all.add(size);
  }
  return { required, all: [...all].sort((a, b) => a - b) };
}

/** Preposterior simulations per pilot size. */
const defaultSimulations = 4000;
/** Pilots weighed for the value of information: 1..this many runs. */
const largestPilot = 12;
/** Forecast draws used as the prior of the value of information (a systematic subsample beyond). */
const largestPriorDraws = 1000;
/** One-sided confidence of the validation-set lower bound. */
const validationConfidence = 0.95;

/**
 * Builds the decision.
 *
 * Phases: resolve the plan's defaults; check the forecast can be read at the sizes the plan reaches
 * (any size when it stores its curves; else it must project to each of them); the
 * table and its rules (decisionTable.ts); the clinical minimum; the value of information of pilots;
 * the sensitivity of the recommendation; the validation-set size; the reasons and cautions.
 *
 * @param forecastFileName for messages
 * @throws DataError naming the training sizes a forecast without stored curves lacks
 */
export function weighRuns(
  forecast: ForecastFile,
  plan: Plan,
  forecastFileName = "forecast",
  options: WeighOptions = {},
): DecisionFile {
  // Resolve and check.
  const resolved = resolvePlan(plan);
  const today = currentSamples(plan, forecast);
  const grid = new ProjectionGrid(forecast);
  const required = sizesToProject(resolved.yieldModel, today, plan.maxRuns);
  const projected = new Set(grid.sizes);
  const missing = grid.readsAnySize ? [] : required.filter((size) => !projected.has(size));
  if (missing.length > 0) throw new DataError(message.missingProjections(forecastFileName, missing, required));

  const metricRange = forecast.metricRange ?? findMetric(forecast.metric)?.range;
  const target = plan.target;
  if (target !== undefined && metricRange !== undefined && !(target >= metricRange[0] && target <= metricRange[1])) {
    const key = options.planKey ?? ((name: string) => `plan ${name}`);
    throw new DataError(`${key("target")}: ${message.targetOutsideRange(target, forecast.metric, metricRange)}`);
  }

  // Orientation: +1 when a higher score is better, so that `sign * difference` is always a gain.
  const sign = forecast.higherIsBetter ? 1 : -1;
  const clinical = plan.clinical === undefined ? undefined : clinicalSampleSize(plan.clinical);
  const context: TableContext = {
    grid,
    today,
    sign,
    level: forecast.level,
    metricRange,
    seed: forecast.seed,
    clinicalMinimum: clinical?.participants,
  };

  // The table and its rules.
  const result = weighTable(resolved, context);
  const { rows } = result;
  const clinicalFloor: ClinicalFloor | null =
    clinical === undefined
      ? null
      : { ...clinical, runsToMinimum: rows.find((row) => row.trainingSize >= clinical.participants)?.runs ?? null };

  // Value of information, sensitivity, validation size.
  const valueOfInformation = pilotInformation(resolved, context, options.simulations ?? defaultSimulations, forecast);
  const sensitivity = sensitivityOfRecommendation(resolved, context, forecast.asymptote ?? forecast.parameters?.a);
  const validation = validationSize(forecast, plan, rows[result.recommendedRuns], context.metricRange);

  const domain = decisionDomain(plan, options.domain);
  const facts: DecisionFacts = {
    plan,
    valueBasis: resolved.valueBasis,
    valuePerPoint: resolved.valuePerPoint,
    rows,
    recommendedRuns: result.recommendedRuns,
    runsToTarget: result.runsToTarget,
    stopAfterRuns: result.stopAfterRuns,
    stopBecause: result.stopBecause,
    clinical: clinicalFloor,
    followsClinicalMinimum: result.recommendationFollowsClinicalMinimum,
    clinicalMinimumUnaffordable: result.clinicalMinimumUnaffordable,
  };
  return {
    kind: "headroom-decision",
    version: 1,
    metric: forecast.metric,
    higherIsBetter: forecast.higherIsBetter,
    level: forecast.level,
    plan: { ...plan, samplesPerRun: resolved.collectedPerRun, valuePerPoint: resolved.valuePerPoint },
    recommendedRuns: result.recommendedRuns,
    runsToTarget: result.runsToTarget,
    stopAfterRuns: result.stopAfterRuns,
    reasons: {
      recommendedRuns: recommendationSentence(facts),
      runsToTarget: targetSentence(facts),
      stopAfterRuns: stopSentence(facts),
      valueOfInformation: informationSentence(valueOfInformation),
      validation: validationSentence(validation),
      clinical: clinicalSentence(facts),
    },
    table: rows,
    valueBasis: resolved.valueBasis,
    expectedYieldPerRun: resolved.expectedYield,
    valueOfInformation,
    sensitivity,
    validation,
    clinical: clinicalFloor,
    ...(domain === undefined ? {} : { domain }),
    cautions: cautions(forecast, plan, domain, result, clinicalFloor, context.metricRange),
  };
}

/**
 * Value of information of a pilot: the go/no-go decision on the rest of a programme.
 *
 * The programme is R further runs, the most that fit the budget and the deadline (at most maxRuns).
 * After a pilot of its first k runs (k = 1..min(R − 1, 12)) one decides whether to go on with the
 * remaining R − k runs (go) or to stop (no-go). Go pays U = valuePerPoint × 100 × sign ×
 * (s(N_R) − s(N_k)) − (cost(R) − cost(k)) over no-go. The pilot's measurement is the
 * cross-validated score at N_k, modeled as s(N_k) plus normal noise of sd τ_k. The EVSI of the pilot
 * is the value of deciding after seeing that score rather than now (valueOfInformation.ts), with the
 * forecast's draws as the prior, sizes at the expected yield.
 *
 * τ_k is the binomial standard error √(s(1 − s)/N_k) of a score that is a share of N_k samples each
 * scored once, for metrics between 0 and 1; for other metrics the spread of single fits at the
 * largest measured size, shrunk by √(largest measured size / N_k) — a cautious (large) noise.
 *
 * The staged plan's value is E[net value of k runs] + max(E[U], 0) + EVSI; committing now to all R
 * runs is worth E[net value of R runs] (both means over draws). A forecast with more than 1,000 draws
 * lends every stride-th of them to the prior, so the work stays near 1,000 × simulations per pilot.
 *
 * @returns null when the plan puts no value on a point of score, fewer than 2 runs are affordable or
 *   the forecast has fewer than 2 draws
 */
function pilotInformation(
  resolved: ResolvedPlan,
  context: TableContext,
  simulations: number,
  forecast: ForecastFile,
): ValueOfInformation | null {
  if (resolved.valueBasis === "target") return null;
  const { grid, sign, today } = context;
  const value = resolved.valuePerPoint * 100;
  // Affordability depends only on cost and months, which rise with runs.
  let programme = 0;
  for (let runs = 1; runs <= resolved.plan.maxRuns; runs++) {
    const cost = costOfRuns(resolved, runs);
    const months = Math.ceil(runs / resolved.parallelRuns) * resolved.plan.monthsPerRun;
    const { budget, deadlineMonths } = resolved.plan;
    if ((budget !== undefined && cost > budget) || (deadlineMonths !== undefined && months > deadlineMonths)) break;
    programme = runs;
  }
  if (programme < 2 || grid.drawCount < 2) return null;
  // Every stride-th draw, at most `largestPriorDraws` of them: the work grows with draws × simulations.
  const stride = Math.ceil(grid.drawCount / largestPriorDraws);
  const drawIndices = Array.from({ length: Math.ceil(grid.drawCount / stride) }, (_, i) => i * stride);
  const sizeAfter = (runs: number) => today + runs * resolved.expectedYield;
  const scoresAt = (size: number) => drawIndices.map((j) => grid.drawAt(size, j));
  const todayScores = scoresAt(today);
  const finalScores = scoresAt(sizeAfter(programme));
  const netOf = (scores: number[], runs: number) =>
    scores.map((score, j) => value * sign * (score - todayScores[j]) - costOfRuns(resolved, runs));
  const commitValue = mean(netOf(finalScores, programme));
  const isFraction = context.metricRange !== undefined && context.metricRange[0] === 0 && context.metricRange[1] === 1;
  const last = forecast.measured[forecast.measured.length - 1];

  const pilots: PilotInformation[] = [];
  for (let runs = 1; runs <= Math.min(programme - 1, largestPilot); runs++) {
    const size = sizeAfter(runs);
    const pilotScores = scoresAt(size);
    const expectedScore = grid.expectedAt(size);
    const observationSd = isFraction
      ? Math.sqrt(Math.max(expectedScore * (1 - expectedScore), 1e-6) / size)
      : Math.max(last?.standardDeviation ?? 0, 1e-9) * Math.sqrt((last?.trainingSize ?? size) / size);
    const rest = costOfRuns(resolved, programme) - costOfRuns(resolved, runs);
    const payoff = finalScores.map((score, j) => value * sign * (score - pilotScores[j]) - rest);
    const estimate = sampleInformationValue(
      payoff,
      pilotScores,
      observationSd,
      streamFor(context.seed, StreamPurpose.pilotValue, runs),
      simulations,
    );
    pilots.push({
      runs,
      observationSd,
      evsi: estimate.evsi,
      standardError: estimate.standardError,
      goOnNow: estimate.goNow,
      probabilityDecisionChanges: estimate.probabilityDecisionChanges,
      stagedValue: mean(netOf(pilotScores, runs)) + estimate.valueNow + estimate.evsi,
    });
  }
  return {
    decision:
      `After a pilot of the first k of ${programme} affordable further runs, go on with the rest or stop; ` +
      `the pilot's cross-validated score shows which curve is nearer the truth.`,
    programmeRuns: programme,
    commitValue,
    simulations,
    pilots,
  };
}

/**
 * Held-out samples needed to support the target with the recommended model (validationSize.ts).
 * @returns null without a target, or for a metric that is not a higher-is-better share between 0 and 1
 */
function validationSize(
  forecast: ForecastFile,
  plan: Plan,
  row: DecisionRow,
  metricRange: [number, number] | undefined,
): ValidationSize | null {
  if (plan.target === undefined || !forecast.higherIsBetter) return null;
  if (metricRange === undefined || metricRange[0] !== 0 || metricRange[1] !== 1) return null;
  return {
    target: plan.target,
    expectedScore: row.expected,
    runs: row.runs,
    confidence: validationConfidence,
    heldOutNeeded: heldOutNeededWilson(row.expected, plan.target, validationConfidence),
    heldOutNeededExact: heldOutNeededExact(row.expected, plan.target, validationConfidence),
    context:
      "Beleites et al. (Analytica Chimica Acta 760, 2013) found that 75 to 100 test samples are needed " +
      "to test a good classifier with useful precision; a score measured on fewer is too uncertain to " +
      "support a claim.",
  };
}

/**
 * The field the decision touches, from one order of sources: the plan's `domain` first (the plan
 * describes the decision), then the one given beside it (the study's `context.domain`, or weigh's
 * `--domain`). A `clinical` block with neither makes it "clinical". decision.json records the result
 * as `domain`, which the report reads when it is not given its own.
 */
export function decisionDomain(plan: Plan, given: string | undefined): string | undefined {
  const named = [plan.domain, given].find((d) => d !== undefined && d.trim() !== "");
  return named?.trim() ?? (plan.clinical !== undefined ? "clinical" : undefined);
}

function cautions(
  forecast: ForecastFile,
  plan: Plan,
  domain: string | undefined,
  result: TableResult,
  clinical: ClinicalFloor | null,
  metricRange: [number, number] | undefined,
): string[] {
  const list: string[] = [];
  const people = peopleCaution(domain, plan.clinical !== undefined);
  if (people !== null) list.push(people);
  if (clinical !== null && result.clinicalMinimumUnaffordable) {
    list.push(
      `No affordable number of runs reaches the minimum of ${clinical.participants} participants for a clinical ` +
        `prediction model; a model developed on fewer is likely to be overfitted.`,
    );
  }
  const isFraction = metricRange !== undefined && metricRange[0] === 0 && metricRange[1] === 1;
  if (resolvePlan(plan).valueBasis === "consequences" && !isFraction) {
    list.push(
      `The value of a point was derived from errors avoided, but ${forecast.metric} is not a share of cases ` +
        `between 0 and 1; check that a 0.01 change of it avoids 1% of the errors.`,
    );
  }
  return list;
}
