/**
 * Bring your own curve: a `trainingSize,score[,repeat]` CSV from any trainer, read by `readCurve` and
 * forecast like a measured curve.
 */
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { readCurve } from "../../src/curve/readCurve.js";
import { forecastCurve } from "../../src/forecast/forecast.js";
import { RandomStream } from "../../src/random.js";

const dir = mkdtempSync(join(tmpdir(), "headroom-curve-csv-"));
/** The trainer's true curve: 0.9 − 1.2·n^(−0.5). */
const truth = (n: number) => 0.9 - 1.2 * Math.pow(n, -0.5);
const sizes = [20, 40, 80, 160, 320, 640];

/** One row per fit: 4 repeats × 3 folds per size, a shift per repeat and noise per fit. */
function curveCsv(withRepeat: boolean, seed: number): string {
  const random = new RandomStream(seed);
  const shifts = Array.from({ length: 4 }, () => 0.01 * random.normal());
  const lines = [withRepeat ? "trainingSize,score,repeat" : "trainingSize,score"];
  for (const n of sizes) {
    for (let r = 0; r < 4; r++) {
      for (let f = 0; f < 3; f++) {
        const score = Math.min(1, truth(n) + shifts[r] + 0.02 * random.normal() * Math.sqrt(100 / n));
        lines.push(withRepeat ? `${n},${score.toFixed(5)},run-${r}` : `${n},${score.toFixed(5)}`);
      }
    }
  }
  return `${lines.join("\n")}\n`;
}

describe("forecasting a curve CSV", () => {
  it("forecasts a CSV with a repeat column, resampling its repeats", () => {
    const file = join(dir, "with-repeat.csv");
    writeFileSync(file, curveCsv(true, 1));
    const curve = readCurve(file);
    const forecast = forecastCurve(curve, { at: [640, 1920, 3200], draws: 100 });
    // The CSV says neither the data set's rows nor the folds: the test-fold size is assumed, and said.
    expect(forecast.warnings).toEqual([expect.stringMatching(/does not say how large its test folds were/)]);
    expect(forecast.testSize).toBe(640);
    for (const p of forecast.projections) {
      expect(p.lower).toBeLessThanOrEqual(p.expected);
      expect(p.expected).toBeLessThanOrEqual(p.upper);
      // Within 3 points of the trainer's true curve up to 5 times the largest size (checked on this seed).
      expect(Math.abs(p.expected - truth(p.trainingSize))).toBeLessThan(0.03);
    }
    const atThree = forecast.projections[1];
    expect(atThree.lower).toBeLessThanOrEqual(truth(1920));
    expect(atThree.upper).toBeGreaterThanOrEqual(truth(1920));
    expect(Object.keys(forecast.familyWeights!).length).toBeGreaterThan(1);
  });

  it("forecasts a CSV without a repeat column, resampling single scores, and says so", () => {
    const file = join(dir, "no-repeat.csv");
    writeFileSync(file, curveCsv(false, 2));
    const forecast = forecastCurve(readCurve(file), { at: [1920], draws: 100 });
    expect(forecast.warnings).toEqual([
      expect.stringMatching(/does not say which repeat each score came from/),
      expect.stringMatching(/does not say how large its test folds were/),
    ]);
    expect(forecast.projections[0].upper).toBeGreaterThan(forecast.projections[0].lower);
  });
});
