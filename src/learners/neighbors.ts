/**
 * Exact k-nearest-neighbor search in Euclidean distance, shared by the k-NN classifier and regressor.
 *
 * The squared distances from each query row to every training row come from a WebAssembly SIMD kernel
 * (distanceKernel.ts), eight queries at a time, each summed column by column in order. For each query
 * the training rows are then scanned in order, keeping the k smallest distances in a sorted list; a
 * training row enters only when strictly nearer than the current k-th, so among rows at the same
 * distance the earlier training row wins, as in scikit-learn's neighbor heaps.
 *
 * Written by hand because the npm package ml-knn takes seconds on 2000 × 60 rows × columns when tried;
 * brute force needs no index structure, which at the sizes a learning curve fits (hundreds to tens of
 * thousands of rows) would cost more to build than it saves. Measured against the plain JavaScript
 * search this replaced (one or four queries per pass over the training rows, each distance stopped
 * once it passed the current k-th), the kernel took 0.2 to 0.4 of the time, from 8 columns (2,000
 * training rows, 500 queries) to 5,000 (192 rows, 48 queries), with the same neighbors.
 */

import { DistanceTable, queriesPerGroup } from "./distanceKernel.js";

/**
 * The k nearest training rows of each query row.
 * @param training row-major `trainingRows × columns`
 * @param queries row-major `queryRows × columns`
 * @param k neighbors per query, at most `trainingRows`
 * @returns row-major `queryRows × k` training row indices, nearest first (ties: lower index first)
 * @throws FitError when the training rows do not fit in a WebAssembly memory (4 GiB).
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
  if (k === 0) return out;
  const table = new DistanceTable(training, trainingRows, columns);
  const distances = new Float64Array(k);
  const indices = new Int32Array(k);
  for (let first = 0; first < queryRows; first += queriesPerGroup) {
    const count = Math.min(queriesPerGroup, queryRows - first);
    const found = table.distances(queries, first, count);
    for (let g = 0; g < count; g++) {
      let held = 0;
      let worst = Infinity; // the k-th smallest distance so far (Infinity until k are held)
      for (let t = 0; t < trainingRows; t++) {
        const d = found[t * queriesPerGroup + g];
        if (d >= worst) continue;
        held = insertNearest(distances, indices, held, k, d, t);
        if (held === k) worst = distances[k - 1];
      }
      out.set(indices.subarray(0, k), (first + g) * k);
    }
  }
  return out;
}

/**
 * Puts training row `t` at distance `d` into the sorted list of the nearest so far (`k` entries,
 * `held` of them filled), after every held distance ≤ d so that equal distances keep training order;
 * the farthest drops out when the list is full (`d` must then be below it). Returns the number held.
 */
function insertNearest(
  distances: Float64Array,
  indices: Int32Array,
  held: number,
  k: number,
  d: number,
  t: number,
): number {
  let position = held < k ? held : k - 1;
  while (position > 0 && distances[position - 1] > d) {
    distances[position] = distances[position - 1];
    indices[position] = indices[position - 1];
    position--;
  }
  distances[position] = d;
  indices[position] = t;
  return held < k ? held + 1 : k;
}
