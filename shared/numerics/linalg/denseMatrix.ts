/**
 * Small dense-matrix helpers on row-major Float64Array (entry (r, c) at r·cols + c).
 */
import { EigenvalueDecomposition, Matrix } from 'ml-matrix'

/** C = op(A)·op(B), with op(X) = X or Xᵀ; shapes are those of op(A) (p×q) and op(B) (q×r). */
export function matmul(a: Float64Array, b: Float64Array, p: number, q: number, r: number, transA = false, transB = false): Float64Array {
  const out = new Float64Array(p * r)
  // Loop order i-k-j keeps the innermost access contiguous in B (and out) when B is not transposed.
  const bt = transB ? transpose(b, r, q) : b
  for (let i = 0; i < p; i++) {
    const o = i * r
    for (let k = 0; k < q; k++) {
      const aik = transA ? a[k * p + i]! : a[i * q + k]!
      if (aik === 0) continue
      const bo = k * r
      for (let j = 0; j < r; j++) out[o + j]! += aik * bt[bo + j]!
    }
  }
  return out
}

/** Transpose of a rows×cols matrix. */
export function transpose(a: Float64Array, rows: number, cols: number): Float64Array {
  const out = new Float64Array(rows * cols)
  for (let i = 0; i < rows; i++) for (let j = 0; j < cols; j++) out[j * rows + i] = a[i * cols + j]!
  return out
}

/**
 * Eigen-decomposition of a symmetric n×n matrix, S = Q diag(d) Qᵀ (ml-matrix's EigenvalueDecomposition,
 * tridiagonal QL from EISPACK tql2). Returns Q row-major with eigenvectors as columns.
 */
export function symmetricEigen(s: Float64Array, n: number): { values: Float64Array; vectors: Float64Array } {
  const m = new Matrix(n, n)
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) m.set(i, j, s[i * n + j]!)
  const e = new EigenvalueDecomposition(m, { assumeSymmetric: true })
  const q = e.eigenvectorMatrix
  const vectors = new Float64Array(n * n)
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) vectors[i * n + j] = q.get(i, j)
  return { values: Float64Array.from(e.realEigenvalues), vectors }
}
