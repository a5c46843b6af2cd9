/**
 * Summary statistics of plain number arrays, in one place for the forecast, the weighing and the
 * measured curve. Sums run left to right (no compensated summation), so every caller gets the same
 * rounding as before and outputs stay byte-identical.
 */

/** Arithmetic mean; 0 for no values. */
export function mean(values: readonly number[]): number {
  return values.length === 0 ? 0 : values.reduce((sum, v) => sum + v, 0) / values.length;
}

/** Sum of squared deviations from `centre`. */
function sumOfSquaredDeviations(values: readonly number[], centre: number): number {
  let squares = 0;
  for (const v of values) squares += (v - centre) ** 2;
  return squares;
}

/** Sample variance (divisor n − 1), or null with fewer than 2 values. */
export function sampleVariance(values: readonly number[]): number | null {
  if (values.length < 2) return null;
  return sumOfSquaredDeviations(values, mean(values)) / (values.length - 1);
}
