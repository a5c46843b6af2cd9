/**
 * The study file: one JSON file that names the data, the measurement options, the plan and the
 * context, so the whole job runs with one command and can be rerun exactly.
 */
import * as z from "zod";
import { planSchema } from "../weigh/plan.js";

export const studySchema = z.strictObject({
  /** Shown as the report's title. */
  title: z.string().optional(),
  /** The CSV, relative to the study file. */
  data: z.string().min(1),
  label: z.string().min(1),
  group: z.string().min(1).optional(),
  ignore: z.array(z.string()).optional(),
  measure: z
    .strictObject({
      /** Folds, or "loo" for leave-one-out (leave-one-run-out with a group). */
      folds: z.union([z.number().int().min(2), z.literal("loo")]).optional(),
      repeats: z.number().int().min(1).optional(),
      sizes: z.array(z.number().int().positive()).min(1).optional(),
      seed: z.number().int().nonnegative().optional(),
      task: z.enum(["classification", "regression"]).optional(),
      learner: z.string().optional(),
      metric: z.string().optional(),
      /** Tune the learner by inner cross-validation at every training size. */
      tune: z.boolean().optional(),
      /** Measure against whole runs of `group` (sizes in runs). */
      byRuns: z.boolean().optional(),
      /** Shell command of the user's own program that fits and predicts (instead of `learner`). */
      trainer: z.string().min(1).optional(),
      /** Seconds after which a trainer's fit is stopped, as a failure. */
      trainerTimeout: z.number().positive().optional(),
      /** Where the fits run: "local" (default) or "slurm" (one job array; needs `tasksDir`). */
      on: z.enum(["local", "slurm"]).optional(),
      /** With `on: "slurm"`: folder the cluster's nodes share, relative to the study file. */
      tasksDir: z.string().min(1).optional(),
      /** With `on: "slurm"`: sbatch options as typed on a command line. */
      slurmOptions: z.string().optional(),
    })
    .default({}),
  forecast: z
    .strictObject({
      level: z.number().gt(0).lt(1).optional(),
      draws: z.number().int().min(20).max(10000).optional(),
      /** One curve family instead of the weighted combination (a name from `curveFamilies`). */
      family: z.string().min(1).optional(),
      /** A target score: the forecast also says at what training size it is reached. */
      target: z.number().optional(),
      /** Probability with which the target should be reached. */
      confidence: z.number().gt(0).lt(1).optional(),
      /** Test rows of the single-model interval. */
      testSize: z.number().int().min(1).optional(),
    })
    .default({}),
  plan: planSchema,
  context: z
    .strictObject({
      /** What the model's decisions touch: e.g. "clinical", "public-health", "safety", "research". */
      domain: z.string().optional(),
      /** Currency of costs and values, shown in the report. */
      currency: z.string().max(12).optional(),
    })
    .default({}),
});

export type Study = z.infer<typeof studySchema>;
