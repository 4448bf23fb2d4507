/**
 * Geometric anisotropy (Chilès & Delfiner 2012): kernel, change-of-support tables, exact conditioning on
 * the general embedding path, and maximum-likelihood recovery from coarse-grained synthetic fields.
 */
import { describe, expect, it } from 'vitest'
import { Matrix, inverse } from 'ml-matrix'
import { coarseCovarianceTable, pointSymmetricCoarseCovarianceTable } from '../../../shared/numerics/grf/changeOfSupport'
import { anisotropyMetric, covarianceFunction, decayRadius, type KernelParams } from '../../../shared/numerics/grf/kernels'
import { coarseCorrelationTable } from '../../../shared/numerics/fit/coarseCorrelation'
import { createDownscaler, type DownscalerSpec } from '../../../shared/numerics/grf/downscaler'
import { denseConditioning } from '../../../shared/numerics/grf/denseConditioning'
import { fitCoarseField, kernelParamsOf } from '../../../shared/numerics/fit/fitCoarse'
import { coordinatesFromShape, shapeFromCoordinates } from '../../../shared/numerics/fit/anisotropySearch'
import { blockAverage } from '../../../shared/numerics/interp/blockAverage'
import { meanAndSpread } from '../fit/synthetic'

function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let m = 0
  for (let k = 0; k < a.length; k++) m = Math.max(m, Math.abs(a[k]! - b[k]!))
  return m
}

/** Invented smooth coarse field with some small-scale structure. */
function coarseField(nx: number, ny: number): Float64Array {
  return Float64Array.from({ length: nx * ny }, (_, k) => 1 + Math.sin(0.8 * (k % nx) + 0.3 * Math.floor(k / nx)) + 0.5 * Math.cos(1.1 * Math.floor(k / nx)))
}

/** Signed angular difference modulo 180°, in (−90°, 90°]. */
function angleError(deg: number, truth: number): number {
  const d = (((deg - truth) % 180) + 180) % 180
  return d > 90 ? d - 180 : d
}

describe('anisotropic kernel', () => {
  it('se equals σ² exp(−½ hᵀ Σ⁻¹ h) with Σ = R diag(ℓ₁², ℓ₂²) Rᵀ (closed form; Σ⁻¹ by ml-matrix)', () => {
    const l1 = 4, l2 = 1.5, theta = 0.7, s2 = 1.3
    const R = new Matrix([[Math.cos(theta), -Math.sin(theta)], [Math.sin(theta), Math.cos(theta)]])
    const Sinv = inverse(R.mmul(Matrix.diag([l1 * l1, l2 * l2])).mmul(R.transpose()))
    const k = covarianceFunction({ kernel: 'se', lengthScale: l1, variance: s2, anisotropy: { ratio: l2 / l1, angle: theta } })
    for (const [dx, dy] of [[0, 0], [1, 0], [0, 1], [3, -2], [-4, 5], [2.5, 2.5]] as const) {
      const h = Matrix.columnVector([dx, dy])
      const q = h.transpose().mmul(Sinv).mmul(h).get(0, 0)
      expect(k(dx, dy)).toBeCloseTo(s2 * Math.exp(-0.5 * q), 14)
    }
  })

  it('along the major axis it is the isotropic kernel with ℓ₁, across it the one with ℓ₂; ratio 1 is isotropic', () => {
    for (const kernel of ['matern12', 'matern32', 'matern52'] as const) {
      const a = { ratio: 0.4, angle: 2.1 }
      const k = covarianceFunction({ kernel, lengthScale: 5, variance: 1, anisotropy: a })
      const k1 = covarianceFunction({ kernel, lengthScale: 5, variance: 1 }), k2 = covarianceFunction({ kernel, lengthScale: 2, variance: 1 })
      for (const r of [0.5, 1, 3, 7]) {
        expect(k(r * Math.cos(a.angle), r * Math.sin(a.angle))).toBeCloseTo(k1(r, 0), 13)
        expect(k(-r * Math.sin(a.angle), r * Math.cos(a.angle))).toBeCloseTo(k2(r, 0), 13)
      }
      // θ and θ + π are the same ellipse; ratio 1 gives back the isotropic kernel whatever θ.
      const kPi = covarianceFunction({ kernel, lengthScale: 5, variance: 1, anisotropy: { ratio: 0.4, angle: 2.1 + Math.PI } })
      const kIso = covarianceFunction({ kernel, lengthScale: 5, variance: 1, anisotropy: { ratio: 1, angle: 1 } })
      for (const [dx, dy] of [[1, 2], [-3, 1], [4, 4]] as const) {
        expect(kPi(dx, dy)).toBeCloseTo(k(dx, dy), 13)
        expect(kIso(dx, dy)).toBe(k1(dx, dy))
      }
    }
  })

  it('metric [a, c, d] has determinant 1/ratio² and is [1, 0, 1] when isotropic', () => {
    const [a, c, d] = anisotropyMetric({ ratio: 0.25, angle: 0.3 })
    expect(a * d - c * c).toBeCloseTo(16, 12)
    expect(anisotropyMetric(undefined)).toEqual([1, 0, 1])
  })

  it('rejects a ratio outside (0, 1] and a non-finite angle', () => {
    const spec = (ratio: number, angle = 0): DownscalerSpec => ({ coarse: coarseField(4, 4), nx: 4, ny: 4, factor: 2, kernel: { kernel: 'matern32', lengthScale: 3, variance: 1, anisotropy: { ratio, angle } }, mean: 0 })
    expect(() => createDownscaler(spec(1.5))).toThrow(/ratio/)
    expect(() => createDownscaler(spec(0))).toThrow(/ratio/)
    expect(() => createDownscaler(spec(0.5, NaN))).toThrow(/angle/)
  })
})

describe('change-of-support tables for rotated kernels', () => {
  it('the point-symmetric table (with and without the elliptical cut-off) equals the general table', () => {
    // The general table is itself checked against A K Aᵀ (ml-matrix) in kernels/changeOfSupport.test.ts.
    const p: KernelParams = { kernel: 'matern32', lengthScale: 6, variance: 1, anisotropy: { ratio: 0.35, angle: 0.9 } }
    const cov = covarianceFunction(p)
    for (const [b, mx, my] of [[3, 7, 5], [4, 6, 9], [2, 1, 4]] as const) {
      const general = coarseCovarianceTable(cov, b, mx, my)
      expect(maxAbsDiff(pointSymmetricCoarseCovarianceTable(cov, b, mx, my), general)).toBeLessThan(1e-15)
      const support = { metric: anisotropyMetric(p.anisotropy), radius: decayRadius(p, 1e-17) }
      expect(maxAbsDiff(pointSymmetricCoarseCovarianceTable(cov, b, mx, my, support), general)).toBeLessThan(1e-15)
      // The fitting table (unit variance) is the same table.
      expect(maxAbsDiff(coarseCorrelationTable('matern32', 6, b, mx, my, undefined, p.anisotropy), general)).toBeLessThan(1e-15)
    }
  })

  it('an axis-aligned se stays separable and equals the general table', () => {
    const a = { ratio: 0.5, angle: Math.PI / 2 }
    const cov = covarianceFunction({ kernel: 'se', lengthScale: 4, variance: 1, anisotropy: a })
    expect(maxAbsDiff(coarseCorrelationTable('se', 4, 3, 6, 5, undefined, a), coarseCovarianceTable(cov, 3, 6, 5))).toBeLessThan(1e-15)
  })
})

describe('exact conditioning with a rotated kernel (general embedding path) against the dense method', () => {
  const cases: { name: string; kernel: KernelParams; solver: string; nx: number; ny: number; b: number }[] = [
    { name: 'Matérn-3/2, ratio 0.4, θ = 35°', kernel: { kernel: 'matern32', lengthScale: 8, variance: 2, anisotropy: { ratio: 0.4, angle: 35 * Math.PI / 180 } }, solver: 'dense', nx: 7, ny: 5, b: 3 },
    { name: 'Matérn-5/2, ratio 0.6, θ = 120°, PCG', kernel: { kernel: 'matern52', lengthScale: 5, variance: 1, nugget: 0.01, anisotropy: { ratio: 0.6, angle: 120 * Math.PI / 180 } }, solver: 'pcg', nx: 6, ny: 6, b: 3 },
    { name: 'se, ratio 0.5, θ = 0 (separable, Kronecker)', kernel: { kernel: 'se', lengthScale: 3, variance: 1, anisotropy: { ratio: 0.5, angle: 0 } }, solver: 'kronecker', nx: 6, ny: 5, b: 3 },
    { name: 'se, ratio 0.5, θ = 50° (general path)', kernel: { kernel: 'se', lengthScale: 3, variance: 1, anisotropy: { ratio: 0.5, angle: 50 * Math.PI / 180 } }, solver: 'dense', nx: 6, ny: 5, b: 3 },
  ]
  for (const c of cases) {
    it(c.name, () => {
      const spec: DownscalerSpec = { coarse: coarseField(c.nx, c.ny), nx: c.nx, ny: c.ny, factor: c.b, kernel: c.kernel, mean: 0.7, options: c.solver === 'pcg' ? { solver: 'pcg' } : {} }
      const d = createDownscaler(spec)
      expect(d.diagnostics.solver).toBe(c.solver)
      // A nugget the engine adds for conditioning is part of its model: give the dense method the same one.
      const ref = denseConditioning({ ...spec, kernel: { ...c.kernel, nugget: (c.kernel.nugget ?? 0) + d.diagnostics.addedNugget } })
      expect(maxAbsDiff(d.mean(), ref.mean)).toBeLessThan(1e-9)
      expect(maxAbsDiff(d.std(), ref.std)).toBeLessThan(1e-8)
      for (const index of [0, 1]) {
        const z = d.unconditional(5, index)
        expect(maxAbsDiff(d.sample(5, index), ref.condition(z))).toBeLessThan(1e-9)
      }
    })
  }

  it('the unconditional sampler has the anisotropic covariance (torus eigenvalues reproduce k on the window)', () => {
    const kernel: KernelParams = { kernel: 'matern32', lengthScale: 10, variance: 1, anisotropy: { ratio: 0.3, angle: 1.1 } }
    const d = createDownscaler({ coarse: coarseField(8, 8), nx: 8, ny: 8, factor: 4, kernel, mean: 0 })
    const { eigenvalues, nx: tx, ny: ty } = d.model.embedding
    // First row of the torus covariance = inverse DFT of λ, by direct summation (independent of the FFT).
    const cov = covarianceFunction(kernel)
    for (const [dx, dy] of [[0, 0], [3, 2], [-5, 4], [7, -7]] as const) {
      let s = 0
      for (let ky = 0; ky < ty; ky++) for (let kx = 0; kx < tx; kx++) s += eigenvalues[ky * tx + kx]! * Math.cos(2 * Math.PI * (kx * dx / tx + ky * dy / ty))
      expect(s / (tx * ty)).toBeCloseTo(cov(dx, dy), 10)
    }
  })

  it('ratio 1 is bit-for-bit the isotropic engine', () => {
    const base: DownscalerSpec = { coarse: coarseField(6, 5), nx: 6, ny: 5, factor: 3, kernel: { kernel: 'matern32', lengthScale: 5, variance: 1 }, mean: 0 }
    const iso = createDownscaler(base), unit = createDownscaler({ ...base, kernel: { ...base.kernel, anisotropy: { ratio: 1, angle: 0.8 } } })
    expect(Array.from(unit.sample(3, 1))).toEqual(Array.from(iso.sample(3, 1)))
    expect(Array.from(unit.mean())).toEqual(Array.from(iso.mean()))
  })
})

describe('maximum-likelihood anisotropy from coarse-grained synthetic fields', () => {
  it('(s, p, q) coordinates round-trip to (ℓ₁, ratio, θ)', () => {
    const back = shapeFromCoordinates(...coordinatesFromShape(7, { ratio: 0.3, angle: 2.5 }))
    expect(back.lengthScale).toBeCloseTo(7, 12)
    expect(back.anisotropy.ratio).toBeCloseTo(0.3, 12)
    expect(back.anisotropy.angle).toBeCloseTo(2.5, 12)
  })

  /**
   * Replicates: fine fields drawn by the engine's unconditional sampler (circulant embedding) with the true
   * anisotropic kernel, block-averaged, fitted with anisotropy 'fit'. Bias and spread are printed.
   */
  function study(kernel: KernelParams, n: number, b: number, replicates: number, method: 'auto' | 'whittle' = 'auto') {
    const fine = n * b
    const d = createDownscaler({ coarse: new Float64Array(n * n), nx: n, ny: n, factor: b, kernel, mean: 0 })
    const ratios: number[] = [], angles: number[] = [], majors: number[] = []
    let adopted = 0
    const truthDeg = (kernel.anisotropy!.angle * 180) / Math.PI
    for (let r = 0; r < replicates; r++) {
      const y = blockAverage(d.unconditional(40 + r), fine, fine, b).map((v) => v + 4)
      const fit = fitCoarseField(y, n, n, { factor: b, kernel: kernel.kernel, anisotropy: 'fit', method })
      const a = fit.anisotropy!
      ratios.push(a.ratio); angles.push(angleError(a.angleDegrees, truthDeg)); majors.push(a.majorLengthScale)
      if (a.adopted) {
        adopted++
        expect(kernelParamsOf(fit).anisotropy).toEqual({ ratio: a.ratio, angle: a.angle })
        expect(fit.lengthScale).toBe(a.majorLengthScale)
      }
    }
    const ratio = meanAndSpread(ratios), angle = meanAndSpread(angles), major = meanAndSpread(majors)
    const truthRatio = kernel.anisotropy!.ratio
    console.log(`[anisotropy study] ${kernel.kernel} ${n}×${n} b=${b}, truth ratio ${truthRatio} angle ${truthDeg.toFixed(0)}° ℓ₁ ${kernel.lengthScale}: `
      + `ratio ${ratio.mean.toFixed(3)} (bias ${(100 * (ratio.mean - truthRatio) / truthRatio).toFixed(1)}%, sd ${ratio.sd.toFixed(3)}), `
      + `angle bias ${angle.mean.toFixed(2)}° sd ${angle.sd.toFixed(2)}°, ℓ₁ ${major.mean.toFixed(2)} sd ${major.sd.toFixed(2)}, adopted ${adopted}/${replicates}`)
    return { ratio, angle, major, adopted, truthRatio }
  }

  it('debiased Whittle, Matérn-3/2, ratio 0.5, θ = 30°, ℓ₁ = 3 coarse cells, 32×32 coarse, b = 4: 6 replicates', () => {
    const s = study({ kernel: 'matern32', lengthScale: 12, variance: 2, anisotropy: { ratio: 0.5, angle: Math.PI / 6 } }, 32, 4, 6)
    // Targets of the issue: angle within 10° and ratio within 15% on average.
    expect(Math.abs(s.ratio.mean - s.truthRatio) / s.truthRatio).toBeLessThan(0.15)
    expect(Math.abs(s.angle.mean)).toBeLessThan(10)
    expect(s.adopted).toBe(6)
  })

  it('se with an estimated nugget, ratio 0.4, θ = 120°, 24×24 coarse, b = 4: 4 replicates', () => {
    const s = study({ kernel: 'se', lengthScale: 10, variance: 1, anisotropy: { ratio: 0.4, angle: (2 * Math.PI) / 3 } }, 24, 4, 4)
    expect(Math.abs(s.ratio.mean - s.truthRatio) / s.truthRatio).toBeLessThan(0.15)
    expect(Math.abs(s.angle.mean)).toBeLessThan(10)
  })

  it('exact dense likelihood, Matérn-5/2, ratio 0.6, θ = 75°, 12×12 coarse, b = 4: 2 replicates', () => {
    const s = study({ kernel: 'matern52', lengthScale: 10, variance: 1, anisotropy: { ratio: 0.6, angle: (75 * Math.PI) / 180 } }, 12, 4, 2)
    // Only 144 cells: looser, but the shape must still be found (bounds of 3 sd from the measured spread).
    expect(Math.abs(s.ratio.mean - s.truthRatio) / s.truthRatio).toBeLessThan(0.25)
    expect(Math.abs(s.angle.mean)).toBeLessThan(15)
  })

  it('isotropic truth: the fitted ratio stays near 1 and the isotropic model is kept in most replicates', () => {
    const s = study({ kernel: 'matern32', lengthScale: 10, variance: 1, anisotropy: { ratio: 1, angle: 0 } }, 32, 4, 6)
    expect(s.ratio.mean).toBeGreaterThan(0.85)
    expect(s.adopted).toBeLessThanOrEqual(2) // the 5% test: P(≥ 3 of 6) < 0.3% (binomial)
  })

  it("'off' gives the isotropic fit, a given shape fits ℓ₁ at that shape", () => {
    const n = 10, b = 4
    const d = createDownscaler({ coarse: new Float64Array(n * n), nx: n, ny: n, factor: b, kernel: { kernel: 'matern32', lengthScale: 6, variance: 1 }, mean: 0 })
    const y = blockAverage(d.unconditional(3), n * b, n * b, b)
    const plain = fitCoarseField(y, n, n, { factor: b, kernel: 'matern32' })
    expect(fitCoarseField(y, n, n, { factor: b, kernel: 'matern32', anisotropy: 'off' })).toEqual(plain)
    expect(plain.anisotropy).toBeUndefined()
    expect(kernelParamsOf(plain).anisotropy).toBeUndefined()
    const given = fitCoarseField(y, n, n, { factor: b, kernel: 'matern32', anisotropy: { ratio: 0.5, angle: 0.4 } })
    expect(given.anisotropy).toMatchObject({ source: 'given', adopted: true, ratio: 0.5, angle: 0.4 })
    expect(kernelParamsOf(given).anisotropy).toEqual({ ratio: 0.5, angle: 0.4 })
    expect(() => fitCoarseField(y, n, n, { factor: b, kernel: 'matern32', anisotropy: { ratio: 2, angle: 0 } })).toThrow(/ratio/)
  })
})
