/**
 * The plan: what a further run yields and costs, and what a point of score is worth.
 * Validated with zod so every error names the key.
 */
import * as z from "zod";

export const planSchema = z.strictObject({
  /** Samples already labelled (default: the curve's rows, or its largest training size). */
  currentSamples: z.number().int().positive().optional(),
  /** Labelled samples one further run yields. */
  samplesPerRun: z.number().int().positive(),
  /** Cost of one further run, in the user's currency. */
  costPerRun: z.number().nonnegative(),
  /** Calendar months one run takes. */
  monthsPerRun: z.number().nonnegative().default(0),
  /** Money available for further runs (no limit when absent). */
  budget: z.number().nonnegative().optional(),
  /** Most further runs to consider. */
  maxRuns: z.number().int().min(1).max(1000).default(5),
  /** Value of one percentage point of the score, in the same currency as costPerRun. */
  valuePerPoint: z.number().nonnegative(),
  /** Score the model should reach, in the metric's units (accuracy 0–1). */
  target: z.number().optional(),
  /** Probability with which the target should be reached. */
  targetConfidence: z.number().gt(0).lt(1).default(0.8),
});

export type Plan = z.infer<typeof planSchema>;
export type PlanInput = z.input<typeof planSchema>;
