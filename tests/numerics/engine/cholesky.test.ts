import { describe, expect, it } from 'vitest'
import { CholeskyDecomposition, Matrix } from 'ml-matrix'
import { choleskyFactor, choleskySolve, logDetFromCholesky } from '../../../shared/numerics/linalg/cholesky'
import { Xoshiro128 } from '../../../shared/numerics/random/xoshiro128'

/** A random symmetric positive-definite matrix B·Bᵀ + n·I. */
function randomSpd(n: number, seed: number): Float64Array {
  const rng = new Xoshiro128(seed)
  const b = Float64Array.from({ length: n * n }, () => rng.nextDouble() - 0.5)
  const a = new Float64Array(n * n)
  for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) {
    let s = r === c ? n : 0
    for (let k = 0; k < n; k++) s += b[r * n + k]! * b[c * n + k]!
    a[r * n + c] = s
  }
  return a
}

describe('choleskyFactor', () => {
  for (const n of [1, 2, 7, 40]) {
    it(`n = ${n}: L·Lᵀ = A and L equals ml-matrix's factor`, () => {
      const a = randomSpd(n, n)
      const L = choleskyFactor(a, n)
      // Identity check L·Lᵀ = A (as ml-matrix's own tests do).
      for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) {
        let s = 0
        for (let k = 0; k < n; k++) s += L[r * n + k]! * L[c * n + k]!
        expect(Math.abs(s - a[r * n + c]!)).toBeLessThan(1e-12 * n * n)
        if (c > r) expect(L[r * n + c]).toBe(0)
      }
      // Outside reference: ml-matrix CholeskyDecomposition.
      const ref = new CholeskyDecomposition(new Matrix(Array.from({ length: n }, (_, r) => Array.from(a.subarray(r * n, (r + 1) * n))))).lowerTriangularMatrix
      for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) expect(Math.abs(L[r * n + c]! - ref.get(r, c))).toBeLessThan(1e-12 * n)
    })
  }

  it('solve and log-determinant agree with ml-matrix', () => {
    const n = 25, a = randomSpd(n, 99)
    const L = choleskyFactor(a, n)
    const b = Float64Array.from({ length: n }, (_, k) => Math.sin(k))
    const x = choleskySolve(L, n, b)
    const m = new Matrix(Array.from({ length: n }, (_, r) => Array.from(a.subarray(r * n, (r + 1) * n))))
    const dec = new CholeskyDecomposition(m)
    const ref = dec.solve(Matrix.columnVector(Array.from(b)))
    for (let k = 0; k < n; k++) expect(Math.abs(x[k]! - ref.get(k, 0))).toBeLessThan(1e-12)
    const refLogDet = 2 * Array.from({ length: n }, (_, k) => Math.log(dec.lowerTriangularMatrix.get(k, k))).reduce((s, v) => s + v, 0)
    expect(Math.abs(logDetFromCholesky(L, n) - refLogDet)).toBeLessThan(1e-10)
    // A diagonal matrix has log det = Σ log a_ii (closed form).
    const d = Float64Array.from([4, 0, 0, 0, 9, 0, 0, 0, 0.25])
    expect(logDetFromCholesky(choleskyFactor(d, 3), 3)).toBeCloseTo(Math.log(9), 14)
  })

  it('throws a clear error for an indefinite matrix', () => {
    const a = Float64Array.from([1, 2, 2, 1])
    expect(() => choleskyFactor(a, 2)).toThrow(/not positive definite \(pivot 1 of 2/)
    expect(() => choleskyFactor(new Float64Array(3), 2)).toThrow(/expected n²/)
  })
})
