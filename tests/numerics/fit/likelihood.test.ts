import { describe, expect, it } from 'vitest'
import { EigenvalueDecomposition, Matrix, determinant, inverse } from 'ml-matrix'
import { prepareCoarseField } from '../../../shared/numerics/fit/coarseField'
import { coarseCorrelationTable } from '../../../shared/numerics/fit/coarseCorrelation'
import { denseLogLikelihood, validCellCorrelation } from '../../../shared/numerics/fit/denseLikelihood'
import { kroneckerLogLikelihood, toeplitzEigen } from '../../../shared/numerics/fit/kroneckerLikelihood'
import { expectedPeriodogram, prepareWhittle, splitCosineTaper, whittleLogLikelihood } from '../../../shared/numerics/fit/whittleLikelihood'
import { coarseSampler } from './synthetic'

/** Gaussian log-density log N(y; μ1, Σ) straight from ml-matrix's inverse and determinant (LU). */
function mvnLogDensity(y: number[], mu: number, Sigma: Matrix): number {
  const m = y.length
  const r = Matrix.columnVector(y.map((v) => v - mu))
  const quad = r.transpose().mmul(inverse(Sigma)).mmul(r).get(0, 0)
  return -0.5 * m * Math.log(2 * Math.PI) - 0.5 * Math.log(determinant(Sigma)) - 0.5 * quad
}

describe('exact profile likelihood (dense Cholesky)', () => {
  const nx = 7, ny = 5, b = 3
  const y = coarseSampler({ kernel: 'matern32', lengthScale: 4, variance: 2.5, mean: 11, factor: b, nx, ny })(7)
  y[3] = NaN; y[17] = NaN; y[30] = NaN // missing cells are left out
  const field = prepareCoarseField(y, nx, ny, b)
  const table = coarseCorrelationTable('matern32', 4.6, b, nx, ny)
  const nugget = 1e-3
  const fit = denseLogLikelihood(field, table, nugget)
  const m = field.valid.length
  const Rflat = validCellCorrelation(field, table, nugget)
  const R = new Matrix(m, m)
  for (let p = 0; p < m; p++) for (let q = 0; q < m; q++) R.set(p, q, Rflat[p * m + q]!)
  const yv = Array.from(field.valid, (k) => y[k]!)

  it('μ̂ and σ̂² match the GLS formulas evaluated with ml-matrix inverse(R)', () => {
    const Ri = inverse(R)
    const one = Matrix.columnVector(new Array(m).fill(1)), yc = Matrix.columnVector(yv)
    const muHat = one.transpose().mmul(Ri).mmul(yc).get(0, 0) / one.transpose().mmul(Ri).mmul(one).get(0, 0)
    const r = Matrix.columnVector(yv.map((v) => v - muHat))
    const s2 = r.transpose().mmul(Ri).mmul(r).get(0, 0) / m
    expect(Math.abs(fit.mean - muHat)).toBeLessThan(1e-10)
    expect(Math.abs(fit.variance / s2 - 1)).toBeLessThan(1e-10)
  })

  it('equals the multivariate normal log-density (ml-matrix inverse + determinant) at (μ̂, σ̂²)', () => {
    const ref = mvnLogDensity(yv, fit.mean, R.clone().mul(fit.variance))
    expect(Math.abs(fit.logLikelihood - ref)).toBeLessThan(1e-9)
  })

  it('is the maximum over μ and σ² (perturbing either lowers the density)', () => {
    for (const [dm, ds] of [[0.05, 1], [-0.05, 1], [0, 1.05], [0, 0.95]] as const) {
      expect(mvnLogDensity(yv, fit.mean + dm, R.clone().mul(fit.variance * ds))).toBeLessThan(fit.logLikelihood)
    }
  })
})

describe('Kronecker likelihood for se on a complete grid (Saatçi 2011)', () => {
  it('equals the dense exact likelihood on a small se case, with and without a visible nugget', () => {
    const nx = 9, ny = 6, b = 2
    const y = coarseSampler({ kernel: 'se', lengthScale: 3, variance: 1.3, mean: -2, factor: b, nx, ny, nugget: 1e-4 })(11)
    const field = prepareCoarseField(y, nx, ny, b)
    for (const [l, nugget] of [[2.2, 1e-4], [3.1, 1e-6], [1.0, 0]] as const) {
      const dense = denseLogLikelihood(field, coarseCorrelationTable('se', l, b, nx, ny), nugget)
      const kron = kroneckerLogLikelihood(field, b, l, nugget)
      expect(Math.abs(kron.logLikelihood - dense.logLikelihood)).toBeLessThan(1e-7 * Math.abs(dense.logLikelihood))
      expect(Math.abs(kron.mean - dense.mean)).toBeLessThan(1e-8)
      expect(Math.abs(kron.variance / dense.variance - 1)).toBeLessThan(1e-8)
    }
  })

  it('centrosymmetric split eigendecomposition reconstructs T and matches ml-matrix eigenvalues (n = 1, 2, 7, 8)', () => {
    for (const n of [1, 2, 7, 8]) {
      const c = Float64Array.from({ length: 2 * n - 1 }, (_, k) => Math.exp(-Math.abs(k - n + 1) / 2.5) + (k === n - 1 ? 0.1 : 0))
      const { values, vectors } = toeplitzEigen(c, n)
      const T = new Matrix(n, n)
      for (let i = 0; i < n; i++) for (let k = 0; k < n; k++) T.set(i, k, c[i - k + n - 1]!)
      const Q = new Matrix(n, n)
      for (let i = 0; i < n; i++) for (let k = 0; k < n; k++) Q.set(i, k, vectors[i * n + k]!)
      const rebuilt = Q.mmul(Matrix.diag(Array.from(values))).mmul(Q.transpose())
      expect(Math.max(...rebuilt.sub(T).abs().to1DArray())).toBeLessThan(1e-13)
      expect(Math.max(...Q.transpose().mmul(Q).sub(Matrix.eye(n)).abs().to1DArray())).toBeLessThan(1e-13)
      const ref = new EigenvalueDecomposition(T, { assumeSymmetric: true }).realEigenvalues.sort((a, b) => a - b)
      const ours = Array.from(values).sort((a, b) => a - b)
      for (let k = 0; k < n; k++) expect(Math.abs(ours[k]! - ref[k]!)).toBeLessThan(1e-13)
    }
  })

  it('refuses a grid with missing cells', () => {
    const y = Float64Array.from({ length: 36 }, (_, k) => Math.sin(k))
    y[5] = NaN
    expect(() => kroneckerLogLikelihood(prepareCoarseField(y, 6, 6, 2), 2, 2, 1e-8)).toThrow(/complete grid/)
  })
})

describe('debiased Whittle likelihood (Guillaumin et al. 2022)', () => {
  for (const taper of [0, 0.5]) {
    it(`expected periodogram equals E|Σ g_s y_s e^{−iω·s}|²/Σg² from the dense covariance, missing cells, taper ${taper}`, () => {
      const nx = 6, ny = 5, b = 2
      const y = Float64Array.from({ length: nx * ny }, (_, k) => Math.cos(1.3 * k))
      y[0] = NaN; y[8] = NaN; y[21] = NaN
      const field = prepareCoarseField(y, nx, ny, b)
      const data = prepareWhittle(field, taper)
      const table = coarseCorrelationTable('matern12', 3, b, nx, ny)
      const nugget = 0.01
      const expected = expectedPeriodogram(data, table, nugget)
      const R = validCellCorrelation(field, table, nugget)
      const m = field.valid.length, wx = 2 * nx - 1
      expect(table.length).toBe(wx * (2 * ny - 1))
      // Weights g_s = taper(i)·taper(j) on valid cells.
      const hx = splitCosineTaper(nx, taper), hy = splitCosineTaper(ny, taper)
      const g = Array.from(field.valid, (s) => hx[s % nx]! * hy[Math.floor(s / nx)]!)
      const sumG2 = g.reduce((acc, v) => acc + v * v, 0)
      for (let ky = 0; ky < ny; ky++) {
        for (let kx = 0; kx < nx; kx++) {
          // E|vᴴy|² = vᴴ R v with v_s = g_s e^{iω·s} over valid cells (direct O(m²) sum).
          let acc = 0
          for (let p = 0; p < m; p++) {
            const sp = field.valid[p]!, ip = sp % nx, jp = Math.floor(sp / nx)
            for (let q = 0; q < m; q++) {
              const sq = field.valid[q]!, iq = sq % nx, jq = Math.floor(sq / nx)
              acc += g[p]! * g[q]! * R[p * m + q]! * Math.cos(2 * Math.PI * (kx * (ip - iq) / nx + ky * (jp - jq) / ny))
            }
          }
          expect(Math.abs(expected[ky * nx + kx]! - acc / sumG2)).toBeLessThan(1e-12)
        }
      }
    })
  }

  it('periodogram is |naive DFT|² / (valid cells) of the centred, masked field', () => {
    const nx = 5, ny = 4
    const y = Float64Array.from({ length: nx * ny }, (_, k) => (k * 7919) % 13 - 6)
    y[6] = NaN
    const field = prepareCoarseField(y, nx, ny, 1)
    const { periodogram } = prepareWhittle(field)
    for (let ky = 0; ky < ny; ky++) for (let kx = 0; kx < nx; kx++) {
      let re = 0, im = 0
      for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
        const a = -2 * Math.PI * (kx * i / nx + ky * j / ny)
        re += field.centred[j * nx + i]! * Math.cos(a); im += field.centred[j * nx + i]! * Math.sin(a)
      }
      expect(Math.abs(periodogram[ky * nx + kx]! - (re * re + im * im) / field.valid.length)).toBeLessThan(1e-10)
    }
  })

  it('with σ² profiled, the Whittle variance is the mean of I/Ī₁ over non-zero frequencies', () => {
    const nx = 8, ny = 8, b = 2
    const y = coarseSampler({ kernel: 'matern32', lengthScale: 3, variance: 4, mean: 0, factor: b, nx, ny })(3)
    const data = prepareWhittle(prepareCoarseField(y, nx, ny, b))
    const table = coarseCorrelationTable('matern32', 3, b, nx, ny)
    const e = expectedPeriodogram(data, table, 0)
    let s = 0
    for (let k = 1; k < nx * ny; k++) s += data.periodogram[k]! / e[k]!
    expect(whittleLogLikelihood(data, table, 0).variance).toBeCloseTo(s / (nx * ny - 1), 12)
  })
})
