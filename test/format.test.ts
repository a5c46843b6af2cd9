/**
 * Tests of the report's number and word formatting. Expected strings are worked by hand; the
 * formatting must not depend on the locale, so every case states the exact characters (the minus
 * sign is U+2212).
 */
import { describe, expect, it } from "vitest";
import {
  countInWords,
  formatChance,
  describeMetric,
  formatCount,
  formatExactScore,
  formatLevel,
  formatMoney,
  formatMonths,
  formatNumber,
  formatProbability,
  formatScore,
  moreRuns,
  scoreStyle,
} from "../src/format.js";

const accuracy = describeMetric("accuracy", true);
const logLoss = describeMetric("log_loss", false);

describe("numbers", () => {
  it.each<[number, number, string]>([
    [1234567.891, 2, "1,234,567.89"],
    [999.5, 0, "1,000"],
    [-12300, 0, "\u221212,300"],
    [-0.004, 2, "0.00"], // rounds to zero: no sign
    [0, 0, "0"],
    [123, 0, "123"],
    [1000, 0, "1,000"],
  ])("formatNumber(%d, %d) → %s", (value, decimals, text) => {
    expect(formatNumber(value, decimals)).toBe(text);
  });

  it.each<[number, string | undefined, string]>([
    [66000, "EUR", "66,000 EUR"],
    [1234.56, undefined, "1,235"],
    [12.5, "USD", "12.5 USD"],
    [0.1 + 0.2, undefined, "0.3"],
    [-12300, "EUR", "\u221212,300 EUR"],
  ])("formatMoney(%d, %s) → %s", (value, currency, text) => {
    expect(formatMoney(value, currency)).toBe(text);
  });

  it.each<[number, string]>([
    [1, "1 month"],
    [9, "9 months"],
    [1.5, "1.5 months"],
  ])("formatMonths(%d) → %s", (months, text) => {
    expect(formatMonths(months)).toBe(text);
  });

  it.each<[number, string]>([
    [0, "0%"],
    [0.004, "under 1%"],
    [0.42, "42%"],
    [0.996, "over 99%"],
    [1, "100%"],
  ])("formatProbability(%d) → %s", (probability, text) => {
    expect(formatProbability(probability)).toBe(text);
  });

  it.each<[number, string]>([
    [0.8, "80%"],
    [0.95, "95%"],
    [0.68, "68%"],
    [0.995, "99.5%"],
  ])("formatLevel(%d) → %s", (level, text) => {
    expect(formatLevel(level)).toBe(text);
  });

  it("formats counts", () => {
    expect(formatCount(29600.4)).toBe("29,600");
  });
});

describe("metrics in words", () => {
  it.each<[string, boolean, [number, number] | undefined, string, boolean]>([
    ["accuracy", true, undefined, "Accuracy", true], // range [0, 1] from src/curve/metrics.ts
    ["balanced_accuracy", true, [0, 1], "Balanced accuracy", true],
    ["log_loss", false, undefined, "Log loss", false],
    ["r2", true, [-Infinity, 1] as [number, number], "R²", false], // the label in src/curve/metrics.ts
  ])("describeMetric(%s)", (metric, higherIsBetter, range, title, isFraction) => {
    const info = describeMetric(metric, higherIsBetter, range);
    expect(info.title).toBe(title);
    expect(info.isFraction).toBe(isFraction);
    expect(info.higherIsBetter).toBe(higherIsBetter);
  });

  it.each<[number, number[], boolean, string]>([
    [0.8529, [0.8529], false, "85.3%"],
    [0.8529, [0.8529], true, "85%"],
  ])("accuracy %d → %s", (value, values, whole, text) => {
    expect(formatScore(value, scoreStyle(accuracy, values, whole))).toBe(text);
  });

  it.each<[number, number[], string]>([
    [0.16321, [0.16321, 0.2], "0.163"], // three significant digits of the largest, 0.2
    [123.44, [123.44], "123"],
    [2.5, [2.5, 12], "2.5"], // largest 12: one decimal
  ])("log loss %d among %j → %s", (value, values, text) => {
    expect(formatScore(value, scoreStyle(logLoss, values))).toBe(text);
  });

  it.each<[number, boolean, string]>([
    [0.85, true, "85%"],
    [0.855, true, "85.5%"],
    [0.8555, true, "85.55%"],
    [0.1234, false, "0.1234"],
    [2, false, "2"],
  ])("formatExactScore(%d) shows a target as given → %s", (value, fraction, text) => {
    expect(formatExactScore(value, fraction ? accuracy : logLoss)).toBe(text);
  });

  it.each<[number, string, string]>([
    [1, "one", "One more run"],
    [3, "three", "Three more runs"],
    [12, "12", "12 more runs"],
  ])("runs in words: %d", (runs, words, phrase) => {
    expect(countInWords(runs)).toBe(words);
    expect(moreRuns(runs)).toBe(phrase);
  });
});

describe("formatChance", () => {
  it.each<[number, number | undefined, string]>([
    [0.795, 0.8, "79.5%"], // short of the asked 80%: not rounded up to it
    [0.7999, 0.8, "79.9%"],
    [0.8, 0.8, "80%"],
    [0.83, 0.8, "83%"],
    [0.795, undefined, "80%"],
    [0.62, 0.8, "62%"],
  ])("%d against %s → %s", (probability, asked, text) => {
    expect(formatChance(probability, asked)).toBe(text);
  });
});
