/**
 * Minimum sample size for developing a clinical prediction model of a binary outcome, after Riley et
 * al. (Stat Med 2019, 38:1276–1296, "Minimum sample size for developing a multivariable prediction
 * model: Part II – binary and time-to-event outcomes"; BMJ 2020, 368:m441, "Calculating the sample
 * size required for developing a clinical prediction model"; citations from memory). The size is the
 * largest of three:
 *
 * (i) expected uniform shrinkage of the predictor effects at least S = 0.9:
 *     n₁ = p / ((S − 1) · ln(1 − R²cs / S));
 * (ii) a small optimism, δ = 0.05, in the apparent Nagelkerke R²: the shrinkage that keeps it is
 *     S_δ = R²cs / (R²cs + δ · max R²cs), with max R²cs = 1 − exp(2 lnL₀/n) for the prevalence φ, and
 *     n₂ = p / ((S_δ − 1) · ln(1 − R²cs / S_δ));
 * (iii) the overall risk estimated within ±0.05 with 95% confidence:
 *     n₃ = (1.96 / 0.05)² · φ(1 − φ);
 *
 * each rounded up; p is the number of candidate predictor parameters and R²cs the anticipated
 * Cox–Snell R². Events are n·φ (rounded), events per parameter n·φ/p.
 */
import { largestCoxSnellR2, type ClinicalInputs } from "./plan.js";

/** Which of Riley et al.'s criteria sets the size. */
export type ClinicalCriterion = "shrinkage" | "optimism" | "precision";

export interface ClinicalSampleSize {
  /** Participants needed: the largest of the three criteria. */
  participants: number;
  /** Participants with the outcome among them, rounded. */
  events: number;
  /** Events per candidate predictor parameter (unrounded). */
  eventsPerParameter: number;
  /** The criterion that needs the most participants. */
  binding: ClinicalCriterion;
  /** Participants each criterion needs. */
  criteria: Record<ClinicalCriterion, number>;
  /** The shrinkage factor of criterion (ii). */
  optimismShrinkage: number;
}

/** Shrinkage target of criterion (i). */
const targetShrinkage = 0.9;
/** Largest optimism in Nagelkerke's R², criterion (ii). */
const largestOptimism = 0.05;
/** Margin of error of the overall risk, criterion (iii). */
const riskMargin = 0.05;

/**
 * @example
 * clinicalSampleSize({ predictorParameters: 24, anticipatedCoxSnellR2: 0.288, prevalence: 0.174 })
 * // → { participants: 662, events: 115, eventsPerParameter: 4.799..., binding: "optimism", ... }
 */
export function clinicalSampleSize(inputs: ClinicalInputs): ClinicalSampleSize {
  const p = inputs.predictorParameters;
  const r2 = inputs.anticipatedCoxSnellR2;
  const prevalence = inputs.prevalence;
  const forShrinkage = (s: number) => p / ((s - 1) * Math.log(1 - r2 / s));
  const optimismShrinkage = r2 / (r2 + largestOptimism * largestCoxSnellR2(prevalence));
  const z = 1.96;
  const criteria: Record<ClinicalCriterion, number> = {
    shrinkage: Math.ceil(forShrinkage(targetShrinkage)),
    // S_δ ≤ 0.9 is possible only when (i) already asks for more; the criterion still holds then.
    optimism: Math.ceil(forShrinkage(optimismShrinkage)),
    precision: Math.ceil((z / riskMargin) ** 2 * prevalence * (1 - prevalence)),
  };
  let binding: ClinicalCriterion = "shrinkage";
  for (const name of ["optimism", "precision"] as const) if (criteria[name] > criteria[binding]) binding = name;
  const participants = criteria[binding];
  return {
    participants,
    events: Math.round(participants * prevalence),
    eventsPerParameter: (participants * prevalence) / p,
    binding,
    criteria,
    optimismShrinkage,
  };
}

/** The criterion in words, for sentences. */
export function criterionInWords(criterion: ClinicalCriterion): string {
  switch (criterion) {
    case "shrinkage":
      return "an expected shrinkage of at least 0.9";
    case "optimism":
      return "an optimism of at most 0.05 in Nagelkerke's R²";
    case "precision":
      return "estimating the overall risk within ±0.05";
  }
}
