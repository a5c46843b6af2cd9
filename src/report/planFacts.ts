/**
 * The facts of a plan the report states in words: the samples a run is expected to yield, the value
 * of one point of score, the fixed cost, the runs that can go on at once and the deadline. They come
 * from the plan resolver (src/weigh/plan.ts), the one place the plan's defaults live.
 */
import { resolvePlan, type Plan, type ValueBasis } from "../weigh/plan.js";

/** What the report says about a plan. */
export interface PlanFacts {
  /** Expected labeled samples one run yields after quality control. */
  samplesPerRun: number;
  /** Value of one percentage point of the score (0.01 of a metric that is not a fraction); 0 when only a target is given. */
  valuePerPoint: number;
  /** Where that value comes from. */
  valueBasis: ValueBasis;
  fixedCost: number;
  parallelRuns: number;
  deadlineMonths: number | undefined;
}

/**
 * The plan's facts. decision.json echoes the plan with valuePerPoint filled in (so the resolver
 * reads it as given); pass the decision's `valueBasis` to keep where the value came from.
 */
export function planFacts(plan: Plan, valueBasis?: ValueBasis): PlanFacts {
  const resolved = resolvePlan(plan);
  return {
    samplesPerRun: resolved.expectedYield,
    valuePerPoint: resolved.valuePerPoint,
    valueBasis: valueBasis ?? resolved.valueBasis,
    fixedCost: resolved.fixedCost,
    parallelRuns: resolved.parallelRuns,
    deadlineMonths: plan.deadlineMonths,
  };
}
