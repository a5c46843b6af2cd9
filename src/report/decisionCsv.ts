/** The decision table as CSV for a spreadsheet (RFC 4180), its header in the reader's words. */
import { describeMetric, formatOdds } from "../format.js";
import type { DecisionFile } from "../weigh/decisionFile.js";
import { sortedRows, type Row } from "./reportWords.js";

/**
 * One CSV field after RFC 4180 §2 (rules 5–7): enclosed in double quotes when it holds a comma, a
 * double quote, CR or LF, with each double quote inside doubled; `null` is an empty field.
 *
 * @example
 * csvField('say "hi", then go') // → '"say ""hi"", then go"'
 */
export function csvField(value: string | number | boolean | null | undefined): string {
  const text = value === null || value === undefined ? "" : String(value);
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** Columns of the decision table as CSV, named as in decision.json. */
const csvColumns = [
  "runs",
  "trainingSize",
  "expected",
  "lower",
  "upper",
  "probabilityOfTarget",
  "cost",
  "months",
  "expectedNetValue",
  "affordable",
] as const;

/** Columns later versions of decision.json add; each is written when some row carries it. */
const optionalCsvColumns = [
  "marginalGain",
  "netValueLower",
  "netValueUpper",
  "probabilityNetPositive",
  "withinBudget",
  "withinDeadline",
] as const;

/**
 * Each column's heading in words, for a reader who opens the file in a spreadsheet (decision.json
 * keeps the keys); `odds` is the likely range's level in words ("8 in 10"), `score` the metric.
 */
function columnHeading(column: string, odds: string, score: string): string {
  const headings: Record<string, string> = {
    runs: "Further runs",
    trainingSize: "Training samples",
    expected: `Expected ${score}`,
    lower: `Likely range from (${odds})`,
    upper: `Likely range to (${odds})`,
    probabilityOfTarget: "Chance of reaching target",
    cost: "Cost",
    months: "Months",
    expectedNetValue: "Expected net value",
    affordable: "Within budget and deadline",
    marginalGain: "Gain from this run",
    netValueLower: `Net value likely from (${odds})`,
    netValueUpper: `Net value likely to (${odds})`,
    probabilityNetPositive: "Chance value exceeds cost",
    withinBudget: "Within budget",
    withinDeadline: "Within deadline",
    recommended: "Recommended",
  };
  return headings[column] ?? column;
}

/**
 * The decision table as CSV for a spreadsheet, following RFC 4180: a header line, one line per row
 * (sorted by runs), CRLF line ends, fields quoted only when needed. Numbers are written in full
 * precision without separators, so a spreadsheet reads them as numbers; a missing value is an empty
 * field. The optional columns of later decision files (marginalGain, netValueLower, netValueUpper,
 * probabilityNetPositive, withinBudget, withinDeadline) follow when present, and a last column says
 * which row the decision recommends. The header names each column in words (`columnHeading`); the
 * columns are decision.json's keys in this order.
 *
 * @example
 * decisionTableCsv(decision).split("\r\n")[0]
 * // → "Further runs,Training samples,Expected accuracy,Likely range from (8 in 10),…,Recommended"
 */
export function decisionTableCsv(decision: DecisionFile): string {
  const rows = sortedRows(decision) as Array<Row & Record<string, unknown>>;
  const optional = optionalCsvColumns.filter((column) => rows.some((row) => row[column] !== undefined));
  const odds = formatOdds(decision.level);
  const score = describeMetric(decision.metric, decision.higherIsBetter).inSentence;
  const header = [...csvColumns, ...optional, "recommended"]
    .map((column) => csvField(columnHeading(column, odds, score)))
    .join(",");
  const lines = rows.map((row) =>
    [
      ...csvColumns.map((column) => csvField(row[column])),
      ...optional.map((column) => csvField(row[column] as number | boolean | undefined)),
      csvField(row.runs === decision.recommendedRuns),
    ].join(","),
  );
  return [header, ...lines].join("\r\n") + "\r\n";
}
