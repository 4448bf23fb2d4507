/**
 * Thresholds given as percentiles of the truth field: linear interpolation between order
 * statistics (Hyndman & Fan 1996 type 7, numpy's default), p in [0, 100], in the field's units.
 */
import { quantileType7 } from '../ensemble/sortedStack'

/** The p-th percentile of all cells of a complete field. */
export function percentileThreshold(truth: ArrayLike<number>, percent: number): number {
  if (!(percent >= 0 && percent <= 100)) throw new Error(`percentile must be within [0, 100], got ${percent}`)
  if (truth.length === 0) throw new Error('cannot take a percentile of an empty field')
  const sorted = Float64Array.from(truth).sort()
  if (Number.isNaN(sorted[sorted.length - 1])) throw new Error('field has missing values')
  return quantileType7(sorted, 0, sorted.length, percent / 100)
}
