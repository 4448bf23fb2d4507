import { describe, expect, it } from 'vitest'
import { DEFAULT_NUGGET_RATIO, fitCoarseField, type FitResult } from '../../../shared/numerics/fit/fitCoarse'
import { covarianceFunction, type KernelName } from '../../../shared/numerics/grf/kernels'
import { blockAverage as blockMeans } from '../../../shared/numerics/interp/blockAverage'
import { coarseSampler, fineFieldSampler, meanAndSpread, seKroneckerSampler } from './synthetic'

/**
 * Replicate study: fits R seeded replicates and returns the estimates, the mean reported standard error
 * and how many ~95% profile intervals contain the truth.
 */
function study(replicate: (seed: number) => Float64Array, R: number, truth: number, fit: (y: Float64Array) => FitResult) {
  const estimates: number[] = [], errors: number[] = []
  let covered = 0
  for (let r = 0; r < R; r++) {
    const res = fit(replicate(500 + r))
    estimates.push(res.lengthScale)
    errors.push(res.standardError)
    if (res.lengthScaleInterval[0] <= truth && truth <= res.lengthScaleInterval[1]) covered++
  }
  const { mean, sd } = meanAndSpread(estimates)
  // One line per study, so the bias and spread appear in the test log.
  console.log(`[fit study] truth ${truth}: mean ${mean.toFixed(3)} (bias ${(100 * (mean - truth) / truth).toFixed(1)}%), sd ${sd.toFixed(3)}, mean se ${meanAndSpread(errors).mean.toFixed(3)}, ${covered}/${R} intervals cover`)
  return { mean, sd, bias: mean - truth, meanStandardError: meanAndSpread(errors).mean, covered }
}

/**
 * Tolerance on the mean of R estimates: 3 standard errors of a mean (3·sd/√R) plus an allowance of 4% of ℓ
 * for the small-sample bias of maximum likelihood for range parameters (consistent, but biased at O(1/m);
 * our measured biases stay within ±3% at these sizes). Common practice, not a published bound.
 */
function expectUnbiased(s: { mean: number; sd: number }, truth: number, R: number): void {
  expect(Math.abs(s.mean - truth)).toBeLessThan(3 * s.sd / Math.sqrt(R) + 0.04 * truth)
}

describe('maximum likelihood recovers a known length scale from coarse-grained synthetic fields', () => {
  it('exact likelihood, matern32, ℓ = 8 fine cells, b = 4, 12×12 coarse: 24 replicates', () => {
    const spec = { kernel: 'matern32' as const, lengthScale: 8, variance: 2, mean: 5, factor: 4, nx: 12, ny: 12 }
    const s = study(coarseSampler(spec), 24, 8, (y) => fitCoarseField(y, 12, 12, { factor: 4, kernel: 'matern32' }))
    expectUnbiased(s, 8, 24)
    // The curvature standard error should describe the replicate spread (within a factor 1.6 with 24 replicates).
    expect(s.meanStandardError / s.sd).toBeGreaterThan(1 / 1.6)
    expect(s.meanStandardError / s.sd).toBeLessThan(1.6)
    // Nominal 95% intervals: fewer than 19 of 24 would have probability 0.1% if they were calibrated (binomial).
    expect(s.covered).toBeGreaterThanOrEqual(19)
  })

  it('fine matern32 fields (dense Cholesky, 28×28 fine) block-averaged with b = 2, ℓ = 4: 12 replicates', () => {
    const fine = fineFieldSampler(covarianceFunction({ kernel: 'matern32', lengthScale: 4, variance: 1.5 }), 28, 28, -3)
    const s = study((seed) => blockMeans(fine(seed), 28, 28, 2), 12, 4, (y) => fitCoarseField(y, 14, 14, { factor: 2, kernel: 'matern32' }))
    expectUnbiased(s, 4, 12)
    expect(s.covered).toBeGreaterThanOrEqual(9) // P(≤ 8 of 12 | 95%) = 0.2% (binomial)
  })

  it('fine se fields (64×64 fine) block-averaged with b = 4, ℓ = 6, Kronecker likelihood: 10 replicates', () => {
    // Separable se: the fine field is Sy Z Sxᵀ with 1-D square roots of the fine se matrices (b = 1 tables);
    // fine white noise 16·1e-10 averages to the default coarse nugget 1e-10.
    const fine = seKroneckerSampler(6, 1, 64, 64, 1, 0, 16 * DEFAULT_NUGGET_RATIO)
    const s = study((seed) => blockMeans(fine(seed), 64, 64, 4), 10, 6, (y) => fitCoarseField(y, 16, 16, { factor: 4, kernel: 'se' }))
    expectUnbiased(s, 6, 10)
    expect(s.covered).toBeGreaterThanOrEqual(8) // P(≤ 7 of 10 | 95%) = 1.2% (binomial)
  })

  it('debiased Whittle, matern32, ℓ = 8, b = 4, 32×32 coarse: 16 replicates', () => {
    const spec = { kernel: 'matern32' as const, lengthScale: 8, variance: 2, mean: 5, factor: 4, nx: 32, ny: 32 }
    const s = study(coarseSampler(spec), 16, 8, (y) => fitCoarseField(y, 32, 32, { factor: 4, kernel: 'matern32', method: 'whittle' }))
    expectUnbiased(s, 8, 16)
    expect(s.covered).toBeGreaterThanOrEqual(13) // P(≤ 12 of 16 | 95%) = 0.7% (binomial)
  })

  it('exact likelihood with 15% of cells missing (NaN), matern12, ℓ = 6, b = 3, 14×14 coarse: 16 replicates', () => {
    const spec = { kernel: 'matern12' as const, lengthScale: 6, variance: 1, mean: 0, factor: 3, nx: 14, ny: 14 }
    const gen = coarseSampler(spec)
    const withHoles = (seed: number) => { const y = gen(seed); for (let k = 0; k < y.length; k++) if ((k * 37) % 100 < 15) y[k] = NaN; return y }
    const s = study(withHoles, 16, 6, (y) => fitCoarseField(y, 14, 14, { factor: 3, kernel: 'matern12' }))
    expectUnbiased(s, 6, 16)
  })
})

describe('nugget: estimated for se by default', () => {
  it('se data with white noise of 1e-6·σ² on each coarse cell: ℓ recovered and η̂ near 1e-6 (a fixed 1e-10 nugget misses ℓ)', () => {
    const gen = seKroneckerSampler(16, 4, 24, 24, 1, 0, 1e-6)
    const s = study(gen, 8, 16, (y) => fitCoarseField(y, 24, 24, { factor: 4, kernel: 'se' }))
    expectUnbiased(s, 16, 8)
    const y = gen(3)
    const est = fitCoarseField(y, 24, 24, { factor: 4, kernel: 'se' })
    expect(est.nuggetEstimated).toBe(true)
    expect(Math.abs(Math.log10(est.nuggetRatio / 1e-6))).toBeLessThan(0.5)
    const fixed = fitCoarseField(y, 24, 24, { factor: 4, kernel: 'se', nugget: 1e-10 })
    expect(fixed.nuggetEstimated).toBe(false)
    expect(Math.abs(fixed.lengthScale - 16)).toBeGreaterThan(10 * est.standardError) // why the default is 'estimate'
  })

  it("Matérn keeps the fixed default unless asked; 'estimate' works there too (Whittle)", () => {
    const y = coarseSampler({ kernel: 'matern32', lengthScale: 8, variance: 2, mean: 5, factor: 4, nx: 32, ny: 32, nugget: 0.05 })(8)
    const fixed = fitCoarseField(y, 32, 32, { factor: 4, kernel: 'matern32', method: 'whittle' })
    expect(fixed.nuggetRatio).toBe(DEFAULT_NUGGET_RATIO)
    const est = fitCoarseField(y, 32, 32, { factor: 4, kernel: 'matern32', method: 'whittle', nugget: 'estimate' })
    expect(est.nuggetRatio).toBeGreaterThan(0.01)
    expect(est.nuggetRatio).toBeLessThan(0.2)
    expect(est.logLikelihood).toBeGreaterThan(fixed.logLikelihood)
  })
})

describe('Whittle and exact likelihoods agree where they should', () => {
  it('se on a 48×48 coarse grid (b = 4, ℓ = 8): the maxima differ by less than the combined standard errors', () => {
    const gen = seKroneckerSampler(8, 4, 48, 48, 2, 5)
    for (let r = 0; r < 5; r++) {
      const y = gen(900 + r)
      const exact = fitCoarseField(y, 48, 48, { factor: 4, kernel: 'se', method: 'exact' })
      const whittle = fitCoarseField(y, 48, 48, { factor: 4, kernel: 'se', method: 'whittle' })
      expect(exact.method).toBe('kronecker')
      expect(whittle.method).toBe('whittle')
      // Both are consistent; their difference has sd ≈ √(se_W² − se_E²) < se_W + se_E. 2.5× is a loose common-practice margin.
      expect(Math.abs(whittle.lengthScale - exact.lengthScale)).toBeLessThan(2.5 * (whittle.standardError + exact.standardError))
      expect(Math.abs(whittle.variance / exact.variance - 1)).toBeLessThan(0.25)
    }
  })

  it('matern32 on an 18×18 coarse grid (dense exact vs Whittle)', () => {
    const gen = coarseSampler({ kernel: 'matern32', lengthScale: 8, variance: 2, mean: 5, factor: 4, nx: 18, ny: 18 })
    for (let r = 0; r < 2; r++) {
      const y = gen(950 + r)
      const exact = fitCoarseField(y, 18, 18, { factor: 4, kernel: 'matern32', method: 'exact' })
      const whittle = fitCoarseField(y, 18, 18, { factor: 4, kernel: 'matern32', method: 'whittle' })
      expect(exact.method).toBe('exact')
      expect(Math.abs(whittle.lengthScale - exact.lengthScale)).toBeLessThan(2.5 * (whittle.standardError + exact.standardError))
    }
  })
})

describe("kernel choice by likelihood ('auto')", () => {
  const pick = (kernel: KernelName, seed: number) => {
    // b = 2 and 20×20: block means of b = 4 smooth away the short-lag behaviour that tells the families apart,
    // and se with its estimated nugget competes with matern12 on small grids (measured, 10 seeds each: 16×16 b = 4
    // ℓ = 6 → matern12 recognised 6/10; 16×16 b = 2 → 9/10; 20×20 b = 2 → 10/10, se 10/10).
    const y = coarseSampler({ kernel, lengthScale: 6, variance: 1, mean: 2, factor: 2, nx: 20, ny: 20 })(seed)
    return fitCoarseField(y, 20, 20, { factor: 2, kernel: 'auto' })
  }
  it('picks se on se data and matern12 on matern12 data (seeded, exact likelihoods, choice by AIC)', () => {
    expect(pick('se', 1).kernel).toBe('se')
    const r = pick('matern12', 1)
    expect(r.kernel).toBe('matern12')
    expect(r.candidates?.map((c) => c.kernel)).toEqual(['se', 'matern12', 'matern32', 'matern52'])
    expect(Math.min(...r.candidates!.map((c) => c.aic))).toBeCloseTo(r.candidates!.find((c) => c.kernel === 'matern12')!.aic, 10)
    expect(r.candidates!.find((c) => c.kernel === 'matern12')!.logLikelihood).toBeCloseTo(r.logLikelihood, 6)
  })

  it('on a large se grid compares under Whittle, then refits the winner with the exact Kronecker likelihood', () => {
    const y = seKroneckerSampler(8, 4, 40, 40, 1, 0)(77)
    const r = fitCoarseField(y, 40, 40, { factor: 4, kernel: 'auto' })
    expect(r.kernel).toBe('se')
    expect(r.candidates!.every((c) => c.method === 'whittle')).toBe(true)
    expect(r.method).toBe('kronecker')
    expect(r.totalEvaluations).toBeGreaterThan(r.evaluations)
  })
})

describe('fit result: profile, interval, bounds', () => {
  const y = coarseSampler({ kernel: 'matern32', lengthScale: 8, variance: 2, mean: 5, factor: 4, nx: 12, ny: 12 })(42)
  const r = fitCoarseField(y, 12, 12, { factor: 4, kernel: 'matern32' })

  it('profile is sorted, spans the bounds and peaks at the reported maximum', () => {
    const ls = r.profile.map((p) => p.lengthScale)
    expect(ls).toEqual([...ls].sort((a, b) => a - b))
    expect(ls[0]).toBeCloseTo(r.lengthScaleBounds[0], 10)
    expect(ls[ls.length - 1]).toBeCloseTo(r.lengthScaleBounds[1], 8)
    expect(Math.max(...r.profile.map((p) => p.logLikelihood))).toBe(r.logLikelihood)
    expect(r.lengthScaleBounds).toEqual([0.4, 24]) // 0.1 coarse cell, half of 12 coarse cells × 4
  })

  it('interval ends sit where the log-likelihood has dropped by χ²₁(0.95)/2 = 1.92 (re-evaluated independently)', () => {
    const [lo, hi] = r.lengthScaleInterval
    expect(lo).toBeLessThan(r.lengthScale)
    expect(hi).toBeGreaterThan(r.lengthScale)
    for (const end of [lo, hi]) {
      const at = fitCoarseField(y, 12, 12, { factor: 4, kernel: 'matern32', lengthScaleBounds: [end * (1 - 1e-9), end * (1 + 1e-9)] })
      expect(Math.abs(r.logLikelihood - at.logLikelihood - 3.841458820694124 / 2)).toBeLessThan(0.01)
    }
  })

  it('white noise drives ℓ to the lower bound and says so', () => {
    const noise = coarseSampler({ kernel: 'matern12', lengthScale: 0.01, variance: 1, mean: 0, factor: 4, nx: 12, ny: 12 })(5)
    const w = fitCoarseField(noise, 12, 12, { factor: 4, kernel: 'matern32' })
    expect(w.atBound).toBe('lower')
    expect(w.lengthScaleInterval[0]).toBeCloseTo(w.lengthScaleBounds[0], 10)
  })

  it('a plane (trend much longer than the domain) drives ℓ to the upper bound and says so', () => {
    const plane = Float64Array.from({ length: 144 }, (_, k) => 0.3 * (k % 12) + 0.2 * Math.floor(k / 12) + 1e-3 * Math.sin(k * 7.7))
    const p = fitCoarseField(plane, 12, 12, { factor: 4, kernel: 'matern32' })
    expect(p.atBound).toBe('upper')
    expect(p.lengthScaleInterval[1]).toBeCloseTo(p.lengthScaleBounds[1], 10)
    expect(Number.isNaN(p.standardError)).toBe(true)
  })

  it("general 'matern' with ν = 1.5 gives the matern32 fit (same likelihood through K_ν)", () => {
    const g = fitCoarseField(y, 12, 12, { factor: 4, kernel: 'matern', nu: 1.5 })
    expect(g.nu).toBe(1.5)
    expect(Math.abs(g.logLikelihood - r.logLikelihood)).toBeLessThan(1e-8)
    expect(Math.abs(g.lengthScale / r.lengthScale - 1)).toBeLessThan(1e-3)
  })

  it('reports the (fixed, Matérn default) nugget as a ratio and as a fine-grid variance η·b²·σ̂²', () => {
    expect(r.nuggetRatio).toBe(DEFAULT_NUGGET_RATIO)
    expect(r.nugget).toBeCloseTo(DEFAULT_NUGGET_RATIO * 16 * r.variance, 20)
  })
})

describe('clear errors', () => {
  const y = coarseSampler({ kernel: 'matern32', lengthScale: 8, variance: 2, mean: 5, factor: 4, nx: 6, ny: 6 })(1)
  it('constant field', () => {
    expect(() => fitCoarseField(new Float64Array(36).fill(3.5), 6, 6, { factor: 4, kernel: 'se' })).toThrow('field is constant: nothing to fit')
    const c = new Float64Array(36).fill(1e5); c[3] = NaN
    expect(() => fitCoarseField(c, 6, 6, { factor: 4, kernel: 'auto' })).toThrow(/constant/)
  })
  it('too few valid cells (a 3×3 grid; all-NaN)', () => {
    expect(() => fitCoarseField(y.subarray(0, 9), 3, 3, { factor: 4, kernel: 'se' })).toThrow('too few valid cells to fit: need at least 16, got 9')
    expect(() => fitCoarseField(new Float64Array(36).fill(NaN), 6, 6, { factor: 4, kernel: 'se' })).toThrow(/got 0/)
  })
  it('bad factor, kernel, method, bounds, nu, size', () => {
    expect(() => fitCoarseField(y, 6, 6, { factor: 0, kernel: 'se' })).toThrow(/factor must be an integer/)
    expect(() => fitCoarseField(y, 6, 6, { factor: 2.5, kernel: 'se' })).toThrow(/factor/)
    expect(() => fitCoarseField(y, 6, 6, { factor: 2, kernel: 'cubic' as KernelName })).toThrow(/unknown kernel/)
    expect(() => fitCoarseField(y, 6, 6, { factor: 2, kernel: 'se', method: 'newton' as 'exact' })).toThrow(/unknown method/)
    expect(() => fitCoarseField(y, 6, 6, { factor: 2, kernel: 'se', lengthScaleBounds: [3, 1] })).toThrow(/bounds/)
    expect(() => fitCoarseField(y, 6, 6, { factor: 2, kernel: 'matern' })).toThrow(/needs a smoothness/)
    expect(() => fitCoarseField(y, 5, 6, { factor: 2, kernel: 'se' })).toThrow(/expected nx·ny = 30/)
    expect(() => fitCoarseField(y, 6, 6, { factor: 2, kernel: 'se', nugget: -1 })).toThrow(/nugget/)
  })
})
