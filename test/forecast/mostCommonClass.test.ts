/**
 * Accuracy against always answering the most common class: curve.json records each class's rows,
 * the forecast warns when the measured accuracy is no better than that share, and a hand-edited
 * count is refused on reading.
 *
 * Data: the Pima Indians diabetes data (fixtures/open-data/pima_diabetes.csv; Smith et al. 1988, via
 * UCI and Weka). Its documentation (Weka's diabetes.arff header, "9. Class Distribution") gives 500
 * rows tested negative and 268 tested positive. References, scikit-learn 1.2.1 from Debian
 * python3-sklearn, computed once on the same file:
 *  - DummyClassifier(strategy="most_frequent") under StratifiedKFold(5): accuracy 0.6510 (= 500 / 768);
 *  - Pipeline(StandardScaler(), LogisticRegression()) on the diastolic blood pressure column `pres`
 *    alone under RepeatedStratifiedKFold(5 folds, 10 repeats, random_state=0): 0.6509 (sd 0.0024),
 *    no better than the most common class; on all eight columns, 0.7754 (sd 0.0245).
 */
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { mean } from "simple-statistics";
import { describe, expect, it } from "vitest";
import type { CurveFile } from "../../src/curve/curveFile.js";
import { measureCurve } from "../../src/curve/measure.js";
import { readCurve } from "../../src/curve/readCurve.js";
import { readCsv } from "../../src/data/csv.js";
import { tableToDataset } from "../../src/data/tableToDataset.js";
import { forecastCurve } from "../../src/forecast/forecast.js";
import { mostCommonClass } from "../../src/curve/mostCommonClass.js";

const file = new URL("../../fixtures/open-data/pima_diabetes.csv", import.meta.url).pathname;
const columns = ["preg", "plas", "pres", "skin", "insu", "mass", "pedi", "age"];
const warningPattern = /always answering the most common class, 'tested_negative'/;

/** Mean accuracy at the curve's largest training size. */
const largestMean = (curve: CurveFile): number => mean(curve.points[curve.points.length - 1].scores);

async function pimaCurve(keep: string[]) {
  const dataset = tableToDataset(readCsv(file), {
    label: "class",
    ignore: columns.filter((column) => !keep.includes(column)),
  });
  return measureCurve(dataset, file, { folds: 5, repeats: 5, seed: 3, workers: 1 });
}

describe("accuracy against the most common class", () => {
  it("records each class's rows as the data set's documentation gives them", async () => {
    const curve = await pimaCurve(columns);
    expect(curve.classNames).toEqual(["tested_negative", "tested_positive"]);
    expect(curve.classCounts).toEqual([500, 268]);
    const common = mostCommonClass(curve);
    expect(common?.name).toBe("tested_negative");
    // scikit-learn's DummyClassifier(strategy="most_frequent"): 0.6510.
    expect(common?.share).toBeCloseTo(0.651, 3);
    // With every column the model beats that share by far (scikit-learn: 0.7754): no warning.
    expect(Math.abs(largestMean(curve) - 0.7754)).toBeLessThan(0.02);
    const forecast = forecastCurve(curve, { draws: 50 });
    expect(forecast.warnings.join("\n")).not.toMatch(warningPattern);
  }, 120_000);

  it("warns when the model does no better than always answering it (blood pressure alone)", async () => {
    const curve = await pimaCurve(["pres"]);
    // scikit-learn scores this model 0.6509 ± 0.0024; headroom draws its own folds.
    expect(Math.abs(largestMean(curve) - 0.651)).toBeLessThan(0.02);
    const forecast = forecastCurve(curve, { draws: 50 });
    expect(forecast.warnings.join("\n")).toMatch(warningPattern);
    // The curve without its counts (older files, CSV curves) cannot tell: no such warning.
    const older = forecastCurve({ ...curve, classCounts: undefined }, { draws: 50 });
    expect(older.warnings.join("\n")).not.toMatch(warningPattern);
  }, 120_000);

  it("refuses counts that do not match the classes or the rows, naming the key", () => {
    const dir = mkdtempSync(join(tmpdir(), "headroom-class-counts-"));
    const base = {
      kind: "headroom-curve",
      version: 1,
      metric: "accuracy",
      higherIsBetter: true,
      rows: 768,
      classNames: ["tested_negative", "tested_positive"],
      points: [{ trainingSize: 100, scores: [0.7, 0.72] }],
    };
    const write = (name: string, value: object): string => {
      const path = join(dir, name);
      writeFileSync(path, JSON.stringify(value));
      return path;
    };
    expect(readCurve(write("ok.json", { ...base, classCounts: [500, 268] })).classCounts).toEqual([500, 268]);
    expect(() => readCurve(write("sum.json", { ...base, classCounts: [500, 200] }))).toThrow(
      /sum\.json: classCounts: must add up to rows \(768\)/,
    );
    expect(() => readCurve(write("length.json", { ...base, classCounts: [768] }))).toThrow(
      /length\.json: classCounts: must give one count for each of classNames/,
    );
    expect(() => readCurve(write("negative.json", { ...base, classCounts: [769, -1] }))).toThrow(
      /negative\.json: classCounts\.1: /,
    );
  });
});
