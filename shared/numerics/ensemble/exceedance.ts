/**
 * Per-pixel exceedance probability of an ensemble: the share of members (or samples)
 * whose value crosses the threshold (GUIDE §4; the standard ensemble relative frequency).
 */
import type { Direction, EnsembleStack, Grid } from './stack'

/**
 * Binary event field of one grid: out[k] = 1 when grid[k] crosses T, else 0.
 * 'above' means x ≥ T, 'below' means x ≤ T. Row-major, same layout as the input.
 */
export function eventField(grid: Grid, threshold: number, direction: Direction, out = new Uint8Array(grid.length)): Uint8Array {
  if (direction === 'above') for (let k = 0; k < grid.length; k++) out[k] = +(grid[k]! >= threshold)
  else for (let k = 0; k < grid.length; k++) out[k] = +(grid[k]! <= threshold)
  return out
}

/**
 * P(event) per pixel = (number of members with x ≥ T, or x ≤ T for 'below') / N.
 * Returns a row-major Float64Array of nx·ny probabilities, each a multiple of 1/N.
 */
export function exceedanceProbability(stack: EnsembleStack, threshold: number, direction: Direction): Float64Array {
  const cells = stack.nx * stack.ny
  const counts = new Int32Array(cells)
  // Branch-free counting: the comparison outcome is added as 0/1 (random fields defeat branch prediction).
  for (const grid of stack.members) {
    if (direction === 'above') for (let k = 0; k < cells; k++) counts[k]! += +(grid[k]! >= threshold)
    else for (let k = 0; k < cells; k++) counts[k]! += +(grid[k]! <= threshold)
  }
  const n = stack.members.length
  const out = new Float64Array(cells)
  for (let k = 0; k < cells; k++) out[k] = counts[k]! / n
  return out
}
