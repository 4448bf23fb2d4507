/**
 * Exact profile log-likelihood of a complete coarse field under the squared-exponential kernel using
 * its separable structure (Saatçi 2011, PhD thesis, ch. 5): block means of a separable kernel have
 * R = Ry ⊗ Rx (row-major cells, j the slow index), so with Rx = Qx Λx Qxᵀ and Ry = Qy Λy Qyᵀ
 * (two small symmetric eigendecompositions, ml-matrix) every quadratic form and ln|R + ηI| is a sum over
 * the nx·ny products λy_l λx_k + η. Cost O(nx³ + ny³ + nx·ny·(nx + ny)) per length scale.
 */
import { EigenvalueDecomposition, Matrix } from 'ml-matrix'
import type { CoarseField } from './coarseField'
import { seCoarseCorrelation1d } from './coarseCorrelation'
import { profileFromQuadraticForms, type ProfiledFit } from './profileLikelihood'

interface SymmetricEigen { values: Float64Array; vectors: Float64Array /* row-major n×n, column k = k-th eigenvector */ }

/** Eigendecomposition of the symmetric Toeplitz matrix T[i][i'] = c[i − i' + n − 1]. */
function toeplitzEigen(c: Float64Array, n: number): SymmetricEigen {
  const T = new Matrix(n, n)
  for (let i = 0; i < n; i++) for (let k = 0; k < n; k++) T.set(i, k, c[i - k + n - 1]!)
  const evd = new EigenvalueDecomposition(T, { assumeSymmetric: true })
  const V = evd.eigenvectorMatrix
  const vectors = new Float64Array(n * n)
  for (let i = 0; i < n; i++) for (let k = 0; k < n; k++) vectors[i * n + k] = V.get(i, k)
  // Round-off can leave the smallest eigenvalues of a near-singular correlation a hair below zero.
  return { values: Float64Array.from(evd.realEigenvalues, (v) => Math.max(v, 0)), vectors }
}

/**
 * Profile log-likelihood (μ, σ² profiled; see profileLikelihood.ts) of a complete field under `se` with
 * length scale ℓ (fine cells), block factor b, and `nugget` η added to the diagonal of the coarse correlation.
 */
export function kroneckerLogLikelihood(field: CoarseField, b: number, lengthScale: number, nugget: number): ProfiledFit {
  const { nx, ny, centred } = field
  if (!field.complete) throw new Error('the Kronecker likelihood needs a complete grid (no missing cells)')
  const ex = toeplitzEigen(seCoarseCorrelation1d(lengthScale, b, nx), nx)
  const ey = nx === ny ? ex : toeplitzEigen(seCoarseCorrelation1d(lengthScale, b, ny), ny)
  // Rotate the data: Ỹ = Qyᵀ Y Qx, with Y the ny×nx matrix of the field.
  const yQx = new Float64Array(nx * ny)
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const v = centred[j * nx + i]!
      if (v === 0) continue
      const q = i * nx, o = j * nx
      for (let k = 0; k < nx; k++) yQx[o + k]! += v * ex.vectors[q + k]!
    }
  }
  const rotated = new Float64Array(nx * ny)
  for (let j = 0; j < ny; j++) {
    const q = j * ny, o = j * nx
    for (let l = 0; l < ny; l++) {
      const w = ey.vectors[q + l]!
      const r = l * nx
      for (let k = 0; k < nx; k++) rotated[r + k]! += w * yQx[o + k]!
    }
  }
  // The constant vector rotates to the outer product of the eigenvectors' sums.
  const sumX = new Float64Array(nx), sumY = new Float64Array(ny)
  for (let i = 0; i < nx; i++) for (let k = 0; k < nx; k++) sumX[k]! += ex.vectors[i * nx + k]!
  for (let j = 0; j < ny; j++) for (let l = 0; l < ny; l++) sumY[l]! += ey.vectors[j * ny + l]!
  let qyy = 0, q1y = 0, q11 = 0, logDet = 0
  for (let l = 0; l < ny; l++) {
    for (let k = 0; k < nx; k++) {
      const d = ey.values[l]! * ex.values[k]! + nugget
      const yr = rotated[l * nx + k]!, one = sumY[l]! * sumX[k]!
      qyy += yr * yr / d
      q1y += yr * one / d
      q11 += one * one / d
      logDet += Math.log(d)
    }
  }
  return profileFromQuadraticForms(qyy, q1y, q11, logDet, nx * ny, field.offset)
}
