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

/**
 * A work array of `length` doubles for `purpose` (a name unique to one use, such as
 * "logistic.training"), with unspecified contents: the start of this thread's array for that purpose,
 * reallocated only when a longer one is asked for. A length that is not a whole number of at least 0
 * gives an empty array (the caller's own shape checks then report it).
 */
export function scratchDoubles(purpose: string, length: number): Float64Array {
  if (!(Number.isSafeInteger(length) && length >= 0)) return new Float64Array(0);
  let array = doubles.get(purpose);
  if (array === undefined || array.length < length) {
    array = new Float64Array(length);
    doubles.set(purpose, array);
  }
  return array.subarray(0, length);
}

/** A work array of `length` 32-bit integers for `purpose`, as {@link scratchDoubles}. */
export function scratchIntegers(purpose: string, length: number): Int32Array {
  if (!(Number.isSafeInteger(length) && length >= 0)) return new Int32Array(0);
  let array = integers.get(purpose);
  if (array === undefined || array.length < length) {
    array = new Int32Array(length);
    integers.set(purpose, array);
  }
  return array.subarray(0, length);
}

/** Drops this thread's work arrays, so that they can be collected (they are reallocated when next asked for). */
export function releaseScratch(): void {
  doubles.clear();
  integers.clear();
}
