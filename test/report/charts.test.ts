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
import { learningCurveChart, valueChart } from "../../src/report/charts.js";
import { okabeIto, palette } from "../../src/report/theme.js";
import type { DecisionFile, DecisionRow } from "../../src/weigh/decisionFile.js";
import {
  goldenCases,
  hostileInput,
  logLossCurve,
  logLossForecast,
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
  ["value hostile strings", () => valueChart(hostileInput.decision!, { currency: hostileInput.currency })],
  ["learningCurve many runs", () => learningCurveChart(sampleCurve, sampleForecast, manyRunsDecision)],
  ["value many runs", () => valueChart(manyRunsDecision)],
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

/** Compiles a Vega-Lite spec and draws it to SVG in Node, keeping every message of both steps. */
async function renderSvg(spec: TopLevelSpec): Promise<{ svg: string; messages: Messages }> {
  const messages: Messages = { warnings: [], errors: [] };
  const compiled = compile(spec, { logger: recordingLogger(messages) as never });
  const view = new vega.View(vega.parse(compiled.spec), {
    renderer: "none",
    logger: recordingLogger(messages) as never,
    logLevel: vega.Warn,
  });
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
    // The y axis is named in words and labelled in percent.
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

  it("colours the series with the palette, whose hues are Okabe–Ito's", () => {
    const colour = layers.find((l) => l.encoding?.color?.field === "series")!.encoding!.color;
    expect(colour.scale!.range).toEqual([palette.fit, palette.ink, palette.curve, palette.band]);
    // Each layer's data names its series, so the legend lists the four in this order.
    const seriesOf = (type: string) => layers.find((l) => l.mark.type === type)!.data!.values[0].series;
    expect([seriesOf("circle"), seriesOf("point"), seriesOf("line"), seriesOf("area")]).toEqual([
      "Each fit",
      "Mean ± 1 sd",
      "Fitted curve",
      "80% projection band",
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
    expect(parts.description).toContain("projects 86% at 2,600 samples (80% band 84% to 88%)");
    expect(parts.description).toContain("The target is 85%.");
  });
});

describe("valueChart", () => {
  it("draws a bar per row, the recommended outline, and two lines of points", async () => {
    const { svg } = await renderSvg(valueChart(sampleDecision, { currency: "EUR" }));
    const counts = markCounts(svg);
    // Bars ("rect" marks): 5 rows + 1 outline of the recommended one.
    expect(countOf(counts, "rect")).toBe(5 + 1);
    // Points on the expected-score line and on the probability line, 5 each.
    expect(countOf(counts, "symbol")).toBe(5 + 5);
    expect(svg).toContain(">Recommended</text>");
    expect(svg).toContain(">Expected net value (EUR)</text>");
    expect(svg).toContain(">Chance of reaching the target of 85%</text>");
  });

  it("shows percent for a metric of unknown name when given the range [0, 1], plain numbers otherwise", () => {
    const renamed = { ...sampleDecision, metric: "share_correct" };
    const percent = loose(valueChart(renamed, { metricRange: [0, 1] }));
    const plain = loose(valueChart(renamed));
    expect(percent.description).toContain("Expected share correct goes from 84% now to 86% after 4 runs");
    expect(plain.description).toContain("Expected share correct goes from 0.837 now to 0.861 after 4 runs");
    expect(percent.vconcat![1].layer[0].encoding!.y.axis!.format).toBe(".0%");
    expect(plain.vconcat![1].layer[0].encoding!.y.axis!.format).toBeUndefined();
  });

  it("has three panels with a target and two without", () => {
    expect(loose(valueChart(sampleDecision)).vconcat).toHaveLength(3);
    expect(loose(valueChart(stopDecision)).vconcat).toHaveLength(2);
  });

  it("fades rows over budget, marks the recommended row and colours losses", () => {
    const panel = loose(valueChart(stopDecision)).vconcat![0];
    const values = panel.data!.values;
    expect(values.map((v) => v.opacity)).toEqual([0.9, 0.9, 0.9, 0.9, 0.35]);
    expect(values.map((v) => v.recommended)).toEqual([true, false, false, false, false]);
    // stopDecision: 1,000,000 × (0.8465 − 0.8368) − 22,000 = −12,300 for one run.
    expect(values[1].expectedNetValue).toBe(-12300);
    expect(values.map((v) => v.sign)).toEqual(["gain", "loss", "loss", "loss", "loss"]);
    expect(values.map((v) => v.step)).toEqual(["Now", "+1", "+2", "+3", "+4"]);
  });

  it("has a text alternative naming the best row and the chances", () => {
    const { description } = loose(valueChart(sampleDecision, { currency: "EUR" }));
    expect(description).toContain("it is highest at 2 (20,400 EUR). The recommendation is 2.");
    expect(description).toContain("goes from 84% now to 86% after 4 runs (80% interval 84% to 88%)");
    expect(description).toContain("is 20% now and 83% after 4 runs");
  });
});

describe("golden specs", () => {
  it.each(goldenCases.map((c) => [c.name, c.build] as const))("%s equals its golden file", (name, build) => {
    const golden = JSON.parse(readFileSync(new URL(`./golden/${name}.json`, import.meta.url), "utf8")) as unknown;
    expect(asJson(build())).toEqual(golden);
  });
});
