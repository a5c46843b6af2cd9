/**
 * The facts of a plan the report states in words: the samples a run is expected to yield and the
 * value of one point of score. Read structurally, so that the report reads plans written before and
 * after the plan gained its optional keys (yield ranges, pass rate, value from consequences).
 */
import type { Plan } from "../weigh/plan.js";

/** The optional keys of later plans, as the report reads them. */
interface PlanKeys {
  samplesPerRun?: number;
  samplesPerRunRange?: [number, number];
  passRate?: number;
  valuePerPoint?: number;
  casesPerYear?: number;
  costPerError?: number;
  yearsInUse?: number;
  fixedCost?: number;
  parallelRuns?: number;
  deadlineMonths?: number;
}

/** What the report says about a plan. */
export interface PlanFacts {
  /** Expected labeled samples one run yields after quality control. */
  samplesPerRun: number;
  /** Value of one percentage point of the score (0.01 of a metric that is not a fraction); 0 when only a target is given. */
  valuePerPoint: number;
  /** Where that value comes from. */
  valueBasis: "valuePerPoint" | "consequences" | "target";
  fixedCost: number;
  parallelRuns: number;
  deadlineMonths: number | undefined;
}

/**
 * The plan's facts, by the rules of the plan file (src/weigh/plan.ts): yield = samplesPerRun (or the
 * middle of samplesPerRunRange) × passRate (default 1); valuePerPoint as given, or casesPerYear ×
 * yearsInUse × costPerError ÷ 100 when derived from consequences, or 0 for a target-only plan.
 * decision.json echoes the plan with valuePerPoint filled in; pass its `valueBasis` to keep where the
 * value came from.
 */
export function planFacts(plan: Plan, valueBasis?: PlanFacts["valueBasis"]): PlanFacts {
  const keys = plan as Plan & PlanKeys;
  const collected =
    keys.samplesPerRun ?? (keys.samplesPerRunRange ? (keys.samplesPerRunRange[0] + keys.samplesPerRunRange[1]) / 2 : 0);
  let valuePerPoint = 0;
  let fromKeys: PlanFacts["valueBasis"] = "target";
  if (keys.valuePerPoint !== undefined) {
    valuePerPoint = keys.valuePerPoint;
    fromKeys = "valuePerPoint";
  } else if (keys.casesPerYear !== undefined && keys.costPerError !== undefined && keys.yearsInUse !== undefined) {
    valuePerPoint = (keys.casesPerYear * keys.yearsInUse * keys.costPerError) / 100;
    fromKeys = "consequences";
  }
  return {
    samplesPerRun: collected * (keys.passRate ?? 1),
    valuePerPoint,
    valueBasis: valueBasis ?? fromKeys,
    fixedCost: keys.fixedCost ?? 0,
    parallelRuns: keys.parallelRuns ?? 1,
    deadlineMonths: keys.deadlineMonths,
  };
}
