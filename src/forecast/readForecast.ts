/** Reads a forecast.json written by `headroom forecast`, checking the keys the later steps use. */
import * as z from "zod";
import { DataError } from "../errors.js";
import { readJsonFile } from "../io/files.js";
import { validate } from "../io/validate.js";
import { message } from "../messages.js";
import type { ForecastFile } from "./forecastFile.js";

const finite = z.number().refine(Number.isFinite, "must be a finite number");

const forecastSchema = z.object({
  kind: z.literal("headroom-forecast"),
  version: z.literal(1),
  metric: z.string(),
  higherIsBetter: z.boolean(),
  level: z.number().gt(0).lt(1),
  largestMeasuredSize: z.number().positive(),
  projections: z.array(
    z.object({
      trainingSize: z.number().int().positive(),
      expected: finite,
      lower: finite,
      upper: finite,
      level: z.number().gt(0).lt(1),
      draws: z.array(finite),
    }),
  ),
  band: z.array(z.object({ trainingSize: finite, expected: finite, lower: finite, upper: finite })),
  measured: z.array(z.object({ trainingSize: finite, mean: finite, standardDeviation: finite, fits: z.number() })),
  warnings: z.array(z.string()),
  curves: z
    .object({
      drawn: z.array(
        z.object({ family: z.string(), parameters: z.array(finite), shift: finite, extrapolation: finite }),
      ),
      fits: z.array(z.object({ family: z.string(), weight: finite, parameters: z.array(finite) })),
    })
    .optional(),
  continuation: z
    .object({
      ownWeight: finite,
      chordWeight: finite,
      slopeWeight: finite,
      headroomWeight: finite,
      spread: finite.nonnegative(),
      gainSpread: finite.nonnegative().optional(),
      learnedFrom: z.string().nullable().optional(),
      smallestSize: z.number().positive(),
      best: finite.nullable(),
      guessError: z.number().gt(0).lte(1).optional(),
      reliabilitySize: finite.nonnegative().optional(),
    })
    .optional(),
});

export function readForecast(file: string): ForecastFile {
  const value = readJsonFile(file);
  if (typeof value !== "object" || value === null || (value as { kind?: unknown }).kind !== "headroom-forecast") {
    throw new DataError(message.wrongFileKind(file, "forecast.json"));
  }
  validate(forecastSchema, value, file);
  return value as ForecastFile;
}
