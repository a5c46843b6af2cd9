/**
 * Scores of a fitted model on held-out rows. Each metric knows its direction and range, which the
 * forecast needs to fit in the right orientation and keep intervals inside the range.
 *
 * Classification metrics read the true class of each row and the model's class probabilities; the
 * predicted class is the most probable one, ties going to the lower class index (numpy's `argmax`).
 * Regression metrics read the true and predicted numeric targets. Every metric is written to give
 * scikit-learn 1.2's value on the same inputs (`scripts/reference/sklearn_metrics.py` recomputes them;
 * `test/curve/metrics.test.ts` compares to 1e-12), except where its doc comment says otherwise.
 *
 * Undefined scores. ROC AUC needs every class in the held-out rows and R² needs held-out targets
 * that are not all equal; on a test fold where that fails, scikit-learn raises (AUC) or returns a
 * conventional 0 or 1 (R²). Here such a metric says why through `undefinedOn`, which depends on the
 * held-out rows only, and the curve loop leaves that fold's fits out at every training size (see
 * `measureCurve`). `score` itself is only called on folds where the metric is defined.
 */

interface MetricBase {
  /** Our name, as given to `--metric`. */
  readonly name: string;
  /** The metric in words, for reports ("accuracy"). */
  readonly label: string;
  readonly higherIsBetter: boolean;
  /**
   * Lowest and highest possible value, when both are finite (for every number of classes). Absent
   * for metrics with an infinite end (log loss, RMSE, MAE, R²): curve.json has no Infinity.
   */
  readonly range?: [number, number];
  /**
   * The best possible score, for a metric without a finite range (R²: 1; log loss, RMSE, MAE: 0);
   * a metric with a range has its best at the range's better end ({@link bestScore}).
   */
  readonly best?: number;
}

/** A metric of class probabilities against true classes. */
export interface ClassificationMetric extends MetricBase {
  readonly task: "classification";
  /** The range for a data set with this many classes, when narrower than `range` (Brier score). */
  rangeFor?(classCount: number): [number, number] | undefined;
  /**
   * Whether the score reads the probabilities themselves, not only the most probable class (so a
   * trainer that writes class names only cannot be scored by it).
   */
  readonly readsProbabilities?: boolean;
  /**
   * Why the metric is undefined on these held-out labels, or undefined when it is defined.
   * @param labels true class of each held-out row
   */
  undefinedOn?(labels: Int32Array, classCount: number): string | undefined;
  /**
   * @param labels true class of each held-out row
   * @param probabilities row-major `rows × classCount` class probabilities
   */
  score(labels: Int32Array, probabilities: Float64Array, classCount: number): number;
}

/** A metric of predicted against true numeric targets. */
export interface RegressionMetric extends MetricBase {
  readonly task: "regression";
  /** Why the metric is undefined on these held-out targets, or undefined when it is defined. */
  undefinedOn?(targets: Float64Array): string | undefined;
  score(targets: Float64Array, predictions: Float64Array): number;
}

export type Metric = ClassificationMetric | RegressionMetric;

/** The predicted class of each row: the most probable, ties to the lower class index. */
function argmaxRows(probabilities: Float64Array, rows: number, classCount: number): Int32Array {
  const out = new Int32Array(rows);
  for (let i = 0; i < rows; i++) {
    let best = 0;
    for (let k = 1; k < classCount; k++) {
      if (probabilities[i * classCount + k] > probabilities[i * classCount + best]) best = k;
    }
    out[i] = best;
  }
  return out;
}

/** Fraction of rows whose most probable class is the true one (scikit-learn's `accuracy_score`). */
export const accuracy: ClassificationMetric = {
  task: "classification",
  name: "accuracy",
  label: "accuracy",
  higherIsBetter: true,
  range: [0, 1],
  score(labels, probabilities, classCount) {
    const predicted = argmaxRows(probabilities, labels.length, classCount);
    let correct = 0;
    for (let i = 0; i < labels.length; i++) if (predicted[i] === labels[i]) correct++;
    return correct / labels.length;
  },
};

/**
 * Mean over classes of each class's recall (the fraction of its rows predicted as it), as
 * scikit-learn's `balanced_accuracy_score`: a class absent from the held-out rows is left out of the
 * mean (scikit-learn warns and does the same).
 */
export const balancedAccuracy: ClassificationMetric = {
  task: "classification",
  name: "balanced_accuracy",
  label: "balanced accuracy",
  higherIsBetter: true,
  range: [0, 1],
  score(labels, probabilities, classCount) {
    const predicted = argmaxRows(probabilities, labels.length, classCount);
    const rowsOf = new Float64Array(classCount);
    const hitsOf = new Float64Array(classCount);
    for (let i = 0; i < labels.length; i++) {
      rowsOf[labels[i]]++;
      if (predicted[i] === labels[i]) hitsOf[labels[i]]++;
    }
    let sum = 0;
    let present = 0;
    for (let k = 0; k < classCount; k++) {
      if (rowsOf[k] === 0) continue;
      sum += hitsOf[k] / rowsOf[k];
      present++;
    }
    return sum / present;
  },
};

/**
 * Area under the ROC curve of one class against the rest, from the Mann–Whitney statistic with
 * average ranks for tied scores (Hanley and McNeil 1982): the probability that a random positive row
 * scores above a random negative one, ties counting one half. Equals the trapezoidal area under
 * scikit-learn's `roc_curve`.
 */
function binaryAuc(positive: Uint8Array, scores: Float64Array): number {
  const n = scores.length;
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => scores[a] - scores[b]);
  let positives = 0;
  let rankSum = 0;
  for (let start = 0; start < n;) {
    let end = start + 1;
    while (end < n && scores[order[end]] === scores[order[start]]) end++;
    // Rows start..end-1 share ranks start+1..end: average rank (start + 1 + end) / 2.
    const averageRank = (start + 1 + end) / 2;
    for (let j = start; j < end; j++) {
      if (positive[order[j]]) {
        positives++;
        rankSum += averageRank;
      }
    }
    start = end;
  }
  const negatives = n - positives;
  return (rankSum - (positives * (positives + 1)) / 2) / (positives * negatives);
}

/**
 * ROC AUC. Two classes: the AUC of the second class's probability (scikit-learn's
 * `roc_auc_score(y, p[:, 1])`). More classes: the unweighted mean over classes of each class's AUC
 * against the rest (`roc_auc_score(multi_class="ovr", average="macro")`). Undefined when a class of
 * the data set is absent from the held-out rows.
 */
export const rocAuc: ClassificationMetric = {
  task: "classification",
  name: "roc_auc",
  readsProbabilities: true,
  label: "ROC AUC",
  higherIsBetter: true,
  range: [0, 1],
  undefinedOn(labels, classCount) {
    const seen = new Uint8Array(classCount);
    for (const label of labels) seen[label] = 1;
    const missing = seen.indexOf(0);
    return missing < 0 ? undefined : `ROC AUC needs every class in the test fold; class ${missing} is absent`;
  },
  score(labels, probabilities, classCount) {
    const rows = labels.length;
    const column = (k: number) => Float64Array.from({ length: rows }, (_, i) => probabilities[i * classCount + k]);
    const isClass = (k: number) => Uint8Array.from(labels, (label) => (label === k ? 1 : 0));
    if (classCount === 2) return binaryAuc(isClass(1), column(1));
    let sum = 0;
    for (let k = 0; k < classCount; k++) sum += binaryAuc(isClass(k), column(k));
    return sum / classCount;
  },
};

/**
 * Mean negative log-probability of the true class, as scikit-learn 1.2's `log_loss(y, p, labels=all
 * classes)`: each probability is first clipped to [ε, 1 − ε] with ε the machine epsilon of doubles
 * (2.22e-16, numpy's `finfo(float64).eps`), then each row is divided by its sum. So a confident
 * wrong answer costs −ln ε ≈ 36.04 rather than infinity.
 */
export const logLoss: ClassificationMetric = {
  task: "classification",
  name: "log_loss",
  readsProbabilities: true,
  label: "log loss",
  higherIsBetter: false,
  best: 0,
  score(labels, probabilities, classCount) {
    const eps = Number.EPSILON;
    const clip = (p: number) => Math.min(Math.max(p, eps), 1 - eps);
    let total = 0;
    for (let i = 0; i < labels.length; i++) {
      let rowSum = 0;
      for (let k = 0; k < classCount; k++) rowSum += clip(probabilities[i * classCount + k]);
      total -= Math.log(clip(probabilities[i * classCount + labels[i]]) / rowSum);
    }
    return total / labels.length;
  },
};

/**
 * Brier score (Brier 1950, "Verification of forecasts expressed in terms of probability").
 * Two classes: mean of (p − y)² with p the probability of the second class and y 1 for it, 0 for
 * the first, as scikit-learn's `brier_score_loss(y, p[:, 1])`; range [0, 1].
 * More classes: Brier's original multi-category score, the mean over rows of Σₖ (pₖ − [y = k])²;
 * range [0, 2]. (scikit-learn 1.2's `brier_score_loss` is binary only; the reference for this case
 * is the formula evaluated with numpy. On two classes this form is twice the binary one.)
 */
export const brier: ClassificationMetric = {
  task: "classification",
  name: "brier",
  readsProbabilities: true,
  label: "Brier score",
  higherIsBetter: false,
  range: [0, 2],
  rangeFor: (classCount) => (classCount === 2 ? [0, 1] : [0, 2]),
  score(labels, probabilities, classCount) {
    let total = 0;
    if (classCount === 2) {
      for (let i = 0; i < labels.length; i++) total += (probabilities[i * 2 + 1] - labels[i]) ** 2;
      return total / labels.length;
    }
    for (let i = 0; i < labels.length; i++) {
      let row = 0;
      for (let k = 0; k < classCount; k++) row += (probabilities[i * classCount + k] - (labels[i] === k ? 1 : 0)) ** 2;
      total += row;
    }
    return total / labels.length;
  },
};

/**
 * Macro F1: the unweighted mean over classes of 2·TP / (2·TP + FP + FN), over the classes that occur
 * among the true or the predicted classes of the held-out rows, as scikit-learn's
 * `f1_score(average="macro")` with its default labels.
 */
export const f1Macro: ClassificationMetric = {
  task: "classification",
  name: "f1_macro",
  label: "macro F1",
  higherIsBetter: true,
  range: [0, 1],
  score(labels, probabilities, classCount) {
    const predicted = argmaxRows(probabilities, labels.length, classCount);
    const truePositives = new Float64Array(classCount);
    const falsePositives = new Float64Array(classCount);
    const falseNegatives = new Float64Array(classCount);
    for (let i = 0; i < labels.length; i++) {
      if (predicted[i] === labels[i]) truePositives[labels[i]]++;
      else {
        falsePositives[predicted[i]]++;
        falseNegatives[labels[i]]++;
      }
    }
    let sum = 0;
    let present = 0;
    for (let k = 0; k < classCount; k++) {
      const denominator = 2 * truePositives[k] + falsePositives[k] + falseNegatives[k];
      if (denominator === 0) continue;
      sum += (2 * truePositives[k]) / denominator;
      present++;
    }
    return sum / present;
  },
};

/** Root mean squared error, as scikit-learn's `mean_squared_error(squared=False)`. */
export const rmse: RegressionMetric = {
  task: "regression",
  name: "rmse",
  label: "RMSE",
  higherIsBetter: false,
  best: 0,
  score(targets, predictions) {
    let total = 0;
    for (let i = 0; i < targets.length; i++) total += (targets[i] - predictions[i]) ** 2;
    return Math.sqrt(total / targets.length);
  },
};

/** Mean absolute error, as scikit-learn's `mean_absolute_error`. */
export const mae: RegressionMetric = {
  task: "regression",
  name: "mae",
  label: "MAE",
  higherIsBetter: false,
  best: 0,
  score(targets, predictions) {
    let total = 0;
    for (let i = 0; i < targets.length; i++) total += Math.abs(targets[i] - predictions[i]);
    return total / targets.length;
  },
};

/**
 * Coefficient of determination R² = 1 − Σ(y − ŷ)² / Σ(y − ȳ)², with ȳ the mean of the held-out
 * targets, as scikit-learn's `r2_score`. Undefined when the held-out targets are all equal (one row,
 * or a constant target), where scikit-learn returns a conventional 1 or 0 instead.
 */
export const r2: RegressionMetric = {
  task: "regression",
  name: "r2",
  label: "R²",
  higherIsBetter: true,
  best: 1,
  undefinedOn(targets) {
    for (let i = 1; i < targets.length; i++) if (targets[i] !== targets[0]) return undefined;
    return "R² needs held-out targets that are not all equal";
  },
  score(targets, predictions) {
    let mean = 0;
    for (const y of targets) mean += y;
    mean /= targets.length;
    let residual = 0;
    let spread = 0;
    for (let i = 0; i < targets.length; i++) {
      residual += (targets[i] - predictions[i]) ** 2;
      spread += (targets[i] - mean) ** 2;
    }
    return 1 - residual / spread;
  },
};

export const metrics: readonly Metric[] = [accuracy, balancedAccuracy, rocAuc, logLoss, brier, f1Macro, rmse, mae, r2];

/** The metric of that name, or undefined. */
export function findMetric(name: string): Metric | undefined {
  return metrics.find((m) => m.name === name);
}

/** The best possible score of a metric (its range's better end, or `best`), if it has one. */
export function bestScore(metric: Metric, range: [number, number] | undefined): number | undefined {
  if (metric.best !== undefined) return metric.best;
  if (range === undefined) return undefined;
  return metric.higherIsBetter ? range[1] : range[0];
}

/** The metric's range on a data set with this many classes (regression: `classCount` unused). */
export function metricRangeFor(metric: Metric, classCount: number): [number, number] | undefined {
  return metric.task === "classification" && metric.rangeFor ? metric.rangeFor(classCount) : metric.range;
}
