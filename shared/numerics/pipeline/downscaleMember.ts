/**
 * One ensemble member at one lead time: fit the prior on the coarse field alone (maximum
 * likelihood), then draw conditional fine-scale samples (conditioning by kriging) and pack them.
 * Optional extensions: a latent transform for non-Gaussian variables (fit and conditioning in the
 * latent space, physical block means restored after the back-transform: transform/), and noise that
 * is autoregressive across lead times (coherence/), each task still computed on its own; geometric
 * anisotropy of the prior (fit/anisotropySearch.ts) and changing regimes (local fits on overlapping
 * windows, blended: regimes/), both off by default.
 * Pure: used by the job worker's threads, the demo seeding and the command line alike.
 */
import { coherentNoiseMatchingSpectrum, coherentSpectralNoise, coherentWhiteNoise } from '../coherence/coherentNoise'
import { torusSide } from '../grf/circulantEmbedding'
import { DEFAULT_NOISE_TRUNCATION, isIsolatedLead, leadCorrelation } from '../coherence/leadNoiseWeights'
import { defaultLengthScaleBounds, fitCoarseField, kernelParamsOf, type FitResult } from '../fit/fitCoarse'
import { createDownscaler } from '../grf/downscaler'
import type { KernelName } from '../grf/kernels'
import { packInt16, type PackedInt16 } from '../io/packInt16'
import { correctCensoredSupport, prepareLatentCoarse, type TransformSummary } from '../transform/latentCoarse'
import type { TransformOption } from '../transform/latentTransform'
import { restorePhysicalBlockMeans, type PhysicalMeanOptions, type PhysicalMeanReport } from '../transform/physicalBlockMeans'
import { fitRegimes, type RegimeFit } from '../regimes/fitRegimes'
import { createRegimeDownscaler, windowSeed } from '../regimes/regimeDownscaler'
import type { CoarseRect } from '../regimes/regimeWindows'
import { regimeSampler, stationarySampler, type MemberSampler } from './memberSampler'

/** Time-coherent samples: sample k of this member at this lead shares AR(1) noise with sample k at the other leads. */
export interface TimeCoherenceInput {
  /** This task's lead index into leadHours. */
  leadIndex: number
  /** Lead times (hours since the reference time) of the run, strictly increasing: all of them, or at least up to leadIndex + 1. */
  leadHours: number[]
  /** Decorrelation time τ (hours): ρ = exp(−Δt/τ) between leads Δt apart. */
  timeScaleHours: number
  /** The same for every lead of one member (memberNoiseSeed), different between members. */
  noiseSeed: number
  /**
   * True when leadIndex is the run's last lead. Only needed when leadHours stops at leadIndex: without
   * the next lead's time the task cannot tell whether a later lead uses this lead's noise.
   */
  isLastLead?: boolean
}

export interface DownscaleMemberInput {
  /** Coarse field, row-major ny×nx, NaN = missing. */
  coarse: Float32Array | Float64Array
  nx: number
  ny: number
  /** Block factor b: fine grid is (b·nx)×(b·ny). */
  factor: number
  kernel: KernelName | 'auto'
  samples: number
  seed: number
  /** Coarse grid spacing, km (to report ℓ in km). */
  spacingKm: number
  /**
   * Upper bound of the length-scale search, in coarse cells (default 5). Longer scales are already
   * fixed by the coarse field itself, and would make the sampling torus very large; a member whose
   * fit reaches the bound is flagged (atBound = 'upper').
   */
  maxLengthScaleCoarseCells?: number
  /** CF standard name of the variable: picks the 'auto' transform. */
  standardName?: string
  /**
   * Latent transform: 'auto' (default) = Box–Cox for gusts and wind speed, censored latent Gaussian
   * for precipitation, none otherwise and whenever standardName is absent.
   */
  transform?: TransformOption
  /** Fixes λ of the boxcox or censored transform instead of fitting it on the coarse field. */
  transformLambda?: number
  /**
   * Censored model with λ fitted: 'indirect' (default) corrects λ and the latent marginal for the
   * change of support (transform/censoredIndirect.ts); 'coarse' keeps the fit of the block values.
   */
  censoredSupport?: 'indirect' | 'coarse'
  /** Physical block-mean restoration after a back-transform (see transform/physicalBlockMeans.ts). */
  physicalMeans?: PhysicalMeanOptions
  /** Time-coherent noise across lead times; absent = independent samples per lead (seeded by `seed`). */
  timeCoherence?: TimeCoherenceInput
  /** Geometric anisotropy of the prior: 'off' (default) or 'fit' (used when significant; reported in fit.anisotropy). */
  anisotropy?: 'off' | 'fit'
  /**
   * Changing regimes: 'off' (default) or 'windows': local ℓ and σ² on overlapping windows of the coarse field,
   * kept where they differ significantly from the whole-domain fit, samples blended (regimes/). When no window
   * differs, the stationary model is used as it is (except with timeCoherence, where the windowed sampler is
   * kept so that the noise of every lead is organised the same way).
   */
  regimes?: 'off' | 'windows'
}

/** The regime option's outcome, per window (for the run's parameter table and map). */
export interface RegimeSummary {
  /** True when the samples come from the blended windowed sampler. */
  used: boolean
  /** Why not, when the option was on but the stationary model was used. */
  note?: string
  tiles: [number, number]
  departures: number
  windows: {
    /** The tile the window was fitted on (coarse cells [x0, x1) × [y0, y1)). */
    tile: CoarseRect
    departs: boolean
    lengthScale: number
    lengthScaleKm: number
    variance: number
    /** Likelihood-ratio statistic against the whole-domain fit and its degrees of freedom. */
    statistic: number
    degreesOfFreedom: number
  }[]
}

/** Common random numbers of the censored model's change-of-support correction: fixed, so λ depends on the data only. */
const CENSORED_SUPPORT_SEED = 0x2c1b3c6d

/** Default cap on the fitted length scale, in coarse cells (see DownscaleMemberInput). */
export const DEFAULT_MAX_LENGTH_SCALE_COARSE_CELLS = 5

export interface MemberFit extends Omit<FitResult, 'profile'> {
  /**
   * The latent transform (name 'none' when the field was downscaled as it is). When it is not 'none',
   * ℓ, variance and mean describe the latent Gaussian field, not the physical values; for the censored
   * model with the change-of-support correction (transform.lambdaMethod 'indirect'), variance and mean
   * are its fine-scale ones, the likelihood figures those of the coarse fit.
   */
  transform: TransformSummary
  /** ℓ in km on the fine grid. */
  lengthScaleKm: number
  lengthScaleIntervalKm: [number, number]
  profile: { lengthScaleKm: number; logLikelihood: number }[]
  /** Present when input.regimes is 'windows'. */
  regimes?: RegimeSummary
}

export interface DownscaleMemberOutput {
  fit: MemberFit
  packed: PackedInt16
  fineNx: number
  fineNy: number
  /** Largest |block mean of a sample − coarse value| over valid cells (should be rounding-level). */
  blockMeanError: number
  diagnostics: Record<string, unknown>
}

/** Derives a task's seed from the run seed, lead index and member index (splitmix-style mixing). */
export function taskSeed(runSeed: number, leadIndex: number, memberIndex: number): number {
  let h = (runSeed ^ Math.imul(leadIndex + 1, 0x9e3779b1) ^ Math.imul(memberIndex + 1, 0x85ebca77)) >>> 0
  h = Math.imul(h ^ (h >>> 16), 0x7feb352d) >>> 0
  h = Math.imul(h ^ (h >>> 15), 0x846ca68b) >>> 0
  return (h ^ (h >>> 16)) >>> 0
}

/** The noise seed of one member, shared by all its lead times (time-coherent runs). */
export function memberNoiseSeed(runSeed: number, memberIndex: number): number {
  return taskSeed(runSeed ^ 0x5bd1e995, -1, memberIndex)
}

export function downscaleMember(input: DownscaleMemberInput): DownscaleMemberOutput {
  const { samples, ...rest } = sampleMember(input)
  return { ...rest, packed: packInt16(samples) }
}

/** What downscaleMember computes, before packing: the samples as Float64Array fine fields (row-major). */
export type MemberSamples = Omit<DownscaleMemberOutput, 'packed'> & { samples: Float64Array[] }

/** downscaleMember without the packing (for checks that need the full-precision samples). */
export function sampleMember(input: DownscaleMemberInput): MemberSamples {
  const { nx, ny, factor } = input
  let latent = prepareLatentCoarse(input.coarse, input.transform ?? 'auto', input.standardName, input.transformLambda)
  const coarse = latent.physical
  const fineNx = nx * factor, fineNy = ny * factor
  if (latent.allDry) return allDryOutput(input, latent.summary)
  const [lower, upper] = defaultLengthScaleBounds(nx, ny, factor)
  const cap = (input.maxLengthScaleCoarseCells ?? DEFAULT_MAX_LENGTH_SCALE_COARSE_CELLS) * factor
  let fit = fitCoarseField(latent.fitField, nx, ny, {
    factor, kernel: input.kernel, lengthScaleBounds: [lower, Math.max(lower * 2, Math.min(upper, cap))], anisotropy: input.anisotropy ?? 'off',
  })
  if (latent.summary.lambdaFitted && latent.transform.censored && (input.censoredSupport ?? 'indirect') === 'indirect') {
    // λ̂ of the block values is biased by the change of support (low: partly dry blocks); the correction
    // also gives the fine-scale latent mean and variance, which the prior takes, keeping the fitted
    // correlation (ℓ barely moves with λ: 5.58 vs 5.65 fine cells on bench/extensions2.ts's truths).
    // Measured there (10 truths, dry fraction of samples − truth's): −0.079 coarse fit; −0.028 with the
    // corrected λ and a refit of the covariance; −0.013 with the fine-scale prior instead (no refit).
    // Not with regimes: the windows are fitted, and tested against this fit, on the same targets.
    const corrected = input.regimes === 'windows' ? { note: 'change-of-support correction not applied with regimes: λ from the coarse fit' }
      : correctCensoredSupport(latent, kernelParamsOf(fit, false), nx, ny, factor, CENSORED_SUPPORT_SEED)
    if ('latent' in corrected) {
      latent = corrected.latent
      fit = { ...fit, mean: corrected.mean, variance: corrected.sd * corrected.sd }
    } else {
      latent.summary = { ...latent.summary, lambdaMethod: 'coarse', note: [latent.summary.note, corrected.note].filter(Boolean).join('; ') }
    }
  }
  const kmPerFine = input.spacingKm / factor
  // The fit's nugget (estimated for se) describes noise in the coarse values; as fine-scale white
  // noise it would turn every sample into static (its fine variance is η·b²·σ², often above σ²).
  // Samples use the smooth part; the engine adds only the numerical nugget it needs to solve C,
  // and block means are still reproduced exactly.
  const regimes = input.regimes === 'windows' ? chooseRegimes(latent.fitField, latent.targets, fit, input) : undefined
  const downscaler: MemberSampler = regimes?.sampler ?? stationarySampler(createDownscaler({
    coarse: latent.targets, nx, ny, factor, kernel: kernelParamsOf(fit, false), mean: fit.mean,
  }))
  const { samples: latentSamples, coherence } = drawSamples(downscaler, input)
  let samples = latentSamples, physicalMeans: PhysicalMeanReport | undefined
  if (latent.transform.name !== 'none') {
    const restored = restorePhysicalBlockMeans(latentSamples, coarse, { nx, ny, factor }, latent.transform,
      (fields, changes) => downscaler.recondition(fields, changes), {
        // Smooth transforms: the exact finish alone leaves steps of ~1 % of the latent sd at block edges
        // (measured, bench/extensions2.ts), a re-conditioning round would cost ~20 % more for a third of
        // that. The censored model's gap is larger and varies more: up to two shared rounds.
        maxIterations: latent.transform.censored ? 2 : 0,
        maxStep: 2 * Math.sqrt(fit.variance), latentScale: Math.sqrt(fit.variance), ...input.physicalMeans,
      })
    samples = restored.samples
    physicalMeans = restored.report
  }
  let blockMeanError = 0
  for (const s of samples) {
    for (let J = 0; J < ny; J++) for (let I = 0; I < nx; I++) {
      const y = coarse[J * nx + I]!
      if (!Number.isFinite(y)) continue
      let sum = 0
      for (let dj = 0; dj < factor; dj++) for (let di = 0; di < factor; di++) sum += s[(J * factor + dj) * fineNx + I * factor + di]!
      blockMeanError = Math.max(blockMeanError, Math.abs(sum / (factor * factor) - y))
    }
  }
  const { profile, ...rest } = fit
  return {
    fit: {
      ...rest,
      transform: latent.summary,
      lengthScaleKm: fit.lengthScale * kmPerFine,
      lengthScaleIntervalKm: [fit.lengthScaleInterval[0] * kmPerFine, fit.lengthScaleInterval[1] * kmPerFine],
      profile: profile.map((p) => ({ lengthScaleKm: p.lengthScale * kmPerFine, logLikelihood: p.logLikelihood })),
      ...(regimes ? { regimes: regimes.summary(kmPerFine) } : {}),
    },
    samples, fineNx, fineNy, blockMeanError,
    diagnostics: {
      ...(downscaler.diagnostics as unknown as Record<string, unknown>),
      ...(physicalMeans ? { physicalMeans } : {}),
      ...(coherence ? { timeCoherence: coherence } : {}),
    },
  }
}

/**
 * Option regimes 'windows': local fits, and the blended sampler when some window departs from the
 * whole-domain fit (or always, with time coherence). Falls back to the stationary model, with a note,
 * when the grid is too small for two tiles or a window has nothing to condition on.
 */
function chooseRegimes(fitField: Float64Array, targets: Float64Array, fit: FitResult, input: DownscaleMemberInput) {
  const { nx, ny, factor } = input
  let note: string | undefined
  let regimeFit: RegimeFit | undefined
  let sampler: MemberSampler | undefined
  try {
    regimeFit = fitRegimes(fitField, nx, ny, fit, { factor, withNugget: false })
    if (regimeFit.windows.length < 2) note = 'grid too small for two windows'
    else if (regimeFit.departures === 0 && !input.timeCoherence) note = 'no window differs significantly from the whole-domain fit'
    else {
      sampler = regimeSampler(createRegimeDownscaler({
        coarse: targets, nx, ny, factor, layout: regimeFit.layout, priors: regimeFit.windows.map((w) => ({ kernel: w.kernel, mean: w.mean })),
      }))
    }
  } catch (err) {
    note = `windowed model not used: ${(err as Error).message}`
  }
  const summary = (kmPerFine: number): RegimeSummary => ({
    used: sampler !== undefined, ...(note ? { note } : {}),
    tiles: regimeFit ? [regimeFit.layout.tilesX, regimeFit.layout.tilesY] : [1, 1],
    departures: regimeFit?.departures ?? 0,
    windows: (regimeFit?.windows ?? []).map((w) => ({
      tile: w.window.tile, departs: w.departs, lengthScale: w.kernel.lengthScale, lengthScaleKm: w.kernel.lengthScale * kmPerFine,
      variance: w.kernel.variance, statistic: w.statistic, degreesOfFreedom: w.degreesOfFreedom,
    })),
  })
  return { sampler, summary }
}

/**
 * Latent samples: seeded per lead, or from time-coherent noise. A lead that shares no innovation with
 * any other (τ short against the lead spacing) takes the seeded spectral draw: the same in law, and one
 * FFT per pair cheaper. Otherwise the member's innovations live in the spectrum of a reference torus
 * (the window's minimal embedding, torusSide(window, ∞)): a lead sampling on that torus draws them
 * directly (no forward FFT); a lead on another torus (doubled by the positive-definiteness check, or
 * smaller for a short length scale) takes the spatial noise that agrees with them on every common
 * cell. With regimes on, every lead keeps the signed-coordinate spatial streams (one per window).
 */
function drawSamples(downscaler: MemberSampler, input: DownscaleMemberInput): { samples: Float64Array[]; coherence?: Record<string, number | boolean | string> } {
  const tc = input.timeCoherence
  if (!tc) return { samples: downscaler.samples(input.samples, input.seed) }
  const t = tc.leadIndex
  const summary = {
    leadIndex: t, timeScaleHours: tc.timeScaleHours,
    correlationWithPreviousLead: t > 0 ? leadCorrelation(tc.leadHours[t]!, tc.leadHours[t - 1]!, tc.timeScaleHours) : NaN,
  }
  if (isIsolatedLead(tc.leadHours, t, tc.timeScaleHours, DEFAULT_NOISE_TRUNCATION, tc.isLastLead ?? false)) {
    return { samples: downscaler.samples(input.samples, taskSeed(tc.noiseSeed, t, -1)), coherence: { ...summary, innovations: 1, droppedWeight: 0, isolated: true, noise: 'seeded' } }
  }
  const b = input.factor
  const torus = downscaler.torus
  if (downscaler.samplesFromSpectralNoise && torus && input.regimes !== 'windows') {
    const reference: [number, number] = [torusSide(input.nx * b, Infinity, b), torusSide(input.ny * b, Infinity, b)]
    const counts = (noise: { weights: { weights: Float64Array; dropped: number } }) => ({ innovations: noise.weights.weights.length, droppedWeight: noise.weights.dropped })
    if (torus.nx === reference[0] && torus.ny === reference[1]) {
      const noise = coherentSpectralNoise(tc)
      return { samples: downscaler.samplesFromSpectralNoise(input.samples, noise), coherence: { ...summary, ...counts(noise), isolated: false, noise: 'spectral' } }
    }
    const noise = coherentNoiseMatchingSpectrum(tc, reference)
    return { samples: downscaler.samplesFromNoise(input.samples, () => noise), coherence: { ...summary, ...counts(noise), isolated: false, noise: 'spatial, matching the spectrum' } }
  }
  const noise = coherentWhiteNoise(tc)
  return {
    samples: downscaler.samplesFromNoise(input.samples, (w) => (w === 0 ? noise : coherentWhiteNoise({ ...tc, noiseSeed: windowSeed(tc.noiseSeed, w) }))),
    coherence: { ...summary, innovations: noise.weights.weights.length, droppedWeight: noise.weights.dropped, isolated: false, noise: 'spatial' },
  }
}

/** Every valid block dry (censored model): the samples are exactly zero, there is nothing to fit. */
function allDryOutput(input: DownscaleMemberInput, transform: TransformSummary): MemberSamples {
  const fineNx = input.nx * input.factor, fineNy = input.ny * input.factor
  const zeros = Array.from({ length: input.samples }, () => new Float64Array(fineNx * fineNy))
  let validCells = 0
  for (let k = 0; k < input.coarse.length; k++) if (Number.isFinite(input.coarse[k]!)) validCells++
  return {
    fit: {
      kernel: input.kernel === 'auto' ? 'matern32' : input.kernel, lengthScale: 0, variance: 0, mean: 0, logLikelihood: 0,
      lengthScaleInterval: [0, 0], standardError: NaN, atBound: null, method: 'exact', evaluations: 0, totalEvaluations: 0,
      nuggetRatio: 0, nuggetEstimated: false, nugget: 0, lengthScaleBounds: [0, 0], validCells,
      transform: { ...transform, note: 'every block is dry: samples are zero, no covariance fitted' },
      lengthScaleKm: 0, lengthScaleIntervalKm: [0, 0], profile: [],
    },
    samples: zeros, fineNx, fineNy, blockMeanError: 0,
    diagnostics: { allDry: true },
  }
}
