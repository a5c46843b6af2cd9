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
  const blocks = columns - (columns % 8);
  for (let q = 0; q < queryRows; q++) {
    const query = q * columns;
    let held = 0;
    let worst = Infinity; // the k-th smallest distance so far (Infinity until k are held)
    for (let t = 0; t < trainingRows; t++) {
      const d = squaredDistanceUpTo(queries, query, training, t * columns, columns, blocks, worst);
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

/**
 * The squared distance between the rows at `a[aStart]` and `b[bStart]`, summed column by column in
 * order; once a block of 8 columns leaves the sum at or above `worst`, that partial sum (the row
 * cannot enter). The blocks are written out, 8 columns a step, which V8 runs markedly faster than a
 * loop per column; the sum is the same, term by term and in the same order.
 */
function squaredDistanceUpTo(
  a: Float64Array,
  aStart: number,
  b: Float64Array,
  bStart: number,
  columns: number,
  blocks: number,
  worst: number,
): number {
  let d = 0;
  let j = 0;
  for (; j < blocks; j += 8) {
    const x = aStart + j;
    const y = bStart + j;
    const e0 = a[x] - b[y];
    const e1 = a[x + 1] - b[y + 1];
    const e2 = a[x + 2] - b[y + 2];
    const e3 = a[x + 3] - b[y + 3];
    const e4 = a[x + 4] - b[y + 4];
    const e5 = a[x + 5] - b[y + 5];
    const e6 = a[x + 6] - b[y + 6];
    const e7 = a[x + 7] - b[y + 7];
    d += e0 * e0;
    d += e1 * e1;
    d += e2 * e2;
    d += e3 * e3;
    d += e4 * e4;
    d += e5 * e5;
    d += e6 * e6;
    d += e7 * e7;
    if (d >= worst) return d;
  }
  for (; j < columns; j++) {
    const e = a[aStart + j] - b[bStart + j];
    d += e * e;
  }
  return d;
}
