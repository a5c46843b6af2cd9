/**
 * Checks parsed JSON against a zod schema and turns the first problem into a one-line DataError
 * that names the file and the key (e.g. `plan.json: costPerRun: Too small: expected number to be >=0`).
 */
import type * as z from "zod";
import { DataError } from "../errors.js";
import { message } from "../messages.js";

export function validate<T extends z.ZodType>(schema: T, value: unknown, file: string, keyPrefix = ""): z.output<T> {
  const result = schema.safeParse(value);
  if (result.success) return result.data;
  const issue = result.error.issues[0];
  const path = [keyPrefix, ...issue.path.map(String)].filter((p) => p !== "").join(".");
  throw new DataError(message.badKey(file, path === "" ? "(top level)" : path, issue.message));
}
