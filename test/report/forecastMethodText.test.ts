/**
 * The methods appendix's paragraph on the learned continuation: it states the numbers the forecast
 * used (from forecast.json's `continuation`) and which of the corpus's curves they were learned from.
 */
import { describe, expect, it } from "vitest";
import type { ForecastFile } from "../../src/forecast/forecastFile.js";
import { learnedForecastText } from "../../src/report/forecastMethodText.js";

function forecastWith(continuation: ForecastFile["continuation"], largestMeasuredSize = 800): ForecastFile {
  return { continuation, largestMeasuredSize } as ForecastFile;
}

const base = {
  ownWeight: 0,
  chordWeight: 0,
  slopeWeight: 0.5568,
  headroomWeight: 0.0602,
  spread: 1,
  smallestSize: 23,
  best: 1,
};

describe("learnedForecastText", () => {
  it("is absent when the forecast followed a family's own formula", () => {
    expect(learnedForecastText(forecastWith(undefined))).toBeUndefined();
  });

  it("gives the weights the forecast used", () => {
    const text = learnedForecastText(forecastWith({ ...base, learnedFrom: "forest" })) as string;
    expect(text).toContain("0.557 × its slope at L");
    expect(text).toContain("0.060 × the distance left");
    expect(text).toContain("multiplied by 1.");
    expect(text).not.toContain("normal error");
    // Terms with no weight are left out of the sentence.
    expect(text).not.toContain("0.000");
    expect(learnedForecastText(forecastWith({ ...base, chordWeight: 0.25, learnedFrom: null }))).toContain(
      "0.250 × its average rise",
    );
  });

  it("says how the distance left was counted, and nothing of it for an earlier file", () => {
    const text = learnedForecastText(forecastWith({ ...base, guessError: 0.75, learnedFrom: null })) as string;
    expect(text).toContain("the distance left to the metric's best value counted by 0.75 (one minus one over");
    expect(learnedForecastText(forecastWith({ ...base, learnedFrom: null }))).not.toContain("counted by");
  });

  it("gives the slope's and the distance left's weights at this curve's L, and how they depend on L", () => {
    // c = 200, L = 800: the slope counts 0.5568 × 0.8 = 0.445, the distance left 0.0602 × 0.2 = 0.012.
    const text = learnedForecastText(forecastWith({ ...base, reliabilitySize: 200, learnedFrom: null })) as string;
    expect(text).toContain("0.445 × its slope at L + 0.012 × the distance left");
    expect(text).toContain(
      "the slope counts 0.5568 × L / (L + 200) and the distance left 0.0602 × 200 / (L + 200), here with L = 800 (",
    );
    // At L = 200 they share the weight evenly.
    const small = learnedForecastText(forecastWith({ ...base, reliabilitySize: 200, learnedFrom: null }, 200));
    expect(small).toContain("0.278 × its slope at L + 0.030 × the distance left");
    // A file written before it took both whole, and says nothing of it.
    expect(learnedForecastText(forecastWith({ ...base, learnedFrom: null }))).not.toContain("L / (L +");
  });

  it("says how far the learned gain's own error widens the draws", () => {
    const text = learnedForecastText(
      forecastWith({ ...base, spread: 0, gainSpread: 0.01, learnedFrom: null }),
    ) as string;
    expect(text).toContain("a standard deviation of 0.01 per unit of ln(n / L)");
    expect(text).toContain("the families' backtest extrapolation errors are left out");
  });

  it.each([
    ["forest", "from its random forest curves"],
    ["logistic", "from its logistic regression curves"],
    [null, "as it holds no curves of this learner"],
  ] as const)("names the corpus curves it learned from (%s)", (learnedFrom, words) => {
    expect(learnedForecastText(forecastWith({ ...base, learnedFrom }))).toContain(words);
  });

  it("does not claim a learner for a file written before the continuation was learned per learner", () => {
    const text = learnedForecastText(forecastWith(base)) as string;
    expect(text).toContain("from its classification curves");
    expect(text).not.toContain("no curves of this learner");
  });
});
