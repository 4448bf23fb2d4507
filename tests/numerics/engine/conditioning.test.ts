import { describe, expect, it } from 'vitest'
import { CholeskyDecomposition, Matrix } from 'ml-matrix'
import { blockMeans, createDownscaler, type DownscalerSpec } from '../../../shared/numerics/grf/downscaler'
import { denseConditioning } from '../../../shared/numerics/grf/denseConditioning'
import { covarianceFunction, type KernelParams } from '../../../shared/numerics/grf/kernels'
import { coarseCovarianceTable } from '../../../shared/numerics/grf/changeOfSupport'

function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let m = 0
  for (let k = 0; k < a.length; k++) m = Math.max(m, Math.abs(a[k]! - b[k]!))
  return m
}

/** A deterministic, non-trivial coarse field (invented values). */
function coarseField(nx: number, ny: number, missing: number[] = []): Float64Array {
  const y = Float64Array.from({ length: nx * ny }, (_, k) => 1.5 + Math.sin(0.9 * (k % nx)) + 0.6 * Math.cos(1.3 * Math.floor(k / nx) + 0.4 * k))
  for (const k of missing) y[k] = NaN
  return y
}

function maxBlockMeanError(field: Float64Array, spec: DownscalerSpec): number {
  const means = blockMeans(field, spec.nx * spec.factor, spec.nx, spec.ny, spec.factor)
  let e = 0
  for (let k = 0; k < means.length; k++) if (Number.isFinite(spec.coarse[k]!)) e = Math.max(e, Math.abs(means[k]! - spec.coarse[k]!))
  return e
}

const cases: { name: string; spec: DownscalerSpec; solver: string }[] = [
  { name: 'Matérn-3/2, complete, constant mean', solver: 'dense',
    spec: { coarse: coarseField(7, 5), nx: 7, ny: 5, factor: 4, kernel: { kernel: 'matern32', lengthScale: 5, variance: 2 }, mean: 1.2 } },
  { name: 'se, complete (Kronecker)', solver: 'kronecker',
    spec: { coarse: coarseField(6, 5), nx: 6, ny: 5, factor: 3, kernel: { kernel: 'se', lengthScale: 2.5, variance: 1.5 }, mean: 0.5 } },
  { name: 'Matérn-3/2, missing cells, linear trend', solver: 'dense',
    spec: { coarse: coarseField(7, 5, [3, 12, 13, 34]), nx: 7, ny: 5, factor: 4, kernel: { kernel: 'matern32', lengthScale: 6, variance: 2 }, mean: { b0: 0.3, b1: 0.02, b2: -0.05 } } },
  { name: 'se, missing cells', solver: 'dense',
    spec: { coarse: coarseField(6, 6, [0, 20]), nx: 6, ny: 6, factor: 2, kernel: { kernel: 'se', lengthScale: 2, variance: 1 }, mean: 1 } },
  { name: 'Matérn-5/2, missing cells, PCG forced, with a nugget', solver: 'pcg',
    spec: { coarse: coarseField(8, 6, [9, 10, 40]), nx: 8, ny: 6, factor: 3, kernel: { kernel: 'matern52', lengthScale: 4, variance: 1, nugget: 0.01 }, mean: 0, options: { solver: 'pcg' } } },
  { name: 'general Matérn ν = 1.2, complete', solver: 'dense',
    spec: { coarse: coarseField(5, 4), nx: 5, ny: 4, factor: 3, kernel: { kernel: 'matern', nu: 1.2, lengthScale: 3, variance: 1 }, mean: 0 } },
  { name: 'Matérn-1/2, complete', solver: 'dense',
    spec: { coarse: coarseField(5, 4), nx: 5, ny: 4, factor: 4, kernel: { kernel: 'matern12', lengthScale: 3, variance: 1 }, mean: 2 } },
]

describe('conditional mean, std and samples against the dense method (reference: ml-matrix, kriging formulas on the plane)', () => {
  for (const { name, spec, solver } of cases) {
    it(name, () => {
      const d = createDownscaler(spec)
      const ref = denseConditioning(spec)
      expect(d.diagnostics.solver).toBe(solver)
      expect(d.diagnostics.addedNugget).toBe(0)
      // Agreement to ~1e-12: both are exact; the torus differs from the plane only below 1e-12·k(0).
      expect(maxAbsDiff(d.mean(), ref.mean)).toBeLessThan(1e-10)
      expect(maxAbsDiff(d.std(), ref.std)).toBeLessThan(1e-9)
      // Samples: the same unconditional field conditioned by both routes (Fourier-domain vs dense).
      for (const index of [0, 1, 2]) {
        const z = d.unconditional(11, index)
        expect(maxAbsDiff(d.sample(11, index), ref.condition(z))).toBeLessThan(1e-10)
        expect(maxAbsDiff(d.condition(z), ref.condition(z))).toBeLessThan(1e-10)
      }
    })
  }
})

describe('block means are reproduced exactly (to rounding)', () => {
  for (const { name, spec } of cases) {
    it(name, () => {
      const d = createDownscaler(spec)
      // Common practice: "to rounding" means a small multiple of ε·max|y| after O(m) operations.
      expect(maxBlockMeanError(d.mean(), spec)).toBeLessThan(1e-13)
      for (const s of d.samples(5, 3)) expect(maxBlockMeanError(s, spec)).toBeLessThan(1e-13)
      expect(d.diagnostics.blockMeanError).toBeLessThan(1e-13)
      // The kriging solve itself, before the final block projection, is already exact to rounding.
      expect(d.diagnostics.blockMeanCorrection).toBeLessThan(1e-11)
    })
  }

  it('missing cells are not conditioned on: their block means differ from the (ignored) input', () => {
    const spec = cases[2]!.spec
    const d = createDownscaler(spec)
    const withValue = { ...spec, coarse: Float64Array.from(spec.coarse, (v) => (Number.isNaN(v) ? 50 : v)) }
    const means = blockMeans(d.mean(), spec.nx * spec.factor, spec.nx, spec.ny, spec.factor)
    expect(Math.abs(means[3]! - 50)).toBeGreaterThan(1)
    expect(maxBlockMeanError(createDownscaler(withValue).mean(), withValue)).toBeLessThan(1e-12)
  })
})

describe('law of total variance (exact, dense case)', () => {
  it('k(0) = posterior variance + Var(conditional mean), Var computed with ml-matrix from the prior covariance', () => {
    const spec = cases[2]!.spec
    const ref = denseConditioning(spec)
    const d = createDownscaler(spec)
    const std = d.std()
    // mean = m + Bᵀ C⁻¹ (y − A m) with B = A K, and Cov(y) = A K Aᵀ under the prior: Var(mean) = diag(Bᵀ C⁻¹ Cov(y) C⁻¹ B).
    const B = ref.blockCross
    const covY = new Matrix(ref.observed.length, ref.observed.length)
    const b = spec.factor, fineNx = spec.nx * b
    for (let r = 0; r < ref.observed.length; r++) for (let c = 0; c < ref.observed.length; c++) {
      const I = ref.observed[c]! % spec.nx, J = (ref.observed[c]! - I) / spec.nx
      let s = 0
      for (let dy = 0; dy < b; dy++) for (let dx = 0; dx < b; dx++) s += B.get(r, (J * b + dy) * fineNx + I * b + dx)
      covY.set(r, c, s / (b * b))
    }
    const W = new CholeskyDecomposition(ref.coarseCovariance).solve(B) // C⁻¹ B
    const varMean = W.transpose().mmul(covY).mmul(W)
    const k0 = spec.kernel.variance + (spec.kernel.nugget ?? 0)
    for (let i = 0; i < std.length; i++) expect(Math.abs(std[i]! ** 2 + varMean.get(i, i) - k0)).toBeLessThan(1e-10)
  })
})

describe('sample covariance of seeded conditional samples converges to the posterior covariance', () => {
  it('every entry within 4.5 standard errors of sampling theory', () => {
    const spec: DownscalerSpec = { coarse: coarseField(3, 2, [4]), nx: 3, ny: 2, factor: 2, kernel: { kernel: 'matern32', lengthScale: 2, variance: 1 }, mean: 0.5 }
    const ref = denseConditioning(spec)
    const d = createDownscaler(spec)
    const n = 4000, W = 24
    const samples = d.samples(n, 2024)
    const mean = ref.mean, post = ref.posteriorCovariance
    let worst = 0
    for (let i = 0; i < W; i++) for (let j = 0; j <= i; j++) {
      let s = 0
      for (const x of samples) s += (x[i]! - mean[i]!) * (x[j]! - mean[j]!)
      const est = s / n, sii = post.get(i, i), sjj = post.get(j, j), sij = post.get(i, j)
      // Var of a sample covariance (known mean) of Gaussian data: (σij² + σii σjj)/n (Anderson 2003, §3.4).
      const se = Math.sqrt((sij * sij + sii * sjj) / n)
      if (se > 1e-12) worst = Math.max(worst, Math.abs(est - sij) / se)
      else expect(Math.abs(est - sij)).toBeLessThan(1e-12) // directions fixed by the block means
    }
    // 300 entries; P(|Z| > 4.5) ≈ 6.8e-6 each, so a correct sampler fails with probability < 0.3 %.
    expect(worst).toBeLessThan(4.5)
    // And the samples are centred on the conditional mean (standard error √(σii/n)).
    for (let i = 0; i < W; i++) {
      const m = samples.reduce((s, x) => s + x[i]!, 0) / n
      expect(Math.abs(m - mean[i]!)).toBeLessThan(4.5 * Math.sqrt(post.get(i, i) / n) + 1e-12)
    }
  })
})

describe('coarse covariance from the torus spectrum', () => {
  it('equals the change-of-support table c_B(Δ) = Σ w(δx)w(δy)k(bΔ+δ) (Kyriakidis 2004) on every window lag', () => {
    for (const kernel of [{ kernel: 'matern32', lengthScale: 5, variance: 2 }, { kernel: 'se', lengthScale: 3, variance: 1 }] as KernelParams[]) {
      const spec: DownscalerSpec = { coarse: coarseField(6, 5), nx: 6, ny: 5, factor: 3, kernel, mean: 0 }
      const C = createDownscaler(spec).model.covariance
      const table = coarseCovarianceTable(covarianceFunction(kernel), 3, 6, 5)
      for (let dy = -4; dy <= 4; dy++) for (let dx = -5; dx <= 5; dx++) {
        expect(Math.abs(C.entry(dx, dy) - table[(dy + 4) * 11 + dx + 5]!)).toBeLessThan(1e-12)
      }
    }
  })
})

describe('circulant embedding eigenvalue check', () => {
  const base: DownscalerSpec = { coarse: coarseField(3, 3), nx: 3, ny: 3, factor: 3, kernel: { kernel: 'matern52', lengthScale: 4, variance: 1 }, mean: 0 }
  it('too little padding goes negative, is enlarged, and the result is still exact', () => {
    // A decay tolerance of 1e-2 cuts the kernel where it is still 1 % of k(0): the first torus is indefinite.
    const spec = { ...base, options: { decayTolerance: 1e-2 } }
    const d = createDownscaler(spec)
    expect(d.diagnostics.paddingEnlargements).toBeGreaterThanOrEqual(1)
    const ref = denseConditioning(base)
    expect(maxAbsDiff(d.mean(), ref.mean)).toBeLessThan(1e-8)
    expect(maxAbsDiff(d.std(), ref.std)).toBeLessThan(1e-8)
  })
  it('fails with a clear message rather than return a wrong covariance', () => {
    const spec = { ...base, options: { decayTolerance: 1e-2, embedding: { maxEnlargements: 0 } } }
    expect(() => createDownscaler(spec)).toThrow(/not positive semi-definite.*min eigenvalue -/)
  })
})

describe('input checks and edge cases', () => {
  const kernel: KernelParams = { kernel: 'matern32', lengthScale: 3, variance: 1 }
  it('block factor must be an integer from 2 to 16', () => {
    for (const factor of [1, 2.5, 17, 0]) {
      expect(() => createDownscaler({ coarse: coarseField(2, 2), nx: 2, ny: 2, factor, kernel, mean: 0 })).toThrow(/block factor must be an integer from 2 to 16/)
    }
  })
  it('wrong length, no observed cells, bad kernel parameters', () => {
    expect(() => createDownscaler({ coarse: new Float64Array(3), nx: 2, ny: 2, factor: 2, kernel, mean: 0 })).toThrow(/3 values, expected nx·ny = 4/)
    expect(() => createDownscaler({ coarse: new Float64Array(4).fill(NaN), nx: 2, ny: 2, factor: 2, kernel, mean: 0 })).toThrow(/no observed cells/)
    expect(() => createDownscaler({ coarse: coarseField(2, 2), nx: 2, ny: 2, factor: 2, kernel: { ...kernel, lengthScale: 0 }, mean: 0 })).toThrow(/length scale/)
  })
  it('a 1×1 coarse grid: samples average to y, mean and std match the dense method', () => {
    const spec: DownscalerSpec = { coarse: Float64Array.of(3.2), nx: 1, ny: 1, factor: 5, kernel, mean: 1 }
    const d = createDownscaler(spec)
    const ref = denseConditioning(spec)
    expect(maxAbsDiff(d.mean(), ref.mean)).toBeLessThan(1e-10)
    expect(maxAbsDiff(d.std(), ref.std)).toBeLessThan(1e-9)
    for (const s of d.samples(3, 1)) expect(Math.abs(s.reduce((a, v) => a + v, 0) / 25 - 3.2)).toBeLessThan(1e-13)
  })
  it('sample k of seed S is reproducible on its own; other seeds differ', () => {
    const d = createDownscaler(cases[0]!.spec)
    const all = d.samples(5, 77)
    for (let k = 0; k < 5; k++) expect(Array.from(d.sample(77, k))).toEqual(Array.from(all[k]!))
    expect(maxAbsDiff(d.sample(78, 0), all[0]!)).toBeGreaterThan(1e-3)
    expect(maxAbsDiff(all[0]!, all[1]!)).toBeGreaterThan(1e-3)
  })
  it('an unconverged PCG throws with its residual instead of returning', () => {
    const spec = { ...cases[0]!.spec, options: { solver: 'pcg' as const, pcg: { maxIterations: 2 } } }
    expect(() => createDownscaler(spec).mean()).toThrow(/did not converge: relative residual .* after 2 iterations/)
  })
})

describe('ill-conditioned squared-exponential (ℓ = 2 coarse cells)', () => {
  it('adds a stated nugget, keeps block means exact, and equals the dense method run with that nugget', () => {
    const spec: DownscalerSpec = { coarse: coarseField(10, 8), nx: 10, ny: 8, factor: 4, kernel: { kernel: 'se', lengthScale: 8, variance: 1 }, mean: 0 }
    const d = createDownscaler(spec)
    expect(d.diagnostics.addedNugget).toBeGreaterThan(0)
    expect(d.diagnostics.conditionBound).toBeLessThanOrEqual(1e10 * (1 + 1e-9))
    expect(maxBlockMeanError(d.mean(), spec)).toBeLessThan(1e-13)
    for (const s of d.samples(2, 5)) expect(maxBlockMeanError(s, spec)).toBeLessThan(1e-13)
    expect(d.diagnostics.blockMeanCorrection).toBeLessThan(1e-8)
    const ref = denseConditioning({ ...spec, kernel: { ...spec.kernel, nugget: d.diagnostics.addedNugget } })
    // cond(C) ≈ 1e10 limits any method to ~ε·cond relative accuracy in the worst directions.
    expect(maxAbsDiff(d.mean(), ref.mean)).toBeLessThan(1e-5)
    expect(maxAbsDiff(d.std(), ref.std)).toBeLessThan(1e-5)
  })
})

describe('squared-exponential with a hole in the data (PCG cannot converge)', () => {
  const missing: number[] = []
  for (let J = 10; J < 20; J++) for (let I = 8; I < 20; I++) missing.push(J * 36 + I)
  const spec: DownscalerSpec = { coarse: coarseField(36, 30, missing), nx: 36, ny: 30, factor: 2, kernel: { kernel: 'se', lengthScale: 4, variance: 1 }, mean: 0 }
  it('falls back to dense Cholesky, says so, and still reproduces the block means', () => {
    const d = createDownscaler({ ...spec, options: { denseLimit: 100 } })
    const mean = d.mean()
    expect(d.diagnostics.solver).toBe('dense')
    expect(d.diagnostics.solverNote).toMatch(/PCG failed .*switched to dense Cholesky/)
    expect(maxBlockMeanError(mean, spec)).toBeLessThan(1e-13)
    expect(d.diagnostics.blockMeanCorrection).toBeLessThan(1e-6)
  })
  it('without a fallback it throws a clear error instead of returning an unconverged answer', () => {
    const d = createDownscaler({ ...spec, options: { denseLimit: 100, denseFallbackLimit: 0 } })
    expect(() => d.mean()).toThrow(/did not converge.*too ill-conditioned/)
  })
})

describe('window posterior std for large grids (reference: dense std)', () => {
  const spec: DownscalerSpec = { coarse: coarseField(22, 19), nx: 22, ny: 19, factor: 2, kernel: { kernel: 'matern32', lengthScale: 4, variance: 1 }, mean: 0 }
  const d = createDownscaler(spec)
  const exact = d.std({ method: 'dense' })
  it('never below the exact std; within its certified bound; interior within the interior bound', () => {
    const w = 9, h = 4
    const std = d.std({ method: 'window', window: w })
    const bound = d.diagnostics.stdErrorBound!, interior = d.diagnostics.stdInteriorErrorBound!
    let worstInterior = 0
    for (let k = 0; k < std.length; k++) {
      expect(std[k]! - exact[k]!).toBeGreaterThan(-1e-12)
      expect(std[k]! - exact[k]!).toBeLessThanOrEqual(bound + 1e-12)
      const I = Math.floor((k % 44) / 2), J = Math.floor(Math.floor(k / 44) / 2)
      if (I >= h && I < 22 - h && J >= h && J < 19 - h) worstInterior = Math.max(worstInterior, std[k]! - exact[k]!)
    }
    expect(worstInterior).toBeLessThanOrEqual(interior + 1e-12)
    expect(interior).toBeLessThan(1e-3)
    expect(maxAbsDiff(std, exact)).toBeLessThan(1e-3)
  })
  it('is exact when the window covers the grid', () => {
    const std = d.std({ method: 'window', window: 23 })
    expect(d.diagnostics.stdErrorBound).toBe(0)
    expect(maxAbsDiff(std, exact)).toBeLessThan(1e-12)
  })
  it('error falls geometrically with the window', () => {
    const e5 = maxAbsDiff(d.std({ method: 'window', window: 5 }), exact)
    const e9 = maxAbsDiff(d.std({ method: 'window', window: 9 }), exact)
    expect(e9).toBeLessThan(e5 / 10)
  })
})
