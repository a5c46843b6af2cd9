/**
 * A curve measured against whole runs (`--by-runs`) restated in rows, so that forecasting and
 * weighing, which count samples (a plan's `samplesPerRun`, `currentSamples`), work in one unit.
 * Each size in runs becomes `round(runs × rowsPerRun)` rows: the mean run's yield, the same
 * assumption a plan makes about future runs.
 */
import type { CurveFile } from "./curveFile.js";

/** The curve with training sizes in rows; a curve already in rows is returned as it is. */
export function sizesInRows(curve: CurveFile): { curve: CurveFile; converted: boolean } {
  if (curve.unit !== "runs" || curve.rowsPerRun === undefined || !(curve.rowsPerRun > 0)) {
    return { curve, converted: false };
  }
  const rowsPerRun = curve.rowsPerRun;
  return {
    curve: {
      ...curve,
      unit: "rows",
      points: curve.points.map((point) => ({ ...point, trainingSize: Math.round(point.trainingSize * rowsPerRun) })),
    },
    converted: true,
  };
}
