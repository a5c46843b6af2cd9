/**
 * Converters from option text to values, each throwing a UsageError that names the option.
 * Commander hands options over as text; converting here keeps every message in our own words.
 */
import { UsageError } from "../errors.js";
import { message } from "../messages.js";

/** A whole number of at least `min`, or undefined when the option was not given. */
export function optionalInteger(option: string, text: string | undefined, min: number): number | undefined {
  if (text === undefined) return undefined;
  const value = Number(text.trim());
  if (!/^[+-]?\d+$/.test(text.trim()) || !Number.isSafeInteger(value) || value < min)
    throw new UsageError(message.optionProblem(option, message.badInteger(text, min)));
  return value;
}

/** Folds: a whole number of at least 2, or "loo" (leave-one-out); undefined when not given. */
export function optionalFolds(text: string | undefined): number | "loo" | undefined {
  if (text === undefined) return undefined;
  if (text.trim().toLowerCase() === "loo") return "loo";
  const value = Number(text.trim());
  if (!/^[+-]?\d+$/.test(text.trim()) || !Number.isSafeInteger(value) || value < 2)
    throw new UsageError(message.optionProblem("--folds", message.badFolds(text)));
  return value;
}

/** A probability strictly between 0 and 1. */
export function optionalProbability(option: string, text: string | undefined): number | undefined {
  if (text === undefined) return undefined;
  const value = Number(text.trim());
  if (text.trim() === "" || !(value > 0 && value < 1))
    throw new UsageError(message.optionProblem(option, message.badLevel(text)));
  return value;
}

/** A comma-separated list of positive whole numbers, sorted and without repeats. */
export function optionalSizeList(option: string, text: string | undefined): number[] | undefined {
  if (text === undefined) return undefined;
  const parts = text.split(",").map((p) => p.trim());
  if (parts.some((p) => !/^\d+$/.test(p) || Number(p) < 1))
    throw new UsageError(message.optionProblem(option, message.badList(text)));
  return [...new Set(parts.map(Number))].sort((a, b) => a - b);
}

/** A positive number of seconds (`--trainer-timeout`), or undefined when not given. */
export function optionalSeconds(text: string | undefined): number | undefined {
  if (text === undefined) return undefined;
  const value = Number(text.trim());
  if (text.trim() === "" || !(value > 0) || !Number.isFinite(value)) throw new UsageError(message.badTimeout(text));
  return value;
}
