/**
 * Direct solver for the coarse system: dense Cholesky of the observed block-mean covariance
 * (O(m³/3); for small grids or as a fallback). Exact up to rounding, any missing-cell pattern.
 */
import { backSubstitute, choleskyFactor, forwardSubstitute } from '../linalg/cholesky'
import type { CoarseCovariance, CoarseSolver } from './coarseCovariance'

export class DenseCoarseSolver implements CoarseSolver {
  readonly method = 'dense' as const
  /** Lower Cholesky factor of C restricted to the observed cells (order of `index`). */
  readonly factor: Float64Array
  readonly index: Int32Array

  constructor(readonly covariance: CoarseCovariance) {
    const { matrix, index } = covariance.denseObserved()
    this.factor = choleskyFactor(matrix, index.length)
    this.index = index
  }

  solve(rhs: Float64Array[]) {
    const n = this.index.length, m = this.covariance.nx * this.covariance.ny
    const solutions = rhs.map((r) => {
      const u = new Float64Array(n)
      for (let k = 0; k < n; k++) u[k] = r[this.index[k]!]!
      backSubstitute(this.factor, n, forwardSubstitute(this.factor, n, u))
      const w = new Float64Array(m)
      for (let k = 0; k < n; k++) w[this.index[k]!] = u[k]!
      return w
    })
    return { solutions, iterations: 0, residual: NaN }
  }
}
