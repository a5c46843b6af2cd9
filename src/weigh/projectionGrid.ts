/**
 * The forecast's projections as a grid in training size, read at any size between them.
 *
 * A forecast projects to fixed training sizes only; a run with an uncertain yield (or a yield scaled
 * for sensitivity) lands between them. The score at such a size is interpolated linearly in
 * log(trainingSize) between the two neighboring projections, draw by draw, so draw j stays one
 * plausible curve. A learning curve is smooth and close to linear in log(size) over the short spans
 * between neighboring projections, which is what makes this a fair approximation; at a projected
 * size the value is exact.
 *
 * A forecast that stores its curves (`curves`, storedCurves.ts) is read exactly at any size instead:
 * at a projected size the projection's own values (the same numbers), elsewhere the stored curves
 * evaluated there, so every size is covered and nothing is interpolated.
 */
import type { ForecastFile } from "../forecast/forecastFile.js";
import { forecastCurves, type ForecastCurves } from "../forecast/storedCurves.js";

export class ProjectionGrid {
  /** Projected training sizes, ascending. */
  readonly sizes: number[];
  private readonly logSizes: number[];
  private readonly projected: Set<number>;
  private readonly expectedValues: number[];
  private readonly intervals: { lower: number; upper: number }[];
  /** draws[i][j]: draw j at sizes[i]. */
  private readonly drawValues: number[][];
  /** Draws per projection (1 when the forecast has none: the expected score stands in). */
  readonly drawCount: number;
  /** The stored curves, when the forecast has them. */
  private readonly curves: ForecastCurves | undefined;

  constructor(forecast: ForecastFile) {
    const projections = [...forecast.projections].sort((a, b) => a.trainingSize - b.trainingSize);
    this.sizes = projections.map((p) => p.trainingSize);
    this.logSizes = this.sizes.map(Math.log);
    this.projected = new Set(this.sizes);
    this.expectedValues = projections.map((p) => p.expected);
    this.intervals = projections.map((p) => ({ lower: p.lower, upper: p.upper }));
    const counts = projections.map((p) => p.draws.length);
    // Draw j of every projection comes from refit j, so all should have as many; use the common part.
    const common = counts.length === 0 ? 0 : Math.min(...counts);
    this.drawCount = Math.max(1, common);
    this.drawValues = projections.map((p) => (common === 0 ? [p.expected] : p.draws.slice(0, common)));
    const curves = forecastCurves(forecast);
    // Stored curves stand for the projections' draws only when they are the same draws.
    this.curves =
      curves !== undefined && (projections.length === 0 || curves.drawCount === common) ? curves : undefined;
    if (projections.length === 0 && this.curves !== undefined) this.drawCount = this.curves.drawCount;
  }

  /** Whether the forecast can be read at any size (it stores its curves), not only between projections. */
  get readsAnySize(): boolean {
    return this.curves !== undefined;
  }

  /** Whether `size` can be read: within the projected sizes, or anywhere with stored curves. */
  covers(size: number): boolean {
    if (this.curves !== undefined) return size > 0;
    return this.sizes.length > 0 && size >= this.sizes[0] && size <= this.sizes[this.sizes.length - 1];
  }

  /** The projection's interval when `size` is one of the projected sizes. */
  projectionAt(size: number): { lower: number; upper: number } | undefined {
    const index = this.sizes.indexOf(size);
    return index < 0 ? undefined : this.intervals[index];
  }

  /** The point forecast's expected score at `size`. */
  expectedAt(size: number): number {
    if (this.curves !== undefined && !this.isProjected(size)) return this.curves.expectedAt(size);
    return this.interpolate(size, (i) => this.expectedValues[i]);
  }

  /** Draw j of the expected score at `size`. */
  drawAt(size: number, draw: number): number {
    if (this.curves !== undefined && !this.isProjected(size)) return this.curves.drawAt(size, draw);
    return this.interpolate(size, (i) => this.drawValues[i][draw]);
  }

  private isProjected(size: number): boolean {
    return this.projected.has(size);
  }

  /**
   * Linear interpolation in log(size) between the neighboring projections.
   * @throws RangeError when `size` lies outside the projected sizes (callers check `covers` first)
   */
  private interpolate(size: number, valueAt: (index: number) => number): number {
    const sizes = this.sizes;
    if (!this.covers(size)) throw new RangeError(`training size ${size} lies outside the projections`);
    // Binary search for the last index with sizes[index] <= size.
    let low = 0;
    let high = sizes.length - 1;
    while (low < high) {
      const middle = (low + high + 1) >> 1;
      if (sizes[middle] <= size) low = middle;
      else high = middle - 1;
    }
    if (sizes[low] === size || low === sizes.length - 1) return valueAt(low);
    const t = (Math.log(size) - this.logSizes[low]) / (this.logSizes[low + 1] - this.logSizes[low]);
    const left = valueAt(low);
    return left + t * (valueAt(low + 1) - left);
  }
}
