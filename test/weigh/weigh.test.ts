import { describe, expect, it } from "vitest";
import type { ForecastFile, Projection } from "../../src/forecast/forecastFile.js";
import { decisionTableCsv } from "../../src/report/html.js";
import { planSchema, type PlanInput } from "../../src/weigh/plan.js";
import { wilsonLowerBound } from "../../src/weigh/validationSize.js";
import { sizesForForecast, weighRuns } from "../../src/weigh/weigh.js";

/** A forecast whose projections are given by hand: expected score and draws at each size. */
function forecast(
  projections: [number, number, number[]][],
  higherIsBetter = true,
  extra: Partial<ForecastFile> = {},
): ForecastFile {
  return {
    kind: "headroom-forecast",
    version: 1,
    metric: "accuracy",
    higherIsBetter,
    rows: 100,
    family: "pow3",
    parameters: {},
    measured: [],
    largestMeasuredSize: 80,
    level: 0.8,
    projections: projections.map(([trainingSize, expected, draws]): Projection => ({
      trainingSize,
      expected,
      lower: Math.min(...draws),
      upper: Math.max(...draws),
      level: 0.8,
      draws,
    })),
    band: [],
    warnings: [],
    seed: 0,
    ...extra,
  };
}

/** A forecast at the given sizes whose draw j is score(size, j), with `expected` the mean of the draws. */
function forecastFrom(sizes: number[], draws: number, score: (size: number, draw: number) => number, extra = {}) {
  return forecast(
    sizes.map((size) => {
      const values = Array.from({ length: draws }, (_, j) => score(size, j));
      return [size, values.reduce((a, b) => a + b, 0) / draws, values];
    }),
    true,
    { metricRange: [0, 1], ...extra },
  );
}

const projections: [number, number, number[]][] = [
  [100, 0.8, [0.78, 0.8, 0.82, 0.8]],
  [150, 0.85, [0.83, 0.85, 0.88, 0.84]],
  [200, 0.87, [0.84, 0.87, 0.9, 0.87]],
  [250, 0.88, [0.85, 0.88, 0.91, 0.9]],
];

describe("weighRuns", () => {
  it("computes cost, months and net value as valuePerPoint × 100 × gain − cost", () => {
    const plan = planSchema.parse({
      samplesPerRun: 50,
      costPerRun: 10000,
      monthsPerRun: 3,
      maxRuns: 3,
      valuePerPoint: 4000,
      target: 0.87,
    });
    const decision = weighRuns(forecast(projections), plan);
    expect(decision.table.map((r) => r.trainingSize)).toEqual([100, 150, 200, 250]);
    expect(decision.table.map((r) => r.cost)).toEqual([0, 10000, 20000, 30000]);
    expect(decision.table.map((r) => r.months)).toEqual([0, 3, 6, 9]);
    // Gains of 5, 7 and 8 points at 4000 a point, minus the cost.
    const net = decision.table.map((r) => r.expectedNetValue);
    [0, 10000, 8000, 2000].forEach((value, i) => expect(net[i]).toBeCloseTo(value, 6));
    expect(decision.recommendedRuns).toBe(1);
    // Share of draws at or above 0.87: 0, 1/4, 3/4, 3/4.
    expect(decision.table.map((r) => r.probabilityOfTarget)).toEqual([0, 0.25, 0.75, 0.75]);
    // Marginal gains of the expected score: 0.05, 0.02, 0.01.
    const gains = decision.table.map((r) => r.marginalGain as number);
    [0, 0.05, 0.02, 0.01].forEach((gain, i) => expect(gains[i]).toBeCloseTo(gain, 12));
    // Net value draw by draw, 400,000 × (draw − today's draw) − cost. Three runs: differences
    // 0.07, 0.08, 0.09, 0.10 give −2,000, 2,000, 6,000, 10,000; three of four are positive, and the
    // 80% interval is the 10% and 90% quantiles (Hyndman–Fan type 7): −800 and 8,800.
    expect(decision.table.map((r) => r.probabilityNetPositive)).toEqual([0, 1, 1, 0.75]);
    expect(decision.table[3].netValueLower).toBeCloseTo(-800, 6);
    expect(decision.table[3].netValueUpper).toBeCloseTo(8800, 6);
    // Stopping rule: run 1 adds 0.05 × 400,000 = 20,000 for 10,000; run 2 adds 8,000 for 10,000, and
    // runs 2 and 3 together 12,000 for 20,000: stop after 1.
    expect(decision.stopAfterRuns).toBe(1);
    expect(decision.reasons.stopAfterRuns).toBe(
      "Stop after 1 run: run 2 is expected to add a gain worth 8,000, less than the 10,000 it costs; no more runs would pay for themselves either.",
    );
    expect(decision.table.every((r) => r.withinDeadline)).toBe(true);
  });

  it("respects the budget and finds the runs that reach the target with the asked confidence", () => {
    const plan = planSchema.parse({
      samplesPerRun: 50,
      costPerRun: 1000,
      maxRuns: 3,
      valuePerPoint: 4000,
      budget: 2000,
      target: 0.87,
      targetConfidence: 0.7,
    });
    const decision = weighRuns(forecast(projections), plan);
    expect(decision.table.map((r) => r.affordable)).toEqual([true, true, true, false]);
    expect(decision.recommendedRuns).toBe(2);
    expect(decision.runsToTarget).toBe(2);
  });

  it("counts a fall in a lower-is-better metric as a gain", () => {
    const plan = planSchema.parse({ samplesPerRun: 50, costPerRun: 0, maxRuns: 1, valuePerPoint: 1000, target: 0.2 });
    const decision = weighRuns(
      forecast(
        [
          [100, 0.3, [0.3]],
          [150, 0.25, [0.19]],
        ],
        false,
      ),
      plan,
    );
    expect(decision.table[1].expectedNetValue).toBeCloseTo(5000, 6);
    expect(decision.table[1].probabilityOfTarget).toBe(1);
  });

  it("names the training sizes the forecast lacks", () => {
    const plan = planSchema.parse({ samplesPerRun: 60, costPerRun: 1, maxRuns: 2, valuePerPoint: 1 });
    expect(() => weighRuns(forecast(projections), plan, "f.json")).toThrow(
      "f.json: the forecast has no projection at training sizes 160, 220 and, written by an earlier version, keeps no curves to compute them; rerun headroom forecast on the same curve (or add --at 100,160,220)",
    );
  });
});

describe("parallel runs, fixed cost and deadline", () => {
  it("keeps going past a first run that does not pay for its fixed cost when later runs do", () => {
    // Gains of 5, 2 and 1 points at 4,000 a point: 20,000, 8,000 and 4,000. The first run costs
    // 6,000 + 15,000 fixed = 21,000 > 20,000, but two runs add 28,000 for 27,000. A rule that looked
    // one run ahead would stop now while recommending 2 runs.
    const plan = planSchema.parse({
      samplesPerRun: 50,
      costPerRun: 6000,
      fixedCost: 15000,
      maxRuns: 3,
      valuePerPoint: 4000,
    });
    const decision = weighRuns(forecast(projections), plan);
    expect(decision.table.map((r) => r.cost)).toEqual([0, 21000, 27000, 33000]);
    const net = decision.table.map((r) => r.expectedNetValue);
    [0, -1000, 1000, -1000].forEach((value, i) => expect(net[i]).toBeCloseTo(value, 6));
    expect(decision.recommendedRuns).toBe(2);
    // After 2 runs, run 3 adds 4,000 for 6,000: stop there.
    expect(decision.stopAfterRuns).toBe(2);
    expect(decision.reasons.stopAfterRuns).toBe(
      "Stop after 2 runs: run 3 is expected to add a gain worth 4,000, less than the 6,000 it costs.",
    );
  });

  it("counts months as ceil(runs / parallelRuns) × monthsPerRun, the fixed cost once, and respects the deadline", () => {
    const plan = planSchema.parse({
      samplesPerRun: 50,
      costPerRun: 1000,
      fixedCost: 5000,
      monthsPerRun: 3,
      parallelRuns: 2,
      deadlineMonths: 3,
      maxRuns: 3,
      valuePerPoint: 4000,
    });
    const decision = weighRuns(forecast(projections), plan);
    expect(decision.table.map((r) => r.months)).toEqual([0, 3, 3, 6]);
    expect(decision.table.map((r) => r.cost)).toEqual([0, 6000, 7000, 8000]);
    expect(decision.table.map((r) => r.withinDeadline)).toEqual([true, true, true, false]);
    expect(decision.table.map((r) => r.affordable)).toEqual([true, true, true, false]);
    // Net values 20,000 − 6,000, 28,000 − 7,000, (32,000 − 8,000 past the deadline).
    expect(decision.recommendedRuns).toBe(2);
    expect(decision.stopAfterRuns).toBe(2);
    expect(decision.reasons.stopAfterRuns).toBe("Stop after 2 runs: run 3 would end after the deadline.");
    expect(decision.reasons.recommendedRuns).toBe(
      "2 further runs give the highest expected net value (21,000) among the runs the deadline allows.",
    );
  });
});

describe("uncertain yields", () => {
  // Curves linear in log(size), s(n) = 0.5 + 0.05·ln(n), so interpolation in log(size) between the
  // projections is exact and every probability follows from the yield's distribution alone.
  const score = (size: number) => 0.5 + 0.05 * Math.log(size);
  const draws = 4000;

  it("draws a uniform yield in the range: P(target) = P(yield ≥ 45) = 6/21 after one run", () => {
    const plan = planSchema.parse({
      samplesPerRunRange: [30, 50],
      costPerRun: 100,
      maxRuns: 2,
      valuePerPoint: 1000,
      target: score(145),
    });
    const f = forecastFrom(sizesForForecast(plan, 100).all, draws, score, { rows: 100 });
    const decision = weighRuns(f, plan);
    expect(decision.table.map((r) => r.trainingSize)).toEqual([100, 140, 180]);
    // 4,000 draws: standard error √(0.286 × 0.714 / 4000) = 0.007; tolerance 0.03.
    expect(Math.abs((decision.table[1].probabilityOfTarget as number) - 6 / 21)).toBeLessThan(0.03);
    // E[s(100 + Y)] over the 21 equally likely yields, within 0.001.
    const exact = Array.from({ length: 21 }, (_, i) => score(130 + i)).reduce((a, b) => a + b, 0) / 21;
    expect(Math.abs(decision.table[1].expected - exact)).toBeLessThan(0.001);
    // The 80% interval: the 10% and 90% quantiles of s(100 + Y), near s(132) and s(148).
    expect(Math.abs(decision.table[1].lower - score(132))).toBeLessThan(0.05 * Math.log(134 / 132));
    expect(Math.abs(decision.table[1].upper - score(148))).toBeLessThan(0.05 * Math.log(150 / 148));
    expect(decision.expectedYieldPerRun).toBe(40);
    expect(decision.plan.samplesPerRun).toBe(40);
  });

  it("thins by the pass rate: P(target) = P(Binomial(50, 0.8) ≥ 40) after one run", () => {
    const plan = planSchema.parse({
      samplesPerRun: 50,
      passRate: 0.8,
      costPerRun: 100,
      maxRuns: 1,
      valuePerPoint: 1000,
      target: score(140),
    });
    const f = forecastFrom(sizesForForecast(plan, 100).all, draws, score, { rows: 100 });
    const decision = weighRuns(f, plan);
    // P(X ≥ 40) for X ~ Binomial(50, 0.8), summed from the probability mass function.
    let exact = 0;
    for (let k = 40; k <= 50; k++) {
      let logChoose = 0;
      for (let i = 1; i <= k; i++) logChoose += Math.log(50 - k + i) - Math.log(i);
      exact += Math.exp(logChoose + k * Math.log(0.8) + (50 - k) * Math.log(0.2));
    }
    expect(Math.abs((decision.table[1].probabilityOfTarget as number) - exact)).toBeLessThan(0.03);
    expect(decision.table[1].trainingSize).toBe(140);
  });

  it("names the sizes an uncertain yield needs", () => {
    const plan = planSchema.parse({ samplesPerRunRange: [30, 50], costPerRun: 1, maxRuns: 1, valuePerPoint: 1 });
    expect(() => weighRuns(forecast(projections), plan, "f.json")).toThrow(
      "f.json: the forecast has no projection at training sizes 130, 140 and, written by an earlier version, keeps no curves to compute them; rerun headroom forecast on the same curve (or add --at 100,130,140,150)",
    );
  });
});

describe("the value of a pilot (expected value of sample information)", () => {
  it("is the value of perfect information when the pilot's score tells the two curves apart", () => {
    // Half the draws keep rising (0.80, 0.85, 0.90 at 1,000, 2,000, 3,000 samples), half stay at 0.80.
    // Going on from 1 to 2 runs pays 400,000 × 0.05 − 12,000 = 8,000 on a rising curve and −12,000 on a
    // flat one: −2,000 on average, so today one would stop. The pilot's score at 2,000 samples tells
    // them apart (0.85 against 0.80, noise √(0.8·0.2/2000) = 0.009), so one goes on exactly when the
    // curve rises: EVSI = ½ × 8,000 = 4,000 (computed by hand).
    const rising = (size: number) => 0.8 + 0.05 * (size / 1000 - 1);
    const f = forecastFrom([1000, 2000, 3000], 200, (size, j) => (j % 2 === 0 ? rising(size) : 0.8), { rows: 1000 });
    const plan = planSchema.parse({ samplesPerRun: 1000, costPerRun: 12000, maxRuns: 2, valuePerPoint: 4000 });
    const information = weighRuns(f, plan).valueOfInformation!;
    expect(information.programmeRuns).toBe(2);
    expect(information.pilots).toHaveLength(1);
    const pilot = information.pilots[0];
    expect(pilot.goOnNow).toBe(false);
    expect(Math.abs(pilot.evsi - 4000)).toBeLessThan(100);
    expect(pilot.observationSd).toBeCloseTo(Math.sqrt((0.825 * 0.175) / 2000), 10);
    // Commit now: ½(40,000 − 24,000) + ½(−24,000) = −4,000; the staged plan: one run (½ × 8,000 −
    // ½ × 12,000 = −2,000), then go on only on a rising curve (+4,000): 2,000.
    expect(information.commitValue).toBeCloseTo(-4000, 6);
    expect(Math.abs(pilot.stagedValue - 2000)).toBeLessThan(100);
  });

  it("is absent when no money is put on a point", () => {
    const plan = planSchema.parse({ samplesPerRun: 50, costPerRun: 1000, maxRuns: 3, target: 0.87 });
    expect(weighRuns(forecast(projections), plan).valueOfInformation).toBeNull();
  });
});

describe("target-only plans", () => {
  it("recommend the fewest affordable runs that reach the target with the asked confidence", () => {
    const plan = planSchema.parse({
      samplesPerRun: 50,
      costPerRun: 1000,
      maxRuns: 3,
      target: 0.87,
      targetConfidence: 0.7,
    });
    const decision = weighRuns(forecast(projections), plan);
    // P(target) = 0, 0.25, 0.75, 0.75 (as above): two runs.
    expect(decision.recommendedRuns).toBe(2);
    expect(decision.valueBasis).toBe("target");
    expect(decision.plan.valuePerPoint).toBe(0);
    expect(decision.stopAfterRuns).toBeNull();
    expect(decision.reasons.recommendedRuns).toBe(
      "2 further runs are the fewest that reach the target with at least 70% probability.",
    );
  });
});

describe("sensitivity of the recommendation to ±25%", () => {
  // Expected 0.80, 0.84, 0.87, 0.88 at 100..250; at 4,000 a point and 10,000 a run the net values are
  // 6,000, 8,000 and 2,000: two runs.
  const rows: [number, number, number[]][] = [
    [100, 0.8, [0.8]],
    [150, 0.84, [0.84]],
    [200, 0.87, [0.87]],
    [250, 0.88, [0.88]],
  ];
  const plan = planSchema.parse({ samplesPerRun: 50, costPerRun: 10000, maxRuns: 3, valuePerPoint: 4000 });
  const decision = weighRuns(forecast(rows, true, { parameters: { a: 0.9 } }), plan);
  const entry = (factor: string) => decision.sensitivity!.find((e) => e.factor === factor)!;

  it.each([
    // Net values by hand, 400,000 × gain − cost (or the changed value and cost):
    // cost 7,500: 8,500, 13,000, 9,500 → 2 runs; cost 12,500: 3,500, 3,000, −5,500 → 1 run.
    ["costPerRun", 7500, 2, 13000, 12500, 1, 3500],
    // 3,000 a point: 2,000, 1,000, −6,000 → 1 run; 5,000 a point: 10,000, 15,000, 10,000 → 2 runs.
    ["valuePerPoint", 3000, 1, 2000, 5000, 2, 15000],
    // Gains × 0.75 or × 1.25: the same as the value of a point; the asymptote 0.8 + 0.75 × 0.1 = 0.875
    // and 0.8 + 1.25 × 0.1 = 0.925.
    ["asymptote", 0.875, 1, 2000, 0.925, 2, 15000],
  ])(
    "%s: low %f → %i runs (%f), high %f → %i runs (%f)",
    (factor, lowValue, lowRuns, lowNet, highValue, highRuns, highNet) => {
      const e = entry(factor as string);
      expect(e.low!.value).toBeCloseTo(lowValue as number, 10);
      expect(e.low!.recommendedRuns).toBe(lowRuns);
      expect(e.low!.netValue).toBeCloseTo(lowNet as number, 6);
      expect(e.high!.value).toBeCloseTo(highValue as number, 10);
      expect(e.high!.recommendedRuns).toBe(highRuns);
      expect(e.high!.netValue).toBeCloseTo(highNet as number, 6);
    },
  );

  it("reads a lower yield between the projections in log(size), and says when a higher one lies beyond them", () => {
    // 38 samples a run: sizes 138, 176, 214, interpolated linearly in log(size) between the projections.
    const at = (size: number, [n0, s0]: [number, number], [n1, s1]: [number, number]) =>
      s0 + ((s1 - s0) * Math.log(size / n0)) / Math.log(n1 / n0);
    const nets = [
      400000 * (at(138, [100, 0.8], [150, 0.84]) - 0.8) - 10000,
      400000 * (at(176, [150, 0.84], [200, 0.87]) - 0.8) - 20000,
      400000 * (at(214, [200, 0.87], [250, 0.88]) - 0.8) - 30000,
    ];
    const e = entry("samplesPerRun");
    expect(e.low!.value).toBe(38);
    expect(e.low!.recommendedRuns).toBe(1);
    expect(e.low!.netValue).toBeCloseTo(nets[0], 6);
    expect(nets[0]).toBeGreaterThan(Math.max(nets[1], nets[2]));
    // 63 samples a run reach 289, beyond the largest projection (250).
    expect(e.high).toBeNull();
    expect(e.note).toContain("289");
  });
});

describe("validation-set size, clinical minimum and cautions", () => {
  const plan: PlanInput = { samplesPerRun: 50, costPerRun: 1000, maxRuns: 3, valuePerPoint: 4000, target: 0.8 };

  it("asks how many held-out samples support the target with the recommended model", () => {
    // Expected 0.88 after the recommended 3 runs (costs are low) against a target of 0.80.
    const decision = weighRuns(forecast(projections), planSchema.parse(plan));
    const validation = decision.validation!;
    expect(validation.runs).toBe(decision.recommendedRuns);
    expect(validation.expectedScore).toBe(decision.table[decision.recommendedRuns].expected);
    const n = validation.heldOutNeeded!;
    expect(wilsonLowerBound(validation.expectedScore, n)).toBeGreaterThan(0.8);
    expect(wilsonLowerBound(validation.expectedScore, n - 1)).toBeLessThanOrEqual(0.8);
    expect(validation.context).toContain("75 to 100 test samples");
  });

  it("has no validation size for a lower-is-better metric", () => {
    const decision = weighRuns(
      forecast(
        [
          [100, 0.3, [0.3]],
          [150, 0.25, [0.19]],
        ],
        false,
      ),
      planSchema.parse({ samplesPerRun: 50, costPerRun: 0, maxRuns: 1, valuePerPoint: 1000, target: 0.2 }),
    );
    expect(decision.validation).toBeNull();
  });

  it("keeps the recommendation at or above Riley et al.'s minimum and says which criterion binds", () => {
    // 662 participants for p = 24, R²cs = 0.288, prevalence 0.174 (see clinicalSampleSize.test.ts).
    // Today 600; 50 a run: 650, 700, 750. Net value alone would choose 1 run (0.85 − 0.80 at 4,000 a
    // point, 20,000 − 15,000 a run), but 1 run stays below 662.
    const sizes: [number, number, number[]][] = [
      [600, 0.8, [0.8]],
      [650, 0.85, [0.85]],
      [700, 0.86, [0.86]],
      [750, 0.865, [0.865]],
    ];
    const decision = weighRuns(
      forecast(sizes, true, { rows: 600 }),
      planSchema.parse({
        samplesPerRun: 50,
        costPerRun: 15000,
        maxRuns: 3,
        valuePerPoint: 4000,
        clinical: { predictorParameters: 24, anticipatedCoxSnellR2: 0.288, prevalence: 0.174 },
      }),
    );
    expect(decision.clinical!.participants).toBe(662);
    expect(decision.clinical!.binding).toBe("optimism");
    expect(decision.clinical!.runsToMinimum).toBe(2);
    expect(decision.recommendedRuns).toBe(2);
    expect(decision.reasons.recommendedRuns).toContain("minimum of 662 participants");
    expect(decision.reasons.clinical).toContain("an optimism of at most 0.05 in Nagelkerke's R²");
    expect(decision.cautions!.join(" ")).toContain("Projections are not validation");
  });

  it.each([
    [{}, undefined, false],
    [{ domain: "research" }, undefined, false],
    [{ domain: "clinical" }, undefined, true],
    [{}, "public-health", true],
    [{}, "safety", true],
  ])("plan %j, study domain %s: caution about decisions on people: %s", (extra, domain, cautioned) => {
    const decision = weighRuns(forecast(projections), planSchema.parse({ ...plan, ...extra }), "f", { domain });
    const text = (decision.cautions ?? []).join(" ");
    expect(text.includes("licensed professional practice")).toBe(cautioned);
  });
});

describe("the decision as CSV (RFC 4180, via the report's decisionTableCsv)", () => {
  it("carries the new columns", () => {
    const plan = planSchema.parse({ samplesPerRun: 50, costPerRun: 10000, maxRuns: 3, valuePerPoint: 4000 });
    const lines = decisionTableCsv(weighRuns(forecast(projections), plan)).split("\r\n");
    const header = lines[0].split(",");
    for (const column of [
      "Gain from this run",
      "Net value likely from (8 in 10)",
      "Net value likely to (8 in 10)",
      "Chance value exceeds cost",
      "Within deadline",
    ]) {
      expect(header).toContain(column);
    }
    // Three runs: P(net value > 0) = 3/4 (first test above).
    expect(lines[4].split(",")[header.indexOf("Chance value exceeds cost")]).toBe("0.75");
    expect(lines[4].split(",")[header.indexOf("Further runs")]).toBe("3");
  });
});
