/**
 * Tests of the HTML report: the headline sentences, the page's sections and numbers, escaping of
 * hostile strings, the offline guarantees (Content-Security-Policy, no outside URL, inlined bundles
 * that cannot close their script element), byte-determinism, and the CSV export. A last block opens
 * the page in Chromium (Debian's `chromium`, through playwright-core) and checks that the charts draw
 * under the page's own policy with no error, no request and no injected element.
 *
 * Expected numbers are worked by hand from test/report/sampleInputs.ts, e.g. two runs: expected
 * 0.8529 → "85.3%", interval 0.8382 to 0.8675 → "83.8% to 86.8%".
 */
import { existsSync } from "node:fs";
import Papa from "papaparse";
import { afterEach, describe, expect, it, vi } from "vitest";
import { inlineScriptText } from "../../src/report/bundles.js";
import { learningCurveChart, valueChart } from "../../src/report/charts.js";
import {
  contentSecurityPolicy,
  csvField,
  decisionTableCsv,
  escapeHtml,
  headline,
  jsonForScript,
  renderReportHtml,
  type ReportInput,
} from "../../src/report/html.js";
import type { DecisionFile } from "../../src/weigh/decisionFile.js";
import {
  briefDecision,
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

const base: Omit<ReportInput, "decision"> = { ...sampleInput };

describe("headline", () => {
  it.each<[string, ReportInput, string]>([
    [
      "recommended runs with a target reached only over budget",
      sampleInput,
      "Two more runs (44,000 EUR, 6 months) are expected to lift accuracy from 84% to 85% (80% interval 84% " +
        "to 87%); the chance of reaching the target of 85% goes from 20% to 61%. Reaching the target of 85% " +
        "with 80% confidence takes four runs (88,000 EUR, 12 months, over budget).",
    ],
    [
      "the example sentence of the brief",
      { ...base, decision: briefDecision },
      "Three more runs (66,000 EUR, 9 months) are expected to lift accuracy from 81% to 86% (80% interval 83% " +
        "to 88%).",
    ],
    [
      "stopping now",
      { ...base, decision: stopDecision },
      "No further run is recommended: with today's 1,000 samples, accuracy is expected to be 84% (80% " +
        "interval 82% to 85%) and one more run (22,000 EUR, 3 months) would take it to 85%.",
    ],
    [
      "no currency given",
      { ...base, decision: briefDecision, currency: undefined },
      "Three more runs (66,000, 9 months) are expected to lift accuracy from 81% to 86% (80% interval 83% to 88%).",
    ],
    [
      "a gain smaller than one whole percent shows one decimal",
      { ...base, decision: smallGainDecision },
      "One more run (22,000 EUR, 3 months) is expected to lift accuracy from 83.7% to 84.1% (80% interval " +
        "83.0% to 85.2%).",
    ],
    [
      "a lower-is-better metric is lowered, in plain numbers",
      { ...base, curve: logLossCurve, forecast: logLossForecast, decision: logLossDecision },
      // 1 − 0.8368 = 0.1632 and 1 − 0.8603 = 0.1397, 1 − 0.8328 = 0.1672; 1 − 0.8465 is 0.15349999… in
      // binary floating point, so it rounds to 0.153.
      "One more run (22,000 EUR, 3 months) is expected to lower log loss from 0.163 to 0.153 (80% interval " +
        "0.140 to 0.167).",
    ],
    [
      "no decision: the largest projection",
      { ...base, decision: undefined },
      "At 2,600 training samples, accuracy is projected to be 86% (80% interval 84% to 88%), against 83% " +
        "measured at 800 samples.",
    ],
    [
      "no decision, metric not a fraction",
      { curve: logLossCurve, forecast: logLossForecast, reproducibility: { toolVersion: "0.1.0" } },
      "At 2,600 training samples, log loss is projected to be 0.139 (80% interval 0.123 to 0.155), against " +
        "0.171 measured at 800 samples.",
    ],
  ])("%s", (_name, input, expected) => {
    expect(headline(input)).toBe(expected);
  });

  it("says when the target is out of reach or already reached", () => {
    const out = { ...sampleDecision, runsToTarget: null };
    expect(headline({ ...base, decision: out })).toContain(
      "No number of runs up to 4 reaches the target of 85% with 80% confidence.",
    );
    const reached = { ...sampleDecision, runsToTarget: 0 };
    expect(headline({ ...base, decision: reached })).toContain(
      "The target of 85% is already reached with 80% confidence.",
    );
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
      'id="chart-value"',
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
    const options = { currency: "EUR", metricRange: [0, 1] as [number, number] };
    expect(specs["chart-learning-curve"]).toEqual(
      JSON.parse(JSON.stringify(learningCurveChart(sampleInput.curve, sampleInput.forecast, sampleDecision, options))),
    );
    expect(specs["chart-value"]).toEqual(JSON.parse(JSON.stringify(valueChart(sampleDecision, options))));
  });

  it("highlights the recommended row and marks the row over budget", () => {
    const recommended = markup.match(/<tr class="recommended">.*?<\/tr>/g) ?? [];
    expect(recommended).toHaveLength(1);
    const [row = ""] = recommended;
    const cells = [...row.matchAll(/<t[hd][^>]*>(.*?)<\/t[hd]>/g)].map((m) => m[1]);
    expect(cells).toEqual([
      '2<span class="tag recommended-tag">recommended</span>',
      "1,800",
      "85.3%",
      "83.8% to 86.8%",
      "61%",
      "44,000",
      "6",
      "20,400",
    ]);
    expect(
      markup.match(/<tr class="over-budget"><th scope="row">4<span class="tag over-tag">over budget<\/span>/g),
    ).toHaveLength(1);
    expect(markup).toContain('<th scope="col">Expected net value (EUR)</th>');
  });

  it("leaves out the target column without a target, and shows losses with a minus sign", () => {
    const page = splitPage(renderReportHtml({ ...sampleInput, decision: stopDecision })).markup;
    expect(page).not.toContain("Chance of reaching target");
    // stopDecision, one run: 1,000,000 × (0.8465 − 0.8368) − 22,000 = −12,300.
    expect(page).toContain("<td>22,000</td><td>3</td><td>\u221212,300</td>");
  });

  it("always cautions that projections are not validation, and about people when a domain is given", () => {
    expect(markup).toContain("Projections are not validation.");
    expect(markup).toContain("This model informs decisions about people&#39;s health (field: clinical).");
    expect(markup).toContain("licensed professional practice decide whether and how such a model may be used.");
    const safety = splitPage(renderReportHtml({ ...sampleInput, domain: "safety" })).markup;
    expect(safety).toContain("people&#39;s safety (field: safety)");
    const none = splitPage(renderReportHtml({ ...sampleInput, domain: undefined })).markup;
    expect(none).toContain("Projections are not validation.");
    expect(none).not.toContain("licensed professional practice");
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
    expect(markup).toContain("Accuracy was measured by 2 times repeated 3-fold cross-validation on subsamples of 4");
    expect(markup).toContain("An inverse power law, score = a − b·n^(−c)");
    expect(markup).toContain("fitted parameters: a = 0.9, b = 2, c = 0.5.");
    expect(markup).toContain("Intervals are central 80% intervals from a bootstrap over repeats");
    expect(markup).toContain("refitted 4 times.");
    expect(markup).toContain("Classes: benign, malignant.");
    expect(markup).toContain("<li>Each run yields 400 samples and costs 22,000 EUR and 3 months, as planned.</li>");
    expect(markup).toContain("<dt>Tool</dt><dd>headroom 0.1.0</dd>");
    expect(markup).toContain("<dt>Seed</dt><dd>7</dd>");
    expect(markup).toContain(`<dd><code>${sampleInput.reproducibility.inputSha256}</code></dd>`);
    expect(markup).toContain("<dd><code>headroom report --curve curve.json");
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
    expect(markup).toContain(`(field: ${escaped})`);
  });

  it("keeps the strings intact inside the chart data", () => {
    const specs = JSON.parse(json) as Record<string, { title: { text: string }; description: string }>;
    expect(specs["chart-learning-curve"].title.text).toBe(
      `Learning curve: ${hostile.script}${hostile.attribute} against training samples`,
    );
    // The unknown metric name still shows as percent in both charts: the range comes from the forecast.
    expect(specs["chart-value"].description).toContain("goes from 84% now to 86% after 4 runs");
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
      "runs,trainingSize,expected,lower,upper,probabilityOfTarget,cost,months,expectedNetValue,affordable,recommended",
    );
    expect(lines[3]).toBe("2,1800,0.8529,0.8382,0.8675,0.61,44000,6,20400,true,true");
    expect(lines[5]).toBe("4,2600,0.8608,0.8448,0.8768,0.83,88000,12,8000,false,false");
    expect(lines[6]).toBe("");
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

const chromiumPath = "/usr/bin/chromium";

// Debian's chromium package; skipped where it is not installed.
describe.skipIf(!existsSync(chromiumPath))("the page in a browser", () => {
  it("draws both charts under its own policy with no error, no request and no injected element", async () => {
    const { chromium } = await import("playwright-core");
    const browser = await chromium.launch({ executablePath: chromiumPath, args: ["--no-sandbox"] });
    try {
      const page = await browser.newPage();
      const problems: string[] = [];
      const requests: string[] = [];
      page.on("console", (message) => {
        if (message.type() === "error" || message.type() === "warning") problems.push(message.text());
      });
      page.on("pageerror", (error) => problems.push(error.message));
      page.on("request", (request) => {
        if (request.url() !== "http://report.invalid/") requests.push(request.url());
      });
      // Browser-side code goes as text (the test's TypeScript has no DOM types): count alerts and
      // policy violations from the first moment of the page.
      await page.addInitScript({
        content: `
          window.recorded = { violations: [], alerts: 0 };
          window.alert = () => { window.recorded.alerts += 1; };
          document.addEventListener("securitypolicyviolation", (event) => {
            window.recorded.violations.push(event.violatedDirective + " " + event.blockedURI);
          });`,
      });
      // Serve the page from a made-up address, so that any other request shows up in `requests`.
      const address = "http://report.invalid/";
      await page.route(address, (route) =>
        route.fulfill({ body: renderReportHtml(hostileInput), contentType: "text/html; charset=utf-8" }),
      );
      await page.goto(address);
      await page.waitForSelector("#chart-value svg", { timeout: 20_000 });
      const state = (await page.evaluate(`({
        violations: window.recorded.violations,
        alerts: window.recorded.alerts,
        images: document.querySelectorAll("img").length,
        scripts: document.querySelectorAll("script").length,
        title: document.title,
        symbols: document.querySelectorAll("#chart-learning-curve svg .mark-symbol.role-mark path").length,
        bars: document.querySelectorAll("#chart-value svg .mark-rect.role-mark path").length,
      })`)) as {
        violations: string[];
        alerts: number;
        images: number;
        scripts: number;
        title: string;
        symbols: number;
        bars: number;
      };
      expect(problems).toEqual([]);
      expect(requests).toEqual([]);
      expect(state.violations).toEqual([]);
      expect(state.alerts).toBe(0);
      expect(state.images).toBe(0);
      expect(state.scripts).toBe(5);
      expect(state.title).toBe(`${hostile.script}${hostile.attribute}`);
      expect(state.symbols).toBe(24 + 4); // 24 single fits + 4 means
      expect(state.bars).toBe(5 + 1); // 5 rows + the recommended outline
    } finally {
      await browser.close();
    }
  }, 60_000);
});
