/**
 * Tests of the chart specs. Every spec is checked three ways against vega-lite's own tools:
 * - it validates against the Vega-Lite JSON schema shipped with vega-lite 6.4.3
 *   (node_modules/vega-lite/build/vega-lite-schema.json, draft-07), with ajv 8;
 * - vega-lite's `compile()` turns it into a Vega spec without a single warning;
 * - vega draws it to SVG in Node (renderer "none"), and the SVG holds the expected number of marks,
 *   counted per mark group from the input data (24 single fits, 4 means, ...).
 * Then the content is checked against the hand-made inputs, and the specs against golden files.
 *
 * Golden files: test/report/golden/*.json hold the specs of `goldenCases` (test/report/sampleInputs.ts).
 * This test only reads them. After an intended change to the charts, run
 * `npx tsx scripts/update-golden.ts`, read the diff of the golden files, and commit them with the change.
 */
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { Ajv } from "ajv";
import * as vega from "vega";
import { compile, type TopLevelSpec } from "vega-lite";
import { describe, expect, it } from "vitest";
import {
  backtestChart,
  backtestErrors,
  backtestOf,
  factorInWords,
  learningCurveChart,
  netValueChart,
  scoreChart,
  sensitivityChart,
  singleModelOf,
  sliderStep,
} from "../../src/report/charts.js";
import { okabeIto, palette } from "../../src/report/theme.js";
import type { DecisionFile, DecisionRow } from "../../src/weigh/decisionFile.js";
import {
  familiesForecast,
  goldenCases,
  hostileInput,
  logLossCurve,
  logLossForecast,
  sampleBacktest,
  sampleCurve,
  sampleDecision,
  sampleForecast,
  stopDecision,
} from "./sampleInputs.js";

const require = createRequire(import.meta.url);
const schema = JSON.parse(readFileSync(require.resolve("vega-lite/vega-lite-schema.json"), "utf8")) as object;

// The schema uses keywords and formats ajv's strict mode rejects ("color-hex"...); they are documentation.
const ajv = new Ajv({ strict: false, allowUnionTypes: true, logger: false });
const validateSpec = ajv.compile(schema);

/** A decision over 12 further runs, to check which sizes the curve marks when there are many. */
const manyRunsDecision: DecisionFile = {
  ...sampleDecision,
  plan: { ...sampleDecision.plan, maxRuns: 12 },
  recommendedRuns: 5,
  runsToTarget: 8,
  table: Array.from({ length: 13 }, (_, runs): DecisionRow => {
    const trainingSize = 1000 + 400 * runs;
    const expected = 0.9 - 2 / Math.sqrt(trainingSize);
    return {
      runs,
      trainingSize,
      expected,
      lower: expected - 0.01,
      upper: expected + 0.01,
      probabilityOfTarget: Math.min(1, runs / 10),
      cost: 22000 * runs,
      months: 3 * runs,
      expectedNetValue: 4_000_000 * (expected - (0.9 - 2 / Math.sqrt(1000))) - 22000 * runs,
      affordable: runs <= 8,
    };
  }),
};

/** Every spec the tests check, by name. */
const specCases: Array<[string, () => TopLevelSpec]> = [
  ...goldenCases.map(({ name, build }): [string, () => TopLevelSpec] => [name, build]),
  ["learningCurve log loss", () => learningCurveChart(logLossCurve, logLossForecast)],
  [
    "learningCurve hostile strings",
    () =>
      learningCurveChart(hostileInput.curve, hostileInput.forecast, hostileInput.decision, {
        currency: hostileInput.currency,
      }),
  ],
  ["score hostile strings", () => scoreChart(hostileInput.decision!, { currency: hostileInput.currency })],
  ["netValue hostile strings", () => netValueChart(hostileInput.decision!, { currency: hostileInput.currency })],
  [
    "sensitivity hostile strings",
    () =>
      sensitivityChart(hostileInput.decision!.sensitivity ?? [], hostileInput.decision!, {
        currency: hostileInput.currency,
      }),
  ],
  ["learningCurve many runs", () => learningCurveChart(sampleCurve, sampleForecast, manyRunsDecision)],
  ["score many runs", () => scoreChart(manyRunsDecision)],
  ["netValue many runs", () => netValueChart(manyRunsDecision)],
  [
    "netValue log loss, no currency",
    () => netValueChart({ ...stopDecision, metric: "log_loss", higherIsBetter: false }),
  ],
  [
    "backtest log loss",
    () => backtestChart({ ...sampleBacktest, metric: "log_loss", higherIsBetter: false, metricRange: undefined }),
  ],
];

interface Messages {
  warnings: string[];
  errors: string[];
}

/** A logger for vega-lite's `compile` and vega's `View` that keeps every warning and error. */
function recordingLogger(messages: Messages) {
  let level = 0;
  const logger = {
    level(value?: number) {
      if (value === undefined) return level as never;
      level = value;
      return logger;
    },
    error: (...args: unknown[]) => (messages.errors.push(args.map(String).join(" ")), logger),
    warn: (...args: unknown[]) => (messages.warnings.push(args.map(String).join(" ")), logger),
    info: () => logger,
    debug: () => logger,
  };
  return logger;
}

/**
 * Compiles a Vega-Lite spec and draws it to SVG in Node, keeping every message of both steps.
 * `signals` set parameters first, as moving a bound control in the page does.
 */
async function renderSvg(
  spec: TopLevelSpec,
  signals: Record<string, number> = {},
): Promise<{ svg: string; messages: Messages }> {
  const messages: Messages = { warnings: [], errors: [] };
  const compiled = compile(spec, { logger: recordingLogger(messages) as never });
  const view = new vega.View(vega.parse(compiled.spec), {
    renderer: "none",
    logger: recordingLogger(messages) as never,
    logLevel: vega.Warn,
  });
  for (const [name, value] of Object.entries(signals)) view.signal(name, value);
  await view.runAsync();
  const svg = await view.toSVG();
  view.finalize();
  return { svg, messages };
}

/**
 * The number of drawn items in each data mark group of a Vega SVG, in drawing order, as
 * [markType, count] pairs ("symbol", 24). Axis, legend and title marks are left out.
 */
function markCounts(svg: string): Array<[string, number]> {
  const groups = svg.matchAll(/<g class="mark-([a-z]+) role-mark [^"]*"[^>]*>(.*?)<\/g>/g);
  return [...groups].map((match) => [match[1], (match[2].match(/<(path|line|text)\b/g) ?? []).length]);
}

/** The total of drawn items over the groups of one mark type. */
function countOf(counts: Array<[string, number]>, markType: string): number {
  return counts.filter(([type]) => type === markType).reduce((sum, [, n]) => sum + n, 0);
}

/** The spec as plain JSON (undefined dropped), as the page embeds it and the golden files hold it. */
function asJson(spec: TopLevelSpec): unknown {
  return JSON.parse(JSON.stringify(spec));
}

/** Loose view of a spec's parts, for reading it in the tests. */
interface LooseLayer {
  mark: { type: string; color?: string; strokeDash?: number[] };
  data?: { values: Array<Record<string, unknown>> };
  encoding?: Record<
    string,
    { field?: string; axis?: { title?: string; format?: string }; scale?: { type?: string; range?: string[] } }
  >;
}
interface LooseSpec {
  title: { text: string };
  description: string;
  layer?: LooseLayer[];
  vconcat?: Array<{ title: { text: string }; layer: LooseLayer[]; data?: { values: Array<Record<string, unknown>> } }>;
}

function loose(spec: TopLevelSpec): LooseSpec {
  return asJson(spec) as LooseSpec;
}

/** The [label, trainingSize] of the vertical rules marking sizes (rules with an x and no y). */
function markedSizes(layers: LooseLayer[]): Array<[unknown, unknown]> {
  return layers
    .filter((l) => l.mark.type === "rule" && l.encoding?.x !== undefined && l.encoding.y === undefined)
    .flatMap((l) => l.data!.values.map((v): [unknown, unknown] => [v.label, v.trainingSize]));
}

describe("every chart spec", () => {
  it.each(specCases)("%s validates against the Vega-Lite 6 JSON schema", (_name, build) => {
    const valid = validateSpec(asJson(build()));
    expect(validateSpec.errors ?? []).toEqual([]);
    expect(valid).toBe(true);
  });

  it("the schema check can fail: a misspelt mark type is rejected", () => {
    const spec = asJson(learningCurveChart(sampleCurve, sampleForecast)) as {
      layer: Array<{ mark: { type: string } }>;
    };
    spec.layer[0].mark.type = "ribbon";
    expect(validateSpec(spec)).toBe(false);
  });

  it.each(specCases)("%s compiles and draws to SVG without warnings", async (_name, build) => {
    const { svg, messages } = await renderSvg(build());
    expect(messages.errors).toEqual([]);
    expect(messages.warnings).toEqual([]);
    expect(svg.startsWith("<svg")).toBe(true);
    expect(markCounts(svg).reduce((sum, [, n]) => sum + n, 0)).toBeGreaterThan(0);
  });
});

describe("learningCurveChart", () => {
  const spec = learningCurveChart(sampleCurve, sampleForecast, sampleDecision, { currency: "EUR" });
  const parts = loose(spec);
  const layers = parts.layer ?? [];

  it("draws one symbol per fit and per mean, one error bar per size, and the marked sizes", async () => {
    const { svg } = await renderSvg(spec);
    const counts = markCounts(svg);
    // Symbols: 4 sizes × 6 fits + 4 means (sampleCurve, sampleForecast.measured).
    expect(countOf(counts, "symbol")).toBe(24 + 4);
    // Rules: 4 error bars + today + 4 runs + the target.
    expect(countOf(counts, "rule")).toBe(4 + 1 + 4 + 1);
    // One band and two line pieces (fitted, projected).
    expect(countOf(counts, "area")).toBe(1);
    expect(countOf(counts, "line")).toBe(2);
    for (const label of ["Today", "+1 run", "+2 runs", "+3 runs", "+4 runs", "Target 85%"]) {
      expect(svg).toContain(`>${label}</text>`);
    }
    // The y axis is named in words and labeled in percent.
    expect(svg).toContain(">Accuracy</text>");
    expect(svg).toContain(">80%</text>");
    expect(svg).toContain(">Training samples</text>");
  });

  it("uses a log x axis, percent on y, and splits the curve at the largest measured size", () => {
    const band = layers.find((l) => l.mark.type === "area")!;
    expect(band.encoding!.x.scale!.type).toBe("log");
    expect(band.encoding!.x.axis!.title).toBe("Training samples");
    expect(band.encoding!.y.axis!.title).toBe("Accuracy");
    expect(band.encoding!.y.axis!.format).toBe(".0%");
    const lines = layers.filter((l) => l.mark.type === "line");
    const fitted = lines[0].data!.values.map((v) => v.trainingSize);
    const projected = lines[1].data!.values.map((v) => v.trainingSize);
    expect(fitted).toEqual([100, 150, 200, 300, 400, 600, 800]);
    expect(projected).toEqual([800, 1000, 1400, 1800, 2200, 2600]);
    expect(lines[1].mark.strokeDash).toEqual([6, 4]);
  });

  it("marks today and the size after each run, and the target", () => {
    expect(markedSizes(layers)).toEqual([
      ["Today", 1000],
      ["+1 run", 1400],
      ["+2 runs", 1800],
      ["+3 runs", 2200],
      ["+4 runs", 2600],
    ]);
    const target = layers.find((l) => l.encoding?.y?.field === "target")!;
    expect(target.data!.values[0].target).toBe(0.85);
    expect(target.mark.color).toBe(palette.target);
  });

  it("marks only the first, recommended, target and last runs when there are many", () => {
    const many = loose(learningCurveChart(sampleCurve, sampleForecast, manyRunsDecision)).layer!;
    const labels = markedSizes(many).map(([label]) => label);
    expect(labels).toEqual(["Today", "+1 run", "+5 runs", "+8 runs", "+12 runs"]);
  });

  it("without a decision marks the largest measured size and draws no target", () => {
    const plain = loose(learningCurveChart(sampleCurve, sampleForecast)).layer!;
    expect(markedSizes(plain)).toEqual([["Largest measured", 800]]);
    expect(plain.some((l) => l.encoding?.y?.field === "target")).toBe(false);
  });

  it("shows a metric that is not a fraction as plain numbers, titled in words", async () => {
    const parts = loose(learningCurveChart(logLossCurve, logLossForecast));
    const band = parts.layer!.find((l) => l.mark.type === "area")!;
    expect(band.encoding!.y.axis!.title).toBe("Log loss");
    expect(band.encoding!.y.axis!.format).toBeUndefined();
    const { svg } = await renderSvg(learningCurveChart(logLossCurve, logLossForecast));
    expect(svg).not.toMatch(/>\d+%<\/text>/);
    expect(svg).toContain(">0.20</text>");
  });

  it("colors the series with the palette, whose hues are Okabe–Ito's", () => {
    const color = layers.find((l) => l.encoding?.color?.field === "series")!.encoding!.color;
    expect(color.scale!.range).toEqual([palette.fit, palette.ink, palette.curve, palette.band]);
    // Each layer's data names its series, so the legend lists the four in this order.
    const seriesOf = (type: string) => layers.find((l) => l.mark.type === type)!.data!.values[0].series;
    expect([seriesOf("circle"), seriesOf("point"), seriesOf("line"), seriesOf("area")]).toEqual([
      "One trial model",
      "Average, with typical spread",
      "Fitted curve",
      "Likely range (8 in 10)",
    ]);
    const hues = Object.values(okabeIto);
    for (const role of ["curve", "band", "runs", "target", "gain", "loss", "probability"] as const) {
      expect(hues).toContain(palette[role]);
    }
  });

  it("has a title and a text alternative that states the numbers", () => {
    expect(parts.title.text).toBe("Learning curve: accuracy against training samples");
    // Means 0.7 → 70% and 0.8293 → 83%; band end 0.8608 (0.8448 to 0.8768) → 86% (84% to 88%).
    expect(parts.description).toContain("from 100 to 800 samples, where the mean accuracy went from 70% to 83%");
    expect(parts.description).toContain("projects 86% at 2,600 samples (likely between 84% and 88%, 8 in 10)");
    expect(parts.description).toContain("The target is 85%.");
  });
});

describe("scoreChart", () => {
  it("draws the expected score with its interval and the chance of the target", async () => {
    const { svg } = await renderSvg(scoreChart(sampleDecision, { metricRange: [0, 1] }));
    const counts = markCounts(svg);
    // Points: 5 expected scores + 5 chances (sampleDecision has 5 rows).
    expect(countOf(counts, "symbol")).toBe(5 + 5);
    // Rules: 5 intervals + the target + the required chance.
    expect(countOf(counts, "rule")).toBe(5 + 1 + 1);
    expect(svg).toContain(">Target 85%</text>");
    expect(svg).toContain(">Chance of reaching the target of 85%</text>");
    expect(svg).toContain(">Accuracy</text>");
    expect(svg).toContain(">84%</text>");
  });

  it("draws the single-model interval behind the expected one when the forecast has it", async () => {
    const spec = scoreChart(sampleDecision, { metricRange: [0, 1] }, singleModelOf(familiesForecast));
    const { svg } = await renderSvg(spec);
    // Rules: 5 single-model intervals + 5 intervals + the target + the required chance.
    expect(countOf(markCounts(svg), "rule")).toBe(5 + 5 + 1 + 1);
    expect(svg).toContain(
      ">Thin grey bars: where one model, scored on 1,000 test samples, lands 8 in 10 times.</tspan>",
    );
    // The last row (2,600 samples): 0.8448 − 0.02 to 0.8768 + 0.02 → 82% to 90%.
    expect(loose(spec).description).toContain(
      "One model trained then and scored on 1,000 test samples would likely score 82% to 90%.",
    );
  });

  it("has two panels with a target and one without", () => {
    expect(loose(scoreChart(sampleDecision)).vconcat).toHaveLength(2);
    expect(loose(scoreChart(stopDecision)).vconcat).toHaveLength(1);
  });

  it("shows percent for a metric of unknown name when given the range [0, 1], plain numbers otherwise", () => {
    const renamed = { ...sampleDecision, metric: "share_correct" };
    const percent = loose(scoreChart(renamed, { metricRange: [0, 1] }));
    const plain = loose(scoreChart(renamed));
    expect(percent.description).toContain("Expected share correct goes from 84% now to 86% after 4 further runs");
    expect(plain.description).toContain("Expected share correct goes from 0.837 now to 0.861 after 4 further runs");
    expect(percent.vconcat![0].layer[0].encoding!.y.axis!.format).toBe(".0%");
    expect(plain.vconcat![0].layer[0].encoding!.y.axis!.format).toBeUndefined();
  });

  it("has a text alternative naming the chances", () => {
    const { description } = loose(scoreChart(sampleDecision, { metricRange: [0, 1] }));
    expect(description).toContain(
      "goes from 84% now to 86% after 4 further runs (likely between 84% and 88%, 8 in 10)",
    );
    expect(description).toContain("is 20% now and 83% after 4 runs; the plan asks for 80%.");
  });
});

describe("netValueChart and its cost and value sliders", () => {
  const spec = netValueChart(sampleDecision, { currency: "EUR", metricRange: [0, 1] });

  /** The recommendation the chart states after setting `signals`, drawn by vega in Node. */
  async function recommendation(chart: TopLevelSpec, signals: Record<string, number> = {}): Promise<string> {
    const { svg, messages } = await renderSvg(chart, signals);
    expect(messages.warnings).toEqual([]);
    const texts = [...svg.matchAll(/<g class="mark-text role-mark recommendation_marks"[^>]*>(.*?)<\/g>/g)];
    expect(texts).toHaveLength(1);
    return [...texts[0][1].matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]).join(" | ");
  }

  it("binds cost per run and value per point to sliders starting at the plan's values", () => {
    const params = (asJson(spec) as { params: Array<{ name: string; value: number; bind: Record<string, unknown> }> })
      .params;
    expect(params.map((p) => [p.name, p.value, p.bind.input, p.bind.min, p.bind.max, p.bind.step])).toEqual([
      // Three times the plan's value; steps of 1, 2 or 5 × 10^k at most a hundredth of the range that
      // divide the start: 22,000 / 500 = 44, 40,000 / 1,000 = 40.
      ["costPerRun", 22000, "range", 0, 66000, 500],
      ["valuePerPoint", 40000, "range", 0, 120000, 1000],
    ]);
    expect(params[0].bind.name).toBe("Cost per run (EUR) ");
    expect(params[1].bind.name).toBe("Value of one percentage point of accuracy (EUR) ");
  });

  it("at the plan's values recomputes decision.json's net values and recommendation", async () => {
    expect(await recommendation(spec)).toBe("Recommended: 2 further runs, expected net value 20,400 EUR");
    const { svg } = await renderSvg(spec);
    // Each bar's text alternative carries its recomputed net value (sampleInputs.ts: 0, 16,800, ...).
    const labels = [...svg.matchAll(/aria-label="([^"]*Expected net value \(EUR\): [^";]*)/g)].map(
      (m) => /Expected net value \(EUR\): ([^;"]*)/.exec(m[1])![1],
    );
    expect(labels).toEqual(["0", "16,800", "20,400", "16,400", "8,000"]);
    const counts = markCounts(svg);
    // Bars: 5 rows + the recommended outline; rules: 5 whiskers + the zero line.
    expect(countOf(counts, "rect")).toBe(5 + 1);
    expect(countOf(counts, "rule")).toBe(5 + 1);
  });

  it.each<[string, Record<string, number>, string]>([
    // Gains in points, (net value + cost) / 40,000: 0.97, 1.61, 2.06, 2.40. At 11,000 a run: 4 runs cost
    // 44,000, within the budget of 80,000: 96,000 − 44,000 = 52,000 beats 3 runs' 82,400 − 33,000.
    ["a cheaper run", { costPerRun: 11000 }, "Recommended: 4 further runs, expected net value 52,000 EUR"],
    // At 20,000 a point one run is worth 19,400 and costs 22,000: no run pays.
    ["a cheaper point", { valuePerPoint: 20000 }, "Recommended: no further run, expected net value 0 EUR"],
    // At 60,000 a point: 3 runs 123,600 − 66,000 = 57,600; 2 runs 96,600 − 44,000 = 52,600.
    ["a dearer point", { valuePerPoint: 60000 }, "Recommended: 3 further runs, expected net value 57,600 EUR"],
    // At 0 a run, the 4 runs within budget have the largest gain: 40,000 × 2.40 = 96,000.
    ["free runs", { costPerRun: 0 }, "Recommended: 4 further runs, expected net value 96,000 EUR"],
  ])("restates the recommendation for %s", async (_name, signals, text) => {
    expect(await recommendation(spec, signals)).toBe(text);
  });

  it("keeps rows past the deadline out whatever the cost", async () => {
    const deadline: DecisionFile = {
      ...sampleDecision,
      table: sampleDecision.table.map((row) =>
        row.runs >= 3 ? { ...row, affordable: false, withinDeadline: false } : row,
      ),
    };
    // 2 runs at 11,000: 64,400 − 22,000 = 42,400; 3 and 4 runs are past the deadline.
    expect(await recommendation(netValueChart(deadline, { currency: "EUR" }), { costPerRun: 11000 })).toBe(
      "Recommended: 2 further runs, expected net value 42,400 EUR",
    );
  });

  it("keeps a clinical minimum size as a floor while an affordable row reaches it", async () => {
    const clinical: DecisionFile = {
      ...sampleDecision,
      recommendedRuns: 3,
      clinical: {
        participants: 2200,
        events: 300,
        eventsPerParameter: 12.5,
        binding: "optimism",
        criteria: { shrinkage: 2200, optimism: 2200, risk: 400 } as never,
        optimismShrinkage: 0.9,
        runsToMinimum: 3,
      },
    };
    const chart = netValueChart(clinical, { currency: "EUR" });
    // At the plan's values 3 runs (2,200 samples) are the fewest reaching the minimum: 16,400.
    expect(await recommendation(chart)).toBe("Recommended: 3 further runs, expected net value 16,400 EUR");
    // At 30,000 a run, 3 runs (90,000) break the budget of 80,000: the floor lapses and the value rule
    // picks 1 run, 38,800 − 30,000 = 8,800 (2 runs: 64,400 − 60,000 = 4,400).
    expect(await recommendation(chart, { costPerRun: 30000 })).toBe(
      "Recommended: 1 further run, expected net value 8,800 EUR",
    );
  });

  it("recommends the fewest runs reaching the target for a plan valued by its target alone", async () => {
    const byTarget: DecisionFile = {
      ...sampleDecision,
      valueBasis: "target",
      plan: { ...sampleDecision.plan, valuePerPoint: 0, targetConfidence: 0.6 },
      recommendedRuns: 2,
      // Without a value per point the net value is minus the cost.
      table: sampleDecision.table.map((row) => ({
        ...row,
        expectedNetValue: -row.cost,
        netValueLower: undefined,
        netValueUpper: undefined,
      })),
    };
    const chart = netValueChart(byTarget, { currency: "EUR" });
    // Chances 20%, 42%, 61%, ...: 2 runs are the fewest with at least 60%.
    expect(await recommendation(chart)).toBe("Recommended: 2 further runs, expected net value −44,000 EUR");
    // At 50,000 a run only 0 and 1 run fit the budget; neither reaches the target: the fewest runs.
    expect(await recommendation(chart, { costPerRun: 50000 })).toBe(
      "Recommended: no further run, expected net value 0 EUR",
    );
    // A value per point turns the rule to net value: gains of 0.97, 1.61, ... points, as before.
    expect(await recommendation(chart, { valuePerPoint: 40000 })).toBe(
      "Recommended: 2 further runs, expected net value 20,400 EUR",
    );
  });

  it("reads a first-version decision.json: no intervals, over budget by cost alone", async () => {
    const first = netValueChart(stopDecision);
    expect(await recommendation(first)).toBe("Recommended: no further run, expected net value 0");
    // stopDecision: 1,000,000 × (0.8608 − 0.8368) = 24,000 for 4 runs, which fit the budget at no cost.
    expect(await recommendation(first, { costPerRun: 0 })).toBe(
      "Recommended: 4 further runs, expected net value 24,000",
    );
    const { svg } = await renderSvg(first);
    expect(countOf(markCounts(svg), "rule")).toBe(1); // the zero line, no whiskers
  });

  it("labels money in one readable unit with its currency, never in exponent notation", async () => {
    const { svg } = await renderSvg(spec);
    expect(svg).toContain(">Expected net value (thousand EUR)</text>");
    // Net values from −30,000 (lowest whisker) to 48,000: ticks in thousands.
    for (const tick of ["−20", "0", "20", "40"]) expect(svg).toContain(`>${tick}</text>`);
    expect(svg).not.toMatch(/>[^<]*e[+−-]\d[^<]*<\/text>/);
    // Amounts a hundred times smaller (largest 640) are shown in plain units.
    const tiny: DecisionFile = {
      ...stopDecision,
      plan: { ...stopDecision.plan, costPerRun: 220, valuePerPoint: 100 },
      table: stopDecision.table.map((row) => ({
        ...row,
        cost: row.cost / 100,
        expectedNetValue: row.expectedNetValue / 100,
      })),
    };
    const small = await renderSvg(netValueChart(tiny));
    expect(small.svg).toContain(">Expected net value</text>");
    expect(small.svg).toContain(">−600</text>");
  });

  it("has a text alternative with the recommendation, its interval and its chance", () => {
    expect(loose(spec).description).toContain(
      "The recommendation is 2 (20,400 EUR, likely between −6,000 EUR and 47,000 EUR (8 in 10)), with a 81% chance that " +
        "the value exceeds the cost.",
    );
    expect(loose(netValueChart(stopDecision)).description).toContain("The recommendation is no further run.");
  });
});

describe("sliderStep", () => {
  it.each<[number, number, number]>([
    [22000, 66000, 500],
    [40000, 120000, 1000],
    [12.5, 37.5, 0.1], // 0.2 does not divide 12.5
    [0, 1000, 10],
    [7, 21, 0.2], // 7 / 0.2 = 35
  ])("sliderStep(%d, %d) → %d", (initial, max, step) => {
    expect(sliderStep(initial, max)).toBe(step);
    expect(Math.abs(initial / step - Math.round(initial / step))).toBeLessThan(1e-9);
  });
});

describe("backtestChart", () => {
  it("computes each family's mean absolute error", () => {
    const errors = backtestErrors(sampleBacktest.predictions);
    // By hand (sampleInputs.ts): pow3 (0.0050 + 0.0073 + 0.0018) / 3, last (0.0414 + 0.0707 + 0.0293) / 3.
    expect(errors.map((e) => e.family)).toEqual(["pow3", "last"]);
    expect(errors[0].error).toBeCloseTo(0.0047, 12);
    expect(errors[1].error).toBeCloseTo(0.1414 / 3, 12);
    expect(errors.map((e) => e.count)).toEqual([3, 3]);
  });

  it("shows the forecast's root mean square errors when it gives them", async () => {
    const input = backtestOf(familiesForecast)!;
    expect(input.familyWeights).toEqual({ pow3: 0.9, last: 0.1 });
    const { svg } = await renderSvg(backtestChart(input));
    expect(svg).toContain(">Typical miss (points)</text>");
    expect(loose(backtestChart(input)).description).toContain(
      "Typical miss of each: pow3 (power law) 0.5 points, last (no further gain) 5.0 points.",
    );
    expect(backtestOf(sampleForecast)).toBeUndefined();
  });

  it("draws the measured means, the predictions and one error bar per family", async () => {
    const { svg } = await renderSvg(backtestChart(sampleBacktest));
    const counts = markCounts(svg);
    // Symbols: 2 measured sizes (400, 800) + 6 predictions; bars: 2 families.
    expect(countOf(counts, "symbol")).toBe(2 + 6);
    expect(countOf(counts, "rect")).toBe(2);
    expect(svg).toContain(">weight 90%</text>");
    expect(svg).toContain(">weight 10%</text>");
    expect(svg).toContain(">Average miss (points)</text>");
  });

  it("states the errors in its text alternative", () => {
    expect(loose(backtestChart(sampleBacktest)).description).toContain(
      "Average miss of each: pow3 (power law) 0.5 points, last (no further gain) 4.7 points. The smallest is that of pow3 (power law).",
    );
  });
});

describe("sensitivityChart", () => {
  const spec = sensitivityChart(sampleDecision.sensitivity ?? [], sampleDecision, { currency: "EUR" });

  it("orders the factors by the swing of the net value, widest on top", () => {
    const layers = loose(spec).layer!;
    const y = layers[0].encoding!.y as unknown as { sort: string[] };
    // Swings around the base of 20,400: value per point 37,000 − 7,100; ceiling 33,000 − 9,000;
    // cost per run 32,900 − 11,300; samples per run 25,000 − 20,400 (its lower side is missing).
    expect(y.sort).toEqual(["Value per point", "Room left to improve", "Cost per run", "Samples per run"]);
  });

  it("draws a bar per computed side, the base, and bold labels where the advice changes", async () => {
    const { svg } = await renderSvg(spec);
    const counts = markCounts(svg);
    expect(countOf(counts, "rect")).toBe(7); // 4 factors × 2 sides − the missing one
    expect(countOf(counts, "rule")).toBe(1);
    const bold = [...svg.matchAll(/<text[^>]*font-weight="700"[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]);
    // Changed from 2 runs: cost lower (3) and higher (1), value lower (1) and higher (3), ceiling lower (1).
    expect(bold.sort()).toEqual(["1 run", "1 run", "1 run", "3 runs", "3 runs"]);
    expect(svg).toContain(">25% lower</text>");
    expect(svg).toContain(">25% higher</text>");
  });

  it("names factors in words", () => {
    expect(factorInWords("costPerRun")).toBe("Cost per run");
    expect(factorInWords("passRate")).toBe("Share passing quality control");
    expect(factorInWords("someNewFactor")).toBe("Some new factor");
    expect(factorInWords("value_per_point")).toBe("Value per point");
  });

  it("has a text alternative listing each factor's outcomes", () => {
    const { description } = loose(spec);
    expect(description).toContain(
      "At the plan's values 2 runs are recommended, with an expected net value of 20,400 EUR.",
    );
    expect(description).toContain("With samples per run lower: not computed; higher: 2 runs, 25,000 EUR.");
  });
});

describe("golden specs", () => {
  it.each(goldenCases.map((c) => [c.name, c.build] as const))("%s equals its golden file", (name, build) => {
    const golden = JSON.parse(readFileSync(new URL(`./golden/${name}.json`, import.meta.url), "utf8")) as unknown;
    expect(asJson(build())).toEqual(golden);
  });
});
