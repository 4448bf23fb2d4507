/**
 * Change of support on a regular grid (Kyriakidis 2004, Geographical Analysis 36:259):
 * covariances between b×b block means of a stationary fine field are themselves stationary.
 */

/** Triangular weight table w(δ) = (b − |δ|)/b² for δ ∈ [−(b−1), b−1], index δ + b − 1. */
function blockLagWeights(b: number): Float64Array {
  const w = new Float64Array(2 * b - 1)
  for (let d = -(b - 1); d <= b - 1; d++) w[d + b - 1] = (b - Math.abs(d)) / (b * b)
  return w
}

/**
 * Covariance of block means c_B(Δ) = Σ_δ w(δx) w(δy) k(bΔ + δ) for coarse lags
 * Δx ∈ [−(mx−1), mx−1], Δy ∈ [−(my−1), my−1].
 * Layout: row-major (2mx−1)×(2my−1), index (Δy + my − 1)·(2mx − 1) + (Δx + mx − 1).
 * `cov(dx, dy)` is the fine-grid covariance at offsets in fine cells.
 * Cost O(mx·my·(2b−1)²) kernel evaluations; never builds the fine covariance matrix.
 */
export function coarseCovarianceTable(cov: (dx: number, dy: number) => number, b: number, mx: number, my: number): Float64Array {
  if (!Number.isInteger(b) || b < 1) throw new Error(`block factor must be a positive integer, got ${b}`)
  const w = blockLagWeights(b)
  const wx = 2 * mx - 1, wy = 2 * my - 1
  const table = new Float64Array(wx * wy)
  // Symmetric kernels (k(h) = k(−h)) would allow filling only half; kept general for anisotropy.
  for (let Dy = -(my - 1); Dy <= my - 1; Dy++) {
    for (let Dx = -(mx - 1); Dx <= mx - 1; Dx++) {
      let s = 0
      for (let dy = -(b - 1); dy <= b - 1; dy++) {
        const wyv = w[dy + b - 1]!
        const hy = b * Dy + dy
        for (let dx = -(b - 1); dx <= b - 1; dx++) s += wyv * w[dx + b - 1]! * cov(b * Dx + dx, hy)
      }
      table[(Dy + my - 1) * wx + (Dx + mx - 1)] = s
    }
  }
  return table
}
