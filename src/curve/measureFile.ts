/**
 * Measuring from a file: reads a CSV, builds the data set and measures its learning curve, as the
 * `measure` command and the study runner do.
 */
import { basename } from "node:path";
import { readDataset } from "../data/readDataset.js";
import type { ColumnChoice } from "../data/tableToDataset.js";
import type { CurveFile } from "./curveFile.js";
import { measureCurve, resolveMeasureOptions, type MeasureOptions } from "./measure.js";
import { sha256OfFile } from "../io/files.js";

/** Reads a CSV, builds the data set and measures its learning curve. */
export async function measureFile(file: string, options: ColumnChoice & MeasureOptions): Promise<CurveFile> {
  // The task (classes or a numeric target) decides how the label column is read.
  const { task } = resolveMeasureOptions(options);
  const dataset = readDataset(file, { ...options, task });
  return measureCurve(dataset, file, options, {
    label: options.label,
    ...(options.group === undefined ? {} : { group: options.group }),
    source: { file: basename(file), sha256: sha256OfFile(file) },
  });
}
