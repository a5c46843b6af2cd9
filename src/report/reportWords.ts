/**
 * The page's shared words and its headline: the metric in words, costs and times, gains in points,
 * and the one-sentence headline a lead reads first. The decision's own reasons come from
 * src/weigh/decisionWords.ts; these sentences say what the numbers mean for the page.
 */
import { beyondLimitsTag } from "../weigh/decisionWords.js";
import type { ForecastFile, Projection } from "../forecast/forecastFile.js";
import type { DecisionFile, DecisionRow } from "../weigh/decisionFile.js";
import {
  capitalize,
  formatChance,
  countInWords,
  describeMetric,
  formatCount,
  formatExactScore,
  formatMoney,
  formatMonths,
  formatNumber,
  formatProbability,
  formatScore,
  moreRuns,
  ordinalInWords,
  scoreStyle,
  type MetricInfo,
  type ScoreStyle,
} from "../format.js";
import type { ReportInput } from "./reportInput.js";

/** A decision row. */
export type Row = DecisionRow;

/** The report's metric in words, with its direction and whether it is a fraction. */
export function metricOf(input: ReportInput): MetricInfo {
  const { forecast, curve } = input;
  return describeMetric(forecast.metric, forecast.higherIsBetter, forecast.metricRange ?? curve.metricRange);
}

/**
 * Headline style: whole percent, or one decimal when whole percent would show two numbers the
 * sentence contrasts as equal though they differ (the score before and after, or the expected score
 * and an end of its interval). `pairs` lists the numbers contrasted.
 */
export function headlineStyle(info: MetricInfo, pairs: ReadonlyArray<readonly [number, number]>): ScoreStyle {
  const values = pairs.flat();
  const whole = scoreStyle(info, values, true);
  const text = (v: number) => formatScore(v, whole);
  const collides = pairs.some(([a, b]) => a !== b && text(a) === text(b));
  return collides ? scoreStyle(info, values, false) : whole;
}

export function sortedRows(decision: DecisionFile): Row[] {
  return [...decision.table].sort((a, b) => a.runs - b.runs);
}

/** "66,000 EUR, 9 months" (months left out when runs take no calendar time). */
export function costAndTime(row: DecisionRow, currency?: string): string {
  const cost = formatMoney(row.cost, currency);
  return row.months > 0 ? `${cost}, ${formatMonths(row.months)}` : cost;
}

/** The change of the score in words: "lift accuracy from 81% to 86%", or "keep ... at about 81%". */
export function changeInWords(info: MetricInfo, from: string, to: string, improves: boolean): string {
  if (from === to) return `keep ${info.inSentence} at about ${from}`;
  if (improves) return `${info.higherIsBetter ? "lift" : "lower"} ${info.inSentence} from ${from} to ${to}`;
  return `change ${info.inSentence} from ${from} to ${to}`;
}

/**
 * What one more run adds, in words: "under half a point", "about 1.5 points" (percentage points of
 * a fraction metric), "a further 0.004" (other metrics), "nothing more" when it does not improve.
 *
 * @param gain the improvement in the metric's units, positive when the score gets better
 */
export function gainInWords(gain: number, info: MetricInfo): string {
  if (!(gain > 0)) return "nothing more";
  if (!info.isFraction) return `a further ${formatScore(gain, scoreStyle(info, [gain])).replace(/(\.\d*?)0+$/, "$1")}`;
  const points = 100 * gain;
  if (points < 0.05) return "almost nothing";
  if (points < 0.5) return "under half a point";
  const text = formatNumber(points, points < 10 ? 1 : 0).replace(/\.0$/, "");
  return `about ${text} ${text === "1" ? "point" : "points"}`;
}

/** The improvement from row `a` to row `b`, positive when the score gets better. */
export function improvement(info: MetricInfo, a: DecisionRow, b: DecisionRow): number {
  return info.higherIsBetter ? b.expected - a.expected : a.expected - b.expected;
}

/** The projection at the largest projected size (or the end of the band when there are none). */
export function largestProjection(
  forecast: ForecastFile,
): Pick<Projection, "trainingSize" | "expected" | "lower" | "upper"> | undefined {
  const candidates = forecast.projections.length > 0 ? forecast.projections : forecast.band;
  return candidates.reduce<(typeof candidates)[number] | undefined>(
    (best, p) => (best === undefined || p.trainingSize > best.trainingSize ? p : best),
    undefined,
  );
}

/**
 * The report's headline: one plain-language sentence (or two) saying what further runs are expected
 * to buy, in the reader's terms (runs, money, months, the score in percent, rounded to whole percent
 * unless that would hide the difference).
 *
 * With a decision: what the recommended number of runs costs and is expected to do to the score,
 * where the expected score likely lies (the forecast's central interval), what one run more would
 * add, and how the chance of reaching the target stands. Without one: the projection at the largest
 * projected size against the score measured at the largest measured size.
 *
 * The text is plain (not HTML); escape it before placing it in a page.
 *
 * @example
 * headline(input)
 * // → "Two more runs (44,000 EUR, 6 months) are expected to lift accuracy from 84% to 85% (likely
 * //    between 84% and 87%); a third would add under half a point. ..."
 */
export function headline(input: ReportInput): string {
  const info = metricOf(input);
  const { decision, forecast, currency } = input;
  if (decision && decision.table.length > 0) {
    const rows = sortedRows(decision);
    const now = rows.find((row) => row.runs === 0) ?? rows[0];
    const chosen = rows.find((row) => row.runs === decision.recommendedRuns) ?? now;
    const target = decision.plan.target;
    const sentences: string[] = [];
    if (chosen.runs > now.runs) {
      const style = headlineStyle(info, [
        [now.expected, chosen.expected],
        [chosen.expected, chosen.lower],
        [chosen.expected, chosen.upper],
      ]);
      const score = (v: number) => formatScore(v, style);
      const improves = improvement(info, now, chosen) > 0;
      let sentence =
        `${moreRuns(chosen.runs)} (${costAndTime(chosen, currency)}) ${chosen.runs === 1 ? "is" : "are"} expected to ` +
        `${changeInWords(info, score(now.expected), score(chosen.expected), improves)} ` +
        `(likely between ${score(chosen.lower)} and ${score(chosen.upper)})`;
      const next = rows.find((row) => row.runs === chosen.runs + 1);
      if (next)
        sentence += `; a ${ordinalInWords(next.runs)} would add ${gainInWords(improvement(info, chosen, next), info)}`;
      sentences.push(sentence + ".");
      if (target !== undefined && now.probabilityOfTarget !== null && chosen.probabilityOfTarget !== null) {
        const before = formatChance(now.probabilityOfTarget, decision.plan.targetConfidence);
        const after = formatChance(chosen.probabilityOfTarget, decision.plan.targetConfidence);
        if (before !== after) {
          sentences.push(
            `The chance of reaching the target of ${formatExactScore(target, info)} goes from ${before} to ${after}.`,
          );
        }
      }
    } else {
      const next = rows.find((row) => row.runs > now.runs);
      const style = headlineStyle(info, [
        [now.expected, now.lower],
        [now.expected, now.upper],
      ]);
      const score = (v: number) => formatScore(v, style);
      let sentence =
        `No further run is recommended: with today's ${formatCount(now.trainingSize)} samples, ` +
        `${info.inSentence} is expected to be ${score(now.expected)} ` +
        `(likely between ${score(now.lower)} and ${score(now.upper)})`;
      if (next) {
        sentence +=
          `, and ${countInWords(next.runs)} more ${next.runs === 1 ? "run" : "runs"} (${costAndTime(next, currency)}) ` +
          `would add ${gainInWords(improvement(info, now, next), info)}`;
      }
      sentences.push(sentence + ".");
    }
    if (target !== undefined) sentences.push(targetSentence(info, decision, target, rows, currency));
    return sentences.join(" ");
  }

  const projection = largestProjection(forecast);
  const measured = forecast.measured.reduce<ForecastFile["measured"][number] | undefined>(
    (best, m) => (best === undefined || m.trainingSize > best.trainingSize ? m : best),
    undefined,
  );
  if (!projection) return `${capitalize(info.inSentence)} was measured; no projection was made.`;
  const style = headlineStyle(info, [
    [measured?.mean ?? projection.expected, projection.expected],
    [projection.expected, projection.lower],
    [projection.expected, projection.upper],
  ]);
  const score = (v: number) => formatScore(v, style);
  let sentence =
    `At ${formatCount(projection.trainingSize)} training samples, ${info.inSentence} is projected to be ` +
    `${score(projection.expected)} (likely between ${score(projection.lower)} and ${score(projection.upper)})`;
  if (measured) {
    sentence += `, against ${score(measured.mean)} measured at ${formatCount(measured.trainingSize)} samples`;
  }
  return sentence + ".";
}

/** The last headline sentence: how many runs reach the target with the confidence the plan asks. */
function targetSentence(
  info: MetricInfo,
  decision: DecisionFile,
  target: number,
  rows: DecisionRow[],
  currency?: string,
): string {
  const targetText = formatExactScore(target, info);
  const confidence = formatProbability(decision.plan.targetConfidence);
  if (decision.runsToTarget === null) {
    const most = rows[rows.length - 1]?.runs ?? 0;
    return `No number of runs up to ${formatCount(most)} reaches the target of ${targetText} with ${confidence} confidence.`;
  }
  if (decision.runsToTarget === 0) {
    return `The target of ${targetText} is already reached with ${confidence} confidence.`;
  }
  const row = rows.find((r) => r.runs === decision.runsToTarget);
  const cost = row ? ` (${costAndTime(row, currency)}${row.affordable ? "" : `, ${beyondLimitsTag(row)}`})` : "";
  const runs = `${countInWords(decision.runsToTarget)} ${decision.runsToTarget === 1 ? "run" : "runs"}`;
  return `Reaching the target of ${targetText} with ${confidence} confidence takes ${runs}${cost}.`;
}
