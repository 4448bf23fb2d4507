/**
 * An area of interest on the grid as cell weights in [0, 1]: 1 = cell inside, 0 = outside,
 * and a fraction for a cell partly covered (when the rasteriser gives coverage).
 * Cells with weight > 0 count for "anywhere"; area means and fractions are weighted.
 */

export interface AreaMask {
  nx: number
  ny: number
  /** Row-major indices j·nx + i of the cells with weight > 0, ascending. */
  cells: Int32Array
  /** Weight of each listed cell (same order as cells). */
  weights: Float64Array
  /** Σ weights, > 0. */
  totalWeight: number
}

/**
 * Builds an AreaMask from a row-major nx × ny array of weights in [0, 1].
 * Throws on a length mismatch, a weight outside [0, 1] or NaN, or an empty area.
 */
export function areaMask(weights: ArrayLike<number>, nx: number, ny: number): AreaMask {
  if (weights.length !== nx * ny) throw new Error(`area mask has ${weights.length} cells, expected nx·ny = ${nx * ny}`)
  const cells: number[] = []
  const w: number[] = []
  let total = 0
  for (let k = 0; k < weights.length; k++) {
    const v = weights[k]!
    if (!(v >= 0 && v <= 1)) throw new Error(`area mask weight at column ${k % nx}, row ${Math.floor(k / nx)} is ${v}: expected a number in [0, 1]`)
    if (v > 0) { cells.push(k); w.push(v); total += v }
  }
  if (cells.length === 0) throw new Error('the area covers no grid cell')
  return { nx, ny, cells: Int32Array.from(cells), weights: Float64Array.from(w), totalWeight: total }
}
