import { describe, expect, it } from "vitest";
import { RandomStream } from "../../src/random.js";
import { binomialDraw, runYield, scaledYield, sizesToProject } from "../../src/weigh/yields.js";

/** The binomial probability mass function, from its definition (log-gamma free for small n). */
function binomialPmf(n: number, p: number, k: number): number {
  let logChoose = 0;
  for (let i = 1; i <= k; i++) logChoose += Math.log(n - k + i) - Math.log(i);
  return Math.exp(logChoose + k * Math.log(p) + (n - k) * Math.log(1 - p));
}

describe("binomialDraw (Devroye's second waiting-time method)", () => {
  it.each([
    [45, 0.8],
    [30, 0.1],
    [12, 0.5],
  ])("Binomial(%i, %f): frequencies match the probability mass function", (n, p) => {
    const draws = 40_000;
    const stream = new RandomStream(11, n);
    const counts = new Array<number>(n + 1).fill(0);
    let sum = 0;
    let sumSquares = 0;
    for (let i = 0; i < draws; i++) {
      const x = binomialDraw(n, p, stream);
      counts[x]++;
      sum += x;
      sumSquares += x * x;
    }
    const mean = sum / draws;
    const variance = sumSquares / draws - mean * mean;
    // Mean n·p within 5 standard errors (√(np(1−p)/draws)); variance np(1−p) within 5%.
    expect(Math.abs(mean - n * p)).toBeLessThan(5 * Math.sqrt((n * p * (1 - p)) / draws));
    expect(Math.abs(variance / (n * p * (1 - p)) - 1)).toBeLessThan(0.05);
    // Each frequency within 5 standard errors of its probability.
    for (let k = 0; k <= n; k++) {
      const q = binomialPmf(n, p, k);
      expect(Math.abs(counts[k] / draws - q)).toBeLessThan(5 * Math.sqrt((q * (1 - q)) / draws) + 1e-4);
    }
  });

  it("returns all or nothing at the edges", () => {
    const stream = new RandomStream(1);
    expect(binomialDraw(17, 1, stream)).toBe(17);
    expect(binomialDraw(17, 0, stream)).toBe(0);
    expect(binomialDraw(0, 0.4, stream)).toBe(0);
  });
});

describe("runYield", () => {
  it("draws every whole number of a range equally often", () => {
    const stream = new RandomStream(5);
    const counts = new Map<number, number>();
    for (let i = 0; i < 20_000; i++) {
      const y = runYield({ kind: "range", fewest: 40, most: 44, passRate: 1 }, stream);
      counts.set(y, (counts.get(y) ?? 0) + 1);
    }
    expect([...counts.keys()].sort((a, b) => a - b)).toEqual([40, 41, 42, 43, 44]);
    // 4,000 expected each; sd √(20000·0.2·0.8) ≈ 57; within 5 sd.
    for (const count of counts.values()) expect(Math.abs(count - 4000)).toBeLessThan(285);
  });
});

describe("sizesToProject", () => {
  it.each([
    // Fixed yield: today + k × 50.
    [{ kind: "fixed" as const, samples: 50 }, [100, 150, 200]],
    // Range [30, 50]: k × 30, 40 and 50.
    [{ kind: "range" as const, fewest: 30, most: 50, passRate: 1 }, [100, 130, 140, 150, 160, 180, 200]],
    // 50 collected, 80% pass: k × 0, 40 and 50.
    [{ kind: "thinned" as const, collected: 50, passRate: 0.8 }, [100, 140, 150, 180, 200]],
  ])("%j over 2 runs from 100 → %j", (model, sizes) => {
    expect(sizesToProject(model, 100, 2)).toEqual(sizes);
  });

  it("scales every sample count for the sensitivity", () => {
    expect(scaledYield({ kind: "range", fewest: 30, most: 50, passRate: 0.9 }, 1.25)).toEqual({
      kind: "range",
      fewest: 38,
      most: 63,
      passRate: 0.9,
    });
  });
});
