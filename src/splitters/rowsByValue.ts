/**
 * Rows grouped by the value of a per-row integer (class or run), held in typed arrays: one pass to
 * count, one to place (a counting sort, Knuth, TAOCP vol. 3, §5.2, algorithm D). The splitters use it
 * instead of a map from value to a list of rows, so that a data set of many rows costs a few flat
 * integer arrays rather than one growing JavaScript array per value and one object per row.
 */

/** The rows of each distinct value, values in increasing order, rows in their given order. */
export interface RowsByValue {
  /** The distinct values, in increasing order. */
  values: Int32Array;
  /** `rows.subarray(starts[v], starts[v + 1])` are the rows of `values[v]`; one entry more than `values`. */
  starts: Int32Array;
  /** The rows, those of each value together, each value's rows in the order they were given. */
  rows: Int32Array;
  /** `valueIndex[i]`: position in `values` of the value of the i-th given row. */
  valueIndex: Int32Array;
}

/**
 * Groups rows by `valueOf[row]`.
 *
 * When the values span a range no wider than a few times the number of rows (class and run indices
 * always do), each row finds its value's position through a table over that range; otherwise through
 * a binary search of the sorted distinct values. Both give the same result.
 * @param valueOf value of every row of the data set
 * @param rows the rows to group (a training pool); all rows `0 .. valueOf.length − 1` when omitted
 */
export function rowsByValue(valueOf: Int32Array, rows?: Int32Array): RowsByValue {
  const count = rows === undefined ? valueOf.length : rows.length;
  const given = rows ?? Int32Array.from({ length: count }, (_, i) => i);
  const valueIndex = new Int32Array(count);
  let values: Int32Array;
  if (count === 0) {
    values = new Int32Array(0);
  } else {
    let min = valueOf[given[0]];
    let max = min;
    for (let i = 1; i < count; i++) {
      const value = valueOf[given[i]];
      if (value < min) min = value;
      else if (value > max) max = value;
    }
    const span = max - min + 1;
    if (span <= 4 * count + 1024) {
      // Dense values: a table from value − min to its position among the distinct values.
      const positionOf = new Int32Array(span).fill(-1);
      for (let i = 0; i < count; i++) positionOf[valueOf[given[i]] - min] = 0;
      let distinct = 0;
      for (let v = 0; v < span; v++) if (positionOf[v] === 0) positionOf[v] = distinct++;
      values = new Int32Array(distinct);
      for (let v = 0; v < span; v++) if (positionOf[v] >= 0) values[positionOf[v]] = v + min;
      for (let i = 0; i < count; i++) valueIndex[i] = positionOf[valueOf[given[i]] - min];
    } else {
      // Sparse values: sort a copy (numeric order for typed arrays), keep each value once, search.
      const sorted = Int32Array.from({ length: count }, (_, i) => valueOf[given[i]]).sort();
      let distinct = 0;
      for (let i = 0; i < count; i++) if (i === 0 || sorted[i] !== sorted[i - 1]) sorted[distinct++] = sorted[i];
      values = sorted.slice(0, distinct);
      for (let i = 0; i < count; i++) {
        const value = valueOf[given[i]];
        let low = 0;
        let high = distinct - 1;
        while (low < high) {
          const middle = (low + high) >>> 1;
          if (values[middle] < value) low = middle + 1;
          else high = middle;
        }
        valueIndex[i] = low;
      }
    }
  }
  const starts = new Int32Array(values.length + 1);
  for (let i = 0; i < count; i++) starts[valueIndex[i] + 1]++;
  for (let v = 0; v < values.length; v++) starts[v + 1] += starts[v];
  const next = starts.slice(0, values.length);
  const grouped = new Int32Array(count);
  for (let i = 0; i < count; i++) grouped[next[valueIndex[i]]++] = given[i];
  return { values, starts, rows: grouped, valueIndex };
}
