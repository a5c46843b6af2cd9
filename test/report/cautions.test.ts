/**
 * The page never shows fewer cautions than decision.json holds (issue 13), whichever route gives the
 * field of use: the plan's `domain`, a plan's `clinical` block, the study's context or weigh's
 * `--domain` (both reach weigh as its `domain` option), the report's own `--domain`, or none.
 */
import { describe, expect, it } from "vitest";
import { forecastCurve } from "../../src/forecast/forecast.js";
import { renderReportHtml } from "../../src/report/html.js";
import { planSchema } from "../../src/weigh/plan.js";
import { weighRuns } from "../../src/weigh/weigh.js";
import { sampleCurve } from "./sampleInputs.js";

const forecast = forecastCurve(sampleCurve, { draws: 40 });
const basePlan = {
  samplesPerRun: 400,
  costPerRun: 22000,
  monthsPerRun: 3,
  budget: 80000,
  maxRuns: 4,
  valuePerPoint: 40000,
};
const clinical = { predictorParameters: 24, anticipatedCoxSnellR2: 0.288, prevalence: 0.174 };

/** The text of the page's cautions section, with the character references read back. */
function cautionsText(html: string): string {
  const section = /<section id="cautions">([\s\S]*?)<\/section>/.exec(html)?.[1] ?? "";
  return section
    .replace(/<[^>]+>/g, " ")
    .replace(/&quot;/g, '"')
    .replace(/&#39;/g, "'")
    .replace(/&lt;/g, "<")
    .replace(/&gt;/g, ">")
    .replace(/&amp;/g, "&")
    .replace(/\s+/g, " ");
}

const routes = [
  {
    route: "plan.domain",
    plan: { domain: "public-health" },
    weighDomain: undefined,
    reportDomain: undefined,
    people: true,
  },
  { route: "plan.clinical", plan: { clinical }, weighDomain: undefined, reportDomain: undefined, people: true },
  { route: "study context / weigh --domain", plan: {}, weighDomain: "safety", reportDomain: undefined, people: true },
  { route: "study context to both", plan: {}, weighDomain: "clinical", reportDomain: "clinical", people: true },
  { route: "report --domain only", plan: {}, weighDomain: undefined, reportDomain: "clinical", people: true },
  {
    route: "plan.domain and a different report --domain",
    plan: { domain: "safety" },
    weighDomain: undefined,
    reportDomain: "health",
    people: true,
  },
  {
    route: "a field not about people",
    plan: { domain: "research" },
    weighDomain: undefined,
    reportDomain: undefined,
    people: false,
  },
  { route: "none", plan: {}, weighDomain: undefined, reportDomain: undefined, people: false },
];

describe("every caution of the decision reaches the page", () => {
  it.each(routes)("$route", ({ plan, weighDomain, reportDomain, people }) => {
    const decision = weighRuns(forecast, planSchema.parse({ ...basePlan, ...plan }), "f", {
      domain: weighDomain,
      simulations: 100,
    });
    const html = renderReportHtml({
      curve: sampleCurve,
      forecast,
      decision,
      domain: reportDomain,
      reproducibility: { toolVersion: "0" },
    });
    const text = cautionsText(html);
    for (const caution of decision.cautions ?? []) expect(text).toContain(caution);
    const aboutPeople = (text.match(/This model informs decisions about people/g) ?? []).length;
    expect(aboutPeople).toBe(people ? 1 : 0);
    expect(text).toContain("Projections are not validation.");
  });

  it("records the field of use in decision.json: the plan's before the one given beside it", () => {
    const weigh = (plan: object, domain?: string) =>
      weighRuns(forecast, planSchema.parse({ ...basePlan, ...plan }), "f", { domain, simulations: 50 }).domain;
    expect(weigh({ domain: "public-health" }, "research")).toBe("public-health");
    expect(weigh({}, "safety")).toBe("safety");
    expect(weigh({ clinical })).toBe("clinical");
    expect(weigh({})).toBeUndefined();
  });
});
