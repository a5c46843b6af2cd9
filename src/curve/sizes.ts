/**
 * Training sizes of a learning curve: the one place where fractions become absolute row counts.
 */

/** The smallest training size worth fitting: at least 10 rows (common practice) and enough for about
 * two rows of the rarest class in a stratified draw. */
export function smallestSensibleSize(classCounts: number[]): number {
  const rows = classCounts.reduce((a, b) => a + b, 0);
  const rarest = Math.min(...classCounts.filter((c) => c > 0));
  return Math.max(10, Math.ceil((2 * rows) / rarest));
}

/** The smallest training size worth fitting for a numeric target: 10 rows (common practice). */
export const smallestSensibleRegressionSize = 10;

/**
 * `count` sizes spaced evenly on a log scale from `smallest` to `largest` (both included), rounded to
 * whole rows and made strictly increasing. Learning curves are close to straight on log axes, so
 * geometric spacing spreads the information evenly along the curve.
 */
export function geometricSizes(smallest: number, largest: number, count = 8): number[] {
  if (largest <= smallest) return [largest];
  const sizes: number[] = [];
  for (let i = 0; i < count; i++) {
    const size = Math.round(smallest * Math.pow(largest / smallest, i / (count - 1)));
    if (sizes.length === 0 || size > sizes[sizes.length - 1]) sizes.push(size);
  }
  return sizes;
}
