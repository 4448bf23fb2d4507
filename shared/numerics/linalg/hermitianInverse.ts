/**
 * Inverse of a small dense complex Hermitian positive-definite matrix through its Cholesky factor
 * A = L·Lᴴ (Golub & Van Loan 2013, Matrix Computations, alg. 4.2.1 in complex arithmetic):
 * A⁻¹ = L⁻ᴴ·L⁻¹. Matrices are row-major n×n with separate real and imaginary planes
 * (entry (r, c) at r·n + c). O(n³) flops; meant for n up to a few dozen.
 */

/**
 * Returns A⁻¹ as { re, im } (full Hermitian matrix). Only the lower triangle of A is read.
 * Throws when A is not (numerically) positive definite.
 */
export function invertHermitianPositive(aRe: Float64Array, aIm: Float64Array, n: number): { re: Float64Array; im: Float64Array } {
  if (aRe.length !== n * n || aIm.length !== n * n) throw new Error(`Hermitian inverse: matrix has ${aRe.length} entries, expected n² = ${n * n}`)
  // L, lower triangular with a real positive diagonal.
  const lRe = new Float64Array(n * n), lIm = new Float64Array(n * n)
  for (let r = 0; r < n; r++) {
    for (let c = 0; c <= r; c++) {
      // s = A(r, c) − Σ_k L(r, k)·conj(L(c, k))
      let sr = aRe[r * n + c]!, si = aIm[r * n + c]!
      for (let k = 0; k < c; k++) {
        const ar = lRe[r * n + k]!, ai = lIm[r * n + k]!, br = lRe[c * n + k]!, bi = lIm[c * n + k]!
        sr -= ar * br + ai * bi
        si -= ai * br - ar * bi
      }
      if (c === r) {
        if (!(sr > 0)) throw new Error(`Hermitian inverse: matrix is not positive definite (pivot ${r} of ${n} is ${sr.toExponential(3)})`)
        lRe[r * n + r] = Math.sqrt(sr)
      } else {
        const d = lRe[c * n + c]!
        lRe[r * n + c] = sr / d
        lIm[r * n + c] = si / d
      }
    }
  }
  // X = L⁻¹ (lower triangular), column by column by forward substitution.
  const xRe = new Float64Array(n * n), xIm = new Float64Array(n * n)
  for (let c = 0; c < n; c++) {
    xRe[c * n + c] = 1 / lRe[c * n + c]!
    for (let r = c + 1; r < n; r++) {
      let sr = 0, si = 0
      for (let k = c; k < r; k++) {
        const ar = lRe[r * n + k]!, ai = lIm[r * n + k]!, br = xRe[k * n + c]!, bi = xIm[k * n + c]!
        sr += ar * br - ai * bi
        si += ar * bi + ai * br
      }
      const d = lRe[r * n + r]!
      xRe[r * n + c] = -sr / d
      xIm[r * n + c] = -si / d
    }
  }
  // A⁻¹ = Xᴴ·X: entry (r, c) = Σ_{k ≥ max(r, c)} conj(X(k, r))·X(k, c).
  const re = new Float64Array(n * n), im = new Float64Array(n * n)
  for (let r = 0; r < n; r++) {
    for (let c = 0; c <= r; c++) {
      let sr = 0, si = 0
      for (let k = r; k < n; k++) {
        const ar = xRe[k * n + r]!, ai = -xIm[k * n + r]!, br = xRe[k * n + c]!, bi = xIm[k * n + c]!
        sr += ar * br - ai * bi
        si += ar * bi + ai * br
      }
      re[r * n + c] = sr; im[r * n + c] = si
      re[c * n + r] = sr; im[c * n + r] = -si
    }
  }
  return { re, im }
}
