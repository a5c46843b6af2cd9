/** A train/test split: row indices into the data set. Splitters only yield these. */
export interface Split {
  train: Int32Array;
  test: Int32Array;
}

/**
 * The k splits of a fold assignment: split f tests the rows whose fold is f and trains on the rest,
 * both in increasing row order.
 * @param foldOf fold index of each row, in `0 .. folds − 1`
 */
export function splitsFromFoldOf(foldOf: Int32Array, folds: number): Split[] {
  const testSizes = new Int32Array(folds);
  for (const f of foldOf) testSizes[f]++;
  const splits: Split[] = [];
  for (let f = 0; f < folds; f++) {
    const test = new Int32Array(testSizes[f]);
    const train = new Int32Array(foldOf.length - testSizes[f]);
    for (let i = 0, t = 0, r = 0; i < foldOf.length; i++) {
      if (foldOf[i] === f) test[t++] = i;
      else train[r++] = i;
    }
    splits.push({ train, test });
  }
  return splits;
}
