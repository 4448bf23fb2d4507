/**
 * Exact profile log-likelihood of the valid coarse cells by a dense Cholesky factorisation of their
 * block-mean correlation matrix R (entries read from the change-of-support table, Kyriakidis 2004).
 * Any pattern of missing cells; cost O(m³/3) per length scale, so for small m only.
 */
import { choleskyFactor, forwardSubstitute, logDetFromCholesky } from '../linalg/cholesky'
import type { CoarseField } from './coarseField'
import { profileFromQuadraticForms, type ProfiledFit } from './profileLikelihood'

/** Largest number of valid cells the dense likelihood accepts (one factorisation ≈ 7·10⁹ flops here). */
export const DENSE_MAX_CELLS = 2800

/** Correlation matrix (row-major m×m) of the valid cells from a unit-variance table, plus `nugget` on the diagonal. */
export function validCellCorrelation(field: CoarseField, table: Float64Array, nugget: number): Float64Array {
  const { nx, ny, valid } = field
  const m = valid.length, wx = 2 * nx - 1
  const R = new Float64Array(m * m)
  for (let p = 0; p < m; p++) {
    const ip = valid[p]! % nx, jp = Math.floor(valid[p]! / nx)
    for (let q = 0; q <= p; q++) {
      const iq = valid[q]! % nx, jq = Math.floor(valid[q]! / nx)
      const v = table[(jq - jp + ny - 1) * wx + (iq - ip + nx - 1)]!
      R[p * m + q] = v
      R[q * m + p] = v
    }
    R[p * m + p]! += nugget
  }
  return R
}

/**
 * Profile log-likelihood (μ, σ² profiled) from the unit-variance block-mean correlation `table`
 * (layout of grf/changeOfSupport.ts, sized for the field's grid), as a function of the nugget η.
 * Every η needs its own factorisation. −Infinity if R + ηI is not numerically positive definite.
 */
export function denseProfile(field: CoarseField, table: Float64Array): (nugget: number) => ProfiledFit {
  const m = field.valid.length
  if (m > DENSE_MAX_CELLS) throw new Error(`exact dense likelihood is limited to ${DENSE_MAX_CELLS} valid cells, got ${m}`)
  const R0 = validCellCorrelation(field, table, 0)
  const y = Float64Array.from(field.valid, (k) => field.centred[k]!)
  return (nugget) => {
    const R = nugget === 0 ? R0 : Float64Array.from(R0)
    if (nugget !== 0) for (let p = 0; p < m; p++) R[p * m + p]! += nugget
    let L: Float64Array
    try { L = choleskyFactor(R, m) } catch {
      return { logLikelihood: -Infinity, mean: NaN, variance: NaN }
    }
    // With R = L Lᵀ: z = L⁻¹y, u = L⁻¹1 give every quadratic form as a dot product.
    const z = forwardSubstitute(L, m, Float64Array.from(y))
    const u = forwardSubstitute(L, m, new Float64Array(m).fill(1))
    let qyy = 0, q1y = 0, q11 = 0
    for (let k = 0; k < m; k++) { qyy += z[k]! * z[k]!; q1y += u[k]! * z[k]!; q11 += u[k]! * u[k]! }
    return profileFromQuadraticForms(qyy, q1y, q11, logDetFromCholesky(L, m), m, field.offset)
  }
}

/** denseProfile(field, table) at one nugget η. */
export function denseLogLikelihood(field: CoarseField, table: Float64Array, nugget: number): ProfiledFit {
  return denseProfile(field, table)(nugget)
}
