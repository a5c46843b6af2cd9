/**
 * headroom's public API. The command line (src/cli) is a thin shell over these functions.
 */

// Data
export { readCsv, parseCsv, type CsvTable } from "./data/csv.js";
export { readTextFile } from "./io/files.js";
export { tableToDataset, type ColumnChoice } from "./data/tableToDataset.js";
export { readDataset } from "./data/readDataset.js";
export type { Dataset } from "./data/dataset.js";

// Learners
export type { Learner, FittedModel, TrainingSet } from "./learners/learner.js";
export { LogisticRegression, type LogisticOptions } from "./learners/logistic.js";
export { fitPreprocessor, type Preprocessor } from "./learners/preprocess.js";
export { createLearner, registerLearner, learnerNames } from "./learners/registry.js";

// Splitters
export type { Split } from "./splitters/split.js";
export { stratifiedKFold } from "./splitters/stratifiedKFold.js";
export { kFold } from "./splitters/kFold.js";
export { leaveOneOut } from "./splitters/leaveOneOut.js";
export { groupKFold } from "./splitters/groupKFold.js";
export { leaveOneGroupOut } from "./splitters/leaveOneGroupOut.js";
export { chooseDesign, type SplitDesign, type SplitterName } from "./splitters/design.js";
export { nestedStratifiedOrder, nestedRandomOrder, nestedRunOrder } from "./splitters/nestedSubsamples.js";

// The curve loop
export { measureCurve, resolveMeasureOptions, type MeasureOptions } from "./curve/measure.js";
export {
  accuracy,
  balancedAccuracy,
  rocAuc,
  logLoss,
  brier,
  f1Macro,
  rmse,
  mae,
  r2,
  findMetric,
  metricRangeFor,
  metrics,
  type Metric,
  type ClassificationMetric,
  type RegressionMetric,
} from "./curve/metrics.js";
export { geometricSizes, smallestSensibleSize } from "./curve/sizes.js";
export { readCurve } from "./curve/readCurve.js";
export type { CurveFile, CurvePoint } from "./curve/curveFile.js";

// Curve fitting and forecasting
export { fitLeastSquares, type LeastSquaresOptions, type LeastSquaresResult } from "./fit/levenbergMarquardt.js";
export {
  curveFamilies,
  exp3,
  findCurveFamily,
  fitCurveFamily,
  ilog2,
  last,
  mmf4,
  pow3,
  pow4,
  wbl4,
  type CurveFamily,
} from "./fit/families.js";
export { forecastCurve, resolveForecastOptions, type ForecastOptions } from "./forecast/forecast.js";
export { readForecast } from "./forecast/readForecast.js";
export type {
  BacktestPrediction,
  BacktestSummary,
  ForecastFile,
  Projection,
  TargetSizeAnswer,
} from "./forecast/forecastFile.js";

// Weighing further runs
export { planSchema, resolvePlan, type Plan, type PlanInput, type ResolvedPlan } from "./weigh/plan.js";
export { weighRuns, plannedSizes, sizesForForecast, type WeighOptions } from "./weigh/weigh.js";
export { readPlan } from "./weigh/readPlan.js";
export type {
  DecisionFile,
  DecisionRow,
  SensitivityEntry,
  ValueOfInformation,
  ValidationSize,
  ClinicalFloor,
} from "./weigh/decisionFile.js";
export {
  wilsonInterval,
  wilsonLowerBound,
  clopperPearsonInterval,
  clopperPearsonLowerBound,
  heldOutNeededWilson,
  heldOutNeededExact,
} from "./weigh/validationSize.js";
export { clinicalSampleSize, type ClinicalSampleSize } from "./weigh/clinicalSampleSize.js";
export { sampleInformationValue, normalSampleInformationValue } from "./weigh/valueOfInformation.js";

// Report
export {
  learningCurveChart,
  scoreChart,
  netValueChart,
  backtestChart,
  sensitivityChart,
  reportCharts,
  type ReportChart,
} from "./report/charts.js";
export { renderReportHtml, decisionTableCsv, headline, type ReportInput } from "./report/html.js";
export { chartSvg, chartPng, findChartFonts } from "./report/chartFiles.js";
export { reportFiles, type ReportFile } from "./report/reportFiles.js";

// Whole jobs
export { measureFile } from "./curve/measureFile.js";
export { runStudy, type StudyRunOptions, type StudyResult } from "./study/runStudy.js";
export { studySchema, type Study } from "./study/studyFile.js";

// Errors and randomness
export {
  HeadroomError,
  UsageError,
  DataError,
  FitError,
  InputError,
  OutputError,
  ExitCode,
  libraryNames,
  type ErrorSubject,
  type ErrorText,
  type OptionNamer,
} from "./errors.js";
export { RandomStream, StreamPurpose, streamFor } from "./random.js";
