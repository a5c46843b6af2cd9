/**
 * The report in a real browser: Debian's Chromium (`apt-get install chromium`, which .ci/run does),
 * driven through playwright-core. Each report is made the way users make it, by the library's
 * `runStudy` on a study file into a temporary folder (one worker), and served to the browser from a
 * made-up address so that any other request the page makes shows up.
 *
 * 1. The demo study (fixtures/demo/study.json): every chart draws with marks under the page's own
 *    Content-Security-Policy, the console stays free of errors and warnings, the page requests
 *    nothing, and moving a cost or value slider changes the recommendation the net-value chart states, to
 *    the value an independent computation from decision.json's rows gives.
 * 2. A small data set whose column names, class labels, title, currency and field contain HTML and
 *    script fragments: they show as text, and no script of theirs runs.
 *
 * Where Chromium is missing the tests are skipped on a developer's machine, but fail in CI (the
 * environment variable CI is set), where a skipped browser check would hide a broken report.
 */
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runStudy, type StudyResult } from "../../src/study/runStudy.js";
import type { DecisionFile } from "../../src/weigh/decisionFile.js";

const chromiumPath = "/usr/bin/chromium";
const chromiumFlags = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
];
const inCi = Boolean(process.env.CI);
const demoStudy = fileURLToPath(new URL("../../fixtures/demo/study.json", import.meta.url));
/** The made-up address the page is served from; `.invalid` never resolves (RFC 2606). */
const pageAddress = "http://report.invalid/report.html";

/** Strings that would run script if the page placed them unescaped. */
const hostile = {
  title: "<script>alert('title')</script> & <b>co</b>",
  feature1: "<img src=x onerror=alert('column')>",
  feature2: "\"><svg onload=alert('column2')>",
  label: "<b onmouseover=alert('label')>outcome</b>",
  group: "<em onclick=alert('group')>cruise</em>",
  class1: "<script>alert('class')</script>",
  class2: "\"><img src=y onerror=alert('class2')>",
  currency: "<i>€</i>",
  domain: "<iframe src=javascript:alert('domain')>",
};

/** A CSV field quoted after RFC 4180 (doubling inner quotes). */
function quoted(text: string): string {
  return `"${text.replace(/"/g, '""')}"`;
}

/**
 * Writes a small learnable data set with hostile names: 150 rows in 5 runs (a group column), two
 * numeric features, two classes (the class is 1 when feature1 + feature2 > 1, with every seventh label
 * flipped so scores stay below 100%), and a study file naming them. Deterministic: the features follow
 * a fixed low-discrepancy sequence, not a random generator.
 */
function writeHostileStudy(folder: string): string {
  const lines = [[hostile.feature1, hostile.feature2, hostile.group, hostile.label].map(quoted).join(",")];
  for (let i = 0; i < 150; i++) {
    const x = (i * 0.618034) % 1;
    const y = (i * 0.754878) % 1;
    const positive = x + y > 1 !== (i % 7 === 0);
    const run = `run ${1 + (i % 5)}`;
    lines.push([x.toFixed(4), y.toFixed(4), run, quoted(positive ? hostile.class1 : hostile.class2)].join(","));
  }
  writeFileSync(join(folder, "hostile.csv"), lines.join("\n") + "\n");
  const study = {
    title: hostile.title,
    data: "hostile.csv",
    label: hostile.label,
    group: hostile.group,
    measure: { folds: 3, repeats: 3, sizes: [20, 40, 70], seed: 11 },
    forecast: { level: 0.8, draws: 40 },
    plan: { samplesPerRun: 20, costPerRun: 1000, maxRuns: 3, valuePerPoint: 800, target: 0.95, targetConfidence: 0.8 },
    context: { domain: hostile.domain, currency: hostile.currency },
  };
  const file = join(folder, "study.json");
  writeFileSync(file, JSON.stringify(study, null, 2));
  return file;
}

/**
 * Waits until `expression` is true in the page, polling with `page.evaluate` from here. (Playwright's
 * own `waitForFunction` compiles its predicate in the page with `new Function`, which the report's
 * policy rightly forbids.)
 */
async function waitUntil(page: Page, expression: string, timeout: number): Promise<void> {
  const deadline = Date.now() + timeout;
  while (!(await page.evaluate(expression))) {
    if (Date.now() > deadline) throw new Error(`timed out after ${timeout} ms waiting for ${expression}`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}

/** What the test saw of one page: console messages, requests and policy violations. */
interface PageWatch {
  page: Page;
  problems: string[];
  requests: string[];
}

/**
 * Opens `html` at `pageAddress` in a new page, recording console errors and warnings, uncaught
 * exceptions, every request other than the page itself (and refusing it), alerts and CSP violations.
 */
async function openReport(browser: Browser, html: string): Promise<PageWatch> {
  const page = await browser.newPage();
  const problems: string[] = [];
  const requests: string[] = [];
  page.on("console", (message) => {
    if (message.type() === "error" || message.type() === "warning")
      problems.push(`${message.type()}: ${message.text()}`);
  });
  page.on("pageerror", (error) => problems.push(`pageerror: ${error.message}`));
  // Browser-side code goes as text (the tests' TypeScript has no DOM types).
  await page.addInitScript({
    content: `
      window.recorded = { violations: [], alerts: 0 };
      window.alert = () => { window.recorded.alerts += 1; };
      document.addEventListener("securitypolicyviolation", (event) => {
        window.recorded.violations.push(event.violatedDirective + " " + event.blockedURI);
      });`,
  });
  await page.route("**/*", (route) => {
    if (route.request().url() === pageAddress) {
      return route.fulfill({ body: html, contentType: "text/html; charset=utf-8" });
    }
    requests.push(route.request().url());
    return route.abort();
  });
  await page.goto(pageAddress);
  await waitUntil(
    page,
    `[...document.querySelectorAll(".chart")].every((chart) => chart.getAttribute("data-drawn") === "true")`,
    30_000,
  );
  return { page, problems, requests };
}

/** Per chart container: its id and the number of drawn data-mark items (paths, lines, texts). */
async function chartMarks(page: Page): Promise<Array<{ id: string; marks: number; hasSvg: boolean }>> {
  return (await page.evaluate(`[...document.querySelectorAll(".chart")].map((chart) => ({
    id: chart.id,
    hasSvg: chart.querySelector("svg") !== null,
    marks: chart.querySelectorAll("svg g.role-mark path, svg g.role-mark line, svg g.role-mark text").length,
  }))`)) as Array<{ id: string; marks: number; hasSvg: boolean }>;
}

/** The recommendation the net-value chart states. */
async function statedRecommendation(page: Page): Promise<string> {
  return (await page.evaluate(
    `document.querySelector("#chart-net-value g.recommendation_marks text")?.textContent ?? ""`,
  )) as string;
}

/**
 * Sets a cost or value slider as a user's drag does (value, then an input event) and waits until the stated
 * recommendation names `runs`; returns the statement (or throws after 10 s, with what it says then).
 */
async function moveSlider(page: Page, name: string, value: number, runs: number): Promise<string> {
  await page.evaluate(`(() => {
    const input = document.querySelector('#chart-net-value input[name="${name}"]');
    input.value = "${value}";
    input.dispatchEvent(new Event("input", { bubbles: true }));
  })()`);
  const prefix = `Recommended: ${runsText(runs)},`;
  try {
    await waitUntil(
      page,
      `(document.querySelector("#chart-net-value g.recommendation_marks text")?.textContent ?? "").startsWith(${JSON.stringify(prefix)})`,
      10_000,
    );
  } catch {
    throw new Error(
      `after ${name} = ${value} the chart says "${await statedRecommendation(page)}", not "${prefix} ..."`,
    );
  }
  return statedRecommendation(page);
}

/**
 * The recommendation for another cost per run and value per point, computed here from decision.json's
 * rows by the rule decision.json states (net value = value per point × points gained − cost; the
 * highest net value within budget and deadline, the fewest runs among equals), independently of the
 * chart's Vega transforms. Points gained come from the rows: (net value + cost) ÷ value per point.
 */
function expectedRecommendation(decision: DecisionFile, costPerRun: number, valuePerPoint: number): number {
  let best = { runs: 0, net: -Infinity };
  for (const row of [...decision.table].sort((a, b) => a.runs - b.runs)) {
    const points = (row.expectedNetValue + row.cost) / decision.plan.valuePerPoint;
    const cost = row.cost - row.runs * decision.plan.costPerRun + row.runs * costPerRun;
    const net = valuePerPoint * points - cost;
    const affordable =
      (row.withinDeadline ?? true) && (decision.plan.budget === undefined || cost <= decision.plan.budget);
    if (affordable && net > best.net + 1e-6) best = { runs: row.runs, net };
  }
  return best.runs;
}

function runsText(runs: number): string {
  return runs === 0 ? "no further run" : `${runs} further ${runs === 1 ? "run" : "runs"}`;
}

describe.skipIf(!existsSync(chromiumPath) && !inCi)("the report in Chromium", () => {
  let browser: Browser;
  let folder: string;
  let demo: StudyResult;
  let demoHtml: string;
  let hostileHtml: string;

  beforeAll(async () => {
    folder = mkdtempSync(join(tmpdir(), "headroom-browser-"));
    demo = await runStudy(demoStudy, { outDir: join(folder, "demo"), workers: 1, command: "headroom demo" });
    demoHtml = readFileSync(join(folder, "demo", "report.html"), "utf8");
    const hostileStudy = writeHostileStudy(folder);
    await runStudy(hostileStudy, { outDir: join(folder, "hostile"), workers: 1, command: hostile.title });
    hostileHtml = readFileSync(join(folder, "hostile", "report.html"), "utf8");
    const { chromium } = await import("playwright-core");
    // In CI a missing Chromium makes this launch fail, and with it every test below.
    browser = await chromium.launch({ executablePath: chromiumPath, args: chromiumFlags });
  }, 240_000);

  afterAll(async () => {
    await browser?.close();
    if (folder) rmSync(folder, { recursive: true, force: true });
  });

  it("finds Debian's Chromium", () => {
    expect(existsSync(chromiumPath)).toBe(true);
  });

  it("draws every chart of the demo with marks, with no console message and no request", async () => {
    const { page, problems, requests } = await openReport(browser, demoHtml);
    try {
      const specs = JSON.parse(
        /<script type="application\/json" id="chart-specs">([^<]*)<\/script>/.exec(demoHtml)![1],
      ) as Record<string, unknown>;
      const charts = await chartMarks(page);
      // Every spec is drawn; the backtest chart sits in the methods appendix, after the others.
      expect(charts.map((c) => c.id).sort()).toEqual(Object.keys(specs).sort());
      expect(charts.length).toBeGreaterThanOrEqual(4);
      for (const chart of charts) {
        expect(chart.hasSvg, chart.id).toBe(true);
        expect(chart.marks, chart.id).toBeGreaterThan(0);
      }
      const state = (await page.evaluate(`({
        violations: window.recorded.violations,
        alerts: window.recorded.alerts,
        sliders: document.querySelectorAll('#chart-net-value input[type="range"]').length,
      })`)) as { violations: string[]; alerts: number; sliders: number };
      expect(problems).toEqual([]);
      expect(requests).toEqual([]);
      expect(state.violations).toEqual([]);
      expect(state.alerts).toBe(0);
      expect(state.sliders).toBe(2);
    } finally {
      await page.close();
    }
  }, 60_000);

  it("speaks plain words: none of the replaced phrases in the page, its charts, their tooltips or the files beside it", async () => {
    const replaced: RegExp[] = [
      /\d+(\.\d+)?% projection band/i,
      /\d+(\.\d+)?% interval/i,
      /mean ± 1 sd/i,
      /\beach fit\b/i,
      /\d pt\b/,
      /root mean square error \(percentage points\)/i,
      /headroom to the curve's ceiling/i,
      /what-if/i,
    ];
    const { page } = await openReport(browser, demoHtml);
    try {
      const text = (await page.evaluate(
        `document.body.innerText + " " + [...document.querySelectorAll("svg")].map((svg) => svg.textContent).join(" ")`,
      )) as string;
      const specs = /<script type="application\/json" id="chart-specs">([^<]*)<\/script>/.exec(demoHtml)![1];
      const files = ["decision.csv", "chart-learning-curve.svg", "chart-score.svg", "chart-net-value.svg"].map((name) =>
        readFileSync(join(folder, "demo", name), "utf8"),
      );
      for (const [where, content] of [["page", text], ["specs", specs], ...files.map((f, i) => [`file ${i}`, f])]) {
        expect(replaced.filter((phrase) => phrase.test(content)).map(String), where).toEqual([]);
      }
      // A tooltip says what its mark is.
      expect(specs).not.toContain('"title":"Mark"');
      expect(text).toContain("likely range (8 in 10)");
      expect(text).toContain("One trial model");
      expect(text).toContain("Average, with typical spread");
    } finally {
      await page.close();
    }
  }, 60_000);

  it("restates the recommendation when a cost or value slider moves", async () => {
    const { page, problems } = await openReport(browser, demoHtml);
    try {
      const { decision } = demo;
      const plan = decision.plan;
      const initial = await statedRecommendation(page);
      expect(initial.startsWith(`Recommended: ${runsText(decision.recommendedRuns)},`)).toBe(true);

      // Free runs: every run within the budget pays; the recommendation moves to the most affordable.
      const free = expectedRecommendation(decision, 0, plan.valuePerPoint);
      expect(free).not.toBe(decision.recommendedRuns);
      const afterCost = await moveSlider(page, "costPerRun", 0, free);
      expect(afterCost).not.toBe(initial);

      // Back to the plan's cost, then a point worth three times as much.
      expect(await moveSlider(page, "costPerRun", plan.costPerRun, decision.recommendedRuns)).toBe(initial);
      const dear = expectedRecommendation(decision, plan.costPerRun, 3 * plan.valuePerPoint);
      await moveSlider(page, "valuePerPoint", 3 * plan.valuePerPoint, dear);
      expect(problems).toEqual([]);
    } finally {
      await page.close();
    }
  }, 60_000);

  it("shows hostile names from the data as text and runs none of their scripts", async () => {
    const { page, problems, requests } = await openReport(browser, hostileHtml);
    try {
      const state = (await page.evaluate(`({
        violations: window.recorded.violations,
        alerts: window.recorded.alerts,
        title: document.title,
        heading: document.querySelector("h1").textContent,
        text: document.querySelector("main").textContent,
        chartText: [...document.querySelectorAll(".chart svg")].map((svg) => svg.textContent).join(" "),
        scripts: document.querySelectorAll("script").length,
        injected: document.querySelectorAll("main img, main iframe, main b, main i, main svg[onload], [onerror], [onmouseover]").length,
        charts: document.querySelectorAll(".chart svg").length,
      })`)) as {
        violations: string[];
        alerts: number;
        title: string;
        heading: string;
        text: string;
        chartText: string;
        scripts: number;
        injected: number;
        charts: number;
      };
      expect(state.alerts).toBe(0);
      expect(state.violations).toEqual([]);
      expect(problems).toEqual([]);
      expect(requests).toEqual([]);
      expect(state.scripts).toBe(5); // the specs, three bundles, the bootstrap
      expect(state.injected).toBe(0);
      expect(state.title).toBe(hostile.title);
      expect(state.heading).toBe(hostile.title);
      // Every name the report shows (curve.json does not keep the feature columns' names).
      const names = [hostile.label, hostile.group, hostile.class1, hostile.class2, hostile.domain];
      expect(names.filter((name) => !state.text.includes(name))).toEqual([]);
      expect(state.chartText).toContain(hostile.currency);
      expect(state.charts).toBeGreaterThanOrEqual(3);
    } finally {
      await page.close();
    }
  }, 60_000);
});
