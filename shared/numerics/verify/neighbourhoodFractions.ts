/**
 * Neighbourhood fractions for the fractions skill score (Roberts & Lean 2008, Mon. Wea. Rev.
 * 136:78): the mean of a field over the n×n square (n odd) centred on each cell, where cells
 * outside the grid count as zero (non-events), so every fraction has denominator n².
 * Input and output row-major nx×ny; computed with a summed-area table in O(nx·ny).
 */
import { rectangleSum, summedAreaTable } from './summedAreaTable'

/** Throws unless n is a positive odd integer (a square centred on a cell). */
export function assertNeighbourhoodSize(n: number): void {
  if (!Number.isInteger(n) || n < 1 || n % 2 === 0) throw new Error(`neighbourhood size must be a positive odd integer, got ${n}`)
}

/**
 * Fraction field of a 0/1 event field (or of event probabilities, giving the mean fraction:
 * the box mean is linear). Values in [0, 1] for such inputs.
 */
export function neighbourhoodFractions(events: ArrayLike<number>, nx: number, ny: number, n: number): Float64Array {
  assertNeighbourhoodSize(n)
  const table = summedAreaTable(events, nx, ny)
  const h = (n - 1) / 2
  const scale = 1 / (n * n)
  const out = new Float64Array(nx * ny)
  for (let j = 0; j < ny; j++) {
    const j0 = Math.max(0, j - h), j1 = Math.min(ny - 1, j + h)
    for (let i = 0; i < nx; i++) {
      out[j * nx + i] = rectangleSum(table, nx, Math.max(0, i - h), Math.min(nx - 1, i + h), j0, j1) * scale
    }
  }
  return out
}
