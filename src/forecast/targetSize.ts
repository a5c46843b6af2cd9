/**
 * The inverse question: how many training samples until the score reaches a target?
 *
 * Two answers, both the smallest whole training size found by a search on a log-spaced grid from the
 * smallest measured size up to `searchRatio` times the largest, refined by bisection between the
 * last grid size short of the target and the first one reaching it:
 * - `expected`: where the expected score (the combined forecast) first reaches the target;
 * - `withConfidence`: where the share of drawn curves reaching the target first is at least
 *   `confidence`, i.e. the forecast gives the target at least that probability.
 * Either is null when the target is not reached within the search.
 */
import type { TargetSizeAnswer } from "./forecastFile.js";

/** The search stops at this multiple of the largest measured size. */
export const searchRatio = 10_000;
/** Grid points of the search. */
const gridPoints = 400;

/**
 * Answers the inverse question.
 * @param expectedAt oriented expected value at a size
 * @param drawsAt oriented values of every draw at a size
 * @param orientedTarget the target in oriented units (sign · target)
 */
export function targetSize(
  target: number,
  confidence: number,
  orientedTarget: number,
  expectedAt: (size: number) => number,
  drawsAt: (size: number) => number[],
  smallestMeasured: number,
  largestMeasured: number,
): TargetSizeAnswer {
  const searchedUpTo = Math.round(searchRatio * largestMeasured);
  const reachesExpected = (size: number): boolean => expectedAt(size) >= orientedTarget;
  const reachesConfidently = (size: number): boolean => {
    const values = drawsAt(size);
    let hits = 0;
    for (const value of values) if (value >= orientedTarget) hits++;
    return values.length > 0 && hits / values.length >= confidence;
  };
  return {
    target,
    confidence,
    expected: smallestReaching(reachesExpected, smallestMeasured, searchedUpTo),
    withConfidence: smallestReaching(reachesConfidently, smallestMeasured, searchedUpTo),
    searchedUpTo,
  };
}

/** Smallest whole size in [from, to] where `reaches` first holds on the grid, refined; else null. */
function smallestReaching(reaches: (size: number) => boolean, from: number, to: number): number | null {
  const start = Math.max(1, Math.ceil(from));
  if (reaches(start)) return start;
  const step = Math.log(to / start) / (gridPoints - 1);
  let below = start;
  for (let k = 1; k < gridPoints; k++) {
    const size = k === gridPoints - 1 ? to : Math.max(below + 1, Math.round(start * Math.exp(step * k)));
    if (size <= below) continue;
    if (reaches(size)) {
      // Bisection on whole sizes between `below` (short) and `size` (reaching).
      let low = below;
      let high = size;
      while (high - low > 1) {
        const middle = Math.floor((low + high) / 2);
        if (reaches(middle)) high = middle;
        else low = middle;
      }
      return high;
    }
    below = size;
  }
  return null;
}
