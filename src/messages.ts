/**
 * Every user-facing error message, in one place. Each is one line saying what is wrong and where
 * (file, line, column, option or key), so a user can fix it without reading code.
 *
 * A message about an option of a library call leaves the option's name out: the error carries it as
 * its subject (`new UsageError(message.notWholeNumber(...), { option: "repeats" })`), and each front
 * end names it its own way (`--repeats` on the command line, `measure.repeats` in a study file). A
 * message that mentions another option takes the front end's namer `n` (an `ErrorText` function).
 */
import type { ErrorText, OptionNamer } from "./errors.js";

/** `file:line:column` or `file:line`, as compilers print positions. */
export function at(file: string, line?: number, column?: number): string {
  if (line === undefined) return file;
  return column === undefined ? `${file}:${line}` : `${file}:${line}:${column}`;
}

export const message = {
  fileMissing: (file: string) => `${file}: no such file`,
  fileUnreadable: (file: string, reason: string) => `${file}: cannot be read (${reason})`,
  notUtf8: (file: string, line: number) => `${at(file, line)}: the file is not UTF-8 text`,
  binaryContent: (file: string, line: number, format: "CSV" | "JSON") =>
    `${at(file, line)}: the file contains binary data (a NUL byte); expected ${format} text`,
  emptyFile: (file: string) => `${file}: the file is empty`,
  headerOnly: (file: string) => `${file}: the file has a header but no data rows`,
  csvSyntax: (file: string, line: number, detail: string) => `${at(file, line)}: CSV syntax error: ${detail}`,
  raggedRow: (file: string, line: number, expected: number, found: number) =>
    `${at(file, line)}: expected ${expected} fields as in the header, found ${found}`,
  emptyColumnName: (file: string, column: number) => `${at(file, 1, column)}: the header has an empty column name`,
  duplicateColumn: (file: string, name: string, first: number, second: number) =>
    `${at(file, 1, second)}: duplicate column name '${name}' (also column ${first})`,
  columnMissing:
    (file: string, option: string, name: string, available: string[]): ErrorText =>
    (n: OptionNamer) =>
      `${file}: ${n(option)} column '${name}' is not in the header (columns: ${preview(available)})`,
  columnTwice:
    (file: string, option: string, name: string, other: string): ErrorText =>
    (n: OptionNamer) =>
      `${file}: ${n(option)} column '${clip(name)}' is already the ${n(other)} column; each column has one role`,
  labelMissing: (file: string, line: number, column: number, name: string) =>
    `${at(file, line, column)}: the label '${name}' is empty`,
  notANumber: (file: string, line: number, column: number, columnName: string, text: string) =>
    `${at(file, line, column)}: '${clip(text)}' in column '${columnName}' is not a number`,
  notFinite: (file: string, line: number, column: number, columnName: string, text: string) =>
    `${at(file, line, column)}: '${clip(text)}' in column '${columnName}' is not a finite number; leave the cell empty for a missing value`,
  tooLarge: (file: string, line: number, column: number, columnName: string, text: string) =>
    `${at(file, line, column)}: '${clip(text)}' in column '${columnName}' is too large to compute with (above 1e150 in size); rescale the column`,
  noFeatures: (file: string) => `${file}: no feature columns are left besides the label, group and ignored columns`,
  oneClass: (file: string, label: string, className: string) =>
    `${file}: the label column '${label}' has only one class ('${clip(className)}'); a learning curve needs at least two`,
  classTooSmall: (file: string, className: string, count: number, folds: number, n: OptionNamer) =>
    `${file}: class '${clip(className)}' has ${count} row${count === 1 ? "" : "s"}, fewer than ${n("folds")} ${folds}; lower ${n("folds")} or collect more of that class`,
  tooFewRows: (file: string, rows: number, needed: number) =>
    `${file}: ${rows} rows are too few for a learning curve (at least ${needed} needed)`,
  sizeTooLarge: (size: number, pool: number) =>
    `training size ${size} is larger than the smallest training pool (${pool} rows after holding out a fold)`,
  sizeTooSmall: (size: number, classes: number) =>
    `training size ${size} is too small to hold each of the ${classes} classes`,
  sizeTooLargeRuns: (size: number, pool: number) =>
    `training size ${size} runs is more than the smallest training pool (${pool} runs after holding out a fold)`,
  sizeTooSmallRegression: (size: number) =>
    `training size ${size} is too small to fit a numeric target (at least 2 rows)`,
  tooFewRuns: (file: string, column: string, runs: number, needed: number) =>
    `${file}: ${runs} runs in '${clip(column)}' are too few for a learning curve against runs (at least ${needed} needed, for 3 training sizes after holding out a fold)`,
  badFolds: (text: string) => `'${clip(text)}' is neither a whole number of at least 2 nor 'loo'`,
  foldsAboveRows:
    (folds: number, rows: number): ErrorText =>
    (n: OptionNamer) =>
      `${folds} is more than the ${rows} rows; use ${n("folds")} loo for leave-one-out`,
  byRunsNeedsGroup: (): ErrorText => (n: OptionNamer) =>
    `needs ${n("group")} naming the column that says which run each row came from`,
  fewRunsFallback: (column: string, runs: number, splitter: string, byRuns: boolean) =>
    `the run column '${clip(column)}' has only ${runs} run${runs === 1 ? "" : "s"}: runs cannot be kept whole across training and test with fewer than 3, so rows are split by ${splitter}${byRuns ? " and training sizes count rows, not runs" : ""}; scores may be optimistic, since rows of one run can be in both training and test`,
  foldsAboveRuns: (folds: number, runs: number, column: string) =>
    `${folds} folds are more than the ${runs} runs in '${clip(column)}': leave-one-run-out (${runs} folds) is used instead`,
  taskMismatch:
    (name: string, kind: string, task: string, what: string): ErrorText =>
    (n: OptionNamer) =>
      `'${clip(name)}' is for ${kind}, but the task is ${task} (set ${n("task")}, or choose another ${what})`,
  dataTaskMismatch: (task: string, dataTask: string) =>
    `the data set was read for ${dataTask}, not ${task}; read it with the same task`,
  targetNotNumber:
    (file: string, line: number, column: number, name: string, text: string): ErrorText =>
    (n: OptionNamer) =>
      `${at(file, line, column)}: the target '${name}' is '${clip(text)}', not a finite number, as ${n("task")} regression needs`,
  numericLabelHint: (label: string, n: OptionNamer) =>
    ` (if '${clip(label)}' is a numeric target, pass ${n("task")} regression)`,
  mixedColumn:
    (file: string, line: number, column: number, columnName: string, text: string): ErrorText =>
    (n: OptionNamer) =>
      `${at(file, line, column)}: '${clip(text)}' in column '${columnName}' is not a number, though most of the column is numbers; fix the cell, leave it empty for a missing value, or ${n("ignore")} the column`,
  metricUndefinedEverywhere: (metric: string, reason: string) =>
    `${metric} is undefined on every test fold (${reason}); choose another metric or more folds per class`,
  metricUndefinedSome: (metric: string, skipped: number, total: number, reason: string) =>
    `the metric ${metric} is undefined on ${skipped} of ${total} test folds (first: ${reason}); their fits are left out, and each point's repeatOfScore says which repeat each score is from`,
  emptyColumns: (names: string[]) =>
    `${names.length === 1 ? "column" : "columns"} ${names
      .slice(0, 5)
      .map((n) => `'${clip(n)}'`)
      .join(
        ", ",
      )}${names.length > 5 ? ` and ${names.length - 5} more` : ""} ${names.length === 1 ? "has" : "have"} no value in any row and add${names.length === 1 ? "s" : ""} nothing to the model; check the file, or ignore ${names.length === 1 ? "it" : "them"} (a column left out of the features)`,
  tuneWithoutGrid: (learner: string) =>
    `tuning: learner '${learner}' has no tuning grid yet, so it was measured with its default settings`,
  /** A command-line option's problem, named as the command line spells it (`--repeats: ...`). */
  optionProblem: (flag: string, detail: string) => `${flag}: ${detail}`,
  badInteger: (text: string, min: number) => `'${clip(text)}' is not a whole number of at least ${min}`,
  badNumber: (text: string) => `'${clip(text)}' is not a number`,
  badLevel: (text: string) => `'${clip(text)}' is not a probability between 0 and 1`,
  badList: (text: string) => `'${clip(text)}' is not a comma-separated list of whole numbers`,
  badJson: (file: string, line: number, column: number, detail: string) =>
    `${at(file, line, column)}: malformed JSON: ${detail}`,
  badKey: (file: string, key: string, detail: string) => `${file}: ${key}: ${detail}`,
  /** A message about a file's content (a study file's option) prefixed with the file. */
  inFile: (file: string, text: string) => `${file}: ${text}`,
  wrongFileKind: (file: string, expected: string) => `${file}: not a ${expected} file written by headroom`,
  forecastOfAnotherCurve: (forecastFile: string, curveFile: string, difference: string) =>
    `${forecastFile}: not a forecast of ${curveFile} (${difference}); run headroom forecast on it again`,
  curveTooShort: (sizes: number) =>
    `the curve has ${sizes} distinct training size${sizes === 1 ? "" : "s"}; a forecast needs at least 3`,
  missingProjections: (file: string, missing: number[], needed: number[]) =>
    `${file}: the forecast has no projection at training size${missing.length === 1 ? "" : "s"} ${missing.join(", ")} and, written by an earlier version, keeps no curves to compute them; rerun headroom forecast on the same curve (or add --at ${needed.join(",")})`,
  outputExists: (file: string) => `${file}: refusing to overwrite an input file`,
  cannotWrite: (file: string, reason: string) => `${file}: cannot be written (${reason})`,
  planYieldMissing: () =>
    `missing: give samplesPerRun, or samplesPerRunRange [fewest, most] when the yield is uncertain`,
  planYieldTwice: () => `give samplesPerRun or samplesPerRunRange, not both`,
  planRangeOrder: (fewest: number, most: number) =>
    `the fewest samples (${fewest}) is larger than the most (${most}); write [fewest, most]`,
  planConsequenceMissing: (key: string) =>
    `missing: the value of a point is derived from casesPerYear, costPerError and yearsInUse together (${key} is not given)`,
  planValueTwice: () => `give valuePerPoint or casesPerYear, costPerError and yearsInUse, not both`,
  planNoValue: () =>
    `missing: give valuePerPoint, or casesPerYear, costPerError and yearsInUse, or a target score to reach`,
  planCoxSnellTooLarge: (value: number, largest: number) =>
    `${value} is not below ${largest.toFixed(4)}, the largest Cox–Snell R² a binary outcome with this prevalence allows`,
  unknownName: (name: string, known: string[]) => `unknown name '${clip(name)}' (known: ${known.join(", ")})`,
  checkpointExists: (file: string) =>
    `${file}: a checkpoint of an interrupted run is here; add --resume to continue it, or delete the file to start over`,
  checkpointMismatch: (file: string, changed: string[]) =>
    `${file}: the checkpoint was written for other data or options (changed: ${changed.join(", ")}); delete it to start over`,
  checkpointLine: (file: string, line: number) =>
    `${at(file, line)}: the checkpoint line is malformed; delete the file to start over`,
  interrupted: (done: number, total: number, checkpoint: string | undefined) =>
    checkpoint === undefined
      ? `interrupted after ${done} of ${total} fits`
      : `interrupted after ${done} of ${total} fits (kept in ${checkpoint}); rerun the same command with --resume to continue`,
  trainerFit: (fit: FitName, problem: string, stderrTail: string) =>
    `--trainer failed on fit (repeat ${fit.repeat + 1}, fold ${fit.fold + 1}, size ${fit.size}): ${problem}${stderrTail === "" ? "" : `; its stderr ended: ${stderrTail}`}`,
  trainerExit: (code: number | null, signal: string | null) =>
    code !== null ? `the trainer exited with code ${code}` : `the trainer was stopped by signal ${signal}`,
  trainerStartFailed: (reason: string) => `the trainer could not be started (${reason})`,
  trainerTimeout: (seconds: number) => `the trainer ran longer than --trainer-timeout ${seconds} s and was stopped`,
  trainerNoPredictions: (file: string) =>
    `the trainer wrote no predictions file (expected ${file}, HEADROOM_PREDICTIONS)`,
  trainerRowCount: (expected: number, found: number) =>
    `the predictions file has ${found} row${found === 1 ? "" : "s"}, but the test file has ${expected}`,
  trainerUnknownClass: (line: number, name: string, known: string[]) =>
    `predictions line ${line}: '${clip(name)}' is not a class of the label (classes: ${preview(known)})`,
  trainerUnknownColumn: (name: string, known: string[]) =>
    `predictions header: column '${clip(name)}' is neither 'prediction' nor a class of the label (classes: ${preview(known)})`,
  trainerRegressionColumn: (header: string[]) =>
    `predictions header: a numeric target needs one column 'prediction' (found: ${preview(header)})`,
  trainerNotNumber: (line: number, column: string, text: string) =>
    `predictions line ${line}, column '${clip(column)}': '${clip(text)}' is not a number`,
  trainerBadProbabilities: (line: number) =>
    `predictions line ${line}: class probabilities must be at least 0 with a positive sum`,
  trainerBadPredictions: (detail: string) => `the predictions file is not CSV (${detail})`,
  trainerLabelsOnly: (metric: string, accepted: string[]) =>
    `--metric ${metric} needs class probabilities, but the trainer wrote only a 'prediction' column of class names; write one column per class holding probabilities, or choose --metric ${accepted.join(", ")}`,
  trainerRenormalised: (fits: number, total: number) =>
    `the trainer's class probabilities did not sum to 1 (within 1e-6) in ${fits} of ${total} fits; they were renormalised`,
  trainerWithLearner: (option: string) =>
    `${option} cannot be used with --trainer: the trainer program is the model (set its settings inside it)`,
  badTimeout: (text: string) => `--trainer-timeout: '${clip(text)}' is not a positive number of seconds`,
  unknownPlace: (text: string) => `unknown place '${clip(text)}' (known: local, slurm)`,
  slurmNeedsFolder: (): ErrorText => (n: OptionNamer) =>
    `${n("on")} slurm needs ${n("tasksDir")} naming a folder on a file system the cluster's nodes share`,
  slurmOnlyOption:
    (option: string): ErrorText =>
    (n: OptionNamer) =>
      `${n(option)} is only used with ${n("on")} slurm`,
  sbatchMissing: () =>
    `--on slurm: sbatch is not on PATH; run headroom on a SLURM login node (or load the slurm module) first`,
  sbatchFailed: (detail: string) =>
    `--on slurm: sbatch refused the job: ${detail.replace(/\s+/g, " ").trim().slice(0, 300)}`,
  tasksDirInUse: (dir: string) =>
    `${dir}: this folder already holds tasks of a measurement; gather them with headroom collect, or choose an empty folder`,
  notTasksDir: (dir: string) =>
    `${dir}: no tasks of a measurement here (no job.json written by headroom measure --on slurm)`,
  tasksDataChanged: (dir: string, file: string) =>
    `${dir}: the data file ${file} changed since the tasks were written; restore it, or measure again into a new folder`,
  tasksIncomplete: (dir: string, done: number, total: number, failed: string[], rerun: string) =>
    `${dir}: ${done} of ${total} tasks are in${failed.length > 0 ? `; failed: ${failed.join("; ")}` : ""}; when the job has ended, rerun the rest with: ${rerun}`,
  slurmDetached: (jobId: string, dir: string, out: string) =>
    `stopped following job ${jobId}, which runs on; gather its results later with: headroom collect ${dir} --out ${out} (or cancel it with: scancel ${jobId})`,
  taskFailedLine: (task: number, text: string) => `task ${task}: ${text}`,
  taskElement: (text: string, elements: number) =>
    `run-task --element: '${clip(text)}' is not an array element (0 to ${elements - 1})`,
  outputUnder: (file: string, parent: string) => `${file}: cannot be written (${parent} is a file, not a folder)`,
  // The forecast's options (subject: the option).
  betweenZeroAndOne: (value: number) => `must be between 0 and 1 (exclusive), not ${value}`,
  seedNotInteger: (seed: number) => `must be an integer, not ${seed}`,
  drawsOutOfRange: (draws: number) => `must be an integer from 1 to 100000, not ${draws}`,
  noProjectionSizes: () => `no training sizes to project to`,
  projectionSizeNotPositive: (size: number) => `projection size ${size} is not a positive number`,
  targetNotFinite: (target: number) => `must be a finite number, not ${target}`,
  targetOutsideRange: (target: number, metric: string, range: readonly [number, number]) =>
    `${target} is outside the ${metric} range [${range[0]}, ${range[1]}]${range[1] === 1 ? " (give accuracy as a fraction, e.g. 0.9)" : ""}`,
  testSizeNotWhole: (testSize: number) => `must be a whole number of at least 1, not ${testSize}`,
  classesNotWhole: (classes: number) => `must be a whole number of at least 2, not ${classes}`,
  classesOfNumericCurve: () => `is for a classification curve; this curve has a numeric target`,
  classesDiffer: (given: number, recorded: number) =>
    `is ${given}, but the curve records ${recorded} classes; leave it out for a curve.json`,
  // A curve given to the forecast.
  curveNoPoints: () => `forecast: the curve has no points`,
  metricRangeNotIncreasing: (range: readonly number[]) =>
    `forecast: metricRange [${range.join(", ")}] is not an increasing pair of numbers`,
  pointSizeNotPositive: (index: number, size: number) =>
    `forecast: point ${index} has training size ${size}; sizes must be positive`,
  pointSizeTwice: (first: number, index: number, size: number) =>
    `forecast: points ${first} and ${index} both have training size ${size}; merge their scores`,
  sizeWithoutScores: (size: number) => `forecast: training size ${size} has no scores`,
  scoreNotFinite: (s: number, size: number, score: number) =>
    `forecast: score ${s} at training size ${size} is ${score}, not a finite number`,
  repeatOfScoreLength: (size: number, scores: number, repeats: number) =>
    `forecast: training size ${size} has ${scores} scores but ${repeats} repeatOfScore entries`,
  repeatNotIndex: (s: number, size: number, repeat: number) =>
    `forecast: repeatOfScore ${s} at training size ${size} is ${repeat}, not a repeat index`,
  tooFewSizesToFit: (sizes: number) =>
    `forecast: the curve has ${sizes} distinct training size${sizes === 1 ? "" : "s"}; at least 3 are needed to fit a curve`,
  noFamilyFitted: (reasons: readonly { family: string; reason: string }[]) =>
    `forecast: no learning-curve family could be fitted (${reasons.map((l) => `${l.family}: ${l.reason}`).join("; ")})`,
  noRefitSucceeded: (draws: number) =>
    `forecast: none of the ${draws} bootstrap refits succeeded; the interval cannot be estimated`,
  curveCsvColumnMissing: (file: string, name: string) =>
    `${file}: a curve CSV needs a '${name}' column (columns: trainingSize, score, optional repeat)`,
  curveCsvSizeNotWhole: (file: string, line: number, column: number, text: string) =>
    `${at(file, line, column)}: trainingSize '${text}' is not a positive whole number`,
  // Curve families and the least-squares fitter (FitError; a family's reason is shown in the forecast).
  unknownFamily: (name: string, known: readonly string[]) =>
    `unknown curve family "${name}"; known families: ${known.join(", ")}`,
  familyTooFewSizes: (family: string, sizes: number, parameters: number) =>
    `${family}: ${sizes} training sizes cannot determine ${parameters} parameters`,
  familyPointUnusable: (family: string, size: number, value: number, weight: number) =>
    `${family}: point at training size ${size} is not usable (value ${value}, weight ${weight})`,
  familyUnsupportedSizes: (family: string, formula: string) =>
    `${family}: cannot be fitted to these training sizes (${formula})`,
  familyNotConverged: (family: string, starts: number, lastProblem: string) =>
    `${family}: no fit converged from ${starts} starting points (${lastProblem})`,
  lsqNoParameters: () => `least-squares fit: no parameters to fit (empty start vector)`,
  lsqLengths: (n: number, yLength: number) => `least-squares fit: x has ${n} values but y has ${yLength}`,
  lsqTooFewPoints: (n: number, p: number) => `least-squares fit: ${n} points cannot determine ${p} parameters`,
  lsqPointNotFinite: (i: number, x: number, y: number) =>
    `least-squares fit: point ${i} is not finite (x = ${x}, y = ${y})`,
  lsqWeightCount: (weights: number, n: number) => `least-squares fit: ${weights} weights given for ${n} points`,
  lsqBadWeight: (i: number, w: number) => `least-squares fit: weight ${i} is ${w}; weights must be finite and ≥ 0`,
  lsqFewWeighted: (positive: number, p: number) =>
    `least-squares fit: only ${positive} points have a positive weight, fewer than the ${p} parameters`,
  lsqBadStart: (j: number, value: number) => `least-squares fit: start parameter ${j} is ${value}`,
  lsqBoundsCrossed: (j: number, lower: number, upper: number) =>
    `least-squares fit: parameter ${j} has lower bound ${lower} above upper bound ${upper}`,
  lsqBadIterations: (value: number) => `least-squares fit: maxIterations must be a positive integer, not ${value}`,
  lsqBadTolerance: (name: string, value: number) =>
    `least-squares fit: tolerance ${name} must be finite and ≥ 0, not ${value}`,
  lsqBoundsLength: (name: string, given: number, p: number) =>
    `least-squares fit: ${name} has ${given} values for ${p} parameters`,
  lsqBoundIsNaN: (name: string, j: number) => `least-squares fit: ${name}[${j}] is NaN`,
  lsqModelNotFinite: (theta: readonly number[]) =>
    `least-squares fit: the model is not finite at the start parameters [${theta.join(", ")}]`,
  lsqJacobianNotFinite: (theta: readonly number[], j: number) =>
    `least-squares fit: the Jacobian is not finite at [${theta.join(", ")}] (parameter ${j})`,
  lsqNoDependence: (theta: readonly number[]) =>
    `least-squares fit: the model does not depend on any parameter at [${theta.join(", ")}]`,
  lsqNotFiniteResult: () => `least-squares fit: the iteration left finite values (internal error)`,
  lsqJacobianLength: (given: number, p: number) =>
    `least-squares fit: the Jacobian gave ${given} derivatives for ${p} parameters`,
  // A learner's settings and training input (from the library, a tuning grid or a study).
  unknownSetting: (learner: string, name: string, known: readonly string[]) =>
    `${learner}: unknown setting '${name}' (known: ${known.join(", ")})`,
  settingNotPositive: (learner: string, name: string, value: number) =>
    `${learner}: ${name} must be a positive finite number, got ${value}`,
  settingNegative: (learner: string, name: string, value: number) =>
    `${learner}: ${name} must be a finite number of at least 0, got ${value}`,
  settingNotWhole: (learner: string, name: string, value: number, min: number) =>
    `${learner}: ${name} must be a whole number of at least ${min}, got ${value}`,
  settingNotFraction: (learner: string, name: string, value: number) =>
    `${learner}: ${name} must be a number in [0, 1), got ${value}`,
  shrinkageOutOfRange: (learner: string, value: number) =>
    `${learner}: shrinkage must be a number in [0, 1] (or NaN for Ledoit–Wolf), got ${value}`,
  classCountNotWhole: (learner: string, classCount: number) =>
    `${learner}: classCount must be a whole number of at least 1, got ${classCount}`,
  labelCount: (learner: string, labels: number, rows: number) =>
    `${learner}: ${labels} labels for ${rows} training rows`,
  noTrainingRows: (learner: string) => `${learner}: no training rows`,
  targetCount: (learner: string, targets: number, rows: number) =>
    `${learner}: ${targets} targets for ${rows} training rows`,
  trainingTargetNotFinite: (learner: string, row: number, target: number) =>
    `${learner}: training row ${row} has target ${target}, not a finite number`,
  labelOutOfRange: (learner: string, row: number, label: number, classCount: number) =>
    `${learner}: training row ${row} has label ${label}, outside 0 .. ${classCount - 1}`,
  newtonStepFailed: () => `logistic: the Newton step could not be solved (the Hessian is not finite)`,
  objectiveNotFinite: () => `logistic: the objective is not finite at the start`,
  tooLargeForKernel: (rows: number, columns: number) =>
    `logistic: ${rows} rows × ${columns} columns are too many for one fit's memory (4 GiB)`,
  nothingToPreprocess: () => `preprocessing: no training rows to fit the imputation and scaling on`,
  featureNotFinite: (role: string, row: number, column: number, value: number) =>
    `preprocessing: ${role} row ${row + 1}, feature column ${column + 1} is ${value}; only NaN may mark a missing value`,
  missingInCompleteColumn: (role: string, row: number, column: number) =>
    `preprocessing: ${role} row ${row + 1}, feature column ${column + 1} is missing, in a column said to have no missing value`,
  shapeNotWhole: (role: string, rows: number, columns: number) =>
    `preprocessing: ${role} shape ${rows} rows × ${columns} columns is not a pair of whole numbers`,
  featureCount: (stage: string, role: string, values: number, rows: number, columns: number) =>
    `${stage}: ${role} features hold ${values} values, expected ${rows} rows × ${columns} columns`,
  categoryListCount: (lists: number, columns: number) =>
    `encoding: ${lists} category lists for ${columns} feature columns`,
  notCategoryIndex: (role: string, row: number, column: number, value: number, count: number) =>
    `encoding: ${role} row ${row + 1}, feature column ${column + 1} holds ${value}, not a category index 0 .. ${count - 1}`,
} as const;

/** A fit of a (repeat, fold) task at one training size, counted from 0 (messages count from 1). */
export interface FitName {
  repeat: number;
  fold: number;
  size: number;
}

function clip(text: string): string {
  const oneLine = text.replace(/[\r\n\t]/g, " ");
  return oneLine.length > 40 ? `${oneLine.slice(0, 37)}...` : oneLine;
}

function preview(names: string[]): string {
  const shown = names.slice(0, 8).map((n) => `'${clip(n)}'`);
  return names.length > 8 ? `${shown.join(", ")}, ... (${names.length} in all)` : shown.join(", ");
}
