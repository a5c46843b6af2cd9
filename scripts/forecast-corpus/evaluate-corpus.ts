/**
 * The forecast evaluated on the corpus end to end: every pilot curve of fixtures/forecast-corpus is
 * forecast by `forecastCurve` itself, at every target from 2 to 16 times the pilot's rows, with the
 * calibration learned without its data set (fixtures/forecast-corpus/leave-one-out.json, written by
 * calibrate.ts --write), and compared with the truth measured on the whole data set.
 *
 *     npx tsx scripts/forecast-corpus/evaluate-corpus.ts [--corpus DIR] [--shipped | --uncalibrated]
 *                                                        [--only NAME,...] [--json FILE]
 *
 * `--shipped` uses the shipped calibration for every data set (not a fair check on the corpus: each
 * data set then informs its own forecast; the fair check on the held-out data sets, `--corpus
 * fixtures/forecast-holdout --shipped`), `--uncalibrated` the families' own extrapolation. Prints the tables of
 * cases.ts (`summaryTable`) for logistic regression, random forest and the numeric targets.
 */
import { readFileSync, writeFileSync } from "node:fs";
import { calibrationFor, shippedCalibrations, type CalibrationSet } from "../../src/forecast/gainCorrection.js";
import { readCorpus } from "./corpus.js";
import { corpusPilots, forecastPilot, summaryTable, type CaseResult } from "./cases.js";

const argv = process.argv.slice(2);
function option(name: string): string | undefined {
  const index = argv.indexOf(name);
  return index >= 0 ? argv[index + 1] : undefined;
}
const corpusDir = option("--corpus") ?? "fixtures/forecast-corpus";
const only = option("--only")?.split(",");
const uncalibrated = argv.includes("--uncalibrated");
const shipped = argv.includes("--shipped");
// A corpus forecast with the shipped or no calibration (the held-out one) needs no leave-one-out file.
const leaveOneOut = (
  uncalibrated || shipped ? {} : JSON.parse(readFileSync(`${corpusDir}/leave-one-out.json`, "utf8"))
) as Record<string, CalibrationSet | null>;
const started = performance.now();
const rows: CaseResult[] = [];
for (const pilot of corpusPilots(readCorpus(corpusDir))) {
  if (only !== undefined && !only.includes(pilot.dataSet)) continue;
  const set = uncalibrated ? null : shipped ? shippedCalibrations : leaveOneOut[pilot.dataSet];
  if (set === undefined) throw new Error(`no leave-one-out calibration for ${pilot.dataSet}`);
  rows.push(...forecastPilot(pilot, set === null ? null : calibrationFor(set, pilot.learner)));
}
const groups: [string, (r: CaseResult) => boolean][] = [
  ["logistic regression (accuracy)", (r) => r.learner === "logistic"],
  ["random forest (accuracy)", (r) => r.learner === "forest"],
  ["ridge and k-nearest neighbours (R²)", (r) => r.learner === "ridge" || r.learner === "knn-regression"],
];
for (const [label, keep] of groups) console.log(summaryTable(rows.filter(keep), `\n${label}`).join("\n"));
console.log(`\n${rows.length} cases in ${((performance.now() - started) / 1000).toFixed(0)} s`);
const jsonOut = option("--json");
if (jsonOut !== undefined) writeFileSync(jsonOut, JSON.stringify(rows) + "\n");
