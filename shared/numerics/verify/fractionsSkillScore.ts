/**
 * Fractions skill score (Roberts & Lean 2008, Mon. Wea. Rev. 136:78):
 * FSS = 1 − Σ(O − M)² / (ΣO² + ΣM²), sums over the whole grid, O and M the observed and
 * forecast neighbourhood fractions (neighbourhoodFractions.ts). Events are value ≥ threshold
 * (direction 'above', the default) or ≤ threshold ('below').
 * For an ensemble, M is the mean over members of the member fractions, which equals the
 * fraction field of the per-cell event probability k/N (the box mean is linear).
 */
import { eventField, exceedanceProbability } from '../ensemble/exceedance'
import type { Direction, EnsembleStack, Grid } from '../ensemble/stack'
import { neighbourhoodFractions } from './neighbourhoodFractions'

/** FSS of two fraction fields; NaN when neither has any event (0/0: undefined). */
export function fssOfFractions(observed: ArrayLike<number>, forecast: ArrayLike<number>): number {
  if (observed.length !== forecast.length) throw new Error('fraction fields differ in size')
  let mse = 0, ref = 0
  for (let k = 0; k < observed.length; k++) {
    const o = observed[k]!, m = forecast[k]!
    mse += (o - m) * (o - m)
    ref += o * o + m * m
  }
  return ref === 0 ? NaN : 1 - mse / ref
}

/** The "useful" level 0.5 + f₀/2 of Roberts & Lean (2008), f₀ the observed base rate. */
export function fssUsefulLevel(baseRate: number): number {
  return 0.5 + baseRate / 2
}

export interface FractionsSkill {
  /** FSS per neighbourhood size n (cells, odd). */
  fss: Map<number, number>
  /** 0.5 + f₀/2. */
  useful: number
  /** f₀: share of truth cells with an event. */
  baseRate: number
}

/**
 * FSS per neighbourhood size of a forecast ensemble (a single member = a deterministic field)
 * against the truth, both row-major nx×ny, with the useful level.
 */
export function fractionsSkill(truth: Grid, forecast: EnsembleStack, threshold: number, sizes: readonly number[], direction: Direction = 'above'): FractionsSkill {
  const { nx, ny } = forecast
  if (truth.length !== nx * ny) throw new Error(`truth has ${truth.length} cells, forecast ${nx}×${ny}`)
  const observed = eventField(truth, threshold, direction)
  let events = 0
  for (let k = 0; k < observed.length; k++) events += observed[k]!
  const probability = exceedanceProbability(forecast, threshold, direction)
  const fss = new Map<number, number>()
  for (const n of sizes) fss.set(n, fssOfFractions(neighbourhoodFractions(observed, nx, ny, n), neighbourhoodFractions(probability, nx, ny, n)))
  const baseRate = events / observed.length
  return { fss, useful: fssUsefulLevel(baseRate), baseRate }
}
