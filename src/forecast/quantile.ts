/**
 * Quantile of sorted values by linear interpolation between order statistics (Hyndman and Fan 1996,
 * "Sample quantiles in statistical packages", definition 7; the default of R and NumPy).
 *
 * @example
 * quantileSorted([1, 2, 3, 4], 0.5) // 2.5
 */
export function quantileSorted(sorted: readonly number[], probability: number): number {
  const position = (sorted.length - 1) * probability;
  const below = Math.floor(position);
  const above = Math.min(below + 1, sorted.length - 1);
  return sorted[below] + (position - below) * (sorted[above] - sorted[below]);
}
