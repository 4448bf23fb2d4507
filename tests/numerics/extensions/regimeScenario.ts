/**
 * The two-regime check of the windowed (non-stationary) model against the stationary one, shared by the
 * automated test (regimes.test.ts) and the bench (bench/extensions.ts).
 *
 * Truth: two unconditional Matérn-3/2 fine fields from the engine's sampler (circulant embedding), one with a
 * short and one with a long length scale, blended across the middle column band (width N/8) with weights
 * cos/sin of a linear ramp so the variance stays σ² everywhere; then coarse-grained (b×b block means).
 * Stationary control: the short-ℓ field alone.
 * Models: the whole-domain fit (stationary) and the windowed model (regimes/), each drawing `samples`
 * conditional samples. Scores in each half (left: short ℓ, right: long ℓ), from shared/numerics/verify:
 *  - spectrum error: mean over rings of |ln(S̄(k)/S_truth(k))|, S̄ the mean of the samples' radially averaged
 *    spectra (Hann window), i.e. a log-spectral distance (common practice; compare spectra by ratio);
 *  - ensemble FSS (Roberts & Lean 2008) of the samples at the truth's 90th percentile in that half, for
 *    neighbourhoods of b + 1 and 2b + 1 fine cells (about one and two coarse cells: below the coarse scale the
 *    position of features is not knowable, and at one pixel a realistic texture pays the double penalty).
 */
import { createDownscaler } from '../../../shared/numerics/grf/downscaler'
import { fitCoarseField, kernelParamsOf } from '../../../shared/numerics/fit/fitCoarse'
import { blockAverage } from '../../../shared/numerics/interp/blockAverage'
import { fitRegimes, type RegimeFit } from '../../../shared/numerics/regimes/fitRegimes'
import { createRegimeDownscaler } from '../../../shared/numerics/regimes/regimeDownscaler'
import { fractionsSkill } from '../../../shared/numerics/verify/fractionsSkillScore'
import { radialSpectrum } from '../../../shared/numerics/verify/radialSpectrum'

export interface RegimeCase {
  /** Coarse cells per side and block factor. */
  n: number
  factor: number
  /** Fine-cell length scales of the two regimes. */
  shortLength: number
  longLength: number
  samples: number
  /** True: the short-ℓ field everywhere (stationary control). */
  stationary?: boolean
}

export interface HalfScores { spectrumError: number; fssOne: number; fssTwo: number }
export interface ModelScores { left: HalfScores; right: HalfScores }

export interface RegimeOutcome {
  stationary: ModelScores
  windowed: ModelScores
  regimeFit: RegimeFit
  globalLengthScale: number
  /** Wall-clock ms: stationary fit + samples; windowed fits + samples (after the stationary fit). */
  stationaryMs: number
  windowedMs: number
  /** Largest |block mean − y| of the windowed samples, before the final projection. */
  windowedBlockMeanCorrection: number
}

/** Truth fine field (row-major N×N, N = n·b) for a case and seed. */
export function regimeTruth(c: RegimeCase, seed: number): Float64Array {
  const { n, factor: b } = c
  const N = n * b
  const field = (lengthScale: number, s: number) => createDownscaler({
    coarse: new Float64Array(n * n), nx: n, ny: n, factor: b, kernel: { kernel: 'matern32', lengthScale, variance: 1 }, mean: 0,
  }).unconditional(s)
  const short = field(c.shortLength, seed)
  if (c.stationary) return short.map((v) => v + 5)
  const long = field(c.longLength, seed + 1000)
  const band = N / 8
  const out = new Float64Array(N * N)
  for (let j = 0; j < N; j++) for (let i = 0; i < N; i++) {
    const t = Math.min(1, Math.max(0, (i + 0.5 - (N - band) / 2) / band))
    const k = j * N + i
    out[k] = 5 + Math.cos((t * Math.PI) / 2) * short[k]! + Math.sin((t * Math.PI) / 2) * long[k]!
  }
  return out
}

function columns(field: Float64Array, N: number, x0: number, x1: number): Float64Array {
  const w = x1 - x0, out = new Float64Array(w * N)
  for (let j = 0; j < N; j++) out.set(field.subarray(j * N + x0, j * N + x1), j * w)
  return out
}

/** Scores of samples against the truth in the left and right halves (see the module comment). */
export function halfScores(truth: Float64Array, samples: Float64Array[], N: number, b: number): ModelScores {
  const score = (x0: number, x1: number): HalfScores => {
    const w = x1 - x0
    const t = columns(truth, N, x0, x1)
    const members = samples.map((s) => columns(s, N, x0, x1))
    const reference = radialSpectrum(t, w, N).power
    const spectra = members.map((m) => radialSpectrum(m, w, N).power)
    let error = 0
    for (let r = 0; r < reference.length; r++) {
      let mean = 0
      for (const s of spectra) mean += s[r]! / spectra.length
      error += Math.abs(Math.log(mean / reference[r]!))
    }
    const sorted = Array.from(t).sort((p, q) => p - q)
    const threshold = sorted[Math.floor(0.9 * sorted.length)]!
    const fss = fractionsSkill(t, { nx: w, ny: N, members }, threshold, [b + 1, 2 * b + 1]).fss
    return { spectrumError: error / reference.length, fssOne: fss.get(b + 1)!, fssTwo: fss.get(2 * b + 1)! }
  }
  return { left: score(0, N / 2), right: score(N / 2, N) }
}

/** Runs one seeded case: truth, both fits and both sets of samples, and the scores. */
export function runRegimeCase(c: RegimeCase, seed: number): RegimeOutcome {
  const { n, factor: b } = c
  const N = n * b
  const truth = regimeTruth(c, seed)
  const y = blockAverage(truth, N, N, b)
  let t0 = performance.now()
  const global = fitCoarseField(y, n, n, { factor: b, kernel: 'matern32', lengthScaleBounds: [0.1 * b, 5 * b] })
  const stationarySamples = createDownscaler({ coarse: y, nx: n, ny: n, factor: b, kernel: kernelParamsOf(global, false), mean: global.mean }).samples(c.samples, seed + 1)
  const stationaryMs = performance.now() - t0
  t0 = performance.now()
  const regimeFit = fitRegimes(y, n, n, global, { factor: b, withNugget: false })
  const windowed = createRegimeDownscaler({
    coarse: y, nx: n, ny: n, factor: b, layout: regimeFit.layout, priors: regimeFit.windows.map((w) => ({ kernel: w.kernel, mean: w.mean })),
  })
  const windowedSamples = windowed.samples(c.samples, seed + 1)
  const windowedMs = performance.now() - t0
  return {
    stationary: halfScores(truth, stationarySamples, N, b),
    windowed: halfScores(truth, windowedSamples, N, b),
    regimeFit, globalLengthScale: global.lengthScale, stationaryMs, windowedMs,
    windowedBlockMeanCorrection: windowed.diagnostics.blockMeanCorrection,
  }
}
