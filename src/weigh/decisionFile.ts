/**
 * decision.json: what further runs are expected to buy. A public contract; later versions only add
 * keys.
 */
export interface DecisionRow {
  /** Further runs (0 = stop now). */
  runs: number;
  /** Samples the final model would be trained on after these runs. */
  trainingSize: number;
  expected: number;
  lower: number;
  upper: number;
  /** Probability that the expected score reaches the plan's target (null without a target). */
  probabilityOfTarget: number | null;
  /** Cumulative cost of the further runs. */
  cost: number;
  /** Calendar months the further runs take. */
  months: number;
  /** valuePerPoint × 100 × (expected score gain over today) − cost. */
  expectedNetValue: number;
  /** Whether the row is within budget (and deadline, when given). */
  affordable: boolean;
}

export interface DecisionFile {
  kind: "headroom-decision";
  version: 1;
  metric: string;
  higherIsBetter: boolean;
  level: number;
  plan: import("./plan.js").Plan;
  recommendedRuns: number;
  /** Smallest number of runs whose probability of reaching the target is at least targetConfidence. */
  runsToTarget: number | null;
  /** One plain sentence each, saying why. */
  reasons: { recommendedRuns: string; runsToTarget: string | null };
  table: DecisionRow[];
}
