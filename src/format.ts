/**
 * Numbers and names in words for the report: counts with thousands separators, scores as percent
 * when the metric is a fraction, money with its currency, run counts in words.
 *
 * Everything here is deterministic and locale-free (no `toLocaleString`, whose output depends on the
 * ICU data Node was built with), so the same input gives byte-identical reports everywhere.
 */
import { findMetric } from "./curve/metrics.js";

/** The minus sign used in prose and tables (U+2212), which lines up with digits unlike "-". */
const minus = "\u2212";

/** Groups the digits of a non-negative integer string in threes with commas ("66000" → "66,000"). */
function groupThousands(digits: string): string {
  return digits.replace(/\B(?=(\d{3})+(?!\d))/g, ",");
}

/**
 * A number with a fixed number of decimals and comma thousands separators, with a true minus sign.
 * Values that round to zero print without a sign.
 */
export function formatNumber(value: number, decimals = 0): string {
  if (!Number.isFinite(value)) return String(value);
  const fixed = Math.abs(value).toFixed(decimals);
  const [whole, fraction] = fixed.split(".");
  const body = groupThousands(whole) + (fraction === undefined ? "" : "." + fraction);
  const isZero = Number(fixed) === 0;
  return (value < 0 && !isZero ? minus : "") + body;
}

/** A number to `digits` significant digits, without trailing zeros or separators: 0.912345 → "0.9123". */
export function formatSignificant(value: number, digits = 4): string {
  if (!Number.isFinite(value)) return String(value);
  return Number(value.toPrecision(digits)).toString();
}

/** A count of samples or rows: "66,000". */
export function formatCount(value: number): string {
  return formatNumber(Math.round(value), 0);
}

/**
 * An amount of money in whole units ("66,000 EUR", "−842"); only amounts under 100 that are not
 * whole keep up to two decimals without trailing zeros ("12.5 USD"), as a cost per sample can be.
 * The currency code or symbol follows when given.
 */
export function formatMoney(value: number, currency?: string): string {
  let text: string;
  if (Math.abs(value) >= 100 || Number.isInteger(value)) {
    text = formatNumber(value, 0);
  } else {
    text = formatNumber(value, 2).replace(/\.?0+$/, "");
  }
  return currency ? `${text} ${currency}` : text;
}

/** Calendar months: "9 months", "1 month", "1.5 months". */
export function formatMonths(months: number): string {
  const text = formatNumber(months, Number.isInteger(months) ? 0 : 1);
  return `${text} ${text === "1" ? "month" : "months"}`;
}

/** A probability in percent, saying "under 1%" and "over 99%" rather than rounding to 0% or 100%. */
export function formatProbability(probability: number): string {
  if (probability < 0.005) return probability <= 0 ? "0%" : "under 1%";
  if (probability > 0.995) return probability >= 1 ? "100%" : "over 99%";
  return `${Math.round(probability * 100)}%`;
}

/**
 * An interval's level as odds a lead reads at a glance: 0.8 → "8 in 10", 0.95 → "19 in 20",
 * 0.99 → "99 in 100" (the smallest of 10, 20, 100 and 1,000 that makes it whole; else a percentage).
 */
export function formatOdds(level: number): string {
  for (const out of [10, 20, 100, 1000]) {
    const hits = level * out;
    if (Math.abs(hits - Math.round(hits)) < 1e-9) return `${formatNumber(Math.round(hits))} in ${formatNumber(out)}`;
  }
  return formatLevel(level);
}

/** The text with its first letter in capitals. */
export function capitalize(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** The words for an interval of this level: "likely range (8 in 10)". */
export function likelyRange(level: number): string {
  return `likely range (${formatOdds(level)})`;
}

/**
 * The chance of reaching a target beside the chance the plan asks for: as `formatProbability`, but a
 * chance just short of the one asked is not rounded up to it (0.795 against 0.8 → "79.5%", not
 * "80%"), so that the page never shows the asked chance for a row that falls short of it.
 */
export function formatChance(probability: number, asked: number | undefined): string {
  const text = formatProbability(probability);
  if (asked === undefined || probability >= asked || text !== formatProbability(asked)) return text;
  return `${formatNumber(Math.floor(probability * 1000) / 10, 1)}%`;
}

/** An interval level as a percentage: 0.8 → "80%", 0.95 → "95%", 0.995 → "99.5%". */
export function formatLevel(level: number): string {
  const percent = level * 100;
  return `${formatNumber(percent, Number.isInteger(Math.round(percent * 10) / 10) ? 0 : 1)}%`;
}

/**
 * How scores of one metric are shown. `percent` when the metric is a fraction in [0, 1] (accuracy
 * 0.81 → "81%"); otherwise plain numbers with `decimals` chosen from the size of the values.
 */
export interface ScoreStyle {
  percent: boolean;
  /** Decimals after the point (of the percentage when `percent`). */
  decimals: number;
}

/** What the report needs to know about a metric: its name in words and whether it is a fraction. */
export interface MetricInfo {
  /** The metric in words, capitalized for an axis title or table heading ("Accuracy"). */
  title: string;
  /** The metric in words inside a sentence ("accuracy"). */
  inSentence: string;
  /** Whether scores are fractions in [0, 1] and shown as percent. */
  isFraction: boolean;
  higherIsBetter: boolean;
}

/**
 * Describes a metric from its name and, when known, its range. The words come from the metric's own
 * label in `src/curve/metrics.ts`; an unknown name ("balanced_accuracy") is spelled out by replacing
 * underscores and dashes with spaces. The metric counts as a fraction when its range is exactly
 * [0, 1].
 */
export function describeMetric(metric: string, higherIsBetter: boolean, metricRange?: [number, number]): MetricInfo {
  const known = findMetric(metric);
  const words = (known?.label ?? metric.replace(/[_-]+/g, " ").trim()) || "score";
  const range = metricRange ?? known?.range;
  return {
    title: words.charAt(0).toUpperCase() + words.slice(1),
    inSentence: words,
    isFraction: range !== undefined && range[0] === 0 && range[1] === 1,
    higherIsBetter,
  };
}

/**
 * The style for showing `values` of a metric so that values which differ visibly stay distinct:
 * percentages get one decimal unless `wholePercent` (headlines); plain numbers get three significant
 * digits of the largest magnitude.
 */
export function scoreStyle(info: MetricInfo, values: readonly number[], wholePercent = false): ScoreStyle {
  if (info.isFraction) return { percent: true, decimals: wholePercent ? 0 : 1 };
  const largest = Math.max(0, ...values.filter(Number.isFinite).map(Math.abs));
  const decimals = largest === 0 ? 2 : Math.min(6, Math.max(0, 2 - Math.floor(Math.log10(largest))));
  return { percent: false, decimals };
}

/** A score in the given style: 0.8123 → "81.2%" (percent, 1 decimal) or "0.812" (3 decimals). */
export function formatScore(value: number, style: ScoreStyle): string {
  return style.percent ? `${formatNumber(value * 100, style.decimals)}%` : formatNumber(value, style.decimals);
}

/**
 * A given score such as a target, with as many decimals as it needs (up to four) so that it is shown
 * as given: 0.85 → "85%", 0.855 → "85.5%", 0.1234 → "0.1234" (not a fraction).
 */
export function formatExactScore(value: number, info: MetricInfo): string {
  const scaled = info.isFraction ? value * 100 : value;
  let decimals = 0;
  while (decimals < 4 && Math.abs(Number(scaled.toFixed(decimals)) - scaled) > 1e-9) decimals++;
  return formatScore(value, { percent: info.isFraction, decimals });
}

const numberWords = ["no", "one", "two", "three", "four", "five", "six", "seven", "eight", "nine", "ten"];
const ordinalWords = [
  "zeroth",
  "first",
  "second",
  "third",
  "fourth",
  "fifth",
  "sixth",
  "seventh",
  "eighth",
  "ninth",
  "tenth",
];

/** A small count in words ("three"), larger ones as digits ("12"). */
export function countInWords(count: number): string {
  return Number.isInteger(count) && count >= 0 && count < numberWords.length ? numberWords[count] : formatCount(count);
}

/** "One more run", "Three more runs", "12 more runs" (capitalized for the start of a sentence). */
export function moreRuns(runs: number): string {
  const words = countInWords(runs);
  const phrase = `${words} more ${runs === 1 ? "run" : "runs"}`;
  return phrase.charAt(0).toUpperCase() + phrase.slice(1);
}

/** An ordinal in words up to ten ("third"), beyond as digits with the English suffix ("12th", "21st"). */
export function ordinalInWords(position: number): string {
  if (Number.isInteger(position) && position >= 0 && position < ordinalWords.length) return ordinalWords[position];
  const lastTwo = Math.abs(position) % 100;
  const last = Math.abs(position) % 10;
  const suffix =
    lastTwo >= 11 && lastTwo <= 13 ? "th" : last === 1 ? "st" : last === 2 ? "nd" : last === 3 ? "rd" : "th";
  return `${formatCount(position)}${suffix}`;
}
