/**
 * Checks and bookkeeping every learner does before fitting: the training set has the shape it
 * claims, each label is a class of the data set, and which classes the rows actually hold (a small
 * training subsample may lack some; learners fit the classes present and give the others
 * probability 0).
 */
import { DataError } from "../errors.js";
import { message } from "../messages.js";
import type { RegressionTrainingSet, TrainingSet } from "./learner.js";

/** The classes a training set holds. */
export interface ClassSummary {
  /** Rows of each class of the data set, `classCount` entries. */
  counts: Int32Array;
  /** The classes with at least one row, ascending. */
  present: Int32Array;
  /** Each row's label renumbered over the present classes: `0 .. present.length − 1`. */
  positions: Int32Array;
}

/**
 * Checks a classification training set and summarizes its classes.
 * @throws DataError when there are no rows, the features do not hold rows × columns values, the
 *   labels do not match the rows, classCount is not a whole number of at least 1, or a label lies
 *   outside 0 .. classCount − 1.
 */
export function summarizeClasses(learner: string, training: TrainingSet): ClassSummary {
  const { features, rows, columns, labels, classCount } = training;
  checkShape(learner, features, rows, columns);
  if (!(Number.isInteger(classCount) && classCount >= 1))
    throw new DataError(message.classCountNotWhole(learner, classCount));
  if (labels.length !== rows) throw new DataError(message.labelCount(learner, labels.length, rows));
  const counts = new Int32Array(classCount);
  for (let i = 0; i < rows; i++) {
    const label = labels[i];
    if (!(label >= 0 && label < classCount))
      throw new DataError(message.labelOutOfRange(learner, i + 1, label, classCount));
    counts[label]++;
  }
  const present: number[] = [];
  const position = new Int32Array(classCount).fill(-1);
  for (let k = 0; k < classCount; k++) {
    if (counts[k] > 0) {
      position[k] = present.length;
      present.push(k);
    }
  }
  const positions = new Int32Array(rows);
  for (let i = 0; i < rows; i++) positions[i] = position[labels[i]];
  return { counts, present: Int32Array.from(present), positions };
}

/**
 * Checks a regression training set.
 * @throws DataError when there are no rows, the features do not hold rows × columns values, the
 *   targets do not match the rows, or a target is not a finite number.
 */
export function checkRegressionSet(learner: string, training: RegressionTrainingSet): void {
  const { features, rows, columns, targets } = training;
  checkShape(learner, features, rows, columns);
  if (targets.length !== rows) throw new DataError(message.targetCount(learner, targets.length, rows));
  for (let i = 0; i < rows; i++) {
    if (!Number.isFinite(targets[i])) throw new DataError(message.trainingTargetNotFinite(learner, i + 1, targets[i]));
  }
}

function checkShape(learner: string, features: Float64Array, rows: number, columns: number): void {
  if (!(Number.isInteger(rows) && rows >= 1)) throw new DataError(message.noTrainingRows(learner));
  if (!(Number.isInteger(columns) && columns >= 0 && features.length === rows * columns))
    throw new DataError(message.featureCount(learner, "training", features.length, rows, columns));
}
