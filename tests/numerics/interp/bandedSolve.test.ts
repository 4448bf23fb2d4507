import { describe, expect, it } from 'vitest'
import { factorBanded } from '../../../shared/numerics/interp/bandedSolve'
import { uniformSource } from '../verify/testRandom'

describe('factorBanded', () => {
  it('solves a random diagonally dominant band system (residual check, strided right-hand side)', () => {
    const u = uniformSource(7)
    for (const [n, p, q] of [[1, 0, 0], [5, 1, 1], [12, 2, 1], [30, 2, 3]] as const) {
      const a = new Float64Array(n * n)
      for (let r = 0; r < n; r++) {
        let off = 0
        for (let c = Math.max(0, r - p); c <= Math.min(n - 1, r + q); c++) if (c !== r) { a[r * n + c] = u() - 0.5; off += Math.abs(a[r * n + c]!) }
        a[r * n + r] = off + 0.1 + u()
      }
      const rhs = Float64Array.from({ length: n }, () => u() - 0.5)
      const strided = new Float64Array(3 * n + 1)
      for (let k = 0; k < n; k++) strided[1 + 3 * k] = rhs[k]!
      factorBanded(a, n, p, q).solve(strided, 1, 3)
      for (let r = 0; r < n; r++) {
        let s = 0
        for (let c = 0; c < n; c++) s += a[r * n + c]! * strided[1 + 3 * c]!
        expect(s).toBeCloseTo(rhs[r]!, 13)
      }
    }
  })

  it('refuses a matrix that is not strictly diagonally dominant', () => {
    expect(() => factorBanded(Float64Array.of(1, 1, 1, 1), 2, 1, 1)).toThrow(/dominant/)
  })
})
