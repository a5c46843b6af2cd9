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
import { familyOption, forecastCurve } from "../forecast/forecast.js";
import { checkpointFileFor, removeCheckpoint } from "../curve/checkpoint.js";
import { checkOutputPath, readJsonFile, toJson, writeFileAtomic } from "../io/files.js";
import { validate } from "../io/validate.js";
import { measureFile } from "../curve/measureFile.js";
import { reportFiles } from "../report/reportFiles.js";
import type { DecisionFile } from "../weigh/decisionFile.js";
import { sizesForForecast, weighRuns } from "../weigh/weigh.js";
import { toolVersion } from "../version.js";
import { inStudyTerms } from "./studyErrors.js";
import { studySchema, type Study } from "./studyFile.js";

export interface StudyRunOptions {
  /** Folder for the outputs. */
  outDir: string;
  /** @default 1 */
  workers?: number;
  onProgress?: (done: number, total: number) => void;
  /** The command line that started the run, for the report's reproducibility footer. */
  command?: string;
  /**
   * Continue an interrupted measurement from its checkpoint (`<outDir>/curve.json.checkpoint.jsonl`,
   * kept while measuring and removed once every output is written). @default false
   */
  resume?: boolean;
  /** Aborting it stops the measurement between fits with an InterruptedError. */
  signal?: AbortSignal;
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
  // Fail before measuring when the output folder cannot exist (each output is checked again when written).
  checkOutputPath(join(options.outDir, "curve.json"), [studyFile, dataFile]);
  const checkpoint = checkpointFileFor(join(options.outDir, "curve.json"));
  // Fail before measuring on an unknown curve family (the forecast checks its other options).
  if (study.forecast.family !== undefined) {
    try {
      familyOption(study.forecast.family);
    } catch (error) {
      throw inStudyTerms(error, studyFile, "forecast");
    }
  }

  const curve = await measureFile(dataFile, {
    label: study.label,
    group: study.group,
    ignore: study.ignore,
    folds: study.measure.folds,
    repeats: study.measure.repeats,
    trainingSizes: study.measure.sizes,
    seed: study.measure.seed,
    task: study.measure.task,
    learner: study.measure.learner,
    metric: study.measure.metric,
    tune: study.measure.tune,
    byRuns: study.measure.byRuns,
    trainer: study.measure.trainer,
    trainerTimeout: study.measure.trainerTimeout,
    on: study.measure.on,
    tasksDir: study.measure.tasksDir === undefined ? undefined : resolve(dirname(studyFile), study.measure.tasksDir),
    slurmOptions: study.measure.slurmOptions,
    out: join(options.outDir, "curve.json"),
    workers: options.workers,
    onProgress: options.onProgress,
    checkpoint: { file: checkpoint, resume: options.resume === true },
    signal: options.signal,
  }).catch((error: unknown) => {
    throw inStudyTerms(error, studyFile);
  });
  const today = study.plan.currentSamples ?? curve.rows;
  // Today's size, each number of further runs at the fewest, expected and most samples a run can
  // yield, and the sizes the ±25% yield sensitivity reads.
  const at = sizesForForecast(study.plan, today).all;
  let forecast: ForecastFile;
  try {
    forecast = forecastCurve(curve, {
      at,
      level: study.forecast.level,
      draws: study.forecast.draws,
      seed: study.measure.seed,
      family: study.forecast.family,
      target: study.forecast.target,
      confidence: study.forecast.confidence,
      testSize: study.forecast.testSize,
    });
  } catch (error) {
    throw inStudyTerms(error, studyFile, "forecast");
  }
  const decision = weighRuns(forecast, study.plan, "forecast", {
    domain: study.context.domain,
    planKey: (key) => `${studyFile}: plan.${key}`,
  });
  const report = await reportFiles({
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

  const outputs: [string, string | Uint8Array][] = [
    ["curve.json", toJson(curve)],
    ["forecast.json", toJson(forecast)],
    ["decision.json", toJson(decision)],
    // report.html, decision.csv, and each chart as SVG and PNG (src/report/reportFiles.ts).
    ...report.map((file): [string, string | Uint8Array] => [file.fileName, file.content]),
  ];
  const written: string[] = [];
  for (const [name, content] of outputs) {
    const path = join(options.outDir, name);
    writeFileAtomic(path, content, [studyFile, dataFile]);
    written.push(path);
  }
  removeCheckpoint(checkpoint);
  return { study, curve, forecast, decision, written };
}
