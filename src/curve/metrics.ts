/**
 * Scores of a fitted model on held-out rows. Each metric knows its direction and range, which the
 * forecast needs to fit in the right orientation and keep intervals inside the range.
 */
export interface Metric {
  /** Our name, as given to `--metric`. */
  readonly name: string;
  /** The metric in words, for reports ("accuracy"). */
  readonly label: string;
  readonly higherIsBetter: boolean;
  /** Lowest and highest possible value, when bounded. */
  readonly range?: [number, number];
  /**
   * @param labels true class of each held-out row
   * @param probabilities row-major `rows × classCount` class probabilities
   */
  score(labels: Int32Array, probabilities: Float64Array, classCount: number): number;
}

/** Fraction of rows whose most probable class is the true one (ties go to the lower class index). */
export const accuracy: Metric = {
  name: "accuracy",
  label: "accuracy",
  higherIsBetter: true,
  range: [0, 1],
  score(labels, probabilities, classCount) {
    let correct = 0;
    for (let i = 0; i < labels.length; i++) {
      let best = 0;
      for (let k = 1; k < classCount; k++) {
        if (probabilities[i * classCount + k] > probabilities[i * classCount + best]) best = k;
      }
      if (best === labels[i]) correct++;
    }
    return correct / labels.length;
  },
};

export const metrics: readonly Metric[] = [accuracy];

/** The metric of that name, or undefined. */
export function findMetric(name: string): Metric | undefined {
  return metrics.find((m) => m.name === name);
}
