/**
 * Samples further runs yield: fixed, uniform in a range, or thinned by a quality-control pass rate.
 *
 * For each forecast draw j the runs' yields are drawn once, run by run, so the training size after
 * k runs in draw j is today + (yield of run 1) + ... + (yield of run k): the k-run and (k+1)-run rows
 * of one draw share their first k runs, as they would in the world.
 */
import type { RandomStream } from "../random.js";
import type { YieldModel } from "./plan.js";

/**
 * A binomial draw: the number of successes in `trials` independent trials of probability `p`.
 *
 * Exact, by the second waiting-time method (Devroye 1986, "Non-Uniform Random Variate Generation",
 * X.4.3): successes are counted by geometric gaps between them, ⌈ln U / ln(1 − p)⌉, so the work is
 * proportional to the number of successes; for p > 1/2 the failures are counted instead.
 */
export function binomialDraw(trials: number, p: number, stream: RandomStream): number {
  if (p <= 0 || trials <= 0) return 0;
  if (p >= 1) return trials;
  if (p > 0.5) return trials - binomialDraw(trials, 1 - p, stream);
  const logQ = Math.log1p(-p);
  let successes = 0;
  let position = 0;
  for (;;) {
    // 1 − uniform() lies in (0, 1], so the logarithm is finite.
    position += Math.ceil(Math.log(1 - stream.uniform()) / logQ) || 1;
    if (position > trials) return successes;
    successes++;
  }
}

/** Samples one run yields in one draw of the world. */
export function runYield(model: YieldModel, stream: RandomStream): number {
  switch (model.kind) {
    case "fixed":
      return model.samples;
    case "thinned":
      return binomialDraw(model.collected, model.passRate, stream);
    case "range": {
      const collected = model.fewest + stream.integer(model.most - model.fewest + 1);
      return model.passRate === 1 ? collected : binomialDraw(collected, model.passRate, stream);
    }
  }
}

/** Whether the yield is a known number (no sampling needed). */
export function yieldIsFixed(model: YieldModel): boolean {
  return model.kind === "fixed";
}

/** Fewest, expected and most samples one run can yield. */
export function yieldBounds(model: YieldModel): { fewest: number; expected: number; most: number } {
  switch (model.kind) {
    case "fixed":
      return { fewest: model.samples, expected: model.samples, most: model.samples };
    case "thinned":
      return { fewest: 0, expected: model.collected * model.passRate, most: model.collected };
    case "range":
      return {
        fewest: model.passRate === 1 ? model.fewest : 0,
        expected: ((model.fewest + model.most) / 2) * model.passRate,
        most: model.most,
      };
  }
}

/** The yield model with every sample count scaled by `factor` (rounded, at least 1 at the top). */
export function scaledYield(model: YieldModel, factor: number): YieldModel {
  const scale = (n: number) => Math.round(n * factor);
  switch (model.kind) {
    case "fixed":
      return { kind: "fixed", samples: Math.max(1, scale(model.samples)) };
    case "thinned":
      return { ...model, collected: Math.max(1, scale(model.collected)) };
    case "range":
      return { ...model, fewest: scale(model.fewest), most: Math.max(1, scale(model.most)) };
  }
}

/**
 * Training sizes the forecast must project to: today + k × (fewest, expected rounded, most) samples
 * per run for k = 0..maxRuns (one size each when the yield is fixed), sorted, without repeats.
 * Between them the weighing interpolates in log(trainingSize).
 */
export function sizesToProject(model: YieldModel, today: number, maxRuns: number): number[] {
  const { fewest, expected, most } = yieldBounds(model);
  const perRun = [...new Set([fewest, Math.round(expected), most])];
  const sizes = new Set<number>();
  for (let runs = 0; runs <= maxRuns; runs++) for (const y of perRun) sizes.add(today + runs * y);
  return [...sizes].sort((a, b) => a - b);
}
