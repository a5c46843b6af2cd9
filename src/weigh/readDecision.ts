/** Reads a decision.json written by `headroom weigh`. */
import * as z from "zod";
import { DataError } from "../errors.js";
import { readJsonFile } from "../io/files.js";
import { validate } from "../io/validate.js";
import { message } from "../messages.js";
import type { DecisionFile } from "./decisionFile.js";

/**
 * The plan as weighed: the keys the report reads. Its cross-key rules are not checked again (the
 * echo carries samplesPerRun and valuePerPoint filled in beside the keys they came from).
 */
const decisionPlanSchema = z
  .object({
    samplesPerRun: z.number().positive(),
    costPerRun: z.number().nonnegative(),
    monthsPerRun: z.number().nonnegative(),
    maxRuns: z.number().int().min(1),
    valuePerPoint: z.number().nonnegative(),
    targetConfidence: z.number().gt(0).lt(1),
    target: z.number().optional(),
    budget: z.number().nonnegative().optional(),
  })
  .loose();

const decisionSchema = z.object({
  kind: z.literal("headroom-decision"),
  version: z.literal(1),
  plan: decisionPlanSchema,
  recommendedRuns: z.number().int().nonnegative(),
  runsToTarget: z.number().int().nonnegative().nullable(),
  table: z.array(z.object({ runs: z.number().int(), trainingSize: z.number(), expected: z.number() }).loose()).min(1),
});

export function readDecision(file: string): DecisionFile {
  const value = readJsonFile(file);
  if (typeof value !== "object" || value === null || (value as { kind?: unknown }).kind !== "headroom-decision") {
    throw new DataError(message.wrongFileKind(file, "decision.json"));
  }
  validate(decisionSchema, value, file);
  return value as DecisionFile;
}
