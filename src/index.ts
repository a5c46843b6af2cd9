/**
 * headroom's public API. The command line (src/cli) is a thin shell over these functions.
 */

// Data
export { readCsv, parseCsv, readTextFile, type CsvTable } from "./data/csv.js";
export { tableToDataset, type ColumnChoice } from "./data/tableToDataset.js";
export type { Dataset } from "./data/dataset.js";

// Learners
export type { Learner, FittedModel, TrainingSet } from "./learners/learner.js";
export { LogisticRegression, type LogisticOptions } from "./learners/logistic.js";
export { fitPreprocessor, type Preprocessor } from "./learners/preprocess.js";
export { createLearner, registerLearner, learnerNames } from "./learners/registry.js";

// Splitters
export type { Split } from "./splitters/split.js";
export { stratifiedKFold } from "./splitters/stratifiedKFold.js";
export { nestedStratifiedOrder } from "./splitters/nestedSubsamples.js";

// The curve loop
export { measureCurve, resolveMeasureOptions, type MeasureOptions } from "./curve/measure.js";
export { accuracy, findMetric, metrics, type Metric } from "./curve/metrics.js";
export { geometricSizes, smallestSensibleSize } from "./curve/sizes.js";
export { readCurve } from "./curve/readCurve.js";
export type { CurveFile, CurvePoint } from "./curve/curveFile.js";

// Curve fitting and forecasting
export { fitLeastSquares, type LeastSquaresOptions, type LeastSquaresResult } from "./fit/levenbergMarquardt.js";
export { curveFamilies, findCurveFamily, fitCurveFamily, pow3, type CurveFamily } from "./fit/families.js";
export { forecastCurve, resolveForecastOptions, type ForecastOptions } from "./forecast/forecast.js";
export { readForecast } from "./forecast/readForecast.js";
export type { ForecastFile, Projection } from "./forecast/forecastFile.js";

// Weighing further runs
export { planSchema, type Plan, type PlanInput } from "./weigh/plan.js";
export { weighRuns, plannedSizes } from "./weigh/weigh.js";
export { readPlan } from "./weigh/readPlan.js";
export type { DecisionFile, DecisionRow } from "./weigh/decisionFile.js";

// Report
export { learningCurveChart, valueChart } from "./report/charts.js";
export { renderReportHtml, decisionTableCsv, headline, type ReportInput } from "./report/html.js";

// Whole jobs
export { measureFile } from "./pipeline.js";
export { runStudy, type StudyRunOptions, type StudyResult } from "./study/runStudy.js";
export { studySchema, type Study } from "./study/studyFile.js";

// Errors and randomness
export { HeadroomError, UsageError, DataError, FitError, InputError, OutputError, ExitCode } from "./errors.js";
export { RandomStream } from "./random.js";
