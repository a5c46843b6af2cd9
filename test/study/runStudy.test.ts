/**
 * A study file's forecast options reach the forecast: the family, target, confidence and test size
 * set in study.json show in forecast.json. (Iris, Fisher 1936 via UCI, as shipped by scikit-learn in
 * Debian's python3-sklearn: fixtures/open-data/iris.csv.)
 */
import { spawnSync } from "node:child_process";
import { copyFileSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
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

  const clusterUp = /\b(idle|mix|alloc)\b/.test(
    spawnSync("sinfo", ["-h", "-o", "%t"], { encoding: "utf8" }).stdout ?? "",
  );

  it("takes trainer, on, tasksDir and slurmOptions in its measure section", async () => {
    const dir = mkdtempSync(join(tmpdir(), "headroom-study-"));
    copyFileSync(join(root, "fixtures/open-data/iris.csv"), join(dir, "iris.csv"));
    const measure = { repeats: 1, seed: 3, sizes: [10, 30, 60], trainer: `sh ${join(root, "examples/majority.sh")}` };
    const write = (name: string, extra: object) => {
      const file = join(dir, name);
      const plan = { samplesPerRun: 30, costPerRun: 100, maxRuns: 2, valuePerPoint: 10 };
      writeFileSync(
        file,
        JSON.stringify({ data: "iris.csv", label: "class", measure: { ...measure, ...extra }, plan }),
      );
      return file;
    };
    const local = await runStudy(write("local.json", { trainerTimeout: 60 }), {
      outDir: join(dir, "local"),
      workers: 2,
    });
    expect(local.curve.learner).toBe("trainer");
    expect(local.curve.trainer).toBe(measure.trainer);
    // The majority class of a stratified iris subsample scores about a third (one class of three).
    for (const point of local.curve.points) for (const score of point.scores) expect(score).toBeLessThan(0.45);
    if (!clusterUp) return;
    const slurm = { on: "slurm", tasksDir: "tasks", slurmOptions: "--time=10" };
    await runStudy(write("slurm.json", slurm), { outDir: join(dir, "slurm"), workers: 1 });
    expect(readFileSync(join(dir, "tasks", "job.json"), "utf8")).toContain('"slurmOptions": "--time=10"');
    expect(readFileSync(join(dir, "slurm", "curve.json"), "utf8")).toBe(
      readFileSync(join(dir, "local", "curve.json"), "utf8"),
    );
  }, 120_000);
});
