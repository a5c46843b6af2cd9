/**
 * Fisher–Yates shuffle (Knuth, TAOCP vol. 2, §3.4.2, algorithm P) of a stretch of an Int32Array, in
 * place. It makes the same draws, in the same order, as `RandomStream.shuffle` on a plain array of
 * the same length, and so leaves the same order: the splitters moved from plain arrays to typed ones
 * without changing the folds or subsamples a seed gives.
 */
import type { RandomStream } from "../random.js";

/**
 * Shuffles `items[start .. end − 1]` in place; the rest of `items` is left alone.
 * @param start first position of the stretch (default 0)
 * @param end one past its last position (default `items.length`)
 */
export function shuffleRows(items: Int32Array, random: RandomStream, start = 0, end = items.length): void {
  for (let i = end - start - 1; i > 0; i--) {
    const j = random.integer(i + 1);
    const tmp = items[start + i];
    items[start + i] = items[start + j];
    items[start + j] = tmp;
  }
}
