/** A train/test split: row indices into the data set. Splitters only yield these. */
export interface Split {
  train: Int32Array;
  test: Int32Array;
}
