/**
 * Exact profile log-likelihood of a complete coarse field under the squared-exponential kernel using
 * its separable structure (Saatçi 2011, PhD thesis, ch. 5): block means of a separable kernel have
 * R = Ry ⊗ Rx (row-major cells, j the slow index), so with Rx = Qx Λx Qxᵀ and Ry = Qy Λy Qyᵀ
 * (two small symmetric Toeplitz eigendecompositions, each split in halves by centrosymmetry) every quadratic form and ln|R + ηI| is a sum over
 * the nx·ny products λy_l λx_k + η. Cost O(nx³ + ny³ + nx·ny·(nx + ny)) per length scale.
 */
import { EigenvalueDecomposition, Matrix } from 'ml-matrix'
import type { CoarseField } from './coarseField'
import { seCoarseCorrelation1d } from './coarseCorrelation'
import { profileFromQuadraticForms, type ProfiledFit } from './profileLikelihood'

export interface SymmetricEigen {
  values: Float64Array
  /** Row-major n×n, column k = k-th eigenvector; columns 0…symmetric−1 satisfy q[i] = q[n−1−i], the rest q[i] = −q[n−1−i]. */
  vectors: Float64Array
  symmetric: number
}

function symmetricEigen(S: Matrix): { values: number[]; V: Matrix } {
  const evd = new EigenvalueDecomposition(S, { assumeSymmetric: true })
  return { values: evd.realEigenvalues, V: evd.eigenvectorMatrix }
}

/**
 * Eigendecomposition of the symmetric Toeplitz matrix T[i][i'] = c[i − i' + n − 1], using its centrosymmetry
 * (Cantoni & Butler 1976, Linear Algebra Appl. 13:275): with h = ⌊n/2⌋ the eigenvectors are symmetric
 * [u; (√2β); Ju]/√2 from the (h or h+1)-sized matrix A + CJ (bordered by √2·c and t₀ when n is odd), or
 * skew [u; 0; −Ju]/√2 from A − CJ, where (A ± CJ)[i][k] = t(|i − k|) ± t(n − 1 − i − k). Two half-size
 * eigenproblems (ml-matrix) cost about a quarter of one full one.
 */
export function toeplitzEigen(c: Float64Array, n: number): SymmetricEigen {
  const t = (lag: number) => c[lag + n - 1]!
  const h = Math.floor(n / 2), odd = n % 2 === 1
  const sym = new Matrix(h + (odd ? 1 : 0), h + (odd ? 1 : 0)), skew = new Matrix(h, h)
  for (let i = 0; i < h; i++) {
    for (let k = 0; k < h; k++) {
      sym.set(i, k, t(Math.abs(i - k)) + t(n - 1 - i - k))
      skew.set(i, k, t(Math.abs(i - k)) - t(n - 1 - i - k))
    }
    if (odd) { sym.set(i, h, Math.SQRT2 * t(h - i)); sym.set(h, i, Math.SQRT2 * t(h - i)) }
  }
  if (odd) sym.set(h, h, t(0))
  const values = new Float64Array(n), vectors = new Float64Array(n * n)
  let col = 0
  const s = symmetricEigen(sym)
  for (let e = 0; e < sym.rows; e++, col++) {
    values[col] = s.values[e]!
    for (let i = 0; i < h; i++) {
      const v = s.V.get(i, e) * Math.SQRT1_2
      vectors[i * n + col] = v
      vectors[(n - 1 - i) * n + col] = v
    }
    if (odd) vectors[h * n + col] = s.V.get(h, e)
  }
  if (h > 0) {
    const a = symmetricEigen(skew)
    for (let e = 0; e < h; e++, col++) {
      values[col] = a.values[e]!
      for (let i = 0; i < h; i++) {
        const v = a.V.get(i, e) * Math.SQRT1_2
        vectors[i * n + col] = v
        vectors[(n - 1 - i) * n + col] = -v
      }
    }
  }
  // Round-off can leave the smallest eigenvalues of a near-singular correlation a hair below zero.
  for (let k = 0; k < n; k++) if (values[k]! < 0) values[k] = 0
  return { values, vectors, symmetric: sym.rows }
}

/**
 * Profile log-likelihood (μ, σ² profiled; see profileLikelihood.ts) of a complete field under `se` with
 * length scale ℓ (fine cells) and block factor b, as a function of the nugget η added to the diagonal of
 * the coarse correlation: the eigendecompositions and the rotated data are computed once, each η then
 * costs one pass over the nx·ny eigenvalue products.
 */
export function kroneckerProfile(field: CoarseField, b: number, lengthScale: number): (nugget: number) => ProfiledFit {
  const { nx, ny, centred } = field
  if (!field.complete) throw new Error('the Kronecker likelihood needs a complete grid (no missing cells)')
  const ex = toeplitzEigen(seCoarseCorrelation1d(lengthScale, b, nx), nx)
  const ey = nx === ny ? ex : toeplitzEigen(seCoarseCorrelation1d(lengthScale, b, ny), ny)
  // Rotate the data: Ỹ = Qyᵀ Y Qx, with Y the ny×nx matrix of the field.
  const rotated = rotateLeft(rotateRight(centred, ny, nx, ex), ny, nx, ey)
  // The constant vector rotates to the outer product of the eigenvectors' sums (zero on skew vectors).
  const sumX = new Float64Array(nx), sumY = new Float64Array(ny)
  for (let i = 0; i < nx; i++) for (let k = 0; k < nx; k++) sumX[k]! += ex.vectors[i * nx + k]!
  for (let j = 0; j < ny; j++) for (let l = 0; l < ny; l++) sumY[l]! += ey.vectors[j * ny + l]!
  const m = nx * ny
  const lambda = new Float64Array(m), yy = new Float64Array(m), y1 = new Float64Array(m), one2 = new Float64Array(m)
  for (let l = 0; l < ny; l++) {
    for (let k = 0; k < nx; k++) {
      const p = l * nx + k, yr = rotated[p]!, one = sumY[l]! * sumX[k]!
      lambda[p] = ey.values[l]! * ex.values[k]!
      yy[p] = yr * yr; y1[p] = yr * one; one2[p] = one * one
    }
  }
  return (nugget) => {
    let qyy = 0, q1y = 0, q11 = 0, logDet = 0
    for (let p = 0; p < m; p++) {
      const d = lambda[p]! + nugget, inv = 1 / d
      qyy += yy[p]! * inv
      q1y += y1[p]! * inv
      q11 += one2[p]! * inv
      logDet += Math.log(d)
    }
    return profileFromQuadraticForms(qyy, q1y, q11, logDet, m, field.offset)
  }
}

/** kroneckerProfile(field, b, ℓ) at one nugget η. */
export function kroneckerLogLikelihood(field: CoarseField, b: number, lengthScale: number, nugget: number): ProfiledFit {
  return kroneckerProfile(field, b, lengthScale)(nugget)
}

/**
 * M·Q for M rows×n (row-major) and Q the eigenvectors of `eig`: each row is folded once into
 * y_i ± y_{n−1−i}, so symmetric and skew columns cost n/2 products each instead of n.
 */
function rotateRight(M: Float64Array, rows: number, n: number, eig: SymmetricEigen): Float64Array {
  const { vectors: Q, symmetric } = eig
  const h = Math.floor(n / 2), odd = n % 2 === 1
  const out = new Float64Array(rows * n)
  const plus = new Float64Array(h), minus = new Float64Array(h)
  for (let r = 0; r < rows; r++) {
    const o = r * n
    for (let i = 0; i < h; i++) { const a = M[o + i]!, b = M[o + n - 1 - i]!; plus[i] = a + b; minus[i] = a - b }
    const mid = odd ? M[o + h]! : 0
    for (let k = 0; k < n; k++) {
      const fold = k < symmetric ? plus : minus
      let acc = k < symmetric && odd ? mid * Q[h * n + k]! : 0
      for (let i = 0; i < h; i++) acc += fold[i]! * Q[i * n + k]!
      out[o + k] = acc
    }
  }
  return out
}

/** Qᵀ·M for M n×cols (row-major), with the same folding over the rows of M. */
function rotateLeft(M: Float64Array, n: number, cols: number, eig: SymmetricEigen): Float64Array {
  const { vectors: Q, symmetric } = eig
  const h = Math.floor(n / 2), odd = n % 2 === 1
  const plus = new Float64Array(h * cols), minus = new Float64Array(h * cols)
  for (let i = 0; i < h; i++) {
    const a = i * cols, b = (n - 1 - i) * cols
    for (let k = 0; k < cols; k++) { plus[a + k] = M[a + k]! + M[b + k]!; minus[a + k] = M[a + k]! - M[b + k]! }
  }
  const out = new Float64Array(n * cols)
  for (let l = 0; l < n; l++) {
    const fold = l < symmetric ? plus : minus
    const o = l * cols
    if (l < symmetric && odd) { const w = Q[h * n + l]!, m = h * cols; for (let k = 0; k < cols; k++) out[o + k] = w * M[m + k]! }
    for (let i = 0; i < h; i++) {
      const w = Q[i * n + l]!, f = i * cols
      for (let k = 0; k < cols; k++) out[o + k]! += w * fold[f + k]!
    }
  }
  return out
}
