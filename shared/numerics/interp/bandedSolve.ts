/**
 * LU factorisation without pivoting of a square banded matrix, for strictly diagonally dominant
 * matrices only (no pivoting is then needed for stability: Golub & Van Loan, Matrix
 * Computations, 4th ed., §4.1.1). Cost O(n·p·q) for lower/upper bandwidths p, q.
 */

/** A factorised band matrix; `solve` overwrites a strided vector in place. */
export interface BandedLu {
  size: number
  /** Solves A x = rhs for the n entries rhs[offset + k·stride], in place. */
  solve(rhs: Float64Array, offset?: number, stride?: number): void
}

/**
 * Factorises the n×n matrix given densely (row-major, entry (r, c) at r·n + c) whose nonzeros lie
 * within `lower` diagonals below and `upper` above the main one. Throws unless every row is
 * strictly diagonally dominant.
 */
export function factorBanded(dense: Float64Array, n: number, lower: number, upper: number): BandedLu {
  for (let r = 0; r < n; r++) {
    let off = 0
    for (let c = 0; c < n; c++) if (c !== r) off += Math.abs(dense[r * n + c]!)
    if (!(Math.abs(dense[r * n + r]!) > off)) throw new Error(`band matrix row ${r} is not strictly diagonally dominant`)
  }
  // Compact band storage: row r keeps columns r − lower … r + upper at r·w + (c − r + lower).
  const w = lower + upper + 1
  const band = new Float64Array(n * w)
  for (let r = 0; r < n; r++) {
    for (let c = Math.max(0, r - lower); c <= Math.min(n - 1, r + upper); c++) band[r * w + c - r + lower] = dense[r * n + c]!
  }
  const at = (r: number, c: number) => r * w + c - r + lower
  for (let k = 0; k < n; k++) {
    const pivot = band[at(k, k)]!
    for (let r = k + 1; r <= Math.min(n - 1, k + lower); r++) {
      const l = band[at(r, k)]! / pivot
      band[at(r, k)] = l
      for (let c = k + 1; c <= Math.min(n - 1, k + upper); c++) band[at(r, c)]! -= l * band[at(k, c)]!
    }
  }
  return {
    size: n,
    solve(rhs, offset = 0, stride = 1) {
      const x = (k: number) => offset + k * stride
      for (let r = 1; r < n; r++) {
        let s = rhs[x(r)]!
        for (let c = Math.max(0, r - lower); c < r; c++) s -= band[at(r, c)]! * rhs[x(c)]!
        rhs[x(r)] = s
      }
      for (let r = n - 1; r >= 0; r--) {
        let s = rhs[x(r)]!
        for (let c = r + 1; c <= Math.min(n - 1, r + upper); c++) s -= band[at(r, c)]! * rhs[x(c)]!
        rhs[x(r)] = s / band[at(r, r)]!
      }
    },
  }
}
