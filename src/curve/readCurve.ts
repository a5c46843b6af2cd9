/**
 * Reads a learning curve for forecasting: a curve.json written by `headroom measure`, or a CSV with
 * columns `trainingSize,score` (one row per fit) and an optional `repeat` column, so curves measured
 * with any other trainer can be forecast too.
 */
import * as z from "zod";
import { readCsv } from "../data/csv.js";
import { DataError } from "../errors.js";
import { readJsonFile } from "../io/files.js";
import { validate } from "../io/validate.js";
import { message } from "../messages.js";
import type { CurveFile, CurvePoint } from "./curveFile.js";

const finite = z.number().refine(Number.isFinite, "must be a finite number");

const curveSchema = z
  .object({
    kind: z.literal("headroom-curve"),
    version: z.literal(1),
    metric: z.string(),
    higherIsBetter: z.boolean(),
    metricRange: z.tuple([finite, finite]).optional(),
    rows: z.number().int().positive(),
    folds: z.number().int().min(1).optional(),
    repeats: z.number().int().min(1).optional(),
    classNames: z.array(z.string()).optional(),
    classCounts: z.array(z.number().int().nonnegative()).optional(),
    points: z
      .array(
        z.object({
          trainingSize: z.number().int().positive(),
          scores: z.array(finite).min(1),
          repeatOfScore: z.array(z.number().int().nonnegative()).optional(),
        }),
      )
      .min(1),
  })
  .superRefine((curve, context) => {
    // The most common class's share is read from these (mostCommonClass), so a count must belong
    // to a named class and the counts must add up to the rows measured.
    const counts = curve.classCounts;
    if (counts === undefined) return;
    const path = ["classCounts"];
    if (counts.length !== (curve.classNames?.length ?? 0)) {
      context.addIssue({ code: "custom", path, message: "must give one count for each of classNames" });
    } else if (counts.reduce((sum, count) => sum + count, 0) !== curve.rows) {
      context.addIssue({ code: "custom", path, message: `must add up to rows (${curve.rows})` });
    }
  });

/** Reads a curve from a .json or .csv file. @throws InputError, DataError */
export function readCurve(file: string, metricOptions: { metric?: string; higherIsBetter?: boolean } = {}): CurveFile {
  if (file.toLowerCase().endsWith(".csv")) return readCurveCsv(file, metricOptions);
  const value = readJsonFile(file);
  if (typeof value !== "object" || value === null || (value as { kind?: unknown }).kind !== "headroom-curve") {
    throw new DataError(message.wrongFileKind(file, "curve.json"));
  }
  validate(curveSchema, value, file);
  return value as CurveFile;
}

function readCurveCsv(file: string, options: { metric?: string; higherIsBetter?: boolean }): CurveFile {
  const table = readCsv(file);
  const column = (name: string, required: boolean): number => {
    const index = table.header.indexOf(name);
    if (index < 0 && required) throw new DataError(message.curveCsvColumnMissing(file, name));
    return index;
  };
  const sizeColumn = column("trainingSize", true);
  const scoreColumn = column("score", true);
  const repeatColumn = column("repeat", false);
  const bySize = new Map<number, CurvePoint>();
  const repeats = new Map<string, number>();
  table.rows.forEach((cells, r) => {
    const line = table.lines[r];
    if (cells.length !== table.header.length)
      throw new DataError(message.raggedRow(file, line, table.header.length, cells.length));
    const size = Number(cells[sizeColumn].trim());
    if (!Number.isInteger(size) || size < 1)
      throw new DataError(message.curveCsvSizeNotWhole(file, line, sizeColumn + 1, cells[sizeColumn]));
    const scoreText = cells[scoreColumn].trim();
    const score = Number(scoreText);
    if (scoreText === "" || !Number.isFinite(score))
      throw new DataError(message.notFinite(file, line, scoreColumn + 1, "score", scoreText));
    const point = bySize.get(size) ?? { trainingSize: size, scores: [] };
    point.scores.push(score);
    if (repeatColumn >= 0) {
      const key = cells[repeatColumn].trim();
      if (!repeats.has(key)) repeats.set(key, repeats.size);
      (point.repeatOfScore ??= []).push(repeats.get(key) as number);
    }
    bySize.set(size, point);
  });
  const points = [...bySize.values()].sort((a, b) => a.trainingSize - b.trainingSize);
  const metric = options.metric ?? "score";
  const allScores = points.flatMap((p) => p.scores);
  const inUnitRange = allScores.every((s) => s >= 0 && s <= 1);
  return {
    kind: "headroom-curve",
    version: 1,
    metric,
    higherIsBetter: options.higherIsBetter ?? true,
    ...(inUnitRange && (options.higherIsBetter ?? true) ? { metricRange: [0, 1] as [number, number] } : {}),
    rows: points[points.length - 1].trainingSize,
    points,
  };
}
