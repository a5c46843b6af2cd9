/** The decision table as CSV for a spreadsheet (RFC 4180). */
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
 * The decision table as CSV for a spreadsheet, following RFC 4180: a header line, one line per row
 * (sorted by runs), CRLF line ends, fields quoted only when needed. Numbers are written in full
 * precision without separators, so a spreadsheet reads them as numbers; a missing value is an empty
 * field. The optional columns of later decision files (marginalGain, netValueLower, netValueUpper,
 * probabilityNetPositive, withinBudget, withinDeadline) follow when present, and a last column `recommended` says
 * which row the decision recommends.
 *
 * @example
 * decisionTableCsv(decision).split("\r\n")[0]
 * // → "runs,trainingSize,expected,lower,upper,probabilityOfTarget,cost,months,expectedNetValue,affordable,recommended"
 */
export function decisionTableCsv(decision: DecisionFile): string {
  const rows = sortedRows(decision) as Array<Row & Record<string, unknown>>;
  const optional = optionalCsvColumns.filter((column) => rows.some((row) => row[column] !== undefined));
  const header = [...csvColumns, ...optional, "recommended"].map(csvField).join(",");
  const lines = rows.map((row) =>
    [
      ...csvColumns.map((column) => csvField(row[column])),
      ...optional.map((column) => csvField(row[column] as number | boolean | undefined)),
      csvField(row.runs === decision.recommendedRuns),
    ].join(","),
  );
  return [header, ...lines].join("\r\n") + "\r\n";
}
