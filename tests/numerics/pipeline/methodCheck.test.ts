// Method check (shared/numerics/pipeline/methodCheck.ts) on small synthetic truths drawn from a known
// prior, where the expected results follow from theory: the posterior mean is the minimum-MSE
// predictor, a sample's error adds its own spread, a calibrated Gaussian predictive has known CRPS,
// and interpolation loses the variance the coarse grid cannot resolve.
import { describe, expect, it } from 'vitest'
import { createDownscaler } from '../../../shared/numerics/grf/downscaler'
import { blockAverage } from '../../../shared/numerics/interp/blockAverage'
import { runMethodCheck } from '../../../shared/numerics/pipeline/methodCheck'
import { sampleMember } from '../../../shared/numerics/pipeline/downscaleMember'
import { meanSquaredError } from '../../../shared/numerics/verify/squaredError'
import type { MethodCheckReport, MethodCheckSettings } from '../../../shared/numerics/pipeline/methodCheckReport'
import { summariseMethodCheck } from '../../../shared/numerics/pipeline/methodCheckSummary'
import { scoreEnsemble } from '../../../shared/numerics/verify/scoreEnsemble'
import { percentileThreshold } from '../../../shared/numerics/verify/percentileThreshold'

const B = 4
const COARSE = 16
const N = COARSE * B
const KERNEL = { kernel: 'matern32' as const, lengthScale: 6, variance: 4 }
const MU = 10
const SAMPLES = 24

/** A truth drawn from the prior itself (circulant embedding, exact covariance on the window). */
function priorTruth(seed: number): Float64Array {
  const sampler = createDownscaler({ coarse: new Float64Array(COARSE * COARSE), nx: COARSE, ny: COARSE, factor: B, kernel: KERNEL, mean: 0 })
  return sampler.unconditional(seed).map((v) => v + MU)
}

const settings = (extra: Partial<MethodCheckSettings> = {}): MethodCheckSettings => ({
  factor: B, kernel: 'matern32', givenKernel: { ...KERNEL, mean: MU }, samples: SAMPLES, seed: 9,
  thresholds: { kind: 'percentile', values: [80] }, neighbourhoods: [1, 3, 9], ...extra,
})

const byId = (r: MethodCheckReport, id: string) => r.forecasts.find((f) => f.id === id)!
const BASELINE_IDS = ['nearest', 'bilinear', 'bilinear-bm', 'bicubic', 'bicubic-bm']

// Three truths with the prior's own parameters given (no fit: the statements below hold exactly in expectation).
const truths = [1, 3, 5].map(priorTruth)
const reports = truths.map((truth) => runMethodCheck({ truth, nx: N, ny: N, spacingKm: 2, units: 'm/s', settings: settings() }))

describe('method check against a truth drawn from the prior', () => {
  it('the posterior mean wins on MSE: over every single sample and over every interpolation', () => {
    const ratios: number[] = []
    for (const r of reports) {
      const mean = byId(r, 'mean')
      // E[MSE(sample)] = MSE(mean) + mean posterior variance ≈ 2·MSE(mean) (a sample's deviation from the
      // mean is independent of the mean's error). The excess is of the order of the MSE itself and varies
      // by ~20 % between samples of 4096 cells correlated over ~6 cells, so 1.2× is a safe floor.
      for (const s of r.samples) expect(s.mse).toBeGreaterThan(1.2 * mean.mse)
      const average = r.samples.reduce((a, s) => a + s.mse, 0) / r.samples.length
      expect(average / mean.mse).toBeGreaterThan(1.6)
      expect(average / mean.mse).toBeLessThan(2.4)
      // The conditional mean is the minimum-MSE predictor given the block means (the prior is the true one),
      // so every linear interpolation of the same block means does worse in expectation.
      const best = Math.min(...BASELINE_IDS.map((id) => byId(r, id).mse))
      expect(mean.mse).toBeLessThan(best)
      ratios.push(mean.mse / best)
    }
    expect(ratios.reduce((a, b) => a + b) / ratios.length).toBeLessThan(0.95)
  })

  it('the samples beat interpolation on the spectrum below the coarse grid scale', () => {
    for (const r of reports) {
      const samples = byId(r, 'ensemble').subgridPowerRatio!
      // Samples of the right prior carry the truth's sub-grid variance: a ratio of 1 up to the sampling
      // noise of one truth's spectrum in the band (a few hundred Fourier modes, correlated rings): ±40 %.
      expect(samples).toBeGreaterThan(0.7)
      expect(samples).toBeLessThan(1.4)
      // Interpolating block means is a low-pass operation (smooth baselines lose most of the band; the
      // block-constant field has spurious power from its steps): every baseline is further from 1 on log axes.
      for (const id of BASELINE_IDS) expect(Math.abs(Math.log(samples))).toBeLessThan(Math.abs(Math.log(byId(r, id).subgridPowerRatio!)))
      for (const id of ['bilinear', 'bicubic']) expect(byId(r, id).subgridPowerRatio!).toBeLessThan(0.5)
      // The conditional mean is smoother than the truth (its sub-grid variance is the prior's minus the posterior's).
      expect(byId(r, 'mean').subgridPowerRatio!).toBeLessThan(0.5)
    }
  })

  it('the scores of a calibrated Gaussian posterior take their closed-form values', () => {
    for (const r of reports) {
      const mean = byId(r, 'mean'), ens = byId(r, 'ensemble')
      // For y ~ N(μ, σ²): E CRPS(N(μ, σ²), y) = σ/√π and E|y − μ| = σ√(2/π) (Gneiting & Raftery 2007, JASA
      // 102:359, §4.2), so their ratio is 1/√2 cell by cell, whatever σ: checked to 2 % over the grid.
      expect(Math.abs(r.posterior.gaussianCrps! / mean.mae - Math.SQRT1_2)).toBeLessThan(0.02)
      // The fair CRPS of samples from that posterior estimates the same CRPS without bias (Ferro 2014).
      expect(Math.abs(ens.crps / r.posterior.gaussianCrps! - 1)).toBeLessThan(0.05)
      // …and is lower than the absolute error of every single field.
      for (const id of ['mean', ...BASELINE_IDS]) expect(ens.crps).toBeLessThan(byId(r, id).mae)
      // Standardised errors have unit variance; spread–skill ≈ 1 (Fortin et al. 2014); each outer rank
      // bin ≈ 1/(N+1) (Hamill 2001). Margins: ±25 % (cells are correlated, so a few hundred effective values).
      expect(r.posterior.standardisedErrorVariance!).toBeGreaterThan(0.75)
      expect(r.posterior.standardisedErrorVariance!).toBeLessThan(1.33)
      expect(r.ensemble.spreadSkill!).toBeGreaterThan(0.8)
      expect(r.ensemble.spreadSkill!).toBeLessThan(1.25)
      for (const side of [r.ensemble.outside.below, r.ensemble.outside.above]) {
        expect(side).toBeGreaterThan(0.5 / (SAMPLES + 1))
        expect(side).toBeLessThan(2 / (SAMPLES + 1))
      }
      expect(r.ensemble.rankHistogram.reduce((a, b) => a + b)).toBe(N * N)
      // Conditioning by kriging: every sample and the mean average back to the coarse values exactly.
      for (const f of [...r.forecasts, ...r.samples]) if (f.preservesBlockMeans) expect(f.blockMeanError).toBeLessThan(1e-9)
      expect(byId(r, 'bilinear').blockMeanError).toBeGreaterThan(1e-3)
    }
  })

  it('gives the ensemble the same scores as `tessera score` on the same samples', () => {
    const truth = truths[0]!, r = reports[0]!
    const coarse = blockAverage(truth, N, N, B)
    const samples = createDownscaler({ coarse, nx: COARSE, ny: COARSE, factor: B, kernel: KERNEL, mean: MU }).samples(SAMPLES, 9)
    const threshold = percentileThreshold(truth, 80)
    const s = scoreEnsemble(truth, { nx: N, ny: N, members: samples }, { threshold, neighbourhoods: [1, 3, 9], seed: 9 })
    const ens = byId(r, 'ensemble')
    expect(r.thresholds[0]!.value).toBe(threshold)
    expect(ens.mse).toBe(s.mse)
    expect(ens.crps).toBe(s.crps)
    expect(r.ensemble.crpsEnsemble).toBe(s.crpsEnsemble)
    expect(ens.fss[0]).toEqual([...s.fss.values()])
    expect(ens.brier[0]).toEqual({ score: s.brier.score, reliability: s.brier.reliability, resolution: s.brier.resolution, uncertainty: s.brier.uncertainty })
    expect(r.ensemble.rankHistogram).toEqual(s.rankHistogram)
    expect(r.ensemble.reliability[0]).toEqual(s.brier.bins)
    expect(r.spectrum.truth).toEqual(Array.from(s.psd.truth))
    // 20 % of cells are events at the 80th percentile (type 7; the field is continuous, so no ties).
    expect(r.thresholds[0]!.baseRate).toBeCloseTo(0.2, 3)
    expect(r.thresholds[0]!.useful).toBeCloseTo(0.6, 3)
  })

  it('fits the prior on the coarse field when no parameters are given, drawing the samples a forecast run would', () => {
    const r = runMethodCheck({ truth: truths[1]!, nx: N, ny: N, settings: settings({ givenKernel: undefined }) })
    expect(r.fit.source).toBe('fitted')
    expect(r.fit.transform).toBeNull()
    // The same coarse field as a run's member (pipeline/downscaleMember.ts, as the worker's tasks call it).
    const member = sampleMember({ coarse: blockAverage(truths[1]!, N, N, B), nx: COARSE, ny: COARSE, factor: B, kernel: 'matern32', samples: SAMPLES, seed: 9, spacingKm: B })
    expect(r.samples.map((s) => s.mse)).toEqual(member.samples.map((s) => meanSquaredError(s, truths[1]!)))
    expect(r.fit.lengthScale).toBe(member.fit.lengthScale)
    expect(r.fit.kernel).toBe('matern32')
    // ℓ from 256 coarse cells: the profile interval must contain the true 6 fine cells.
    expect(r.fit.lengthScaleInterval![0]).toBeLessThan(6)
    expect(r.fit.lengthScaleInterval![1]).toBeGreaterThan(6)
    expect(byId(r, 'mean').mse).toBeLessThan(Math.min(...BASELINE_IDS.map((id) => byId(r, id).mse)))
    expect(r.grid.spacingKm).toBeNull()
    expect(r.spectrum.samplesAgreeDownTo?.km).toBeNull()
  })
})

describe('method check: grid handling, baselines and errors', () => {
  const small = { factor: 4, kernel: 'matern32' as const, givenKernel: { kernel: 'matern32' as const, lengthScale: 4, variance: 1, mean: 0 }, samples: 4, seed: 1, thresholds: { kind: 'value' as const, values: [0.5] }, neighbourhoods: [3, 1] }

  it('scores block-constant interpolation of a plane with the closed-form error (a²+c²)(b²−1)/12', () => {
    const a = 0.3, c = -0.7, nx = 32, ny = 24
    const plane = Float64Array.from({ length: nx * ny }, (_, k) => 2 + a * (k % nx) + c * Math.floor(k / nx))
    const r = runMethodCheck({ truth: plane, nx, ny, settings: small })
    // Within a block the plane departs from its block mean by a·(p − (b−1)/2) + c·(q − (b−1)/2), p, q = 0…b−1
    // independent and uniform: the variance of a discrete uniform on b points is (b² − 1)/12 per unit slope.
    expect(byId(r, 'nearest').mse).toBeCloseTo((a * a + c * c) * (B * B - 1) / 12, 12)
    // Linear interpolation (with linear ghosts at the edges) and Keys' cubic reproduce a plane exactly.
    for (const id of ['bilinear', 'bilinear-bm', 'bicubic', 'bicubic-bm']) expect(byId(r, id).mse).toBeLessThan(1e-20)
    expect(r.neighbourhoods).toEqual([1, 3])
  })

  it('crops a truth that is not a multiple of the factor, and scores it as the cropped field', () => {
    const nx = 34, ny = 35
    const g = priorTruth(7)
    const full = Float64Array.from({ length: nx * ny }, (_, k) => g[(Math.floor(k / nx) % 32) * N + (k % nx)]!)
    const cropped = Float64Array.from({ length: 32 * 32 }, (_, k) => full[Math.floor(k / 32) * nx + (k % 32)]!)
    const a = runMethodCheck({ truth: full, nx, ny, settings: small })
    const b = runMethodCheck({ truth: cropped, nx: 32, ny: 32, settings: small })
    expect(a.grid).toMatchObject({ nx: 32, ny: 32, coarseNx: 8, coarseNy: 8, croppedFrom: { nx: 34, ny: 35 } })
    expect(b.grid.croppedFrom).toBeNull()
    expect(a.forecasts.map((f) => f.mse)).toEqual(b.forecasts.map((f) => f.mse))
  })

  it('refuses incomplete truths, grids too small for the factor and bad settings, in one line', () => {
    const field = new Float64Array(32 * 32).fill(1).map((v, k) => v + Math.sin(k))
    const withGap = Float64Array.from(field); withGap[40] = NaN
    expect(() => runMethodCheck({ truth: withGap, nx: 32, ny: 32, settings: small })).toThrow(/column 8, row 1; it must be complete/)
    expect(() => runMethodCheck({ truth: field.subarray(0, 144), nx: 12, ny: 12, settings: small })).toThrow(/only 3×3 blocks/)
    expect(() => runMethodCheck({ truth: field, nx: 32, ny: 32, settings: { ...small, factor: 1 } })).toThrow(/from 2 to 16/)
    expect(() => runMethodCheck({ truth: field, nx: 32, ny: 32, settings: { ...small, samples: 1 } })).toThrow(/samples must be/)
    expect(() => runMethodCheck({ truth: field, nx: 32, ny: 32, settings: { ...small, neighbourhoods: [2] } })).toThrow(/odd/)
    expect(() => runMethodCheck({ truth: field, nx: 32, ny: 32, settings: { ...small, thresholds: { kind: 'percentile', values: [120] } } })).toThrow(/outside 0–100/)
  })
})

describe('method-check summary', () => {
  const r = reports[0]!

  it('says what the numbers say', () => {
    const text = r.summary.join(' ')
    expect(text).toMatch(/On MSE the posterior mean is best \(RMSE [\d.]+ m\/s\)/)
    expect(text).toMatch(/The posterior mean is smoother than the truth/)
    expect(text).toMatch(/the spread is about right/)
    // The percentage in the CRPS sentence is computed from the two numbers it quotes.
    const m = /fair CRPS \(([\d.]+) m\/s\) is (\d+) % lower than the absolute error of the best interpolation \([^,]+, ([\d.]+) m\/s\)/.exec(text)
    expect(m).not.toBeNull()
    expect(Number(m![2])).toBeCloseTo(100 * (1 - Number(m![1]) / Number(m![3])), -0.5)
  })

  it('changes its sentences when the numbers change (rules, not fixed text)', () => {
    const doctored: MethodCheckReport = structuredClone(r)
    const mean = byId(doctored, 'mean'), bilinear = byId(doctored, 'bilinear')
    bilinear.mse = 0.88 * mean.mse
    bilinear.rmse = Math.sqrt(bilinear.mse)
    doctored.ensemble.outside = { below: 0.2, above: 0.15, expectedEach: 1 / 25 }
    const text = summariseMethodCheck(doctored).join(' ')
    expect(text).toMatch(/Bilinear beats the posterior mean on MSE by 12 %/)
    expect(text).not.toMatch(/On MSE the posterior mean is best/)
    expect(text).toMatch(/the samples spread too little \(under-dispersed\)/)
  })
})
