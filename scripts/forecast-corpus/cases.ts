/**
 * Pilot-to-target cases of the forecast corpus and the headline figures of a forecast evaluation.
 *
 * A case is one pilot curve of the corpus and one target size at which the truth was measured, from
 * twice to 16 times the pilot's rows. Its figures:
 * - error: forecast − truth at the target (signed; its mean is the signed error, its absolute value's
 *   mean the mean absolute error);
 * - the pilot's own error: the pilot curve's mean score at its largest measured size L minus the
 *   truth at L, what no extrapolation can remove (its absolute mean is the floor);
 * - gain ratio over a group of cases: Σ(forecast − pilot's score at L) ÷ Σ(truth at target − truth
 *   at L), the share of the true gain from L to the target that the forecast foresaw (1: all of it);
 * - coverage: the share of cases whose 80% interval holds the truth.
 */
import type { CorpusFile } from "./corpus.js";
import type { CurveFile } from "../../src/curve/curveFile.js";
import { forecastCurve } from "../../src/forecast/forecast.js";
import type { Projection } from "../../src/forecast/forecastFile.js";
import type { GainCalibration } from "../../src/forecast/gainCorrection.js";

export interface CorpusPilot {
  dataSet: string;
  learner: string;
  task: "classification" | "regression";
  /** Rows of the pilot. */
  size: number;
  draw: number;
  curve: CurveFile;
  /** Largest measured training size. */
  largest: number;
  /** Mean score of the pilot curve at `largest`. */
  scoreAtLargest: number;
  truthAtLargest: number;
  /** Target sizes with their truths. */
  targets: { size: number; truth: number }[];
}

/** Targets from `lowestMultiple` to `highestMultiple` times the pilot's rows. */
export const lowestMultiple = 2;
export const highestMultiple = 16;

/** The truth at size n, interpolated linearly in ln n between measured sizes (exact at them). */
function truthAt(file: CorpusFile, n: number): number {
  const t = file.truth;
  if (n <= t[0].size) return t[0].mean;
  for (let i = 1; i < t.length; i++) {
    if (n <= t[i].size) {
      const w = Math.log(n / t[i - 1].size) / Math.log(t[i].size / t[i - 1].size);
      return (1 - w) * t[i - 1].mean + w * t[i].mean;
    }
  }
  return t[t.length - 1].mean;
}

export function corpusPilots(corpus: readonly CorpusFile[]): CorpusPilot[] {
  const pilots: CorpusPilot[] = [];
  for (const file of corpus) {
    for (const { size, draw, curve } of file.pilots) {
      const last = curve.points[curve.points.length - 1];
      const largest = last.trainingSize;
      const scores = last.scores.filter(Number.isFinite);
      const targets = file.truth
        .filter((t) => t.size >= lowestMultiple * size && t.size <= highestMultiple * size && t.size > largest)
        .map((t) => ({ size: t.size, truth: t.mean }));
      if (targets.length === 0) continue;
      pilots.push({
        dataSet: file.dataSet,
        learner: file.learner,
        task: file.task,
        size,
        draw,
        curve,
        largest,
        scoreAtLargest: scores.reduce((s, v) => s + v, 0) / scores.length,
        truthAtLargest: truthAt(file, largest),
        targets,
      });
    }
  }
  return pilots;
}

/** One forecast of one case. */
export interface CaseResult {
  dataSet: string;
  learner: string;
  pilot: number;
  draw: number;
  target: number;
  /** Target over the largest measured size. */
  ratio: number;
  truth: number;
  truthAtLargest: number;
  scoreAtLargest: number;
  forecast: number;
  lower: number;
  upper: number;
}

export interface Summary {
  cases: number;
  /** Mean absolute error. */
  meanAbsoluteError: number;
  /** Mean of forecast − truth. */
  signedError: number;
  /** Σ forecast gain ÷ Σ true gain. */
  gainRatio: number;
  coverage: number;
  /** Mean absolute error of the pilot's score at its largest size (the floor). */
  floor: number;
  /** Largest mean absolute error of one data set (with its name). */
  worstDataSet: { name: string; meanAbsoluteError: number };
}

export function summarise(results: readonly CaseResult[]): Summary {
  const mean = (values: number[]): number => values.reduce((s, v) => s + v, 0) / values.length;
  let forecastGain = 0;
  let trueGain = 0;
  for (const r of results) {
    forecastGain += r.forecast - r.scoreAtLargest;
    trueGain += r.truth - r.truthAtLargest;
  }
  let worst = { name: "", meanAbsoluteError: -Infinity };
  for (const name of new Set(results.map((r) => r.dataSet))) {
    const e = mean(results.filter((r) => r.dataSet === name).map((r) => Math.abs(r.forecast - r.truth)));
    if (e > worst.meanAbsoluteError) worst = { name, meanAbsoluteError: e };
  }
  return {
    cases: results.length,
    meanAbsoluteError: mean(results.map((r) => Math.abs(r.forecast - r.truth))),
    signedError: mean(results.map((r) => r.forecast - r.truth)),
    gainRatio: forecastGain / trueGain,
    coverage: mean(results.map((r) => (r.lower <= r.truth && r.truth <= r.upper ? 1 : 0))),
    floor: mean(results.map((r) => Math.abs(r.scoreAtLargest - r.truthAtLargest))),
    worstDataSet: worst,
  };
}

/** Ratio bands of the tables: target over the largest measured size. */
export const ratioBands: [number, number][] = [
  [2, 4],
  [4, 8],
  [8, 20],
];

/** The summary table: overall, per pilot size, per ratio band, per data set (as rows of text). */
export function summaryTable(results: readonly CaseResult[], title: string): string[] {
  const pct = (v: number, digits = 2): string => (100 * v).toFixed(digits);
  const line = (label: string, s: Summary): string =>
    [
      label.padEnd(30),
      String(s.cases).padStart(6),
      pct(s.meanAbsoluteError).padStart(7),
      pct(s.floor).padStart(7),
      pct(s.signedError).padStart(7),
      s.gainRatio.toFixed(2).padStart(6),
      pct(s.coverage, 0).padStart(5),
    ].join("  ");
  const out = [
    title,
    ["".padEnd(30), "cases", "MAE pp", "floor", "signed", "gain", "cov%"]
      .map((h, i) => (i ? h.padStart(i === 1 ? 6 : 7) : h))
      .join("  "),
  ];
  if (results.length === 0) return out;
  out.push(line("all", summarise(results)));
  for (const pilot of [...new Set(results.map((r) => r.pilot))].sort((p, q) => p - q))
    out.push(line(`pilot of ${pilot} rows`, summarise(results.filter((r) => r.pilot === pilot))));
  for (const [low, high] of ratioBands) {
    const band = results.filter((r) => r.ratio >= low && r.ratio < high);
    if (band.length > 0) out.push(line(`${low}–${high}× largest measured`, summarise(band)));
  }
  for (const name of [...new Set(results.map((r) => r.dataSet))].sort())
    out.push(line(name, summarise(results.filter((r) => r.dataSet === name))));
  return out;
}

/** What a case is, before its forecast: the pilot, the target and the truths. */
export function caseOf(
  pilot: CorpusPilot,
  t: { size: number; truth: number },
): Omit<CaseResult, "forecast" | "lower" | "upper"> {
  return {
    dataSet: pilot.dataSet,
    learner: pilot.learner,
    pilot: pilot.size,
    draw: pilot.draw,
    target: t.size,
    ratio: t.size / pilot.largest,
    truth: t.truth,
    truthAtLargest: pilot.truthAtLargest,
    scoreAtLargest: pilot.scoreAtLargest,
  };
}

/** The cases of one pilot, forecast by `forecastCurve` itself with the given calibration. */
export function forecastPilot(
  pilot: CorpusPilot,
  calibration: GainCalibration | null,
  options: { draws?: number } = {},
): CaseResult[] {
  const forecast = forecastCurve(pilot.curve, {
    at: pilot.targets.map((t) => t.size),
    calibration,
    seed: 1,
    ...options,
  });
  return pilot.targets.map((t) => {
    const p = forecast.projections.find((q) => q.trainingSize === t.size) as Projection;
    return {
      ...caseOf(pilot, t),
      forecast: p.expected,
      lower: p.lower,
      upper: p.upper,
    };
  });
}
