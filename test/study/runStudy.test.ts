/**
 * A study file's forecast options reach the forecast: the family, target, confidence and test size
 * set in study.json show in forecast.json. (Iris, Fisher 1936 via UCI, as shipped by scikit-learn in
 * Debian's python3-sklearn: fixtures/open-data/iris.csv.)
 */
import { copyFileSync, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { runStudy } from "../../src/study/runStudy.js";

const root = fileURLToPath(new URL("../../", import.meta.url));

describe("runStudy", () => {
  it("passes the study's forecast options to the forecast", async () => {
    const dir = mkdtempSync(join(tmpdir(), "headroom-study-"));
    copyFileSync(join(root, "fixtures/open-data/iris.csv"), join(dir, "iris.csv"));
    const studyFile = join(dir, "study.json");
    writeFileSync(
      studyFile,
      JSON.stringify({
        data: "iris.csv",
        label: "class",
        measure: { repeats: 2, seed: 3 },
        forecast: { family: "pow3", target: 0.9, confidence: 0.7, testSize: 60, draws: 40 },
        plan: { samplesPerRun: 30, costPerRun: 100, maxRuns: 2, valuePerPoint: 10 },
      }),
    );
    const result = await runStudy(studyFile, { outDir: join(dir, "out"), workers: 1 });
    const forecast = result.forecast;
    expect(forecast.familyWeights).toEqual({ pow3: 1 });
    expect(forecast.testSize).toBe(60);
    expect(forecast.targetSize?.target).toBe(0.9);
    expect(forecast.targetSize?.confidence).toBe(0.7);
  }, 60_000);
});
