/**
 * Rank histogram (Talagrand diagram; Hamill 2001, Mon. Wea. Rev. 129:550): the rank of the truth
 * among the N members at every cell, counted into N + 1 bins (rank 0: truth below every member,
 * rank N: above every member). A calibrated ensemble gives a flat histogram in expectation.
 *
 * Ties (truth equal to some members, common for zero precipitation) are broken at random, as
 * Hamill (2001) recommends: with b members below and t equal, the rank is uniform on b … b + t.
 * The draw uses xoshiro128** (random/xoshiro128.ts) from `seed`, one uniform per tied cell in
 * row-major order, so the result is reproducible and tie-free cells consume no numbers.
 */
import type { SortedStack } from '../ensemble/sortedStack'
import { Xoshiro128 } from '../random/xoshiro128'

/** Index of the first value ≥ y (strict: `after` = true gives the first value > y) in sorted[lo, hi). */
function lowerBound(values: ArrayLike<number>, lo: number, hi: number, y: number, after: boolean): number {
  while (lo < hi) {
    const mid = (lo + hi) >>> 1
    if (values[mid]! < y || (after && values[mid]! === y)) lo = mid + 1
    else hi = mid
  }
  return lo
}

/** Counts per rank 0 … N of the truth (row-major, same cells) among a pixel-sorted stack. */
export function rankHistogram(sorted: SortedStack, truth: ArrayLike<number>, seed = 1): number[] {
  if (truth.length !== sorted.cells) throw new Error(`truth has ${truth.length} cells, forecast ${sorted.cells}`)
  const n = sorted.n
  const counts = new Array<number>(n + 1).fill(0)
  const rng = new Xoshiro128(seed)
  for (let c = 0; c < sorted.cells; c++) {
    const y = truth[c]!
    if (Number.isNaN(y)) throw new Error(`truth cell ${c} is missing`)
    const start = c * n
    const below = lowerBound(sorted.values, start, start + n, y, false) - start
    const notAbove = lowerBound(sorted.values, start + below, start + n, y, true) - start
    const ties = notAbove - below
    const rank = ties === 0 ? below : below + Math.floor(rng.nextDouble() * (ties + 1))
    counts[rank]!++
  }
  return counts
}
