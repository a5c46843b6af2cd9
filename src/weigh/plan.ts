/**
 * The plan: what a further run yields and costs, how long it takes, and what a point of score is
 * worth. Validated with zod so that every error names the key (`plan.json: costPerRun: ...`).
 *
 * Yield. A run yields `samplesPerRun` labeled samples, or an uncertain number: `samplesPerRunRange`
 * [fewest, most] (every whole number in between equally likely), and/or a share `passRate` of the
 * samples a run collects passes quality control (binomial thinning).
 *
 * Value. One percentage point of the score (0.01 of a metric that is not a fraction) is worth
 * `valuePerPoint`, or is derived from consequences: a model used on `casesPerYear` cases a year for
 * `yearsInUse` years makes casesPerYear × yearsInUse / 100 fewer errors per point of accuracy, each
 * costing `costPerError`, so valuePerPoint = casesPerYear × yearsInUse × costPerError / 100. A plan
 * may instead (or also) name a `target` score to reach with probability `targetConfidence`.
 *
 * New keys are optional without zod defaults so that the parsed type keeps the shape the foundation
 * issue defined; `resolvePlan` fills in their defaults, the one place they live.
 */
import * as z from "zod";
import { message } from "../messages.js";

/** Riley et al.'s inputs for a clinical prediction model of a binary outcome. */
export const clinicalSchema = z.strictObject({
  /** Candidate predictor parameters (degrees of freedom), not just predictors. */
  predictorParameters: z.number().int().positive(),
  /** Anticipated Cox–Snell R² of the model (from earlier models or the literature). */
  anticipatedCoxSnellR2: z.number().gt(0).lt(1),
  /** Share of participants with the outcome. */
  prevalence: z.number().gt(0).lt(1),
});

export const planSchema = z
  .strictObject({
    /** Samples already labeled (default: the curve's rows, or its largest training size). */
    currentSamples: z.number().int().positive().optional(),
    /** Labeled samples one further run yields (with `passRate`: collects, before quality control). */
    samplesPerRun: z.number().int().positive().optional(),
    /** [fewest, most] samples one run yields, when the yield is uncertain; instead of samplesPerRun. */
    samplesPerRunRange: z.tuple([z.number().int().nonnegative(), z.number().int().positive()]).optional(),
    /** Share of a run's samples that passes quality control (default 1). */
    passRate: z.number().gt(0).max(1).optional(),
    /** Cost of one further run, in the user's currency. */
    costPerRun: z.number().nonnegative(),
    /** Cost paid once if any further run is made (set-up, ethics approval, ...). Default 0. */
    fixedCost: z.number().nonnegative().optional(),
    /** Calendar months one run takes. */
    monthsPerRun: z.number().nonnegative().default(0),
    /** Runs that can go on at the same time (default 1): months = ceil(runs / parallelRuns) × monthsPerRun. */
    parallelRuns: z.number().int().positive().optional(),
    /** Money available for further runs, fixed cost included (no limit when absent). */
    budget: z.number().nonnegative().optional(),
    /** Calendar months available for further runs (no limit when absent). */
    deadlineMonths: z.number().nonnegative().optional(),
    /** Most further runs to consider. */
    maxRuns: z.number().int().min(1).max(1000).default(5),
    /** Value of one percentage point of the score, in the same currency as costPerRun. */
    valuePerPoint: z.number().nonnegative().optional(),
    /** Cases a year the model will be used on (with costPerError and yearsInUse). */
    casesPerYear: z.number().positive().optional(),
    /** Cost of one wrong prediction. */
    costPerError: z.number().nonnegative().optional(),
    /** Years the model will be in use. */
    yearsInUse: z.number().positive().optional(),
    /** Score the model should reach, in the metric's units (accuracy 0–1). */
    target: z.number().optional(),
    /** Probability with which the target should be reached. */
    targetConfidence: z.number().gt(0).lt(1).default(0.8),
    /** What the model's decisions touch, e.g. "clinical", "public-health", "safety", "research". */
    domain: z.string().optional(),
    /** The model predicts a binary clinical outcome: Riley et al.'s minimum sample size applies. */
    clinical: clinicalSchema.optional(),
  })
  .superRefine((plan, context) => {
    const issue = (key: string | string[], text: string) =>
      context.addIssue({ code: "custom", path: Array.isArray(key) ? key : [key], message: text });
    if (plan.samplesPerRun === undefined && plan.samplesPerRunRange === undefined) {
      issue("samplesPerRun", message.planYieldMissing());
    }
    if (plan.samplesPerRun !== undefined && plan.samplesPerRunRange !== undefined) {
      issue("samplesPerRunRange", message.planYieldTwice());
    }
    if (plan.samplesPerRunRange !== undefined && plan.samplesPerRunRange[0] > plan.samplesPerRunRange[1]) {
      issue("samplesPerRunRange", message.planRangeOrder(plan.samplesPerRunRange[0], plan.samplesPerRunRange[1]));
    }
    const consequences = (["casesPerYear", "costPerError", "yearsInUse"] as const).filter(
      (key) => plan[key] !== undefined,
    );
    if (consequences.length > 0 && consequences.length < 3) {
      const missing = (["casesPerYear", "costPerError", "yearsInUse"] as const).find((key) => plan[key] === undefined);
      issue(missing as string, message.planConsequenceMissing(missing as string));
    }
    if (plan.valuePerPoint !== undefined && consequences.length > 0) {
      issue("valuePerPoint", message.planValueTwice());
    }
    if (plan.valuePerPoint === undefined && consequences.length === 0 && plan.target === undefined) {
      issue("valuePerPoint", message.planNoValue());
    }
    if (plan.clinical !== undefined) {
      const largest = largestCoxSnellR2(plan.clinical.prevalence);
      if (plan.clinical.anticipatedCoxSnellR2 >= largest) {
        issue(
          ["clinical", "anticipatedCoxSnellR2"],
          message.planCoxSnellTooLarge(plan.clinical.anticipatedCoxSnellR2, largest),
        );
      }
    }
  });

export type Plan = z.infer<typeof planSchema>;
export type PlanInput = z.input<typeof planSchema>;
export type ClinicalInputs = z.infer<typeof clinicalSchema>;

/**
 * The largest Cox–Snell R² a binary outcome with this prevalence allows: 1 − exp(2·lnL0/n) with
 * lnL0/n = φ ln φ + (1 − φ) ln(1 − φ) the null model's mean log-likelihood (Nagelkerke 1991;
 * Riley et al. 2019, Stat Med 38:1276–1296, from memory).
 */
export function largestCoxSnellR2(prevalence: number): number {
  const meanLogLikelihood = prevalence * Math.log(prevalence) + (1 - prevalence) * Math.log(1 - prevalence);
  return 1 - Math.exp(2 * meanLogLikelihood);
}

/** Where the value of a point of score comes from. */
export type ValueBasis = "valuePerPoint" | "consequences" | "target";

/** How many samples one run yields. */
export type YieldModel =
  | { kind: "fixed"; samples: number }
  | { kind: "range"; fewest: number; most: number; passRate: number }
  | { kind: "thinned"; collected: number; passRate: number };

/** The plan with every default filled in: what `weighRuns` computes with. */
export interface ResolvedPlan {
  plan: Plan;
  yieldModel: YieldModel;
  /** Expected samples one run yields after quality control. */
  expectedYield: number;
  /** Expected samples one run collects before quality control (samplesPerRun, or the range's middle). */
  collectedPerRun: number;
  parallelRuns: number;
  fixedCost: number;
  /** Value of one percentage point (0 when only a target is given). */
  valuePerPoint: number;
  valueBasis: ValueBasis;
}

/**
 * The one resolver of the plan's defaults: parallelRuns 1, fixedCost 0, passRate 1; the yield model;
 * valuePerPoint given, derived from consequences, or 0 for a target-only plan.
 */
export function resolvePlan(plan: Plan): ResolvedPlan {
  const passRate = plan.passRate ?? 1;
  let yieldModel: YieldModel;
  let collectedPerRun: number;
  if (plan.samplesPerRunRange !== undefined) {
    const [fewest, most] = plan.samplesPerRunRange;
    yieldModel = { kind: "range", fewest, most, passRate };
    collectedPerRun = (fewest + most) / 2;
  } else {
    const samples = plan.samplesPerRun as number;
    yieldModel = passRate === 1 ? { kind: "fixed", samples } : { kind: "thinned", collected: samples, passRate };
    collectedPerRun = samples;
  }
  let valuePerPoint: number;
  let valueBasis: ValueBasis;
  if (plan.valuePerPoint !== undefined) {
    valuePerPoint = plan.valuePerPoint;
    valueBasis = "valuePerPoint";
  } else if (plan.casesPerYear !== undefined && plan.costPerError !== undefined && plan.yearsInUse !== undefined) {
    valuePerPoint = (plan.casesPerYear * plan.yearsInUse * plan.costPerError) / 100;
    valueBasis = "consequences";
  } else {
    valuePerPoint = 0;
    valueBasis = "target";
  }
  return {
    plan,
    yieldModel,
    expectedYield: collectedPerRun * passRate,
    collectedPerRun,
    parallelRuns: plan.parallelRuns ?? 1,
    fixedCost: plan.fixedCost ?? 0,
    valuePerPoint,
    valueBasis,
  };
}

/** Cumulative cost of `runs` further runs: the fixed cost once if any run is made, plus each run. */
export function costOfRuns(resolved: ResolvedPlan, runs: number): number {
  return runs === 0 ? 0 : resolved.fixedCost + runs * resolved.plan.costPerRun;
}

/** Calendar months `runs` further runs take, `parallelRuns` at a time. */
export function monthsOfRuns(resolved: ResolvedPlan, runs: number): number {
  return Math.ceil(runs / resolved.parallelRuns) * resolved.plan.monthsPerRun;
}
