/**
 * Runs a whole study: measure, forecast at the sizes the plan reaches, weigh, report.
 *
 * Phases: read and check the study file; measure the curve; forecast at today's size and after each
 * further run; weigh the runs; render the report; write every output (each atomically, only once all
 * of them have been computed, so a failure leaves earlier outputs as they were).
 */
import { dirname, join, resolve } from "node:path";
import type { CurveFile } from "../curve/curveFile.js";
import type { ForecastFile } from "../forecast/forecastFile.js";
import { forecastCurve } from "../forecast/forecast.js";
import { readJsonFile, toJson, writeFileAtomic } from "../io/files.js";
import { validate } from "../io/validate.js";
import { measureFile } from "../pipeline.js";
import { decisionTableCsv, renderReportHtml } from "../report/html.js";
import type { DecisionFile } from "../weigh/decisionFile.js";
import { weighRuns } from "../weigh/weigh.js";
import { toolVersion } from "../version.js";
import { studySchema, type Study } from "./studyFile.js";

export interface StudyRunOptions {
  /** Folder for the outputs. */
  outDir: string;
  /** @default 1 */
  workers?: number;
  onProgress?: (done: number, total: number) => void;
  /** The command line that started the run, for the report's reproducibility footer. */
  command?: string;
}

export interface StudyResult {
  study: Study;
  curve: CurveFile;
  forecast: ForecastFile;
  decision: DecisionFile;
  /** Paths written, in order. */
  written: string[];
}

export async function runStudy(studyFile: string, options: StudyRunOptions): Promise<StudyResult> {
  const study = validate(studySchema, readJsonFile(studyFile), studyFile);
  const dataFile = resolve(dirname(studyFile), study.data);

  const curve = await measureFile(dataFile, {
    label: study.label,
    group: study.group,
    ignore: study.ignore,
    folds: study.measure.folds,
    repeats: study.measure.repeats,
    trainingSizes: study.measure.sizes,
    seed: study.measure.seed,
    learner: study.measure.learner,
    metric: study.measure.metric,
    workers: options.workers,
    onProgress: options.onProgress,
  });
  const today = study.plan.currentSamples ?? curve.rows;
  const at = Array.from({ length: study.plan.maxRuns + 1 }, (_, runs) => today + runs * study.plan.samplesPerRun);
  const forecast = forecastCurve(curve, {
    at,
    level: study.forecast.level,
    draws: study.forecast.draws,
    seed: study.measure.seed,
  });
  const decision = weighRuns(forecast, study.plan);
  const html = renderReportHtml({
    curve,
    forecast,
    decision,
    title: study.title,
    domain: study.context.domain,
    currency: study.context.currency,
    reproducibility: {
      toolVersion,
      seed: curve.seed,
      inputSha256: curve.source?.sha256,
      command: options.command,
    },
  });

  const outputs: [string, string][] = [
    ["curve.json", toJson(curve)],
    ["forecast.json", toJson(forecast)],
    ["decision.json", toJson(decision)],
    ["decision.csv", decisionTableCsv(decision)],
    ["report.html", html],
  ];
  const written: string[] = [];
  for (const [name, content] of outputs) {
    const path = join(options.outDir, name);
    writeFileAtomic(path, content, [studyFile, dataFile]);
    written.push(path);
  }
  return { study, curve, forecast, decision, written };
}
