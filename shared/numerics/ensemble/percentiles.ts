/**
 * Per-pixel ensemble percentiles by linear interpolation between order statistics
 * (Hyndman & Fan 1996 type 7, numpy's and R's default).
 */
import { quantileType7, type SortedStack } from './sortedStack'

/** The percentiles shown by default: 10th, 50th (median), 90th. */
export const DEFAULT_PERCENTILES = [10, 50, 90] as const

/**
 * One row-major nx·ny grid per requested percentile (each in [0, 100]), in the members' units.
 */
export function pixelPercentiles(sorted: SortedStack, percents: readonly number[] = DEFAULT_PERCENTILES): Float64Array[] {
  return percents.map((p) => {
    if (!(p >= 0 && p <= 100)) throw new Error(`percentile must be within [0, 100], got ${p}`)
    const out = new Float64Array(sorted.cells)
    for (let k = 0; k < sorted.cells; k++) out[k] = quantileType7(sorted.values, k * sorted.n, sorted.n, p / 100)
    return out
  })
}
