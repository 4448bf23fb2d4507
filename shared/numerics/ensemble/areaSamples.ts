/**
 * Joint-sample statistics of an area: for every sample m (one scenario, the same index across
 * lead times), the area maximum, minimum and weighted mean. Area probabilities must come from
 * these joint values, never from per-pixel marginals (GUIDE §4): P(max ≥ T) depends on the
 * correlation between cells, which the marginals do not carry.
 */
import type { AreaMask } from './areaMask'
import type { EnsembleStack } from './stack'

/** Per-sample area statistics (length N each), threshold-independent. */
export interface AreaSamples {
  /** Area maximum of each sample (over the window: the largest over lead times). */
  max: Float64Array
  /** Area minimum of each sample (over the window: the smallest over lead times). */
  min: Float64Array
  /** Weighted area mean of each sample; over a window, its largest value over lead times. */
  meanMax: Float64Array
  /** Weighted area mean of each sample; over a window, its smallest value over lead times. */
  meanMin: Float64Array
}

/** Area maximum, minimum and weighted mean Σwx/Σw of each sample of one lead time. */
export function areaSamples(stack: EnsembleStack, mask: AreaMask): AreaSamples {
  if (stack.nx !== mask.nx || stack.ny !== mask.ny) throw new Error(`area mask is ${mask.nx}×${mask.ny}, grid is ${stack.nx}×${stack.ny}`)
  const n = stack.members.length
  const max = new Float64Array(n)
  const min = new Float64Array(n)
  const mean = new Float64Array(n)
  const { cells, weights, totalWeight } = mask
  stack.members.forEach((grid, m) => {
    let hi = -Infinity
    let lo = Infinity
    let s = 0
    for (let c = 0; c < cells.length; c++) {
      const v = grid[cells[c]!]!
      if (v > hi) hi = v
      if (v < lo) lo = v
      s += weights[c]! * v
    }
    max[m] = hi
    min[m] = lo
    mean[m] = s / totalWeight
  })
  return { max, min, meanMax: mean, meanMin: mean }
}

/**
 * Combines sample-aligned area statistics of several lead times into a time window:
 * max over t of the maxima, min of the minima, and the largest / smallest area mean.
 * P(anywhere, at any time in the window) then follows from the combined max (or min).
 */
export function windowAreaSamples(perLead: readonly AreaSamples[]): AreaSamples {
  if (perLead.length === 0) throw new Error('a time window needs at least one lead time')
  const n = perLead[0]!.max.length
  perLead.forEach((s, t) => { if (s.max.length !== n) throw new Error(`lead time ${t} has ${s.max.length} samples, expected ${n}`) })
  const max = Float64Array.from(perLead[0]!.max)
  const min = Float64Array.from(perLead[0]!.min)
  const meanMax = Float64Array.from(perLead[0]!.meanMax)
  const meanMin = Float64Array.from(perLead[0]!.meanMin)
  for (let t = 1; t < perLead.length; t++) {
    const s = perLead[t]!
    for (let m = 0; m < n; m++) {
      if (s.max[m]! > max[m]!) max[m] = s.max[m]!
      if (s.min[m]! < min[m]!) min[m] = s.min[m]!
      if (s.meanMax[m]! > meanMax[m]!) meanMax[m] = s.meanMax[m]!
      if (s.meanMin[m]! < meanMin[m]!) meanMin[m] = s.meanMin[m]!
    }
  }
  return { max, min, meanMax, meanMin }
}
