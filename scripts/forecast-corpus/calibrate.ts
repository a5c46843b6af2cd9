/**
 * Learns the forecast's gain correction from the corpus of measured curves and judges it
 * leave-one-data-set-out.
 *
 *     npx tsx scripts/forecast-corpus/calibrate.ts [--corpus fixtures/forecast-corpus] [--cache FILE]
 *                                                  [--write]
 *
 * 1. For every pilot curve of the corpus, the forecast's uncorrected parts as `forecastCurve` makes
 *    them (seed 1, 200 draws): each family's point fit and backtest weight, and the draws (family,
 *    refitted parameters, shared shift, extrapolation error). They do not depend on the correction,
 *    so they are computed once (`--cache FILE` keeps them between runs).
 * 2. For each data set D, a continuation (gainCorrection.ts) is learned from the other data sets'
 *    classification cases only (leave-one-data-set-out; both learners of D are left out), once from
 *    all of them (the pooled one) and, for a per-learner variant, once from each learner's: the weights
 *    of the variant's terms by weighted least squares of truth − Σ w_f m_f(L) on the terms (each
 *    data set weighing the same), constrained so that the summed forecast gain equals the summed
 *    gain measured later (calibration in the large), with, for a variant that has it, the slope's
 *    reliability r chosen from a grid by the least weighted squared error of those fits; then the
 *    spread (multiplier of the families' extrapolation errors) by bisection, so that the 80%
 *    intervals hold the truth in 82% of the training cases. D's cases are forecast with that
 *    continuation.
 * 3. Prints the leave-one-data-set-out figures of each variant tried (spread 1), then the chosen
 *    one's tables (`--variant NAME` chooses another).
 * 4. With `--write`: the calibrations learned from every data set go to
 *    src/forecast/corpusCalibration.ts, and each data set's leave-one-out calibration to
 *    fixtures/forecast-corpus/leave-one-out.json (for evaluate-corpus.ts and the test).
 */
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import { Matrix, solve } from "ml-matrix";
import { format, resolveConfig } from "prettier";
import { assessFamilies } from "../../src/forecast/backtest.js";
import { drawCurves, drawnValue, type DrawnCurve } from "../../src/forecast/drawCurves.js";
import { measuredCurve } from "../../src/forecast/measuredCurve.js";
import { sampleShift } from "../../src/forecast/sampleUncertainty.js";
import { findCurveFamily, orientationSign, orientedRange } from "../../src/fit/families.js";
import { quantileSorted } from "../../src/forecast/quantile.js";
import {
  calibrationFor,
  continuationFor,
  continuedGain,
  guessError,
  type CalibrationSet,
  type Continuation,
  type GainCalibration,
} from "../../src/forecast/gainCorrection.js";
import { scoreLimits } from "../../src/forecast/storedCurves.js";
import { RandomStream } from "../../src/random.js";
import { readCorpus } from "./corpus.js";
import { caseOf, corpusPilots, summarise, summaryTable, type CaseResult, type CorpusPilot } from "./cases.js";

const argv = process.argv.slice(2);
function option(name: string): string | undefined {
  const index = argv.indexOf(name);
  return index >= 0 ? argv[index + 1] : undefined;
}
const corpusDir = option("--corpus") ?? "fixtures/forecast-corpus";
const cacheFile = option("--cache");
const write = argv.includes("--write");

// ---------------------------------------------------------------------------------------------
// 1. The uncorrected parts of each pilot's forecast

interface Parts {
  sign: 1 | -1;
  range?: [number, number];
  families: { name: string; parameters: number[]; weight: number }[];
  draws: { family: number; parameters: number[]; shift: number; extrapolation: number }[];
}

const pilots = corpusPilots(readCorpus(corpusDir));
const keyOf = (p: CorpusPilot): string => `${p.dataSet}--${p.learner}--${p.size}--${p.draw}`;
const cache: Record<string, Parts | null> =
  cacheFile !== undefined && existsSync(cacheFile)
    ? (JSON.parse(readFileSync(cacheFile, "utf8")) as Record<string, Parts | null>)
    : {};
let computed = 0;
const started = performance.now();
for (const pilot of pilots) {
  const key = keyOf(pilot);
  if (key in cache) continue;
  try {
    const measured = measuredCurve(pilot.curve);
    const assessment = assessFamilies(measured, undefined, 1);
    const shift = sampleShift(pilot.curve, measured);
    const drawn = drawCurves(measured, assessment.families, shift.standardDeviation, { seed: 1, draws: 200 }, null);
    const names = assessment.families.map((f) => f.family.name);
    cache[key] = {
      sign: measured.sign,
      range: orientedRange(measured.orientation),
      families: assessment.families.map((f) => ({
        name: f.family.name,
        parameters: f.fit.parameters,
        weight: f.weight,
      })),
      draws: drawn.curves.map((c) => ({
        family: names.indexOf(c.family.name),
        parameters: c.parameters,
        shift: c.shift,
        extrapolation: c.extrapolation,
      })),
    };
  } catch (error) {
    console.error(`${key}: ${(error as Error).message}`);
    cache[key] = null;
  }
  if (++computed % 100 === 0)
    console.error(`${computed} pilots in ${((performance.now() - started) / 1000).toFixed(0)} s`);
}
if (cacheFile !== undefined && computed > 0) writeFileSync(cacheFile, JSON.stringify(cache));

// ---------------------------------------------------------------------------------------------
// 2. Forecasting a case with a calibration, and learning one

const usable = pilots.filter((p) => cache[keyOf(p)] != null);
/**
 * The standard normals of the learned gain's error, one per draw of each pilot (the cached draws hold
 * none; `forecastCurve` draws its own from each draw's stream). Each pilot has its own, as each
 * forecast has: normals shared by every pilot would shift every interval the same way.
 */
const gainNormals = new Map(
  usable.map((p, i) => {
    const random = new RandomStream(6201, i);
    return [keyOf(p), Array.from({ length: (cache[keyOf(p)] as Parts).draws.length }, () => random.normal())];
  }),
);
/**
 * The continuation is learned from the classification curves (accuracy) only: a pilot's R² on a
 * numeric target swings by tens of points (R² far below 0 on small training sets), so those cases
 * would swamp the fit; the numeric targets' figures are reported as a check out of the sample.
 */
const learnable = (p: CorpusPilot): boolean => p.task === "classification";

/**
 * The continuation `forecastCurve` gives the pilot's curve with this calibration; for a variant
 * that takes the distance left whole (`byClasses` false), with the factor q at 1.
 */
function continuationOf(
  pilot: CorpusPilot,
  calibration: GainCalibration | null,
  byClasses: boolean,
): Continuation | null {
  if (calibration === null) return null;
  const { best } = scoreLimits(pilot.curve);
  const oriented = best === undefined ? null : orientationSign(pilot.curve) * best;
  return continuationFor(
    calibration,
    pilot.curve.points[0].trainingSize,
    oriented,
    byClasses ? guessError(pilot.curve) : 1,
  );
}

/** The forecast of one case as forecastCurve makes it: the weighted point fits, the draws' 80% interval. */
function forecastCase(
  pilot: CorpusPilot,
  calibration: GainCalibration | null,
  byClasses: boolean,
  n: number,
  drawLimit = Infinity,
): { forecast: number; lower: number; upper: number } {
  const parts = cache[keyOf(pilot)] as Parts;
  const clamp = (v: number): number =>
    parts.range === undefined ? v : Math.min(parts.range[1], Math.max(parts.range[0], v));
  const continuation = continuationOf(pilot, calibration, byClasses);
  const spread = calibration?.spread ?? 1;
  const normals = gainNormals.get(keyOf(pilot)) as number[];
  const drawn = (
    name: string,
    parameters: number[],
    shift: number,
    extrapolation: number,
    gainError: number,
  ): DrawnCurve => ({
    family: findCurveFamily(name),
    parameters,
    shift,
    extrapolation,
    continuation,
    gainError,
  });
  const point = clamp(
    parts.families.reduce(
      (s, f) => s + f.weight * drawnValue(drawn(f.name, f.parameters, 0, 0, 0), n, pilot.largest),
      0,
    ),
  );
  const values = parts.draws
    .slice(0, Math.min(drawLimit, parts.draws.length))
    .map(
      (d, j) =>
        parts.sign *
        drawnValue(
          drawn(
            parts.families[d.family].name,
            d.parameters,
            d.shift,
            spread * d.extrapolation,
            (continuation?.gainSpread ?? 0) * normals[j],
          ),
          n,
          pilot.largest,
          parts.range,
        ),
    )
    .sort((p, q) => p - q);
  const expected = parts.sign * point;
  return {
    forecast: expected,
    lower: Math.min(expected, quantileSorted(values, 0.1)),
    upper: Math.max(expected, quantileSorted(values, 0.9)),
  };
}

interface Variant {
  name: string;
  /** Which terms are learned (none: the families' own extrapolation). */
  terms: ("own" | "chord" | "slope" | "headroom")[];
  /** Whether the summed forecast gain is held to the summed true gain. */
  constrained: boolean;
  /** Whether each corpus learner gets its own weights and spread (besides the pooled ones). */
  perLearner?: boolean;
  /** Whether the distance left counts by the factor q of the number of classes (`guessError`). */
  byClasses?: boolean;
  /**
   * The values of r tried for the slope's reliability L / (L + r) (`reliabilityOf`); absent: the
   * slope and the distance left are taken whole.
   */
  reliabilitySizes?: number[];
}

/**
 * Weighted least squares of (truth − Σ w_f m_f(L)) on the features Σ w_f chord_f · ln(n/L) and
 * Σ w_f (best − m_f(L)) · ln(n/L), each data set weighing the same, with the constraint (a Lagrange
 * multiplier) that Σ over cases of the forecast gain, forecast − the pilot's score at L, equals
 * Σ (truth at n − truth at L).
 */
function learnWeights(
  train: readonly CorpusPilot[],
  variant: Variant,
  reliabilitySize: number | null,
): {
  weights: { ownWeight: number; chordWeight: number; slopeWeight: number; headroomWeight: number };
  /** The fit's weighted sum of squared errors on `train`. */
  squaredError: number;
} {
  const k = variant.terms.length;
  const perDataSet = new Map<string, number>();
  for (const p of train) perDataSet.set(p.dataSet, (perDataSet.get(p.dataSet) ?? 0) + p.targets.length);
  const a = Matrix.zeros(k + 1, k + 1);
  const b = Matrix.zeros(k + 1, 1);
  let trueGain = 0;
  let squaredTruth = 0;
  const featureSum = new Array<number>(k).fill(0);
  for (const p of train) {
    const parts = cache[keyOf(p)] as Parts;
    const continuation = continuationOf(
      p,
      { ownWeight: 0, chordWeight: 0, slopeWeight: 0, headroomWeight: 0, spread: 1, gainSpread: 0, reliabilitySize },
      variant.byClasses === true,
    ) as Continuation;
    const weight = 1 / (perDataSet.get(p.dataSet) as number);
    let anchor = 0;
    let chord = 0;
    let left = 0;
    let slope = 0;
    for (const f of parts.families) {
      const model = (size: number): number => findCurveFamily(f.name).model(size, f.parameters);
      // Each term as continuedGain takes it: the gain with only that weight at 1, over one unit of ln n.
      const term = (weight: "chordWeight" | "slopeWeight" | "headroomWeight"): number =>
        continuedGain({ ...continuation, [weight]: 1 }, model, p.largest, p.largest * Math.E);
      anchor += f.weight * model(p.largest);
      chord += f.weight * term("chordWeight");
      left += f.weight * term("headroomWeight");
      slope += f.weight * term("slopeWeight");
    }
    const features = { chord, slope, headroom: left };
    const own = (size: number): number =>
      parts.families.reduce((sum, f) => {
        const family = findCurveFamily(f.name);
        return sum + f.weight * (family.model(size, f.parameters) - family.model(p.largest, f.parameters));
      }, 0);
    for (const t of p.targets) {
      const logRatio = Math.log(t.size / p.largest);
      const x = variant.terms.map((term) => (term === "own" ? own(t.size) : features[term] * logRatio));
      const y = parts.sign * t.truth - anchor;
      squaredTruth += weight * y * y;
      for (let i = 0; i < k; i++) {
        b.set(i, 0, b.get(i, 0) + weight * x[i] * y);
        for (let j = 0; j < k; j++) a.set(i, j, a.get(i, j) + weight * x[i] * x[j]);
        featureSum[i] += x[i];
      }
      // The forecast gain is anchor − score at L + x·β; the true gain, truth at n − truth at L.
      trueGain += parts.sign * (t.truth - p.truthAtLargest) - (anchor - parts.sign * p.scoreAtLargest);
    }
  }
  let size = k;
  if (variant.constrained) {
    for (let i = 0; i < k; i++) {
      a.set(i, k, featureSum[i]);
      a.set(k, i, featureSum[i]);
    }
    b.set(k, 0, trueGain);
    size = k + 1;
  }
  const beta = solve(a.subMatrix(0, size - 1, 0, size - 1), b.subMatrix(0, size - 1, 0, 0)).getColumn(0);
  const weightOf = (term: Variant["terms"][number]): number =>
    variant.terms.includes(term) ? beta[variant.terms.indexOf(term)] : 0;
  // Σ w (y − xβ)² = Σ w y² − 2 βᵀ(Σ w x y) + βᵀ(Σ w x xᵀ)β
  let squaredError = squaredTruth;
  for (let i = 0; i < k; i++) {
    squaredError -= 2 * beta[i] * b.get(i, 0);
    for (let j = 0; j < k; j++) squaredError += beta[i] * a.get(i, j) * beta[j];
  }
  return {
    weights: {
      ownWeight: weightOf("own"),
      chordWeight: weightOf("chord"),
      slopeWeight: weightOf("slope"),
      headroomWeight: weightOf("headroom"),
    },
    squaredError,
  };
}

const targetCoverage = 0.82;

/**
 * Share of the cases whose 80% interval (from the first 50 draws) holds the truth, overall and for
 * each pilot size.
 */
function coverageOf(
  train: readonly CorpusPilot[],
  calibration: GainCalibration,
  byClasses: boolean,
): { overall: number; bySize: Map<number, number> } {
  const inside = new Map<number, number>();
  const count = new Map<number, number>();
  for (const p of train) {
    for (const t of p.targets) {
      const f = forecastCase(p, calibration, byClasses, t.size, 50);
      inside.set(p.size, (inside.get(p.size) ?? 0) + (f.lower <= t.truth && t.truth <= f.upper ? 1 : 0));
      count.set(p.size, (count.get(p.size) ?? 0) + 1);
    }
  }
  const sum = (m: Map<number, number>): number => [...m.values()].reduce((a, b) => a + b, 0);
  const bySize = new Map([...count].map(([size, n]) => [size, (inside.get(size) ?? 0) / n]));
  return { overall: sum(inside) / sum(count), bySize };
}

/** The learned gain's error tried (per unit of ln(n / L)). */
const gainSpreads = [0, 0.005, 0.01, 0.015];

/**
 * The continuation's weights, then its two widths. For each gain spread tried, the spread (to a 0.05
 * step, from 0 to 4) whose intervals hold the truth in the share of the training cases closest to
 * 0.82, by bisection (coverage grows with it); of those pairs, the one whose coverage is most even
 * across pilot sizes (least squared distance from 0.82, each pilot size counting the same).
 */
function learnCalibration(
  train: readonly CorpusPilot[],
  variant: Variant,
  learnSpread: boolean,
  reliabilitySize: number | null,
): GainCalibration {
  const weights = { ...learnWeights(train, variant, reliabilitySize).weights, reliabilitySize };
  if (!learnSpread) return { ...weights, spread: 1, gainSpread: 0 };
  let best: { calibration: GainCalibration; unevenness: number } | undefined;
  for (const gainSpread of gainSpreads) {
    let low = 0;
    let high = 4;
    while (high - low > 0.05) {
      const middle = (low + high) / 2;
      const trial = { ...weights, spread: middle, gainSpread };
      if (coverageOf(train, trial, variant.byClasses === true).overall < targetCoverage) low = middle;
      else high = middle;
    }
    const calibration = { ...weights, spread: Math.round(((low + high) / 2) * 20) / 20, gainSpread };
    const { bySize } = coverageOf(train, calibration, variant.byClasses === true);
    const unevenness = [...bySize.values()].reduce((s, c) => s + (c - targetCoverage) ** 2, 0) / bySize.size;
    if (best === undefined || unevenness < best.unevenness) best = { calibration, unevenness };
  }
  return (best as { calibration: GainCalibration }).calibration;
}

/** The classification learners of the corpus. */
const corpusLearners = [...new Set(pilots.filter(learnable).map((p) => p.learner))].sort();

/**
 * The pooled calibration (every learnable curve of `train`) and, for a per-learner variant, one per
 * corpus learner from that learner's curves alone.
 */
function learnSet(train: readonly CorpusPilot[], variant: Variant, learnSpread: boolean): CalibrationSet | null {
  if (variant.terms.length === 0) return null;
  const classificationCurves = train.filter(learnable);
  const fitted: (readonly CorpusPilot[])[] =
    variant.perLearner === true
      ? corpusLearners.map((learner) => classificationCurves.filter((p) => p.learner === learner))
      : [classificationCurves];
  const reliabilitySize = chooseReliabilitySize(fitted, variant);
  const byLearner: Record<string, GainCalibration> = {};
  if (variant.perLearner === true) {
    corpusLearners.forEach((learner, i) => {
      byLearner[learner] = { ...learnCalibration(fitted[i], variant, learnSpread, reliabilitySize), learner };
    });
  }
  return { pooled: learnCalibration(classificationCurves, variant, learnSpread, reliabilitySize), byLearner };
}

/**
 * r of the slope's reliability (`reliabilityOf`): of the variant's values, the one whose fits (one per
 * corpus learner for a per-learner variant, one pooled otherwise) leave the least summed weighted
 * squared error on the training curves; one r for every learner, as the slope's sampling noise
 * is a property of the pilot's size. Null for a variant without it.
 */
function chooseReliabilitySize(fitted: readonly (readonly CorpusPilot[])[], variant: Variant): number | null {
  if (variant.reliabilitySizes === undefined) return null;
  let best: { size: number; error: number } | undefined;
  for (const size of variant.reliabilitySizes) {
    const error = fitted.reduce((sum, train) => sum + learnWeights(train, variant, size).squaredError, 0);
    if (best === undefined || error < best.error) best = { size, error };
  }
  return (best as { size: number }).size;
}

function results(pilot: CorpusPilot, set: CalibrationSet | null, variant: Variant): CaseResult[] {
  const calibration = set === null ? null : calibrationFor(set, pilot.learner);
  return pilot.targets.map((t) => ({
    ...caseOf(pilot, t),
    ...forecastCase(pilot, calibration, variant.byClasses === true, t.size),
  }));
}

/** Each data set forecast with a calibration learned from the others (both its learners left out). */
function leaveOneOut(
  variant: Variant,
  learnSpread: boolean,
): { rows: CaseResult[]; calibrations: Record<string, CalibrationSet | null> } {
  const rows: CaseResult[] = [];
  const calibrations: Record<string, CalibrationSet | null> = {};
  for (const dataSet of [...new Set(usable.map((p) => p.dataSet))]) {
    const calibration = learnSet(
      usable.filter((p) => p.dataSet !== dataSet),
      variant,
      learnSpread,
    );
    calibrations[dataSet] = calibration;
    for (const p of usable.filter((q) => q.dataSet === dataSet)) rows.push(...results(p, calibration, variant));
  }
  return { rows, calibrations };
}

// ---------------------------------------------------------------------------------------------
// 3. The variants, then the chosen one

const variants: Variant[] = [
  { name: "families' own extrapolation (before)", terms: [], constrained: false },
  { name: "own gain, calibrated in the large", terms: ["own"], constrained: true },
  { name: "chord + distance left, calibrated in the large", terms: ["chord", "headroom"], constrained: true },
  { name: "slope + distance left, calibrated in the large", terms: ["slope", "headroom"], constrained: true },
  {
    name: "slope + distance left, calibrated in the large, per learner",
    terms: ["slope", "headroom"],
    constrained: true,
    perLearner: true,
  },
  {
    name: "slope + distance left × (1 − 1/K), calibrated in the large, per learner",
    terms: ["slope", "headroom"],
    constrained: true,
    perLearner: true,
    byClasses: true,
  },
  {
    name: "slope × L/(L + r) + distance left × (1 − 1/K) × r/(L + r), calibrated in the large, per learner",
    terms: ["slope", "headroom"],
    constrained: true,
    perLearner: true,
    byClasses: true,
    reliabilitySizes: [25, 50, 75, 100, 150, 200, 300, 500],
  },
  {
    name: "chord + slope + distance left, calibrated in the large",
    terms: ["chord", "slope", "headroom"],
    constrained: true,
  },
  { name: "own + slope + distance left, least squares", terms: ["own", "slope", "headroom"], constrained: false },
  {
    name: "own + slope + distance left, calibrated in the large",
    terms: ["own", "slope", "headroom"],
    constrained: true,
  },
  {
    name: "own + chord + slope + distance left, calibrated in the large",
    terms: ["own", "chord", "slope", "headroom"],
    constrained: true,
  },
];
const chosen = variants.find(
  (v) =>
    v.name ===
    (option("--variant") ??
      "slope × L/(L + r) + distance left × (1 − 1/K) × r/(L + r), calibrated in the large, per learner"),
) as Variant;
const groups: [string, (r: CaseResult) => boolean][] = [
  ["logistic", (r) => r.learner === "logistic"],
  ["forest", (r) => r.learner === "forest"],
  ["ridge and knn (R²)", (r) => r.learner === "ridge" || r.learner === "knn-regression"],
];
const pp = (v: number): string => (100 * v).toFixed(2);
const line = (s: ReturnType<typeof summarise>): string =>
  `MAE ${pp(s.meanAbsoluteError)} (floor ${pp(s.floor)}), signed ${pp(s.signedError)}, gain ratio ${s.gainRatio.toFixed(2)}, coverage ${(100 * s.coverage).toFixed(0)}%, worst ${s.worstDataSet.name} ${(100 * s.worstDataSet.meanAbsoluteError).toFixed(1)}`;
const dataSets = new Set(usable.map((p) => p.dataSet)).size;
const caseCount = usable.reduce((s, p) => s + p.targets.length, 0);
console.log(`${usable.length} pilot curves, ${caseCount} cases, ${dataSets} data sets`);
let chosenRun: ReturnType<typeof leaveOneOut> | undefined;
for (const variant of variants) {
  const run = leaveOneOut(variant, variant === chosen);
  if (variant === chosen) chosenRun = run;
  console.log(`\n${variant.name} (leave-one-data-set-out${variant === chosen ? ", spread learned" : ", spread 1"}):`);
  for (const [label, keep] of groups) console.log(`  ${label.padEnd(20)} ${line(summarise(run.rows.filter(keep)))}`);
}
const { rows, calibrations } = chosenRun as ReturnType<typeof leaveOneOut>;
console.log(`\nchosen: ${chosen.name} (leave-one-data-set-out)`);
for (const [label, keep] of groups) console.log(summaryTable(rows.filter(keep), `\n${label}`).join("\n"));
const full = learnSet(usable, chosen, true) as CalibrationSet;
const round = (c: GainCalibration): GainCalibration => ({
  ownWeight: Number(c.ownWeight.toFixed(4)),
  chordWeight: Number(c.chordWeight.toFixed(4)),
  slopeWeight: Number(c.slopeWeight.toFixed(4)),
  headroomWeight: Number(c.headroomWeight.toFixed(4)),
  spread: c.spread,
  gainSpread: c.gainSpread,
  reliabilitySize: c.reliabilitySize,
  ...(c.learner === undefined ? {} : { learner: c.learner }),
});
const rounded: CalibrationSet = {
  pooled: round(full.pooled),
  byLearner: Object.fromEntries(Object.entries(full.byLearner).map(([name, c]) => [name, round(c)])),
};
console.log(`\nlearned from every data set: ${JSON.stringify(rounded)}`);

// ---------------------------------------------------------------------------------------------
// 4. Writing

const learnedPilots = usable.filter(learnable);
const learnedCases = learnedPilots.reduce((s, p) => s + p.targets.length, 0);
const learnedDataSets = new Set(learnedPilots.map((p) => p.dataSet)).size;
const pilotSizes = learnedPilots.map((p) => p.size);
if (write) {
  writeFileSync(`${corpusDir}/leave-one-out.json`, JSON.stringify(calibrations, null, 1) + "\n");
  const file = "src/forecast/corpusCalibration.ts";
  const text = `/**
 * The forecast's learned continuation (gainCorrection.ts), written by
 * \`npx tsx scripts/forecast-corpus/calibrate.ts --write\`; do not edit by hand.
 *
 * Learned from the ${learnedPilots.length} classification pilot curves (${learnedCases} pilot-to-target cases) of the
 * ${learnedDataSets} classification data sets of fixtures/forecast-corpus (logistic regression and random
 * forest, accuracy), pilots of ${Math.min(...pilotSizes)} to ${Math.max(...pilotSizes)} rows, targets 2 to 16 times the pilot; variant
 * "${chosen.name}". Checked leave-one-data-set-out: see the README's forecast section.
 */
import type { CalibrationSet } from "./gainCorrection.js";

export const corpusCalibration: CalibrationSet = ${JSON.stringify(rounded, null, 2)};
`;
  // Written as the project's formatter would write it, so that \`npm test\`'s format check passes.
  writeFileSync(file, await format(text, { ...(await resolveConfig(file)), filepath: file }));
}
