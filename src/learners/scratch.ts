/**
 * Work arrays reused from one fit to the next on the same thread.
 *
 * A learning curve runs hundreds of fits, each needing a standardized copy of the training rows, of
 * the held-out rows and other arrays as large as the data. Typed arrays live outside the JavaScript
 * heap, and V8 collects dead ones only after tens of MiB of them have piled up, so copies allocated
 * per fit would hold the process's memory well above what the fits need, in every thread. A fit
 * instead borrows its work arrays here: one per purpose and thread, grown to the largest length asked
 * for and then reused.
 *
 * What a borrowed array holds is valid only until the next borrowing for the same purpose on the same
 * thread, so only hand out arrays that do not outlive a call (never one returned to a caller or kept in
 * a model). Each worker thread has its own copy of this module, hence its own arrays; `releaseScratch`
 * lets the main thread give the memory back when a measurement ends.
 */

const doubles = new Map<string, Float64Array>();
const integers = new Map<string, Int32Array>();

/** Training rows the coming fits on this thread may reach: see {@link expectTrainingRows}. */
let expectedRows = 0;

/**
 * Says that the fits about to run on this thread train on at most `rows` rows: a fit task's largest
 * training size. Its sizes run in increasing order, so an array per training row that grew with each
 * size would leave an outgrown array per size behind, dead but uncollected (see above) and together
 * larger than the last; {@link scratchRowDoubles} allocates for this many rows at once instead.
 */
export function expectTrainingRows(rows: number): void {
  expectedRows = Number.isSafeInteger(rows) && rows > 0 ? rows : 0;
}

/**
 * A work array of `length` doubles for `purpose` (a name unique to one use, such as
 * "logistic.training"), with unspecified contents: the start of this thread's array for that purpose,
 * reallocated only when a longer one is asked for. A length that is not a whole number of at least 0
 * gives an empty array (the caller's own shape checks then report it).
 */
export function scratchDoubles(purpose: string, length: number): Float64Array {
  return borrow(doubles, Float64Array, purpose, length, length);
}

/** A work array of `length` 32-bit integers for `purpose`, as {@link scratchDoubles}. */
export function scratchIntegers(purpose: string, length: number): Int32Array {
  return borrow(integers, Int32Array, purpose, length, length);
}

/**
 * A work array of `rows × width` doubles for `purpose`, one row (of `width` values) per training row,
 * as {@link scratchDoubles}; when it must grow, it grows at once to the rows said by
 * {@link expectTrainingRows} when they are more.
 */
export function scratchRowDoubles(purpose: string, rows: number, width = 1): Float64Array {
  return borrow(doubles, Float64Array, purpose, rows * width, Math.max(rows, expectedRows) * width);
}

/** A work array of `rows × width` 32-bit integers for `purpose`, as {@link scratchRowDoubles}. */
export function scratchRowIntegers(purpose: string, rows: number, width = 1): Int32Array {
  return borrow(integers, Int32Array, purpose, rows * width, Math.max(rows, expectedRows) * width);
}

function borrow<T extends Float64Array | Int32Array>(
  arrays: Map<string, T>,
  Kind: new (length: number) => T,
  purpose: string,
  length: number,
  capacity: number,
): T {
  if (!(Number.isSafeInteger(length) && length >= 0)) return new Kind(0);
  let array = arrays.get(purpose);
  if (array === undefined || array.length < length) {
    array = new Kind(Number.isSafeInteger(capacity) && capacity > length ? capacity : length);
    arrays.set(purpose, array);
  }
  return array.subarray(0, length) as T;
}

/** Drops this thread's work arrays, so that they can be collected (they are reallocated when next asked for). */
export function releaseScratch(): void {
  doubles.clear();
  integers.clear();
  expectedRows = 0;
}
