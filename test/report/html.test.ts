/**
 * Tests of the HTML report: the facts the page states (numbers, sections, cautions), a few golden
 * sentences, escaping of hostile strings, the offline guarantees (Content-Security-Policy, no outside
 * URL, inlined bundles that cannot close their script element), byte-determinism, and the CSV export.
 * Wording may change without breaking these tests; the numbers may not. The page in a real browser is
 * tested in browser.test.ts.
 *
 * Expected numbers are worked by hand from test/report/sampleInputs.ts, e.g. two runs: expected
 * 0.8529 → "85.3%", interval 0.8382 to 0.8675 → "83.8% to 86.8%".
 */
import Papa from "papaparse";
import { afterEach, describe, expect, it, vi } from "vitest";
import { inlineScriptText } from "../../src/report/bundles.js";
import { reportCharts } from "../../src/report/charts.js";
import {
  contentSecurityPolicy,
  csvField,
  decisionTableCsv,
  escapeHtml,
  gainInWords,
  headline,
  jsonForScript,
  renderReportHtml,
  type ReportInput,
} from "../../src/report/html.js";
import { describeMetric } from "../../src/format.js";
import type { DecisionFile } from "../../src/weigh/decisionFile.js";
import {
  briefDecision,
  familiesForecast,
  hostile,
  hostileInput,
  logLossCurve,
  logLossForecast,
  sampleDecision,
  sampleInput,
  stopDecision,
} from "./sampleInputs.js";

/** A log-loss decision (lower is better), to check the headline's verb. */
const logLossDecision: DecisionFile = {
  ...sampleDecision,
  metric: "log_loss",
  higherIsBetter: false,
  plan: { ...sampleDecision.plan, target: undefined },
  recommendedRuns: 1,
  runsToTarget: null,
  table: sampleDecision.table.slice(0, 2).map((row) => ({
    ...row,
    expected: 1 - row.expected,
    lower: 1 - row.upper,
    upper: 1 - row.lower,
    probabilityOfTarget: null,
  })),
};

/** A decision whose gain hides in whole percent (0.8368 → 0.8412 both round to 84%). */
const smallGainDecision: DecisionFile = {
  ...briefDecision,
  recommendedRuns: 1,
  table: [
    { ...sampleDecision.table[0], probabilityOfTarget: null },
    { ...sampleDecision.table[1], expected: 0.8412, lower: 0.8301, upper: 0.8523, probabilityOfTarget: null },
  ],
};

/**
 * The brief's own example: two runs (44,000, 6 months) lift accuracy from 81% to 86% (83% to 88%), and
 * a third adds 0.4 of a point (0.864 − 0.860).
 */
const briefExample: DecisionFile = {
  ...briefDecision,
  recommendedRuns: 2,
  table: [
    { ...sampleDecision.table[0], expected: 0.81, lower: 0.79, upper: 0.83, probabilityOfTarget: null },
    { ...sampleDecision.table[2], expected: 0.86, lower: 0.83, upper: 0.88, probabilityOfTarget: null },
    { ...sampleDecision.table[3], expected: 0.864, lower: 0.832, upper: 0.885, probabilityOfTarget: null },
  ],
};

const base: Omit<ReportInput, "decision"> = { ...sampleInput };

/** The numbers a text states, as written: "44,000", "85%", "0.163", "6". */
function numbersIn(text: string): string[] {
  return text.match(/\u2212?\d[\d,]*(\.\d+)?%?/g) ?? [];
}

describe("headline", () => {
  // Two golden sentences: the brief's own example, and stopping now.
  it("the brief's example, without a currency", () => {
    expect(headline({ ...base, decision: briefExample, currency: undefined })).toBe(
      "Two more runs (44,000, 6 months) are expected to lift accuracy from 81% to 86% (likely between 83% and " +
        "88%); a third would add under half a point.",
    );
  });

  it("stopping now", () => {
    // One run adds 0.8465 − 0.8368 = 0.97 of a point, "about 1 point".
    expect(headline({ ...base, decision: stopDecision })).toBe(
      "No further run is recommended: with today's 1,000 samples, accuracy is expected to be 84% (likely " +
        "between 82% and 85%), and one more run (22,000 EUR, 3 months) would add about 1 point.",
    );
  });

  it.each<[string, ReportInput, string[]]>([
    [
      // 0.8368 → 0.8529 (0.8382 to 0.8675); P(target) 20% → 61%; four runs reach it over budget.
      "recommended runs with a target reached only over budget",
      sampleInput,
      ["44,000", "6", "84%", "85%", "84%", "87%", "85%", "20%", "61%", "85%", "80%", "88,000", "12"],
    ],
    [
      "the largest number of runs weighed",
      { ...base, decision: briefDecision },
      ["66,000", "9", "81%", "86%", "83%", "88%"],
    ],
    // Whole percent would show 84% twice: one decimal.
    [
      "a gain hidden by whole percent",
      { ...base, decision: smallGainDecision },
      ["22,000", "3", "83.7%", "84.1%", "83.0%", "85.2%"],
    ],
    // 1 − 0.8368 = 0.1632, 1 − 0.8465 = 0.1535 (0.15349999… in binary: 0.153), 1 − 0.8603, 1 − 0.8328.
    [
      "a lower-is-better metric, in plain numbers",
      { ...base, curve: logLossCurve, forecast: logLossForecast, decision: logLossDecision },
      ["22,000", "3", "0.163", "0.153", "0.140", "0.167"],
    ],
    [
      "no decision: the largest projection",
      { ...base, decision: undefined },
      ["2,600", "86%", "84%", "88%", "83%", "800"],
    ],
    [
      "no decision, metric not a fraction",
      { curve: logLossCurve, forecast: logLossForecast, reproducibility: { toolVersion: "0.1.0" } },
      ["2,600", "0.139", "0.123", "0.155", "0.171", "800"],
    ],
  ])("%s: states its numbers in order", (_name, input, numbers) => {
    expect(numbersIn(headline(input))).toEqual(numbers);
  });

  it("lowers a lower-is-better metric and lifts a higher-is-better one", () => {
    expect(headline({ ...base, curve: logLossCurve, forecast: logLossForecast, decision: logLossDecision })).toMatch(
      /\blower log loss\b/,
    );
    expect(headline(sampleInput)).toMatch(/\blift accuracy\b/);
  });

  it("says when the target is out of reach or already reached", () => {
    const out = headline({ ...base, decision: { ...sampleDecision, runsToTarget: null } });
    expect(out).toMatch(/No number of runs up to 4 reaches the target of 85%/);
    const reached = headline({ ...base, decision: { ...sampleDecision, runsToTarget: 0 } });
    expect(reached).toMatch(/target of 85% is already reached/);
  });
});

describe("gainInWords", () => {
  const accuracy = describeMetric("accuracy", true);
  const logLoss = describeMetric("log_loss", false);
  it.each<[number, string]>([
    [0.0004, "almost nothing"],
    [0.0045, "under half a point"],
    [0.0097, "about 1 point"],
    [0.015, "about 1.5 points"],
    [0.1234, "about 12 points"],
    [0, "nothing more"],
    [-0.002, "nothing more"],
  ])("accuracy gain %d → %s", (gain, words) => {
    expect(gainInWords(gain, accuracy)).toBe(words);
  });

  it("says a gain in a metric that is not a fraction in its own units", () => {
    expect(gainInWords(0.0042, logLoss)).toBe("a further 0.0042");
    expect(gainInWords(0.042, logLoss)).toBe("a further 0.042");
  });
});

describe("escapeHtml and jsonForScript", () => {
  it.each([
    ["a & b", "a &amp; b"],
    ["<b>", "&lt;b&gt;"],
    [`"quoted" 'single'`, "&quot;quoted&quot; &#39;single&#39;"],
    ["&lt;", "&amp;lt;"],
    [hostile.attribute, "&quot;&gt;&lt;img src=x onerror=alert(1)&gt;"],
  ])("escapeHtml(%j) → %j", (input, output) => {
    expect(escapeHtml(input)).toBe(output);
  });

  it("writes JSON that holds no <, > or & and parses back unchanged", () => {
    const value = { text: `${hostile.script}${hostile.attribute} & </SCRIPT>`, list: ["<!--", "-->"] };
    const json = jsonForScript(value);
    expect(json).not.toMatch(/[<>&]/);
    expect(JSON.parse(json)).toEqual(value);
  });
});

describe("inlineScriptText", () => {
  it("drops source-map comments and escapes </script in any case", () => {
    const source = 'var a = "</script>", b = "</SCRIPT >";\n//# sourceMappingURL=a.min.js.map\n';
    const text = inlineScriptText(source);
    expect(text).toBe('var a = "<\\/script>", b = "<\\/SCRIPT >";');
    // The escaped text means the same to JavaScript.
    expect(new Function(`${text}; return [a, b];`)()).toEqual(["</script>", "</SCRIPT >"]);
  });
});

/** The text a reader sees in one element of the page (by id), tags dropped and references read back. */
function textOf(markup: string, id: string): string {
  const start = markup.indexOf(`id="${id}"`);
  if (start < 0) return "";
  const tag = markup.lastIndexOf("<", start);
  const name = /^<(\w+)/.exec(markup.slice(tag))![1];
  const end = markup.indexOf(`</${name}>`, start);
  return markup
    .slice(tag, end)
    .replace(/<[^>]+>/g, " ")
    .replace(/&#39;/g, "'")
    .replace(/&quot;/g, '"')
    .replace(/&lt;/g, "<")
    .replace(/&gt;/g, ">")
    .replace(/&amp;/g, "&")
    .replace(/\s+/g, " ")
    .trim();
}

/** The page split into the JSON block, the inline scripts and the markup outside any script. */
function splitPage(html: string) {
  const json = /<script type="application\/json" id="chart-specs">([^<]*)<\/script>/.exec(html);
  const markup = html.replace(/<script\b[^>]*>[\s\S]*?<\/script>/g, "<script></script>");
  return { json: json?.[1] ?? "", markup };
}

describe("renderReportHtml", () => {
  const html = renderReportHtml(sampleInput);
  const { json, markup } = splitPage(html);

  it("puts the sections in the order the reader needs them", () => {
    const order = [
      "<h1>",
      'class="headline"',
      'id="meaning"',
      'id="chart-learning-curve"',
      'id="chart-score"',
      'id="chart-net-value"',
      'id="chart-sensitivity"',
      'id="decision"',
      'id="assumptions"',
      'id="cautions"',
      'id="methods"',
      'id="reproducibility"',
    ].map((marker) => markup.indexOf(marker));
    expect(order.every((position) => position >= 0)).toBe(true);
    expect([...order].sort((a, b) => a - b)).toEqual(order);
    expect(markup).toContain(`<p class="headline">${escapeHtml(headline(sampleInput))}</p>`);
    expect(markup).toContain("<title>Cell classifier: is more labelling worth it?</title>");
  });

  it("carries a Content-Security-Policy that forbids outside requests and eval", () => {
    expect(html).toContain(`<meta http-equiv="Content-Security-Policy" content="${contentSecurityPolicy}">`);
    const directives = new Map(
      contentSecurityPolicy.split(";").map((d) => {
        const [name, ...values] = d.trim().split(/\s+/);
        return [name, values.join(" ")] as const;
      }),
    );
    expect(directives.get("default-src")).toBe("'none'");
    expect(directives.get("connect-src")).toBe("'none'");
    expect(directives.get("script-src")).toBe("'unsafe-inline'");
    expect(contentSecurityPolicy).not.toContain("unsafe-eval");
    expect(contentSecurityPolicy).not.toMatch(/https?:|\*/);
  });

  it("references no outside URL and loads no outside resource", () => {
    expect(html).not.toMatch(/\b(?:src|href|srcset|action|poster)\s*=\s*["']?\s*(?:https?:)?\/\//i);
    expect(markup).not.toMatch(/<(?:link|img|iframe|object|embed|base)\b/i);
    expect(markup).not.toMatch(/<script\b[^>]*\bsrc=/i);
  });

  it("inlines vega, vega-lite and vega-embed in that order, with no </script inside", () => {
    // 1 JSON block + 3 bundles + 1 bootstrap: exactly five opening and five closing tags.
    expect(html.match(/<script\b/gi)).toHaveLength(5);
    expect(html.match(/<\/script/gi)).toHaveLength(5);
    const positions = ["/* vega */", "/* vega-lite */", "/* vega-embed */"].map((m) => html.indexOf(m));
    expect(positions.every((p) => p > 0)).toBe(true);
    expect([...positions].sort((a, b) => a - b)).toEqual(positions);
    expect(html).toContain('t.version="6.4.0"'); // vega 6.4.0's bundle sets its version this way
    expect(html).not.toContain("sourceMappingURL");
    expect(html).not.toContain("<!--");
    expect(html.length).toBeGreaterThan(800_000); // the three bundles are about 830 KB
    expect(html).toContain("expr: vegaEmbed.expressionInterpreter");
    expect(html).toContain("ast: true");
  });

  it("embeds the chart specs as JSON that parses back to the chart functions' output", () => {
    expect(json).not.toContain("<");
    const specs = JSON.parse(json) as Record<string, unknown>;
    const charts = reportCharts(sampleInput);
    // No backtest in the sample forecast: four charts.
    expect(charts.map((c) => c.id)).toEqual([
      "chart-learning-curve",
      "chart-score",
      "chart-net-value",
      "chart-sensitivity",
    ]);
    expect(Object.keys(specs)).toEqual(charts.map((c) => c.id));
    for (const chart of charts) expect(specs[chart.id]).toEqual(JSON.parse(JSON.stringify(chart.spec)));
  });

  it("gives each chart a caption and a table of its numbers, and the net value a note on its controls", () => {
    for (const chart of reportCharts(sampleInput)) {
      // The chart's accessible name is its title; its description is the caption it points to.
      expect(markup).toContain(
        `role="img" aria-label="${escapeHtml(chart.title)}" aria-describedby="${chart.id}-caption"`,
      );
      expect(markup).toContain(`<figcaption id="${chart.id}-caption">${escapeHtml(chart.description)}</figcaption>`);
      expect(markup).toContain(`<caption>${escapeHtml(chart.table.caption)}</caption>`);
    }
    expect(reportCharts(sampleInput).map((chart) => chart.title)).toEqual([
      "Learning curve: accuracy against training samples",
      "What further runs are expected to do to accuracy",
      "Expected net value of further runs",
      "What could change the advice",
    ]);
    expect(markup.match(/<details class="chart-data">/g)).toHaveLength(4);
    expect(markup).toMatch(/<p class="chart-note">[^<]*cost and value sliders/);
    // The learning curve's table: measured sizes (mean ± sd of 6 fits), then the projections beyond.
    const rows = markup.match(/<tr><td>[\d,]+<\/td><td>(measured|projected)[^\n]*<\/tr>/g) ?? [];
    const cells = (size: string) =>
      numbersIn((rows.find((row) => row.startsWith(`<tr><td>${size}</td>`)) ?? "").replace(/<[^>]+>/g, " "));
    expect(cells("800")).toEqual(["800", "6", "82.9%", "82.3%", "83.5%"]);
    expect(cells("2,600")).toEqual(["2,600", "86.1%", "8", "10", "84.5%", "87.7%"]);
  });

  it("highlights the recommended row with its intervals and marks the row over budget", () => {
    const recommended = markup.match(/<tr class="recommended">.*?<\/tr>/g) ?? [];
    expect(recommended).toHaveLength(1);
    const [row = ""] = recommended;
    const cells = [...row.matchAll(/<t[hd][^>]*>(.*?)<\/t[hd]>/g)].map((m) => m[1]);
    expect(cells).toEqual([
      '2<span class="tag recommended-tag">recommended</span>',
      "1,800",
      '85.3%<span class="range">83.8% to 86.8%</span>',
      "+0.6 points", // marginalGain 0.0064
      "61%",
      "44,000",
      "6",
      '20,400<span class="range">\u22126,000 to 47,000</span>',
      "81%",
    ]);
    expect(
      markup.match(/<tr class="over-budget"><th scope="row">4<span class="tag over-tag">over budget<\/span>/g),
    ).toHaveLength(1);
    expect(markup).toContain(
      '<th scope="col">Expected net value (EUR)<span class="range">likely range (8 in 10)</span></th>',
    );
  });

  it("leaves out the target column without a target, and shows losses with a minus sign", () => {
    const page = splitPage(renderReportHtml({ ...sampleInput, decision: stopDecision })).markup;
    expect(page).not.toContain("Chance of reaching target");
    // stopDecision, one run: 1,000,000 × (0.8465 − 0.8368) − 22,000 = −12,300.
    expect(page).toContain("<td>22,000</td><td>3</td><td>\u221212,300</td>");
  });

  it("always cautions that projections are not validation, and about people when a domain is given", () => {
    const cautions = (input: ReportInput) => textOf(splitPage(renderReportHtml(input)).markup, "cautions");
    const clinical = cautions(sampleInput);
    expect(clinical).toContain("Projections are not validation.");
    expect(clinical).toMatch(/decisions about people's health \(field: clinical\)/);
    expect(cautions({ ...sampleInput, domain: "safety" })).toMatch(/people's safety \(field: safety\)/);
    const none = cautions({ ...sampleInput, domain: undefined });
    expect(none).toContain("Projections are not validation.");
    expect(none).not.toContain("decisions about people");
  });

  it("gives each class's rows and, for accuracy, the score of always answering the most common class", () => {
    // Class counts of the Wisconsin diagnostic breast cancer data (Street, Wolberg and Mangasarian
    // 1993; as described by scikit-learn's load_breast_cancer and fixtures/open-data/README.md):
    // benign 357, malignant 212 of 569; always answering benign scores 357 / 569 = 62.7%.
    const curve = { ...sampleInput.curve, rows: 569, classCounts: [357, 212] };
    const methods = textOf(splitPage(renderReportHtml({ ...sampleInput, curve })).markup, "methods");
    expect(methods).toContain("Classes: benign (357 rows), malignant (212 rows).");
    expect(methods).toContain("Always answering benign, whatever the features, would score an accuracy of 62.7%");
    // Another metric has another baseline (balanced accuracy 50%, log loss none): the counts only.
    const logLoss = { ...curve, metric: "log_loss", higherIsBetter: false, metricRange: undefined };
    const other = textOf(splitPage(renderReportHtml({ ...sampleInput, curve: logLoss })).markup, "methods");
    expect(other).toContain("Classes: benign (357 rows), malignant (212 rows).");
    expect(other).not.toContain("Always answering");
  });

  it("lists the forecast's warnings", () => {
    const warned = renderReportHtml({
      ...sampleInput,
      forecast: { ...sampleInput.forecast, warnings: ["Only 4 sizes were measured.", "The asymptote is near 1."] },
    });
    expect(warned).toContain(
      '<h3>Warnings from the forecast</h3>\n<ul class="warnings">\n<li>Only 4 sizes were measured.</li>\n' +
        "<li>The asymptote is near 1.</li>\n</ul>",
    );
    expect(markup).not.toContain("Warnings from the forecast");
  });

  it("states the methods, assumptions and reproducibility facts", () => {
    const methods = textOf(markup, "methods");
    // Design, sizes and data: 3 folds, 2 repeats, 4 sizes from 100 to 800 of 1,000 rows.
    expect(methods).toMatch(/cross-validation \(3 folds, repeated 2 times\)/);
    expect(numbersIn(methods.slice(0, methods.indexOf("Classes")))).toEqual(["3", "2", "4", "100", "800", "1,000"]);
    // The family's formula comes from the fitter's own description (src/fit/families.ts).
    expect(methods).toContain("pow3 (score = a − b·n^(−c) when higher is better");
    expect(methods).toContain("a = 0.9, b = 2, c = 0.5");
    expect(methods).toMatch(/refitted 4 times/);
    expect(methods).toMatch(/No backtest was made/);
    expect(markup).toContain("<li>Efron, B. and Tibshirani, R. J. (1993). An Introduction to the Bootstrap.");
    // LCDB is cited only when several families are combined.
    expect(markup).not.toContain("LCDB");
    expect(methods).toContain("Classes: benign, malignant.");
    const assumptions = textOf(markup, "assumptions");
    expect(assumptions).toMatch(/400 samples/);
    expect(assumptions).toMatch(/22,000 EUR/);
    expect(assumptions).toMatch(/3 months/);
    expect(markup).toContain("<dt>Tool</dt><dd>headroom 0.1.0</dd>");
    expect(markup).toContain("<dt>Seed</dt><dd>7</dd>");
    expect(markup).toContain("<dt>Field of use</dt><dd>clinical</dd>");
    expect(markup).toContain(`<dd><code>${sampleInput.reproducibility.inputSha256}</code></dd>`);
    expect(markup).toContain("<dd><code>headroom report --curve curve.json");
  });

  it("describes the families, their weights, backtest and the sources of uncertainty of a forecast that has them", () => {
    const page = splitPage(renderReportHtml({ ...sampleInput, forecast: familiesForecast })).markup;
    const methods = textOf(page, "methods");
    expect(methods).toMatch(/Two learning-curve families were fitted/);
    expect(methods).toMatch(/pow3 \(score[^;]*weight 90%; last \(score[^;]*weight 10%/);
    expect(methods).toContain("a = 0.9, b = 2, c = 0.5");
    // sampleInputs.ts: backtest cuts 200 and 400; root mean square errors 0.005199 and 0.050184 → 0.5 and 5.0
    // points; the shift's standard deviation 1.2 points; single-model test set 1,000.
    expect(methods).toMatch(/up to 200, 400 samples/);
    expect(methods).toMatch(/pow3 \(power law\) 0\.5 points, last \(no further gain\) 5\.0 points/);
    expect(methods).toMatch(/1\.2 percentage points \(Nadeau and Bengio/);
    expect(methods).toMatch(/test set of 1,000 samples/);
    for (const author of [
      "Bates, J. M.",
      "Bürkner, P.-C.",
      "Hoeting, J. A.",
      "Nadeau, C.",
      "Bousquet, O.",
      "Mohr, F.",
    ]) {
      expect(page).toContain(`<li>${escapeHtml(author)}`);
    }
    expect(reportCharts({ ...sampleInput, forecast: familiesForecast }).map((c) => c.id)).toEqual([
      "chart-learning-curve",
      "chart-score",
      "chart-net-value",
      "chart-backtest",
      "chart-sensitivity",
    ]);
    // The backtest chart is drawn in the methods appendix, not among the lead's charts.
    expect(page.indexOf('id="figure-chart-backtest"')).toBeGreaterThan(page.indexOf('<section id="methods">'));
    expect(page.indexOf('id="figure-chart-learning-curve"')).toBeLessThan(page.indexOf('<section id="methods">'));
  });

  it("says in a sentence, instead of drawing a chart, that no assumption moved ±25% changes the advice", () => {
    const steady: DecisionFile = {
      ...sampleDecision,
      sensitivity: (sampleDecision.sensitivity ?? []).map((f) => ({
        ...f,
        low: f.low && { ...f.low, recommendedRuns: sampleDecision.recommendedRuns },
        high: f.high && { ...f.high, recommendedRuns: sampleDecision.recommendedRuns },
      })),
    };
    const page = splitPage(renderReportHtml({ ...sampleInput, decision: steady })).markup;
    expect(page).not.toContain('id="chart-sensitivity"');
    expect(textOf(page, "sensitivity-note")).toMatch(/25% lower or higher.*leaves the advice at two further runs/);
    expect(splitPage(renderReportHtml(sampleInput)).markup).toContain('id="chart-sensitivity"');
  });

  it("states the stopping rule, the test-set size and the weighing's cautions when decision.json has them", () => {
    const decision: DecisionFile = {
      ...sampleDecision,
      stopAfterRuns: 2,
      validation: {
        target: 0.85,
        expectedScore: 0.8529,
        runs: 2,
        confidence: 0.95,
        heldOutNeeded: 4000,
        heldOutNeededExact: 4100,
        context: "Seventy-five to a hundred test samples are a minimum.",
      },
      cautions: ["The yield is uncertain.", "Projections are not validation: repeated."],
    };
    const page = splitPage(renderReportHtml({ ...sampleInput, decision })).markup;
    // The third run adds 0.0045 × 100 points × 40,000 = 18,000, less than its 22,000.
    const meaning = textOf(page, "meaning");
    expect(meaning).toMatch(/Stop after 2 runs: run 3 [^.]*18,000 EUR[^.]*22,000 EUR/);
    const cautions = textOf(page, "cautions");
    expect(numbersIn(cautions.slice(cautions.indexOf("How large a test set"))).slice(0, 5)).toEqual([
      "95%",
      "85%",
      "4,000",
      "4,100",
      "85.3%",
    ]);
    expect(cautions).toContain("Seventy-five to a hundred test samples are a minimum.");
    // Every caution of the decision is shown, word for word.
    expect(page).toContain("<li>The yield is uncertain.</li>");
    expect(page).toContain("<li>Projections are not validation: repeated.</li>");
  });

  it("has a print stylesheet that fits charts to the page", () => {
    expect(html).toMatch(/@media print \{[\s\S]*\.chart svg \{ width: 100% !important; height: auto !important; \}/);
  });

  it("is byte-identical however often and whenever it is rendered", () => {
    vi.useFakeTimers();
    vi.setSystemTime(new Date("2001-02-03T04:05:06Z"));
    const early = renderReportHtml(sampleInput);
    vi.setSystemTime(new Date("2031-12-31T23:59:59Z"));
    const late = renderReportHtml(structuredClone(sampleInput));
    expect(late).toBe(early);
    expect(early).toBe(html);
  });

  afterEach(() => {
    vi.useRealTimers();
  });
});

describe("renderReportHtml with hostile strings", () => {
  const html = renderReportHtml(hostileInput);
  const { json, markup } = splitPage(html);

  it("never lets the raw markup through, in the page or the JSON block", () => {
    for (const raw of [hostile.script, hostile.attribute, "onerror=alert(1)>"]) {
      expect(html).not.toContain(raw);
    }
    expect(json).not.toMatch(/[<>]/);
    expect(markup).not.toMatch(/<img\b/i);
    // Only our own five script elements exist.
    expect(html.match(/<script\b/gi)).toHaveLength(5);
  });

  it("shows every hostile string escaped where the reader sees it", () => {
    const escaped = escapeHtml(`${hostile.script}${hostile.attribute}`);
    expect(markup).toContain(`<title>${escaped}</title>`);
    expect(markup).toContain(`<h1>${escaped}</h1>`);
    expect(markup).toContain(`<li>${escaped}</li>`); // the forecast warning
    expect(markup).toContain(`Classes: ${escapeHtml(hostile.script)}, ${escapeHtml(hostile.attribute)}.`);
    expect(markup).toContain(`<dd><code>${escaped}</code></dd>`); // command and checksum
    expect(markup).toContain(`<meta name="generator" content="headroom ${escaped}">`);
    expect(markup).toContain(`<dt>Field of use</dt><dd>${escaped}</dd>`);
  });

  it("keeps the strings intact inside the chart data", () => {
    const specs = JSON.parse(json) as Record<string, { title: { text: string }; description: string }>;
    expect(specs["chart-learning-curve"].title.text).toBe(
      `Learning curve: ${hostile.script}${hostile.attribute} against training samples`,
    );
    // The unknown metric name still shows as percent in the charts: the range comes from the forecast.
    expect(specs["chart-score"].description).toContain("goes from 84% now to 86% after 4 further runs");
  });
});

describe("decisionTableCsv", () => {
  it.each<[string | number | boolean | null, string]>([
    ["plain", "plain"],
    ["a,b", '"a,b"'],
    ['say "hi"', '"say ""hi"""'],
    ["two\r\nlines", '"two\r\nlines"'],
    [null, ""],
    [-12300, "-12300"],
    [true, "true"],
  ])("csvField(%j) → %j (RFC 4180 §2 rules 5–7)", (value, field) => {
    expect(csvField(value)).toBe(field);
  });

  it("writes a header and one CRLF-ended line per row, numbers in full precision", () => {
    const csv = decisionTableCsv(sampleDecision);
    const lines = csv.split("\r\n");
    expect(lines).toHaveLength(7); // header + 5 rows + the empty string after the last CRLF
    expect(lines[0]).toBe(
      "Further runs,Training samples,Expected accuracy,Likely range from (8 in 10),Likely range to (8 in 10)," +
        "Chance of reaching target,Cost,Months,Expected net value,Within budget and deadline,Gain from this run," +
        "Net value likely from (8 in 10),Net value likely to (8 in 10),Chance value exceeds cost,Within budget," +
        "Within deadline,Recommended",
    );
    expect(lines[3]).toBe("2,1800,0.8529,0.8382,0.8675,0.61,44000,6,20400,true,0.0064,-6000,47000,0.81,true,true,true");
    expect(lines[5]).toBe(
      "4,2600,0.8608,0.8448,0.8768,0.83,88000,12,8000,false,0.0034,-30000,46000,0.58,false,true,false",
    );
    expect(lines[6]).toBe("");
  });

  it("writes only the first version's columns for a first-version decision.json", () => {
    expect(decisionTableCsv(stopDecision).split("\r\n")[0]).toBe(
      "Further runs,Training samples,Expected accuracy,Likely range from (8 in 10),Likely range to (8 in 10)," +
        "Chance of reaching target,Cost,Months,Expected net value,Within budget and deadline,Recommended",
    );
  });

  it("reads back in an independent CSV parser (papaparse) with an empty field for no target", () => {
    const parsed = Papa.parse<string[]>(decisionTableCsv(stopDecision), { skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data).toHaveLength(6);
    expect(parsed.data.every((row) => row.length === 11)).toBe(true);
    expect(parsed.data.slice(1).map((row) => row[5])).toEqual(["", "", "", "", ""]);
    expect(parsed.data[2][8]).toBe("-12300");
  });
});
