/**
 * The decision's sentences are true for every combination of the plan's limits (issue 13): a budget
 * and a deadline each absent, loose or binding, and the clinical minimum reached today, within the
 * plan's runs or not at all. Riley et al.'s minimum for p = 24, R²cs = 0.288, prevalence 0.174 is
 * 662 participants (clinicalSampleSize.test.ts, checked against the paper's worked example).
 */
import { describe, expect, it } from "vitest";
import type { ForecastFile } from "../../src/forecast/forecastFile.js";
import { planSchema } from "../../src/weigh/plan.js";
import { weighRuns } from "../../src/weigh/weigh.js";

/** Projections every 50 samples from 400 to 1,000, the score rising by 0.01 a step; one draw. */
function forecast(): ForecastFile {
  const sizes = Array.from({ length: 13 }, (_, k) => 400 + 50 * k);
  return {
    kind: "headroom-forecast",
    version: 1,
    metric: "accuracy",
    higherIsBetter: true,
    metricRange: [0, 1],
    family: "pow3",
    parameters: {},
    measured: [],
    largestMeasuredSize: 400,
    level: 0.8,
    projections: sizes.map((trainingSize, k) => {
      const expected = 0.7 + 0.01 * k;
      return { trainingSize, expected, lower: expected, upper: expected, level: 0.8, draws: [expected] };
    }),
    band: [],
    warnings: [],
    seed: 0,
  };
}

const clinical = { predictorParameters: 24, anticipatedCoxSnellR2: 0.288, prevalence: 0.174 };
/** Budget and deadline: absent, loose, or binding after the first run (runs cost 1,000 and take a month). */
const limits = {
  budget: { none: undefined, loose: 1_000_000, binding: 1000 },
  deadlineMonths: { none: undefined, loose: 100, binding: 1 },
};
/** Where the minimum of 662 stands: today (700 samples), after 2 runs of 50 (600 → 700), never (500 → 650). */
const floors = {
  today: { currentSamples: 700, phrase: "which today's data already reach." },
  within: { currentSamples: 600, phrase: "reached after 2 further runs" },
  never: { currentSamples: 500, phrase: "which no number of runs up to the plan's 3 reaches." },
};

const cases = (["none", "loose", "binding"] as const).flatMap((budget) =>
  (["none", "loose", "binding"] as const).flatMap((deadline) =>
    (["today", "within", "never"] as const).map((floor) => [budget, deadline, floor] as const),
  ),
);

describe("the clinical reason, for every budget × deadline × floor", () => {
  it.each(cases)("budget %s, deadline %s, minimum reached %s", (budget, deadline, floor) => {
    const plan = planSchema.parse({
      samplesPerRun: 50,
      costPerRun: 1000,
      monthsPerRun: 1,
      maxRuns: 3,
      valuePerPoint: 1000,
      currentSamples: floors[floor].currentSamples,
      budget: limits.budget[budget],
      deadlineMonths: limits.deadlineMonths[deadline],
      clinical,
    });
    const decision = weighRuns(forecast(), plan, "f", { simulations: 50 });
    const reason = decision.reasons.clinical as string;
    expect(decision.clinical!.participants).toBe(662);
    expect(reason).toMatch(/^A clinical prediction model of a binary outcome needs at least 662 participants/);
    expect(reason).not.toMatch(/\bbut\b/);
    // Only a minimum reached after some runs can be out of the plan's limits, and then the reason
    // names exactly the limits the second run breaks.
    let ending = floors[floor].phrase;
    if (floor === "within") {
      const broken = [budget === "binding" ? "the budget" : "", deadline === "binding" ? "the deadline" : ""].filter(
        Boolean,
      );
      ending +=
        broken.length === 0 ? "." : `, more than ${broken.join(" and ")} allow${broken.length === 1 ? "s" : ""}.`;
    }
    expect(reason.endsWith(ending), reason).toBe(true);
    // The caution about an unaffordable minimum agrees with the reason.
    const unaffordable = floor === "never" || (floor === "within" && (budget === "binding" || deadline === "binding"));
    expect(
      (decision.cautions ?? []).some((c) => c.startsWith("No affordable number of runs reaches the minimum")),
    ).toBe(unaffordable);
  });
});

describe("the recommendation names only the limits the plan sets", () => {
  it.each(cases.filter(([, , floor]) => floor === "within"))("budget %s, deadline %s", (budget, deadline) => {
    const plan = planSchema.parse({
      samplesPerRun: 50,
      costPerRun: 1000,
      monthsPerRun: 1,
      maxRuns: 3,
      valuePerPoint: 1000,
      currentSamples: 600,
      budget: limits.budget[budget],
      deadlineMonths: limits.deadlineMonths[deadline],
    });
    const reason = weighRuns(forecast(), plan, "f", { simulations: 50 }).reasons.recommendedRuns;
    expect(reason.includes("budget")).toBe(budget !== "none");
    expect(reason.includes("deadline")).toBe(deadline !== "none");
  });
});
