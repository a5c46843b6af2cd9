/** Reads and checks a plan file; every error names the key. */
import { readJsonFile } from "../io/files.js";
import { validate } from "../io/validate.js";
import { planSchema, type Plan } from "./plan.js";

export function readPlan(file: string): Plan {
  return validate(planSchema, readJsonFile(file), file);
}
