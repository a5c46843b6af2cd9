import { describe, expect, it } from "vitest";
import { clinicalSampleSize } from "../../src/weigh/clinicalSampleSize.js";
import { largestCoxSnellR2 } from "../../src/weigh/plan.js";

describe("Riley et al.'s minimum sample size for a binary outcome", () => {
  it("reproduces the worked example: p = 24, R²cs = 0.288, prevalence 0.174 → 662 participants, 115 events, 4.8 EPP", () => {
    // Inputs from memory of the worked example of Riley et al. (BMJ 2020, 368:m441). 662 participants
    // and 4.8 events per parameter agree with its abstract (from memory); 115 events is 662 × 0.174.
    const size = clinicalSampleSize({ predictorParameters: 24, anticipatedCoxSnellR2: 0.288, prevalence: 0.174 });
    expect(size.participants).toBe(662);
    expect(size.events).toBe(115);
    expect(size.eventsPerParameter).toBeCloseTo(4.8, 1);
    expect(size.binding).toBe("optimism");
    // Each criterion by hand from the formulas (computed here, to the unit):
    // (i) 24 / (−0.1 × ln(1 − 0.288/0.9)) = 622.3 → 623;
    // (iii) (1.96/0.05)² × 0.174 × 0.826 = 220.9 → 221.
    expect(size.criteria).toEqual({ shrinkage: 623, optimism: 662, precision: 221 });
    // S_δ = 0.288 / (0.288 + 0.05 × 0.6032) = 0.9052 (max R²cs for prevalence 0.174 is 0.60321).
    expect(size.optimismShrinkage).toBeCloseTo(0.9052, 4);
  });

  it.each([
    // max R²cs = 1 − exp(2(φ ln φ + (1 − φ) ln(1 − φ))); at φ = 0.5 it is 1 − 1/4 = 0.75 exactly.
    [0.5, 0.75],
    // At φ = 0.174, computed with the formula in Python: 0.603209.
    [0.174, 0.603209],
  ])("the largest Cox–Snell R² at prevalence %f is %f", (prevalence, largest) => {
    expect(largestCoxSnellR2(prevalence)).toBeCloseTo(largest, 5);
  });

  it("lets the precision of the overall risk bind when the model explains much with few parameters", () => {
    // p = 2, R²cs = 0.3, prevalence 0.5: (i) 2 / (0.1 × −ln(1 − 0.3/0.9)) = 49.3 → 50; (iii) 1536.6 × 0.25 = 384.2 → 385.
    const size = clinicalSampleSize({ predictorParameters: 2, anticipatedCoxSnellR2: 0.3, prevalence: 0.5 });
    expect(size.binding).toBe("precision");
    expect(size.participants).toBe(385);
    expect(size.criteria.shrinkage).toBe(50);
  });
});
