/**
 * Small hand-made inputs for the report tests, written as literals.
 *
 * The accuracy numbers follow the inverse power law 0.9 − 2·n^(−0.5) (so the mean at 400 samples is
 * 0.9 − 2/20 = 0.8 exactly), with fixed offsets for the single fits, rounded to four decimals. The
 * decision rows follow the net-value rule of decision.json: valuePerPoint × 100 × (expected − expected
 * now) − cost, with valuePerPoint 40,000 and 22,000 per run, e.g. two runs: 4,000,000 × (0.8529 −
 * 0.8368) − 44,000 = 64,400 − 44,000 = 20,400. The net values' intervals and chances are invented
 * (they come from forecast draws the sample does not have); the sensitivity outcomes are worked by
 * hand from the rows where the factor is a plan key (see `sampleSensitivity`).
 */
import type { TopLevelSpec } from "vega-lite";
import type { CurveFile } from "../../src/curve/curveFile.js";
import type { ForecastFile } from "../../src/forecast/forecastFile.js";
import {
  backtestChart,
  learningCurveChart,
  netValueChart,
  scoreChart,
  sensitivityChart,
  type BacktestInput,
} from "../../src/report/charts.js";
import type { ReportInput } from "../../src/report/html.js";
import type { DecisionFile, DecisionRow, SensitivityEntry } from "../../src/weigh/decisionFile.js";

export const sampleCurve: CurveFile = {
  kind: "headroom-curve",
  version: 1,
  metric: "accuracy",
  higherIsBetter: true,
  metricRange: [0, 1],
  rows: 1000,
  learner: "logistic",
  folds: 3,
  repeats: 2,
  seed: 7,
  label: "diagnosis",
  classNames: ["benign", "malignant"],
  source: { file: "cells.csv", sha256: "5f0c3c0a8d3b1e9e2d1f4a6b7c8d9e0f1a2b3c4d5e6f708192a3b4c5d6e7f809" },
  points: [
    { trainingSize: 100, scores: [0.67, 0.72, 0.71, 0.69, 0.725, 0.685] },
    { trainingSize: 200, scores: [0.7386, 0.7736, 0.7636, 0.7486, 0.7786, 0.7486] },
    { trainingSize: 400, scores: [0.788, 0.81, 0.804, 0.794, 0.812, 0.792] },
    { trainingSize: 800, scores: [0.8213, 0.8353, 0.8323, 0.8253, 0.8363, 0.8253] },
  ],
};

export const sampleForecast: ForecastFile = {
  kind: "headroom-forecast",
  version: 1,
  metric: "accuracy",
  higherIsBetter: true,
  metricRange: [0, 1],
  rows: 1000,
  family: "pow3",
  parameters: { a: 0.9, b: 2, c: 0.5 },
  measured: [
    { trainingSize: 100, mean: 0.7, standardDeviation: 0.0217, fits: 6 },
    { trainingSize: 200, mean: 0.7586, standardDeviation: 0.0158, fits: 6 },
    { trainingSize: 400, mean: 0.8, standardDeviation: 0.01, fits: 6 },
    { trainingSize: 800, mean: 0.8293, standardDeviation: 0.0062, fits: 6 },
  ],
  largestMeasuredSize: 800,
  level: 0.8,
  projections: [
    {
      trainingSize: 1000,
      expected: 0.8368,
      lower: 0.8243,
      upper: 0.8492,
      level: 0.8,
      draws: [0.83, 0.835, 0.84, 0.838],
    },
    {
      trainingSize: 1400,
      expected: 0.8465,
      lower: 0.8328,
      upper: 0.8603,
      level: 0.8,
      draws: [0.838, 0.845, 0.85, 0.849],
    },
    {
      trainingSize: 1800,
      expected: 0.8529,
      lower: 0.8382,
      upper: 0.8675,
      level: 0.8,
      draws: [0.843, 0.851, 0.858, 0.856],
    },
    {
      trainingSize: 2200,
      expected: 0.8574,
      lower: 0.842,
      upper: 0.8727,
      level: 0.8,
      draws: [0.846, 0.856, 0.863, 0.861],
    },
    {
      trainingSize: 2600,
      expected: 0.8608,
      lower: 0.8448,
      upper: 0.8768,
      level: 0.8,
      draws: [0.848, 0.859, 0.867, 0.865],
    },
  ],
  band: [
    { trainingSize: 100, expected: 0.7, lower: 0.696, upper: 0.704 },
    { trainingSize: 150, expected: 0.7367, lower: 0.7312, upper: 0.7422 },
    { trainingSize: 200, expected: 0.7586, lower: 0.752, upper: 0.7651 },
    { trainingSize: 300, expected: 0.7845, lower: 0.7765, upper: 0.7926 },
    { trainingSize: 400, expected: 0.8, lower: 0.7909, upper: 0.8091 },
    { trainingSize: 600, expected: 0.8184, lower: 0.8078, upper: 0.8289 },
    { trainingSize: 800, expected: 0.8293, lower: 0.8176, upper: 0.8409 },
    { trainingSize: 1000, expected: 0.8368, lower: 0.8243, upper: 0.8492 },
    { trainingSize: 1400, expected: 0.8465, lower: 0.8328, upper: 0.8603 },
    { trainingSize: 1800, expected: 0.8529, lower: 0.8382, upper: 0.8675 },
    { trainingSize: 2200, expected: 0.8574, lower: 0.842, upper: 0.8727 },
    { trainingSize: 2600, expected: 0.8608, lower: 0.8448, upper: 0.8768 },
  ],
  warnings: [],
  seed: 7,
};

const sampleRows: DecisionRow[] = [
  {
    runs: 0,
    trainingSize: 1000,
    expected: 0.8368,
    lower: 0.8243,
    upper: 0.8492,
    probabilityOfTarget: 0.2,
    cost: 0,
    months: 0,
    expectedNetValue: 0,
    affordable: true,
    marginalGain: 0,
    netValueLower: 0,
    netValueUpper: 0,
    probabilityNetPositive: 0,
    withinBudget: true,
    withinDeadline: true,
  },
  {
    runs: 1,
    trainingSize: 1400,
    expected: 0.8465,
    lower: 0.8328,
    upper: 0.8603,
    probabilityOfTarget: 0.42,
    cost: 22000,
    months: 3,
    expectedNetValue: 16800,
    affordable: true,
    marginalGain: 0.0097,
    netValueLower: -2000,
    netValueUpper: 36000,
    probabilityNetPositive: 0.88,
    withinBudget: true,
    withinDeadline: true,
  },
  {
    runs: 2,
    trainingSize: 1800,
    expected: 0.8529,
    lower: 0.8382,
    upper: 0.8675,
    probabilityOfTarget: 0.61,
    cost: 44000,
    months: 6,
    expectedNetValue: 20400,
    affordable: true,
    marginalGain: 0.0064,
    netValueLower: -6000,
    netValueUpper: 47000,
    probabilityNetPositive: 0.81,
    withinBudget: true,
    withinDeadline: true,
  },
  {
    runs: 3,
    trainingSize: 2200,
    expected: 0.8574,
    lower: 0.842,
    upper: 0.8727,
    probabilityOfTarget: 0.74,
    cost: 66000,
    months: 9,
    expectedNetValue: 16400,
    affordable: true,
    marginalGain: 0.0045,
    netValueLower: -15000,
    netValueUpper: 48000,
    probabilityNetPositive: 0.7,
    withinBudget: true,
    withinDeadline: true,
  },
  {
    runs: 4,
    trainingSize: 2600,
    expected: 0.8608,
    lower: 0.8448,
    upper: 0.8768,
    probabilityOfTarget: 0.83,
    cost: 88000,
    months: 12,
    expectedNetValue: 8000,
    affordable: false,
    marginalGain: 0.0034,
    netValueLower: -30000,
    netValueUpper: 46000,
    probabilityNetPositive: 0.58,
    withinBudget: false,
    withinDeadline: true,
  },
];

export const sampleDecision: DecisionFile = {
  kind: "headroom-decision",
  version: 1,
  metric: "accuracy",
  higherIsBetter: true,
  level: 0.8,
  plan: {
    currentSamples: 1000,
    samplesPerRun: 400,
    costPerRun: 22000,
    monthsPerRun: 3,
    budget: 80000,
    maxRuns: 4,
    valuePerPoint: 40000,
    target: 0.85,
    targetConfidence: 0.8,
  },
  recommendedRuns: 2,
  runsToTarget: 4,
  reasons: {
    recommendedRuns: "Two runs have the highest expected net value within the budget.",
    runsToTarget: "Four runs are the fewest with at least an 80% chance of reaching 85%, but they exceed the budget.",
  },
  table: sampleRows,
  sensitivity: sampleSensitivity(),
};

/**
 * The sensitivity of `sampleDecision`, worked by hand from its rows (score gain in points =
 * (net value + cost) ÷ 40,000: 0.97, 1.61, 2.06, 2.40 for 1 to 4 runs; budget 80,000):
 * - cost per run 16,500: 3 runs, 82,400 − 49,500 = 32,900 (2 runs: 31,400; 4 runs: 30,000);
 *   27,500: 1 run, 38,800 − 27,500 = 11,300 (2 runs: 9,400; 3 runs over budget);
 * - value per point 30,000: 1 run, 29,100 − 22,000 = 7,100 (2 runs: 4,300);
 *   50,000: 3 runs, 103,000 − 66,000 = 37,000 (2 runs: 36,500).
 * The asymptote's and the yield's outcomes are invented (they need the forecast's draws), and the
 * yield's lower side is missing, as when the forecast does not reach the sizes it needs.
 */
function sampleSensitivity(): SensitivityEntry[] {
  return [
    {
      factor: "costPerRun",
      low: { change: -0.25, value: 16500, recommendedRuns: 3, netValue: 32900 },
      high: { change: 0.25, value: 27500, recommendedRuns: 1, netValue: 11300 },
    },
    {
      factor: "samplesPerRun",
      low: null,
      high: { change: 0.25, value: 500, recommendedRuns: 2, netValue: 25000 },
      note: "The forecast does not reach the sizes 25% fewer samples per run give.",
    },
    {
      factor: "valuePerPoint",
      low: { change: -0.25, value: 30000, recommendedRuns: 1, netValue: 7100 },
      high: { change: 0.25, value: 50000, recommendedRuns: 3, netValue: 37000 },
    },
    {
      factor: "asymptote",
      low: { change: -0.25, value: null, recommendedRuns: 1, netValue: 9000 },
      high: { change: 0.25, value: null, recommendedRuns: 2, netValue: 33000 },
    },
  ];
}

/**
 * The same plan with a point worth only 10,000: no run repays its cost, so stopping is recommended.
 * Written as a decision.json of the first version: rows without intervals, no sensitivity.
 */
export const stopDecision: DecisionFile = {
  kind: "headroom-decision",
  version: 1,
  metric: "accuracy",
  higherIsBetter: true,
  level: 0.8,
  plan: { ...sampleDecision.plan, valuePerPoint: 10000, target: undefined },
  recommendedRuns: 0,
  runsToTarget: null,
  reasons: { recommendedRuns: "No run repays its cost.", runsToTarget: null },
  table: sampleRows.map((row) => ({
    runs: row.runs,
    trainingSize: row.trainingSize,
    expected: row.expected,
    lower: row.lower,
    upper: row.upper,
    probabilityOfTarget: null,
    cost: row.cost,
    months: row.months,
    // 1,000,000 × (expected − 0.8368) − cost, e.g. one run: 9,700 − 22,000 = −12,300.
    expectedNetValue: Math.round(1_000_000 * (row.expected - 0.8368) - row.cost),
    affordable: row.affordable,
  })),
};

/**
 * The example sentence of the report's brief: three runs (66,000 EUR, 9 months) lifting accuracy from
 * 81% to 86% with an 80% interval of 83% to 88%. Only the rows the headline reads are filled in.
 */
export const briefDecision: DecisionFile = {
  ...sampleDecision,
  plan: { ...sampleDecision.plan, target: undefined },
  recommendedRuns: 3,
  runsToTarget: null,
  table: [
    { ...sampleRows[0], expected: 0.81, lower: 0.79, upper: 0.83, probabilityOfTarget: null },
    { ...sampleRows[3], expected: 0.861, lower: 0.834, upper: 0.879, probabilityOfTarget: null },
  ],
};

/** A lower-is-better metric without a range (not a fraction): log loss, shown as plain numbers. */
export const logLossForecast: ForecastFile = {
  ...sampleForecast,
  metric: "log_loss",
  higherIsBetter: false,
  metricRange: undefined,
  measured: sampleForecast.measured.map((m) => ({ ...m, mean: 1 - m.mean })),
  projections: sampleForecast.projections.map((p) => ({
    ...p,
    expected: 1 - p.expected,
    lower: 1 - p.upper,
    upper: 1 - p.lower,
    draws: p.draws.map((d) => 1 - d),
  })),
  band: sampleForecast.band.map((b) => ({ ...b, expected: 1 - b.expected, lower: 1 - b.upper, upper: 1 - b.lower })),
};

export const logLossCurve: CurveFile = {
  ...sampleCurve,
  metric: "log_loss",
  higherIsBetter: false,
  metricRange: undefined,
  points: sampleCurve.points.map((p) => ({ ...p, scores: p.scores.map((s) => 1 - s) })),
};

/** Strings that would run script if a page placed them unescaped. */
export const hostile = {
  script: "<script>alert(1)</script>",
  attribute: '"><img src=x onerror=alert(1)>',
} as const;

const hostileText = `${hostile.script}${hostile.attribute}`;

/** The sample with every user-supplied string replaced by hostile markup. */
export const hostileInput: ReportInput = {
  curve: {
    ...sampleCurve,
    metric: hostileText,
    learner: hostileText,
    label: hostileText,
    group: hostileText,
    classNames: [hostile.script, hostile.attribute],
    source: { file: hostileText, sha256: hostileText },
  },
  forecast: { ...sampleForecast, metric: hostileText, warnings: [hostileText] },
  decision: { ...sampleDecision, metric: hostileText },
  title: hostileText,
  domain: hostileText,
  currency: hostileText,
  reproducibility: { toolVersion: hostileText, command: hostileText, inputSha256: hostileText },
};

export const sampleInput: ReportInput = {
  curve: sampleCurve,
  forecast: sampleForecast,
  decision: sampleDecision,
  title: "Cell classifier: is more labelling worth it?",
  domain: "clinical",
  currency: "EUR",
  reproducibility: {
    toolVersion: "0.1.0",
    seed: 7,
    inputSha256: sampleCurve.source?.sha256,
    command: "headroom report --curve curve.json --forecast forecast.json --decision decision.json",
  },
};

/**
 * The golden specs: each case's spec is stored in test/report/golden/<name>.json and the test compares
 * the freshly built spec with it. To accept an intended change, run `npx tsx scripts/update-golden.ts`
 * and review the diff of the golden files before committing.
 */
export const goldenCases: ReadonlyArray<{ name: string; build: () => TopLevelSpec }> = [
  {
    name: "learningCurve",
    build: () => learningCurveChart(sampleCurve, sampleForecast, sampleDecision, { currency: "EUR" }),
  },
  { name: "learningCurveWithoutDecision", build: () => learningCurveChart(sampleCurve, sampleForecast) },
  { name: "score", build: () => scoreChart(sampleDecision, { metricRange: [0, 1] }) },
  { name: "scoreWithoutTarget", build: () => scoreChart(stopDecision, { metricRange: [0, 1], width: 480 }) },
  { name: "netValue", build: () => netValueChart(sampleDecision, { currency: "EUR", metricRange: [0, 1] }) },
  { name: "netValueFirstVersion", build: () => netValueChart(stopDecision, { currency: "EUR", width: 480 }) },
  { name: "backtest", build: () => backtestChart(sampleBacktest) },
  {
    name: "sensitivity",
    build: () => sensitivityChart(sampleDecision.sensitivity ?? [], sampleDecision, { currency: "EUR" }),
  },
];

/**
 * A backtest of two families on the sample curve (invented predictions): pow3 and "last" (no further
 * gain), each fitted up to 200 samples predicting 400 and 800, and up to 400 predicting 800.
 * Mean absolute errors, by hand: pow3 (0.0050 + 0.0073 + 0.0018) / 3 = 0.0047;
 * last (0.0414 + 0.0707 + 0.0293) / 3 = 0.047133.
 */
export const sampleBacktest: BacktestInput = {
  metric: "accuracy",
  higherIsBetter: true,
  metricRange: [0, 1],
  predictions: [
    { family: "pow3", fittedUpTo: 200, trainingSize: 400, predicted: 0.795, measured: 0.8 },
    { family: "pow3", fittedUpTo: 200, trainingSize: 800, predicted: 0.822, measured: 0.8293 },
    { family: "pow3", fittedUpTo: 400, trainingSize: 800, predicted: 0.8275, measured: 0.8293 },
    { family: "last", fittedUpTo: 200, trainingSize: 400, predicted: 0.7586, measured: 0.8 },
    { family: "last", fittedUpTo: 200, trainingSize: 800, predicted: 0.7586, measured: 0.8293 },
    { family: "last", fittedUpTo: 400, trainingSize: 800, predicted: 0.8, measured: 0.8293 },
  ],
  familyWeights: { pow3: 0.9, last: 0.1 },
};

/**
 * The sample forecast as the forecast of several families writes it: two families weighted by their
 * backtest (pow3 0.9, last 0.1), the backtest of `sampleBacktest` with root mean square errors worked
 * from its predictions (pow3 sqrt((0.005² + 0.0073² + 0.0018²) / 3) = 0.005199, last
 * sqrt((0.0414² + 0.0707² + 0.0293²) / 3) = 0.050184), a shared shift of 0.012, and a single-model
 * interval for a test set of 1,000 rows, 0.02 wider on each side than the expected score's.
 */
export const familiesForecast: ForecastFile = {
  ...sampleForecast,
  familyWeights: { pow3: 0.9, last: 0.1 },
  familyParameters: { pow3: { a: 0.9, b: 2, c: 0.5 }, last: { a: 0.8293 } },
  backtest: {
    predictions: sampleBacktest.predictions.map((p) => ({ ...p })),
    rootMeanSquareError: { pow3: 0.005199, last: 0.050184 },
    extrapolationError: { pow3: 0.002, last: 0.03 },
  },
  sampleStandardDeviation: 0.012,
  testSize: 1000,
  extrapolationRatio: 3.25,
  projections: sampleForecast.projections.map((p) => ({
    ...p,
    extrapolationRatio: p.trainingSize / 800,
    singleModelLower: p.lower - 0.02,
    singleModelUpper: p.upper + 0.02,
  })),
};
