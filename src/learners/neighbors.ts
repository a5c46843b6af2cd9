/**
 * Exact k-nearest-neighbor search in Euclidean distance, shared by the k-NN classifier and regressor.
 *
 * For each query row it scans the training rows in order and keeps the k smallest squared distances
 * in a sorted list; a training row enters only when strictly nearer than the current k-th, so among
 * rows at the same distance the earlier training row wins, as in scikit-learn's neighbor heaps. A
 * row's distance sum stops as soon as it exceeds the current k-th distance (the sum of squares only
 * grows, so this never changes the result). Queries are searched four at a time (see `group`), and
 * on rows of 64 columns or more eight at a time by a WebAssembly kernel (distanceKernel.ts); each
 * query's distances are summed column by column in order on every path, so the neighbors are the same.
 *
 * Written by hand because the npm package ml-knn takes seconds on 2000 × 60 rows × columns when tried;
 * brute force over raw Float64Arrays needs no index structure, which at the sizes a
 * learning curve fits (hundreds to tens of thousands of rows) would cost more to build than it saves.
 */

import { DistanceTable, queriesPerGroup } from "./distanceKernel.js";

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
  if (columns >= kernelColumns && trainingRows > 0) {
    searchWithKernel(training, trainingRows, queries, queryRows, columns, k, out);
    return out;
  }
  const held = new Int32Array(group);
  const worst = new Float64Array(group); // each query's k-th smallest distance so far (Infinity until k are held)
  const distances = new Float64Array(group * k);
  const indices = new Int32Array(group * k);
  const found = new Float64Array(group);
  const blocks = columns - (columns % 8);
  for (let first = 0; first < queryRows; first += group) {
    const size = Math.min(group, queryRows - first);
    held.fill(0);
    worst.fill(Infinity);
    for (let t = 0; t < trainingRows; t++) {
      if (size === group) {
        squaredDistancesOfFour(queries, first * columns, columns, training, t * columns, blocks, worst, found);
      } else {
        for (let g = 0; g < size; g++) {
          found[g] = squaredDistanceUpTo(
            queries,
            (first + g) * columns,
            training,
            t * columns,
            columns,
            blocks,
            worst[g],
          );
        }
      }
      for (let g = 0; g < size; g++) {
        const d = found[g];
        if (d >= worst[g]) continue;
        held[g] = insertNearest(distances, indices, g * k, held[g], k, d, t);
        if (held[g] === k) worst[g] = distances[g * k + k - 1];
      }
    }
    for (let g = 0; g < size; g++) out.set(indices.subarray(g * k, g * k + k), (first + g) * k);
  }
  return out;
}

/**
 * Puts training row `t` at distance `d` into one query's sorted list of the nearest so far (the `k`
 * entries from `base`, `held` of them filled), after every held distance ≤ d so that equal distances
 * keep training order; the farthest drops out when the list is full. `d` must be below the k-th
 * distance when the list is full. Returns the new number held.
 */
function insertNearest(
  distances: Float64Array,
  indices: Int32Array,
  base: number,
  held: number,
  k: number,
  d: number,
  t: number,
): number {
  let position = held < k ? held : k - 1;
  while (position > 0 && distances[base + position - 1] > d) {
    distances[base + position] = distances[base + position - 1];
    indices[base + position] = indices[base + position - 1];
    position--;
  }
  distances[base + position] = d;
  indices[base + position] = t;
  return held < k ? held + 1 : k;
}

/**
 * Columns from which the distances are computed by the WebAssembly kernel (distanceKernel.ts), which
 * gives the same sums; on fewer, copying the rows into its memory costs more than it saves, and the
 * plain search's early stop saves more.
 */
const kernelColumns = 64;

/** {@link nearestNeighbors} with the distances from the WebAssembly kernel, eight queries at a time. */
function searchWithKernel(
  training: Float64Array,
  trainingRows: number,
  queries: Float64Array,
  queryRows: number,
  columns: number,
  k: number,
  out: Int32Array,
): void {
  const table = new DistanceTable(training, trainingRows, columns);
  const distances = new Float64Array(k);
  const indices = new Int32Array(k);
  for (let first = 0; first < queryRows; first += queriesPerGroup) {
    const count = Math.min(queriesPerGroup, queryRows - first);
    const found = table.distances(queries, first, count);
    for (let g = 0; g < count; g++) {
      let held = 0;
      let worst = Infinity;
      for (let t = 0; t < trainingRows; t++) {
        const d = found[t * queriesPerGroup + g];
        if (d >= worst) continue;
        held = insertNearest(distances, indices, 0, held, k, d, t);
        if (held === k) worst = distances[k - 1];
      }
      out.set(indices.subarray(0, k), (first + g) * k);
    }
  }
}

/**
 * Queries searched together: each pass over a training row serves this many of them, and their four
 * sums overlap in the processor. On wide data (thousands of columns) the training rows do not fit in the
 * processor's nearer caches; measured on 48 queries against 192 training rows of 5,000 columns, the
 * search took about a quarter less time than one query at a time.
 */
const group = 4;

/**
 * The squared distances from four consecutive query rows (from `queries[qStart]`) to the training row at
 * `b[bStart]`, into `found`: each the sum {@link squaredDistanceUpTo} gives, term by term and in the same
 * order, except that the pass stops once every one of the four is at or above its `worst` (none can enter).
 * The four sums are independent, so the processor overlaps their additions.
 */
function squaredDistancesOfFour(
  queries: Float64Array,
  qStart: number,
  columns: number,
  b: Float64Array,
  bStart: number,
  blocks: number,
  worst: Float64Array,
  found: Float64Array,
): void {
  const a0 = qStart;
  const a1 = a0 + columns;
  const a2 = a1 + columns;
  const a3 = a2 + columns;
  const w0 = worst[0];
  const w1 = worst[1];
  const w2 = worst[2];
  const w3 = worst[3];
  let d0 = 0;
  let d1 = 0;
  let d2 = 0;
  let d3 = 0;
  let j = 0;
  for (; j < blocks; j += 8) {
    for (let i = j; i < j + 8; i += 2) {
      const v = b[bStart + i];
      const u = b[bStart + i + 1];
      const e0 = queries[a0 + i] - v;
      const e1 = queries[a1 + i] - v;
      const e2 = queries[a2 + i] - v;
      const e3 = queries[a3 + i] - v;
      const f0 = queries[a0 + i + 1] - u;
      const f1 = queries[a1 + i + 1] - u;
      const f2 = queries[a2 + i + 1] - u;
      const f3 = queries[a3 + i + 1] - u;
      d0 += e0 * e0;
      d1 += e1 * e1;
      d2 += e2 * e2;
      d3 += e3 * e3;
      d0 += f0 * f0;
      d1 += f1 * f1;
      d2 += f2 * f2;
      d3 += f3 * f3;
    }
    if (d0 >= w0 && d1 >= w1 && d2 >= w2 && d3 >= w3) break;
  }
  if (j >= blocks) {
    for (; j < columns; j++) {
      const v = b[bStart + j];
      const e0 = queries[a0 + j] - v;
      const e1 = queries[a1 + j] - v;
      const e2 = queries[a2 + j] - v;
      const e3 = queries[a3 + j] - v;
      d0 += e0 * e0;
      d1 += e1 * e1;
      d2 += e2 * e2;
      d3 += e3 * e3;
    }
  }
  found[0] = d0;
  found[1] = d1;
  found[2] = d2;
  found[3] = d3;
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
