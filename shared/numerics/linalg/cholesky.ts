/**
 * Dense Cholesky factorisation A = L·Lᵀ of a symmetric positive-definite matrix
 * (Cholesky–Banachiewicz, row by row; Golub & Van Loan 2013, Matrix Computations, alg. 4.2.1).
 * Matrices are row-major Float64Array n×n (entry (r, c) at r·n + c). O(n³/3) flops.
 */

/**
 * Returns the lower-triangular factor L (row-major n×n, upper part zero) with L·Lᵀ = A.
 * Only the lower triangle of `a` is read. Throws when A is not (numerically) positive definite.
 */
export function choleskyFactor(a: Float64Array, n: number): Float64Array {
  if (a.length !== n * n) throw new Error(`Cholesky: matrix has ${a.length} entries, expected n² = ${n * n}`)
  const L = new Float64Array(n * n)
  for (let r = 0; r < n; r++) {
    const ro = r * n
    for (let c = 0; c <= r; c++) {
      const co = c * n
      // Both rows are contiguous: the inner product runs along memory.
      let s = a[ro + c]!
      for (let k = 0; k < c; k++) s -= L[ro + k]! * L[co + k]!
      if (c === r) {
        if (!(s > 0)) throw new Error(`Cholesky: matrix is not positive definite (pivot ${r} of ${n} is ${s.toExponential(3)})`)
        L[ro + r] = Math.sqrt(s)
      } else {
        L[ro + c] = s / L[co + c]!
      }
    }
  }
  return L
}

/** Solves L·u = b in place (forward substitution); `b` has length n. */
export function forwardSubstitute(L: Float64Array, n: number, b: Float64Array): Float64Array {
  for (let r = 0; r < n; r++) {
    const ro = r * n
    let s = b[r]!
    for (let k = 0; k < r; k++) s -= L[ro + k]! * b[k]!
    b[r] = s / L[ro + r]!
  }
  return b
}

/** Solves Lᵀ·x = u in place (back substitution). */
export function backSubstitute(L: Float64Array, n: number, u: Float64Array): Float64Array {
  for (let r = n - 1; r >= 0; r--) {
    const s = u[r]! / L[r * n + r]!
    u[r] = s
    // Column r of L below the diagonal = row r of Lᵀ: subtract its contribution from earlier unknowns.
    for (let k = 0; k < r; k++) u[k]! -= L[r * n + k]! * s
  }
  return u
}

/** Solves A·x = b given the Cholesky factor L of A; returns a new array x. */
export function choleskySolve(L: Float64Array, n: number, b: Float64Array): Float64Array {
  if (b.length !== n) throw new Error(`Cholesky solve: right-hand side has length ${b.length}, expected ${n}`)
  return backSubstitute(L, n, forwardSubstitute(L, n, Float64Array.from(b)))
}

/** log det A = 2 Σ log L_ii. */
export function logDetFromCholesky(L: Float64Array, n: number): number {
  let s = 0
  for (let r = 0; r < n; r++) s += Math.log(L[r * n + r]!)
  return 2 * s
}
