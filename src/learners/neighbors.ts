/**
 * Exact k-nearest-neighbor search in Euclidean distance, shared by the k-NN classifier and regressor.
 *
 * For each query row it scans the training rows in order and keeps the k smallest squared distances
 * in a sorted list; a training row enters only when strictly nearer than the current k-th, so among
 * rows at the same distance the earlier training row wins, as in scikit-learn's neighbor heaps. A
 * row's distance sum stops as soon as it exceeds the current k-th distance (the sum of squares only
 * grows, so this never changes the result).
 *
 * Written by hand because the npm package ml-knn takes seconds on 2000 × 60 rows × columns when tried;
 * brute force over raw Float64Arrays needs no index structure, which at the sizes a
 * learning curve fits (hundreds to tens of thousands of rows) would cost more to build than it saves.
 */

/**
 * The k nearest training rows of each query row.
 * @param training row-major `trainingRows × columns`
 * @param queries row-major `queryRows × columns`
 * @param k neighbors per query, at most `trainingRows`
 * @returns row-major `queryRows × k` training row indices, nearest first (ties: lower index first)
 */
export function nearestNeighbors(
  training: Float64Array,
  trainingRows: number,
  queries: Float64Array,
  queryRows: number,
  columns: number,
  k: number,
): Int32Array {
  const out = new Int32Array(queryRows * k);
  const distances = new Float64Array(k);
  const indices = new Int32Array(k);
  for (let q = 0; q < queryRows; q++) {
    const query = q * columns;
    let held = 0;
    let worst = Infinity; // the k-th smallest distance so far (Infinity until k are held)
    for (let t = 0; t < trainingRows; t++) {
      const row = t * columns;
      let d = 0;
      let j = 0;
      // Partial sums in blocks of 8 columns, abandoning the row once it cannot enter.
      while (j < columns) {
        const end = Math.min(columns, j + 8);
        for (; j < end; j++) {
          const diff = queries[query + j] - training[row + j];
          d += diff * diff;
        }
        if (d >= worst) break;
      }
      if (d >= worst) continue;
      // Insert after every held distance ≤ d, so equal distances keep training order.
      let position = held < k ? held : k - 1;
      while (position > 0 && distances[position - 1] > d) {
        distances[position] = distances[position - 1];
        indices[position] = indices[position - 1];
        position--;
      }
      distances[position] = d;
      indices[position] = t;
      if (held < k) held++;
      if (held === k) worst = distances[k - 1];
    }
    out.set(indices.subarray(0, k), q * k);
  }
  return out;
}
