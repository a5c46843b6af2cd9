/**
 * The decision in sentences: the one place that turns a decision and its plan into words. `weigh`
 * writes these sentences into decision.json's `reasons` (without a currency), the command line
 * prints them, and the report shows the same sentences with the plan's currency.
 *
 * Each sentence names only the limits the plan sets (a budget, a deadline, both or neither), and is
 * true for every combination of them; numbers go through the shared formatter (src/format.ts).
 */
import { formatMoney, formatNumber, formatProbability } from "../format.js";
import { criterionInWords } from "./clinicalSampleSize.js";
import { chooseRuns } from "./decisionTable.js";
import type { ClinicalFloor, DecisionFile, DecisionRow, ValidationSize, ValueOfInformation } from "./decisionFile.js";
import type { Plan, ValueBasis } from "./plan.js";

/** Why the stopping rule stops where it does. */
export type StopCause = "notWorthIt" | "overBudget" | "pastDeadline" | "lastRun" | "noValue";

/** What the sentences are made from: the weighed rows and rules, with the plan's values filled in. */
export interface DecisionFacts {
  plan: Pick<Plan, "budget" | "deadlineMonths" | "maxRuns" | "targetConfidence" | "target">;
  valueBasis: ValueBasis;
  /** Value of one percentage point (0 for a target-only plan). */
  valuePerPoint: number;
  /** Rows for 0..maxRuns further runs, by runs. */
  rows: readonly DecisionRow[];
  recommendedRuns: number;
  runsToTarget: number | null;
  stopAfterRuns: number | null;
  stopBecause: StopCause;
  clinical: ClinicalFloor | null;
  /** The clinical minimum moved the recommendation to more runs than net value alone would choose. */
  followsClinicalMinimum: boolean;
  /** No affordable row reaches the clinical minimum. */
  clinicalMinimumUnaffordable: boolean;
}

/** How the sentences show amounts: with the plan's currency, when the reader's page knows it. */
export interface WordingOptions {
  currency?: string;
}

/** "1 further run", "3 further runs". */
export function plural(count: number, word: string): string {
  return `${formatNumber(count)} ${word}${count === 1 ? "" : "s"}`;
}

/** The limits the plan sets, in words: "the budget and the deadline", "the budget", "the deadline" or "". */
export function limitsInWords(plan: Pick<Plan, "budget" | "deadlineMonths">): string {
  if (plan.budget !== undefined && plan.deadlineMonths !== undefined) return "the budget and the deadline";
  if (plan.budget !== undefined) return "the budget";
  if (plan.deadlineMonths !== undefined) return "the deadline";
  return "";
}

/** The limits a row breaks, in words ("the budget", "the deadline", "the budget and the deadline"). */
export function limitsBroken(row: DecisionRow): string {
  const overBudget = row.withinBudget === false;
  const pastDeadline = row.withinDeadline === false;
  if (overBudget && pastDeadline) return "the budget and the deadline";
  if (overBudget) return "the budget";
  if (pastDeadline) return "the deadline";
  // Files of the first version say only `affordable`.
  return "the budget or the deadline";
}

/** A short tag for a row beyond the plan's limits: "over budget", "past deadline", "over budget and deadline". */
export function beyondLimitsTag(row: DecisionRow): string {
  const overBudget = row.withinBudget === false;
  const pastDeadline = row.withinDeadline === false;
  if (overBudget && pastDeadline) return "over budget and deadline";
  if (pastDeadline) return "past deadline";
  if (overBudget) return "over budget";
  return "over budget or deadline";
}

/** A probability as a whole percentage, as the plan states a confidence: "80%". */
function percent(probability: number): string {
  return formatProbability(probability);
}

/**
 * The facts of a decision file, for the report: the rules' causes are read back from the rows (the
 * next row's limits say why the stopping rule stops; the affordable rows say whether the clinical
 * minimum is within reach).
 */
export function factsOfDecision(decision: DecisionFile): DecisionFacts {
  const rows = [...decision.table].sort((a, b) => a.runs - b.runs);
  const clinical = decision.clinical ?? null;
  const stop = decision.stopAfterRuns ?? null;
  let stopBecause: StopCause = "noValue";
  if (stop !== null) {
    const next = rows.find((row) => row.runs === stop + 1);
    if (next === undefined) stopBecause = "lastRun";
    else if (next.withinBudget === false) stopBecause = "overBudget";
    else if (next.withinDeadline === false) stopBecause = "pastDeadline";
    else if (!next.affordable) stopBecause = "overBudget";
    else stopBecause = "notWorthIt";
  }
  const reachesMinimum = (row: DecisionRow) => clinical !== null && row.trainingSize >= clinical.participants;
  const affordable = rows.filter((row) => row.affordable);
  const floorHolds = clinical !== null && affordable.some(reachesMinimum);
  const valueBasis = decision.valueBasis ?? (decision.plan.valuePerPoint > 0 ? "valuePerPoint" : "target");
  return {
    plan: decision.plan,
    valueBasis,
    valuePerPoint: decision.plan.valuePerPoint,
    rows,
    recommendedRuns: decision.recommendedRuns,
    runsToTarget: decision.runsToTarget,
    stopAfterRuns: stop,
    stopBecause,
    clinical,
    followsClinicalMinimum:
      floorHolds && chooseRuns(affordable, valueBasis, decision.plan.targetConfidence) !== decision.recommendedRuns,
    clinicalMinimumUnaffordable: clinical !== null && !floorHolds,
  };
}

/** Why the recommended number of runs. */
export function recommendationSentence(facts: DecisionFacts, options: WordingOptions = {}): string {
  const { plan, clinical } = facts;
  const row = facts.rows[facts.recommendedRuns];
  const next = facts.rows[1];
  const limits = limitsInWords(plan);
  const floor =
    clinical !== null && facts.followsClinicalMinimum
      ? ` among the runs that reach the minimum of ${formatNumber(clinical.participants)} participants (Riley et al.)`
      : "";
  if (facts.valueBasis === "target") {
    const confidence = percent(plan.targetConfidence);
    const chance = row.probabilityOfTarget ?? 0;
    if (row.runs === 0 && chance >= plan.targetConfidence) {
      return `The model already reaches the target with at least ${confidence} probability.`;
    }
    if (chance >= plan.targetConfidence) {
      return `${plural(row.runs, "further run")} ${row.runs === 1 ? "is" : "are"} the fewest${limits ? ` within ${limits}` : ""} that reach the target with at least ${confidence} probability${floor}.`;
    }
    const minimum =
      clinical !== null && row.runs > 0
        ? `; ${plural(row.runs, "further run")} reach${row.runs === 1 ? "es" : ""} the minimum of ${formatNumber(clinical.participants)} participants (Riley et al.)`
        : "";
    return `No number of further runs${limits ? ` within ${limits}` : ""} reaches the target with ${confidence} probability${minimum}.`;
  }
  if (row.runs === 0) {
    if (next && !next.affordable) return `No further run fits within ${limitsBroken(next)}.`;
    return "No number of further runs is expected to add more value than it costs.";
  }
  const within = limits
    ? `the runs ${limits} allow${limits.includes(" and ") ? "" : "s"}`
    : `up to ${plural(plan.maxRuns, "run")}`;
  let sentence =
    `${plural(row.runs, "further run")} ${row.runs === 1 ? "gives" : "give"} the highest expected net value ` +
    `(${formatMoney(row.expectedNetValue, options.currency)}`;
  if (options.currency !== undefined && row.netValueLower !== undefined && row.netValueUpper !== undefined) {
    sentence += `, likely between ${formatMoney(row.netValueLower, options.currency)} and ${formatMoney(row.netValueUpper, options.currency)}`;
  }
  return `${sentence}) among ${within}${floor}.`;
}

/** How many runs reach the target with the plan's confidence. */
export function targetSentence(facts: DecisionFacts): string | null {
  const { plan } = facts;
  if (plan.target === undefined) return null;
  const confidence = percent(plan.targetConfidence);
  const row = facts.runsToTarget === null ? undefined : facts.rows[facts.runsToTarget];
  if (row === undefined) {
    return `Within ${plural(plan.maxRuns, "further run")} the target is not reached with ${confidence} probability.`;
  }
  if (row.runs === 0) {
    return `Today's data already reach the target with at least ${confidence} probability (${percent(row.probabilityOfTarget as number)}).`;
  }
  const over = row.affordable
    ? ""
    : `, more than ${limitsBroken(row)} allow${limitsBroken(row).includes(" and ") ? "" : "s"}`;
  return `${plural(row.runs, "further run")} reach${row.runs === 1 ? "es" : ""} the target with at least ${confidence} probability (${percent(row.probabilityOfTarget as number)})${over}.`;
}

/** The stopping rule. */
export function stopSentence(facts: DecisionFacts, options: WordingOptions = {}): string | null {
  const runs = facts.stopAfterRuns;
  if (runs === null) return null;
  const next = facts.rows[runs + 1];
  const stop = runs === 0 ? "Stop now" : `Stop after ${plural(runs, "run")}`;
  const ordinal = `run ${runs + 1}`;
  switch (facts.stopBecause) {
    case "lastRun":
      return `Every run up to the plan's ${formatNumber(facts.plan.maxRuns)} is expected to be worth more than it costs.`;
    case "overBudget":
      return `${stop}: ${ordinal} would take the cost past the budget.`;
    case "pastDeadline":
      return `${stop}: ${ordinal} would end after the deadline.`;
    default: {
      const worth = facts.valuePerPoint * 100 * (next.marginalGain ?? 0);
      const cost = next.cost - facts.rows[runs].cost;
      const more = runs + 1 < facts.plan.maxRuns ? "; no more runs would pay for themselves either" : "";
      return `${stop}: ${ordinal} is expected to add a gain worth ${formatMoney(worth, options.currency)}, less than the ${formatMoney(cost, options.currency)} it costs${more}.`;
    }
  }
}

/** What measuring again after a pilot is worth. */
export function informationSentence(
  information: ValueOfInformation | null | undefined,
  options: WordingOptions = {},
): string | null {
  if (!information || information.pilots.length === 0) return null;
  const best = information.pilots.reduce((a, b) => (b.evsi > a.evsi ? b : a));
  const rest = information.programmeRuns - best.runs;
  if (best.evsi <= 2 * best.standardError) {
    const largest = information.pilots[information.pilots.length - 1].runs;
    const pilots = largest === 1 ? "a pilot of 1 run" : `a pilot of 1 to ${largest} runs`;
    return `Measuring the curve again after ${pilots} is not expected to change the decision on the rest of the ${information.programmeRuns} affordable runs.`;
  }
  return (
    `Measuring the curve again after ${plural(best.runs, "run")} before paying for the other ${rest} is worth ` +
    `about ${formatMoney(best.evsi, options.currency)} to that decision (expected value of sample information).`
  );
}

/** How many held-out samples support the target. */
export function validationSentence(validation: ValidationSize | null | undefined): string | null {
  if (!validation) return null;
  const share = (v: number) => `${formatNumber(v * 100, 1)}%`;
  if (validation.expectedScore <= validation.target) {
    return `The expected score of ${share(validation.expectedScore)} does not exceed the target of ${share(validation.target)}, so no held-out set can be expected to support the target.`;
  }
  if (validation.heldOutNeeded === null) {
    return `The expected score of ${share(validation.expectedScore)} is so close to the target of ${share(validation.target)} that more than ten million held-out samples would be needed to support it.`;
  }
  const exact =
    validation.heldOutNeededExact === null
      ? ""
      : ` (${formatNumber(validation.heldOutNeededExact)} by the exact Clopper–Pearson bound)`;
  return (
    `Supporting the target of ${share(validation.target)} with an expected score of ` +
    `${share(validation.expectedScore)} needs about ${formatNumber(validation.heldOutNeeded)} held-out samples${exact}, ` +
    `for a one-sided 95% lower bound above the target.`
  );
}

/**
 * The clinical minimum and where the plan stands to it: reached today; reached after k runs (within
 * the plan's limits, or beyond the limits the k-th row breaks); or not within the plan's runs at all.
 */
export function clinicalSentence(facts: DecisionFacts): string | null {
  const { clinical } = facts;
  if (clinical === null) return null;
  let where: string;
  if (clinical.runsToMinimum === null) {
    where = `which no number of runs up to the plan's ${formatNumber(facts.plan.maxRuns)} reaches`;
  } else if (clinical.runsToMinimum === 0) {
    where = "which today's data already reach";
  } else {
    const row = facts.rows[clinical.runsToMinimum];
    const broken = row !== undefined && !row.affordable ? limitsBroken(row) : "";
    where =
      `reached after ${plural(clinical.runsToMinimum, "further run")}` +
      (broken ? `, more than ${broken} allow${broken.includes(" and ") || broken.includes(" or ") ? "" : "s"}` : "");
  }
  return (
    `A clinical prediction model of a binary outcome needs at least ${formatNumber(clinical.participants)} participants ` +
    `(${formatNumber(clinical.events)} events, ${formatNumber(clinical.eventsPerParameter, 1)} per predictor parameter; Riley et al. 2019), ` +
    `set by ${criterionInWords(clinical.binding)}, ${where}.`
  );
}

/** Does a field of use touch decisions about people (health, care, safety, the public)? */
export function concernsPeople(domain: string | undefined): boolean {
  return domain !== undefined && /clinic|health|medic|hospital|patient|care|safety|public/i.test(domain);
}

/** The field a domain concerns, for the caution about people: "health", "safety" or both. */
function domainConcern(domain: string | undefined): string {
  const d = (domain ?? "").toLowerCase();
  if (/safety/.test(d)) return "safety";
  if (/clinic|health|medic|care|hospital|patient/.test(d)) return "health";
  return "health or safety";
}

/**
 * The caution owed to a reader whose decisions touch people: given when the domain concerns people
 * or the plan describes a clinical model. One wording, in decision.json and on the page.
 */
export function peopleCaution(domain: string | undefined, clinical: boolean): string | null {
  if (!concernsPeople(domain) && !clinical) return null;
  const concern = clinical && !concernsPeople(domain) ? "health" : domainConcern(domain);
  const field = domain !== undefined && domain.trim() !== "" ? ` (field: ${domain.trim()})` : "";
  return (
    `This model informs decisions about people's ${concern}${field}. Projections are not validation: ` +
    `independent validation, the applicable regulatory requirements and licensed professional practice decide ` +
    `whether and how such a model may be used.`
  );
}
