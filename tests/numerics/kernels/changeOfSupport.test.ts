import { describe, expect, it } from 'vitest'
import { Matrix } from 'ml-matrix'
import {
  coarseCovariance1d, coarseCovarianceTable, isotropicCoarseCovarianceTable, separableCoarseCovarianceTable,
} from '../../../shared/numerics/grf/changeOfSupport'
import { correlationAt, covarianceFunction, decayRadius, type KernelParams } from '../../../shared/numerics/grf/kernels'
import '../../../shared/numerics/grf/maternGeneral'

/**
 * Brute force: the dense fine covariance K (ml-matrix), the block-averaging matrix A, and C = A K Aᵀ.
 * Entry (p, q) of C must equal the table at the coarse lag between cells p and q.
 */
function bruteForceBlockCovariance(cov: (dx: number, dy: number) => number, b: number, mx: number, my: number): Matrix {
  const nx = b * mx, ny = b * my, n = nx * ny, m = mx * my
  const K = new Matrix(n, n)
  for (let p = 0; p < n; p++) for (let q = 0; q < n; q++) K.set(p, q, cov((q % nx) - (p % nx), Math.floor(q / nx) - Math.floor(p / nx)))
  const A = new Matrix(m, n)
  for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) A.set(Math.floor(j / b) * mx + Math.floor(i / b), j * nx + i, 1 / (b * b))
  return A.mmul(K).mmul(A.transpose())
}

function maxTableError(table: Float64Array, C: Matrix, mx: number, my: number): number {
  const wx = 2 * mx - 1
  let worst = 0
  for (let p = 0; p < mx * my; p++) {
    for (let q = 0; q < mx * my; q++) {
      const Dx = (q % mx) - (p % mx), Dy = Math.floor(q / mx) - Math.floor(p / mx)
      worst = Math.max(worst, Math.abs(table[(Dy + my - 1) * wx + Dx + mx - 1]! - C.get(p, q)))
    }
  }
  return worst
}

describe('change-of-support table of block means', () => {
  const b = 3, mx = 4, my = 3
  const kernels: KernelParams[] = [
    { kernel: 'se', lengthScale: 2.2, variance: 1.7 },
    { kernel: 'matern12', lengthScale: 3, variance: 1 },
    { kernel: 'matern32', lengthScale: 1.4, variance: 0.6 },
    { kernel: 'matern', nu: 0.8, lengthScale: 2.5, variance: 2 },
  ]

  for (const p of kernels) {
    it(`equals A K Aᵀ built densely with ml-matrix (${p.kernel}, b = ${b}, ${mx}×${my} coarse)`, () => {
      const C = bruteForceBlockCovariance(covarianceFunction(p), b, mx, my)
      expect(maxTableError(coarseCovarianceTable(covarianceFunction(p), b, mx, my), C, mx, my)).toBeLessThan(1e-14)
      const iso = isotropicCoarseCovarianceTable((r) => p.variance * correlationAt(p, r), b, mx, my)
      expect(maxTableError(iso, C, mx, my)).toBeLessThan(1e-14)
    })
  }

  it('handles an anisotropic, non-symmetric-axis kernel (general path only)', () => {
    const cov = (dx: number, dy: number) => Math.exp(-((dx + 0.3 * dy) ** 2) / 8 - (dy * dy) / 3)
    const C = bruteForceBlockCovariance(cov, 2, 3, 4)
    expect(maxTableError(coarseCovarianceTable(cov, 2, 3, 4), C, 3, 4)).toBeLessThan(1e-14)
  })

  it('separable se: outer product of 1-D tables equals the 2-D table', () => {
    const p: KernelParams = { kernel: 'se', lengthScale: 4, variance: 1 }
    const k1 = (h: number) => Math.exp(-(h * h) / (2 * 16))
    const sep = separableCoarseCovarianceTable(coarseCovariance1d(k1, 4, 5), coarseCovariance1d(k1, 4, 3))
    const full = coarseCovarianceTable(covarianceFunction(p), 4, 5, 3)
    let worst = 0
    for (let k = 0; k < full.length; k++) worst = Math.max(worst, Math.abs(sep[k]! - full[k]!))
    expect(worst).toBeLessThan(1e-15)
  })

  it('a cut-off at the decay radius changes the table by less than the tolerance', () => {
    const p: KernelParams = { kernel: 'matern32', lengthScale: 2, variance: 1 }
    const rho = (r: number) => correlationAt(p, r)
    const full = isotropicCoarseCovarianceTable(rho, 4, 12, 10)
    const cut = isotropicCoarseCovarianceTable(rho, 4, 12, 10, decayRadius(p, 1e-15))
    let worst = 0
    for (let k = 0; k < full.length; k++) worst = Math.max(worst, Math.abs(cut[k]! - full[k]!))
    expect(worst).toBeLessThan(1e-14)
    expect(full[full.length - 1]).toBeGreaterThan(0) // the far corner is tiny but not zero without the cut-off
  })

  it('the zero-lag entry is the variance of a block mean (exceeds 0, at most σ²; → σ² as ℓ/b grows)', () => {
    const table = (l: number) => isotropicCoarseCovarianceTable((r) => Math.exp(-r / l), 4, 3, 3)[2 * 5 + 2]!
    expect(table(0.5)).toBeLessThan(0.2)
    expect(table(1e4)).toBeGreaterThan(0.999)
  })

  it('rejects a bad block factor', () => {
    expect(() => coarseCovarianceTable(() => 1, 0, 2, 2)).toThrow(/block factor/)
    expect(() => isotropicCoarseCovarianceTable(() => 1, 2.5, 2, 2)).toThrow(/block factor/)
  })
})
