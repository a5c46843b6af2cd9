/**
 * Turning per-class scores into the probability rows every classifier returns: the softmax of a row
 * of scores, and the spread of probabilities over the classes present in training into rows as wide
 * as the data set's classes (absent classes get probability 0).
 */

/**
 * Spreads probabilities over the present classes into rows of the data set's width: row-major
 * `rows × present.length` in, `rows × classCount` out, absent classes 0.
 */
export function spreadOverClasses(
  probabilities: Float64Array,
  rows: number,
  present: Int32Array,
  classCount: number,
): Float64Array {
  const width = present.length;
  if (width === classCount) return probabilities;
  const out = new Float64Array(rows * classCount);
  for (let i = 0; i < rows; i++) {
    for (let k = 0; k < width; k++) out[i * classCount + present[k]] = probabilities[i * width + k];
  }
  return out;
}

/** In place: each row of `scores` (`rows × width`) becomes its softmax. */
export function softmaxRows(scores: Float64Array, rows: number, width: number): Float64Array {
  for (let i = 0; i < rows; i++) {
    const offset = i * width;
    let max = -Infinity;
    for (let k = 0; k < width; k++) if (scores[offset + k] > max) max = scores[offset + k];
    let sum = 0;
    for (let k = 0; k < width; k++) {
      const e = Math.exp(scores[offset + k] - max);
      scores[offset + k] = e;
      sum += e;
    }
    for (let k = 0; k < width; k++) scores[offset + k] /= sum;
  }
  return scores;
}
