/**
 * Per-pixel ensemble mean and spread. Spread is the sample standard deviation with
 * divisor N − 1 (the unbiased-variance convention); computed in two passes
 * (mean first, then squared deviations) to avoid the cancellation of Σx² − N·x̄².
 */
import type { EnsembleStack } from './stack'

/** Ensemble mean per pixel, row-major nx·ny, in the members' units. */
export function ensembleMean(stack: EnsembleStack): Float64Array {
  const cells = stack.nx * stack.ny
  const mean = new Float64Array(cells)
  for (const grid of stack.members) for (let k = 0; k < cells; k++) mean[k]! += grid[k]!
  const n = stack.members.length
  for (let k = 0; k < cells; k++) mean[k] = mean[k]! / n
  return mean
}

/**
 * Ensemble spread per pixel: sqrt(Σ(x − x̄)² / (N − 1)), in the members' units.
 * With a single member the spread is undefined and every cell is NaN.
 * Pass the mean if it is already computed.
 */
export function ensembleSpread(stack: EnsembleStack, mean = ensembleMean(stack)): Float64Array {
  const cells = stack.nx * stack.ny
  const n = stack.members.length
  const spread = new Float64Array(cells)
  if (n < 2) return spread.fill(NaN)
  for (const grid of stack.members) {
    for (let k = 0; k < cells; k++) { const d = grid[k]! - mean[k]!; spread[k]! += d * d }
  }
  for (let k = 0; k < cells; k++) spread[k] = Math.sqrt(spread[k]! / (n - 1))
  return spread
}
