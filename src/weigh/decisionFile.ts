/**
 * decision.json: what further runs are expected to buy. A public contract; later versions only add
 * keys. Keys added after the first version are optional in these types (files written before them
 * lack them) but `weighRuns` always writes them.
 */
import type { ClinicalSampleSize } from "./clinicalSampleSize.js";
import type { Plan, ValueBasis } from "./plan.js";

export interface DecisionRow {
  /** Further runs (0 = stop now). */
  runs: number;
  /**
   * Samples the final model would be trained on after these runs (with an uncertain yield: today
   * plus runs × the expected yield, rounded).
   */
  trainingSize: number;
  /** Expected score (point forecast; averaged over the yields when they are uncertain). */
  expected: number;
  /** Central interval at `level` for the expected score, from the forecast's draws. */
  lower: number;
  upper: number;
  /** Probability that the expected score reaches the plan's target (null without a target). */
  probabilityOfTarget: number | null;
  /** Cumulative cost of the further runs (fixedCost included once any run is made). */
  cost: number;
  /** Calendar months the further runs take: ceil(runs / parallelRuns) × monthsPerRun. */
  months: number;
  /** valuePerPoint × 100 × (expected score gain over today) − cost. */
  expectedNetValue: number;
  /** Whether the row is within budget (and deadline, when given). */
  affordable: boolean;
  /** Expected score gain of this run over one run fewer, in the metric's units, positive = better. */
  marginalGain?: number;
  /** Central interval at `level` of the net value, draw by draw. */
  netValueLower?: number;
  netValueUpper?: number;
  /** Share of draws in which the net value is above 0. */
  probabilityNetPositive?: number;
  /** Whether the cost is within the budget (true without a budget). */
  withinBudget?: boolean;
  /** Whether the months are within deadlineMonths (true without a deadline). */
  withinDeadline?: boolean;
}

/** The plan as weighed: the keys given, with samplesPerRun and valuePerPoint always filled in. */
export type DecisionPlan = Plan & {
  /** As given; with samplesPerRunRange, the middle of the range. */
  samplesPerRun: number;
  /** As given; derived from casesPerYear × yearsInUse × costPerError / 100; or 0 for a target only. */
  valuePerPoint: number;
};

/** How one input's ±25% change moves the recommendation. */
export interface SensitivityOutcome {
  /** The relative change: −0.25 or +0.25. */
  change: number;
  /** The changed input's value (for the asymptote: the changed asymptote, when the forecast names it). */
  value: number | null;
  recommendedRuns: number;
  /** Expected net value of the recommended runs under the change. */
  netValue: number;
}

export interface SensitivityEntry {
  factor: "costPerRun" | "samplesPerRun" | "valuePerPoint" | "asymptote";
  /** Null when the forecast does not reach the sizes the change needs (see `note`). */
  low: SensitivityOutcome | null;
  high: SensitivityOutcome | null;
  note?: string;
}

/** Expected value of sample information of a pilot of `runs` runs. */
export interface PilotInformation {
  /** Runs in the pilot (k). */
  runs: number;
  /** Noise of the score measured after the pilot, in the metric's units. */
  observationSd: number;
  /** Expected value of sample information, in money. */
  evsi: number;
  standardError: number;
  /** Whether, deciding now, going on to all programme runs after the pilot is the better choice. */
  goOnNow: boolean;
  /** Share of simulated pilots after which the decision would differ from today's. */
  probabilityDecisionChanges: number;
  /** Expected net value of: pilot, then decide on the rest (mean over draws). */
  stagedValue: number;
}

export interface ValueOfInformation {
  /** The decision in words. */
  decision: string;
  /** R: the most further runs within budget and deadline. */
  programmeRuns: number;
  /** Expected net value of committing to all R runs now (mean over draws). */
  commitValue: number;
  simulations: number;
  pilots: PilotInformation[];
}

export interface ValidationSize {
  /** The score to support. */
  target: number;
  /** Expected score of the model after the recommended runs. */
  expectedScore: number;
  /** Runs the expected score refers to (recommendedRuns). */
  runs: number;
  /** One-sided confidence of the lower bound. */
  confidence: number;
  /** Fewest held-out samples for the Wilson lower bound to exceed the target (null: none). */
  heldOutNeeded: number | null;
  /** The same with the Clopper–Pearson exact bound (null: none up to the search limit). */
  heldOutNeededExact: number | null;
  /** Context for the report, from Beleites et al. 2013. */
  context: string;
}

export interface ClinicalFloor extends ClinicalSampleSize {
  /** Fewest further runs whose training size reaches `participants` (null: not within maxRuns). */
  runsToMinimum: number | null;
}

export interface DecisionFile {
  kind: "headroom-decision";
  version: 1;
  metric: string;
  higherIsBetter: boolean;
  level: number;
  plan: DecisionPlan;
  recommendedRuns: number;
  /** Smallest number of runs whose probability of reaching the target is at least targetConfidence. */
  runsToTarget: number | null;
  /**
   * Stopping rule: stop after this many runs, when the next run's expected gain is worth less than
   * its cost or it would not fit the budget or deadline (null when the plan puts no value on a point).
   */
  stopAfterRuns?: number | null;
  /** One plain sentence each, saying why. */
  reasons: {
    recommendedRuns: string;
    runsToTarget: string | null;
    stopAfterRuns?: string | null;
    valueOfInformation?: string | null;
    validation?: string | null;
    clinical?: string | null;
  };
  table: DecisionRow[];
  /** Where the value of a point comes from. */
  valueBasis?: ValueBasis;
  /** Expected samples one run yields (after quality control). */
  expectedYieldPerRun?: number;
  valueOfInformation?: ValueOfInformation | null;
  sensitivity?: SensitivityEntry[];
  validation?: ValidationSize | null;
  clinical?: ClinicalFloor | null;
  /**
   * The field the decision touches: the plan's `domain`, else the study's context or weigh's
   * `--domain`, else "clinical" for a plan with a `clinical` block (see `decisionDomain`).
   */
  domain?: string;
  /** Plain warnings the report must show, every one of them. */
  cautions?: string[];
}
