/**
 * Continuous ranked probability score, CRPS(F, y) = ∫ (F(x) − 1{x ≥ y})² dx, in the variable's
 * units (Matheson & Winkler 1976; lower is better).
 *
 * Ensemble forms, with members x₁ … x_N:
 * - 'ensemble': CRPS of the empirical distribution of the members (Hersbach 2000, Wea.
 *   Forecasting 15:559): (1/N) Σ|xᵢ − y| − (1/(2N²)) Σᵢⱼ |xᵢ − xⱼ|.
 * - 'fair': Ferro (2014, QJRMS 140:1917): the spread term divided by 2N(N − 1) instead of 2N²,
 *   an unbiased estimate of the CRPS of the distribution the members are drawn from (N ≥ 2).
 * Σᵢⱼ|xᵢ − xⱼ| = 2 Σₖ (2k − N + 1) x₍ₖ₎ over the sorted members (k = 0 … N − 1), so each
 * cell costs a sort, O(N log N), instead of the O(N²) double sum.
 */
import type { SortedStack } from '../ensemble/sortedStack'
import { normalCdf, normalDensity } from './normalDistribution'

export type EnsembleCrpsKind = 'ensemble' | 'fair'

/**
 * CRPS for members already sorted ascending in sorted[offset … offset + n − 1].
 * 'fair' with a single member is undefined and returns NaN.
 */
export function crpsOfSorted(sorted: ArrayLike<number>, offset: number, n: number, y: number, kind: EnsembleCrpsKind): number {
  let absError = 0, spread = 0
  for (let k = 0; k < n; k++) {
    const x = sorted[offset + k]!
    absError += Math.abs(x - y)
    spread += (2 * k - n + 1) * x
  }
  if (kind === 'ensemble') return absError / n - spread / (n * n)
  return n < 2 ? NaN : absError / n - spread / (n * (n - 1))
}

/** CRPS of one ensemble (any order) against the verifying value y. */
export function ensembleCrps(members: ArrayLike<number>, y: number, kind: EnsembleCrpsKind): number {
  const sorted = Float64Array.from(members).sort()
  return crpsOfSorted(sorted, 0, sorted.length, y, kind)
}

/**
 * Mean over cells of the ensemble CRPS of a pixel-sorted stack (ensemble/sortedStack.ts)
 * against the truth field (row-major, same cells); also returns the per-cell map.
 */
export function ensembleCrpsField(sorted: SortedStack, truth: ArrayLike<number>, kind: EnsembleCrpsKind): { mean: number; perCell: Float64Array } {
  if (truth.length !== sorted.cells) throw new Error(`truth has ${truth.length} cells, forecast ${sorted.cells}`)
  const perCell = new Float64Array(sorted.cells)
  let sum = 0
  for (let c = 0; c < sorted.cells; c++) {
    perCell[c] = crpsOfSorted(sorted.values, c * sorted.n, sorted.n, truth[c]!, kind)
    sum += perCell[c]!
  }
  return { mean: sum / sorted.cells, perCell }
}

/**
 * CRPS of a normal distribution N(μ, σ²) (Gneiting et al. 2005, Mon. Wea. Rev. 133:1098):
 * σ [z(2Φ(z) − 1) + 2φ(z) − 1/√π], z = (y − μ)/σ; σ = 0 gives |y − μ|.
 */
export function gaussianCrps(mu: number, sigma: number, y: number): number {
  if (!(sigma >= 0)) throw new Error(`sigma must be ≥ 0, got ${sigma}`)
  if (sigma === 0) return Math.abs(y - mu)
  const z = (y - mu) / sigma
  return sigma * (z * (2 * normalCdf(z) - 1) + 2 * normalDensity(z) - 1 / Math.sqrt(Math.PI))
}
