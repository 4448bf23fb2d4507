/**
 * Method check: how good is the downscaling where the fine truth is known? The truth (row-major
 * nx×ny, index j·nx + i, complete) is averaged over b×b blocks (the model's operator A) and that coarse
 * field is downscaled exactly as a forecast run's member is (pipeline/downscaleMember.ts sampleMember:
 * maximum-likelihood fit on the coarse field alone, the runs' cap on ℓ, conditioning by kriging), or with
 * a given prior (grf/downscaler.ts), with the runs' options (latent transform chosen by variable,
 * anisotropy, regimes; `standardName` as for a run); the posterior mean and pointwise std come from the same Gaussian
 * model (when the member pipeline used a latent transform or windowed regimes, the mean of the samples
 * stands in for the mean and the posterior scores are left out). All of them, together with interpolation
 * baselines of the same coarse field (interp/upsample.ts: block-constant, bilinear and bicubic, the
 * latter two also with block means kept), are scored against the truth: MSE, MAE, fair CRPS (Ferro
 * 2014), FSS per neighbourhood (Roberts & Lean 2008), Brier with Murphy's (1973) decomposition, rank
 * histogram (Hamill 2001), spread–skill (Fortin et al. 2014) and radially averaged spectra.
 * Pure (no I/O, seeded): the worker and `tessera check` both call it; conventions in methodCheckReport.ts.
 */
import { ensembleMean, ensembleSpread } from '../ensemble/moments'
import { eventField, exceedanceProbability } from '../ensemble/exceedance'
import { sortByPixel } from '../ensemble/sortedStack'
import type { EnsembleStack } from '../ensemble/stack'
import { kernelParamsOf } from '../fit/fitCoarse'
import { blockMeans, createDownscaler } from '../grf/downscaler'
import type { KernelParams } from '../grf/kernels'
import { blockAverage } from '../interp/blockAverage'
import { upsample, type InterpolationMethod } from '../interp/upsample'
import { meanAbsoluteError } from '../verify/absoluteError'
import { brierScore } from '../verify/brierScore'
import { ensembleCrpsField, gaussianCrps } from '../verify/crps'
import { fssOfFractions, fssUsefulLevel } from '../verify/fractionsSkillScore'
import { assertNeighbourhoodSize, neighbourhoodFractions } from '../verify/neighbourhoodFractions'
import { percentileThreshold } from '../verify/percentileThreshold'
import { radialSpectrum, type RadialSpectrum } from '../verify/radialSpectrum'
import { rankHistogram } from '../verify/rankHistogram'
import { agreementLimit, bandPowerRatio, spectrumRatio } from '../verify/spectrumAgreement'
import { meanSquaredError } from '../verify/squaredError'
import { sampleMember } from './downscaleMember'
import { summariseMethodCheck } from './methodCheckSummary'
import {
  METHOD_CHECK_DEFAULTS, METHOD_CHECK_REPORT_VERSION, type ForecastScores, type MethodCheckHeadline, type MethodCheckProgress,
  type MethodCheckReport, type MethodCheckSettings, type SpectrumSeries,
} from './methodCheckReport'

export { METHOD_CHECK_DEFAULTS }

export interface MethodCheckInput {
  /** The fine truth, row-major nx×ny, every value finite. */
  truth: ArrayLike<number>
  nx: number
  ny: number
  /** Fine grid spacing in km, when known (distances in the report are then also in km). */
  spacingKm?: number
  units?: string
  /** CF standard name of the variable: picks the latent transform when settings.transform is 'auto', as for runs. */
  standardName?: string
  settings: MethodCheckSettings
}

/** Smallest coarse grid the check accepts along each axis (the fit needs room for correlation). */
export const MIN_COARSE_SIDE = 4
/** Factor within which a spectrum is said to agree with the truth's (Tessera's rule, stated in the report). */
export const SPECTRUM_AGREEMENT_FACTOR = 2
/** Largest number of conditional samples. */
export const MAX_SAMPLES = 100


interface Baseline { id: string; label: string; method: InterpolationMethod; preserve: boolean }

/** The interpolation baselines, in the order reports list them. Block-constant keeps block means by construction. */
export const BASELINES: readonly Baseline[] = [
  { id: 'nearest', label: 'Block-constant (nearest)', method: 'nearest', preserve: true },
  { id: 'bilinear', label: 'Bilinear', method: 'bilinear', preserve: false },
  { id: 'bilinear-bm', label: 'Bilinear (block means kept)', method: 'bilinear', preserve: true },
  { id: 'bicubic', label: 'Bicubic', method: 'bicubic', preserve: false },
  { id: 'bicubic-bm', label: 'Bicubic (block means kept)', method: 'bicubic', preserve: true },
]

/** Throws a one-line Error for settings the check cannot run with. */
export function validateMethodCheckSettings(s: MethodCheckSettings): void {
  if (!Number.isInteger(s.factor) || s.factor < 2 || s.factor > 16) throw new Error(`block factor must be an integer from 2 to 16, got ${s.factor}`)
  if (!Number.isInteger(s.samples) || s.samples < 2 || s.samples > MAX_SAMPLES) throw new Error(`samples must be an integer from 2 to ${MAX_SAMPLES}, got ${s.samples}`)
  if (!Number.isInteger(s.seed) || s.seed < 0) throw new Error(`seed must be a non-negative integer, got ${s.seed}`)
  const { kind, values } = s.thresholds
  if (values.length === 0) throw new Error('give at least one threshold')
  for (const v of values) {
    if (!Number.isFinite(v)) throw new Error(`threshold ${v} is not a finite number`)
    if (kind === 'percentile' && (v < 0 || v > 100)) throw new Error(`percentile ${v} is outside 0–100`)
  }
  if (s.neighbourhoods.length === 0) throw new Error('give at least one neighbourhood size')
  s.neighbourhoods.forEach(assertNeighbourhoodSize)
  if (s.transform !== undefined && !['auto', 'none', 'boxcox', 'log', 'censored'].includes(s.transform)) throw new Error(`unknown transform "${s.transform}" (auto, none, boxcox, log or censored)`)
  if (s.anisotropy !== undefined && !['off', 'fit'].includes(s.anisotropy)) throw new Error(`anisotropy must be off or fit, got "${s.anisotropy}"`)
  if (s.regimes !== undefined && !['off', 'windows'].includes(s.regimes)) throw new Error(`regimes must be off or windows, got "${s.regimes}"`)
  const g = s.givenKernel
  if (g && !(g.lengthScale > 0 && g.variance > 0 && Number.isFinite(g.lengthScale) && Number.isFinite(g.variance))) {
    throw new Error('given kernel parameters need a positive length scale and variance')
  }
}

/** Runs the whole check; `onProgress` is told the fraction done and the stage. */
export function runMethodCheck(input: MethodCheckInput, onProgress: MethodCheckProgress = () => {}): MethodCheckReport {
  const d0 = METHOD_CHECK_DEFAULTS
  const settings: MethodCheckSettings = {
    ...input.settings,
    neighbourhoods: [...new Set(input.settings.neighbourhoods)].sort((a, b) => a - b),
    ...(input.settings.givenKernel ? {} : {
      transform: input.settings.transform ?? d0.transform, anisotropy: input.settings.anisotropy ?? d0.anisotropy, regimes: input.settings.regimes ?? d0.regimes,
    }),
  }
  validateMethodCheckSettings(settings)
  const b = settings.factor
  if (input.truth.length !== input.nx * input.ny) throw new Error(`truth has ${input.truth.length} values, expected ${input.nx}×${input.ny}`)
  const cnx = Math.floor(input.nx / b), cny = Math.floor(input.ny / b)
  if (cnx < MIN_COARSE_SIDE || cny < MIN_COARSE_SIDE) {
    throw new Error(`a ${input.nx}×${input.ny} truth gives only ${cnx}×${cny} blocks of ${b}×${b}; at least ${MIN_COARSE_SIDE}×${MIN_COARSE_SIDE} are needed (use a smaller factor)`)
  }
  const nx = cnx * b, ny = cny * b
  const truth = cropTruth(input.truth, input.nx, nx, ny)
  const spacing = input.spacingKm !== undefined && input.spacingKm > 0 ? input.spacingKm : undefined

  onProgress(0.02, 'coarse-graining the truth')
  const coarse = blockAverage(truth, nx, ny, b)

  onProgress(0.05, `fitting the prior and drawing ${settings.samples} conditional samples`)
  const model = downscaleCoarse(coarse, cnx, cny, settings, spacing, input.standardName)
  const { samples, fit } = model
  onProgress(0.5, 'posterior mean')
  const mean = model.mean()
  onProgress(0.55, 'posterior standard deviation')
  const std = model.std()
  onProgress(0.75, 'interpolation baselines')
  const baselines = BASELINES.map((bl) => ({ ...bl, field: upsample(coarse, cnx, cny, b, { method: bl.method, preserveBlockMeans: bl.preserve }) }))

  onProgress(0.8, 'scoring')
  const thresholdValues = settings.thresholds.values.map((v) => (settings.thresholds.kind === 'percentile' ? percentileThreshold(truth, v) : v))
  const ctx = scoringContext(truth, nx, ny, coarse, b, thresholdValues, settings.neighbourhoods, spacing)
  const meanScores = scoreField(ctx, { id: 'mean', label: std ? 'Posterior mean' : 'Mean of the samples', kind: 'mean', preservesBlockMeans: true }, mean)
  const sampleScores = samples.map((s, k) => scoreField(ctx, { id: `sample-${k + 1}`, label: `Sample ${k + 1}`, kind: 'sample', preservesBlockMeans: true }, s))
  const stack: EnsembleStack = { nx, ny, members: samples }
  const ens = scoreEnsemble(ctx, stack, settings.seed)
  const baselineScores = baselines.map((bl) => scoreField(ctx, { id: bl.id, label: bl.label, kind: 'baseline', method: bl.method, preservesBlockMeans: bl.preserve }, bl.field))

  onProgress(0.95, 'spectra and summary')
  const posterior = std ? posteriorScores(truth, mean, std) : { meanVariance: null, standardisedErrorVariance: null, gaussianCrps: null }
  const sampleSpectra = samples.map((s) => ctx.spectrum(s).power)
  const sampleMeanPower = Float64Array.from(ctx.truthSpectrum.power, (_, r) => sampleSpectra.reduce((acc, p) => acc + p[r]!, 0) / sampleSpectra.length)
  ens.scores.subgridPowerRatio = finiteOrNull(ctx.subgridShare(sampleMeanPower))
  const series: SpectrumSeries[] = [
    spectrumSeries(ctx, 'mean', 'Posterior mean', ctx.spectrum(mean).power),
    spectrumSeries(ctx, 'samples', 'Samples (mean spectrum)', sampleMeanPower),
    spectrumSeries(ctx, 'samples-low', 'Samples (lowest)', ctx.truthSpectrum.power.map((_, r) => Math.min(...sampleSpectra.map((p) => p[r]!)))),
    spectrumSeries(ctx, 'samples-high', 'Samples (highest)', ctx.truthSpectrum.power.map((_, r) => Math.max(...sampleSpectra.map((p) => p[r]!)))),
    ...baselines.map((bl) => spectrumSeries(ctx, bl.id, bl.label, ctx.spectrum(bl.field).power)),
  ]
  const limit = agreementLimit(spectrumRatio(sampleMeanPower, ctx.truthSpectrum.power), SPECTRUM_AGREEMENT_FACTOR)
  const wn = ctx.truthSpectrum.wavenumber
  const d = model.diagnostics

  const report: Omit<MethodCheckReport, 'summary' | 'headline'> = {
    version: METHOD_CHECK_REPORT_VERSION,
    settings,
    grid: {
      nx, ny, coarseNx: cnx, coarseNy: cny, factor: b, spacingKm: spacing ?? null,
      croppedFrom: nx !== input.nx || ny !== input.ny ? { nx: input.nx, ny: input.ny } : null,
      units: input.units ?? null,
    },
    truth: fieldStats(truth),
    fit,
    engine: {
      solver: String(d.solver ?? 'unknown'), blockMeanError: Math.max(Number(d.blockMeanError ?? 0), ens.scores.blockMeanError), addedNugget: Number(d.addedNugget ?? 0),
      stdMethod: typeof d.stdMethod === 'string' ? d.stdMethod : null, stdErrorBound: typeof d.stdErrorBound === 'number' ? d.stdErrorBound : null,
    },
    thresholds: thresholdValues.map((value, t) => ({
      value, percentile: settings.thresholds.kind === 'percentile' ? settings.thresholds.values[t]! : null,
      baseRate: ctx.baseRates[t]!, useful: fssUsefulLevel(ctx.baseRates[t]!),
    })),
    neighbourhoods: settings.neighbourhoods,
    forecasts: [meanScores, ens.scores, ...baselineScores],
    samples: sampleScores,
    ensemble: ens.details,
    posterior,
    spectrum: {
      wavenumber: Array.from(wn),
      wavenumberPerKm: spacing ? Array.from(wn, (k) => k / spacing) : null,
      modes: Array.from(ctx.truthSpectrum.modes),
      truth: jsonArray(ctx.truthSpectrum.power),
      series,
      coarseNyquist: ctx.coarseNyquist,
      window: ctx.truthSpectrum.window,
      removeMean: ctx.truthSpectrum.removeMean,
      agreementFactor: SPECTRUM_AGREEMENT_FACTOR,
      samplesAgreeDownTo: limit < 0 ? null : { ring: limit, cells: 1 / wn[limit]!, km: spacing ? spacing / wn[limit]! : null },
    },
  }
  const headline = methodCheckHeadline(report)
  const full: MethodCheckReport = { ...report, headline, summary: [] }
  full.summary = summariseMethodCheck(full)
  onProgress(1, 'done')
  return full
}

function cropTruth(values: ArrayLike<number>, fullNx: number, nx: number, ny: number): Float64Array {
  const out = new Float64Array(nx * ny)
  for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
    const v = values[j * fullNx + i]!
    if (!Number.isFinite(v)) throw new Error(`the truth has a missing or non-finite value at column ${i}, row ${j}; it must be complete`)
    out[j * nx + i] = v
  }
  return out
}

interface CoarseDownscaling {
  samples: Float64Array[]
  /** The posterior mean (or the mean of the samples when the model is not a single Gaussian field). */
  mean: () => Float64Array
  /** Pointwise posterior std, or null when the model is not a single Gaussian field. */
  std: () => Float64Array | null
  fit: MethodCheckReport['fit']
  diagnostics: Record<string, unknown>
}

/**
 * Downscales the coarse field: with the given prior, or as a forecast run's member (sampleMember, the
 * same inputs the worker's tasks pass), whose fitted prior then gives the posterior mean and std.
 */
function downscaleCoarse(coarse: Float64Array, cnx: number, cny: number, s: MethodCheckSettings, spacing: number | undefined, standardName: string | undefined): CoarseDownscaling {
  const km = (cells: number) => (spacing ? cells * spacing : null)
  const gaussian = (kernel: KernelParams, mean: number) => createDownscaler({ coarse, nx: cnx, ny: cny, factor: s.factor, kernel, mean })
  if (s.givenKernel) {
    const g = s.givenKernel
    const mean = g.mean ?? coarse.reduce((a, v) => a + v, 0) / coarse.length
    const d = gaussian({ kernel: g.kernel, lengthScale: g.lengthScale, variance: g.variance }, mean)
    return {
      samples: d.samples(s.samples, s.seed), mean: () => d.mean(), std: () => d.std(),
      diagnostics: d.diagnostics as unknown as Record<string, unknown>,
      fit: {
        source: 'given', kernel: g.kernel, lengthScale: g.lengthScale, lengthScaleKm: km(g.lengthScale), lengthScaleInterval: null,
        variance: g.variance, mean, atBound: null, method: null, logLikelihood: null, lengthScaleCap: null, transform: null,
      },
    }
  }
  const member = sampleMember({
    coarse, nx: cnx, ny: cny, factor: s.factor, kernel: s.kernel, samples: s.samples, seed: s.seed,
    spacingKm: (spacing ?? 1) * s.factor, ...(s.maxLengthScaleCoarseCells !== undefined ? { maxLengthScaleCoarseCells: s.maxLengthScaleCoarseCells } : {}),
    ...(standardName ? { standardName } : {}),
    transform: s.transform, anisotropy: s.anisotropy, regimes: s.regimes,
  })
  const f = member.fit
  const transform = f.transform.name === 'none' ? null : f.transform.name
  // The member's own model: the fitted prior's smooth part, as its sampler used (downscaleMember.ts).
  const d = !transform && !f.regimes?.used ? gaussian(kernelParamsOf({ ...f, profile: [] }, false), f.mean) : null
  const samples = member.samples
  return {
    samples,
    mean: () => (d ? d.mean() : ensembleMean({ nx: cnx * s.factor, ny: cny * s.factor, members: samples })),
    std: () => (d ? d.std() : null),
    diagnostics: d ? { ...member.diagnostics, ...(d.diagnostics as unknown as Record<string, unknown>) } : member.diagnostics,
    fit: {
      source: 'fitted', kernel: f.kernel, lengthScale: f.lengthScale, lengthScaleKm: km(f.lengthScale), lengthScaleInterval: f.lengthScaleInterval,
      variance: f.variance, mean: f.mean, atBound: f.atBound, method: f.method, logLikelihood: f.logLikelihood,
      lengthScaleCap: f.lengthScaleBounds[1], transform,
    },
  }
}

interface ScoringContext {
  truth: Float64Array
  nx: number
  ny: number
  coarse: Float64Array
  factor: number
  thresholds: number[]
  sizes: number[]
  truthEvents: Uint8Array[]
  /** observedFractions[t][n] */
  observedFractions: Float64Array[][]
  baseRates: number[]
  truthSpectrum: RadialSpectrum
  coarseNyquist: number
  spectrum: (field: Float64Array) => RadialSpectrum
  subgridShare: (power: ArrayLike<number>) => number
}

function scoringContext(truth: Float64Array, nx: number, ny: number, coarse: Float64Array, factor: number, thresholds: number[], sizes: number[], spacing: number | undefined): ScoringContext {
  const truthEvents = thresholds.map((t) => eventField(truth, t, 'above'))
  const spectrum = (field: Float64Array) => radialSpectrum(field, nx, ny, spacing ? { spacing } : {})
  const truthSpectrum = spectrum(truth)
  const coarseNyquist = 1 / (2 * factor)
  return {
    truth, nx, ny, coarse, factor, thresholds, sizes, truthEvents,
    observedFractions: truthEvents.map((e) => sizes.map((n) => neighbourhoodFractions(e, nx, ny, n))),
    baseRates: truthEvents.map((e) => e.reduce((a, v) => a + v, 0) / e.length),
    truthSpectrum, coarseNyquist, spectrum,
    subgridShare: (power) => bandPowerRatio(power, truthSpectrum.power, truthSpectrum.modes, truthSpectrum.wavenumber, coarseNyquist),
  }
}

type ForecastIdentity = Pick<ForecastScores, 'id' | 'label' | 'kind' | 'preservesBlockMeans'> & { method?: InterpolationMethod }

function blockMeanError(ctx: ScoringContext, field: Float64Array): number {
  const means = blockMeans(field, ctx.nx, ctx.nx / ctx.factor, ctx.ny / ctx.factor, ctx.factor)
  let err = 0
  for (let k = 0; k < means.length; k++) err = Math.max(err, Math.abs(means[k]! - ctx.coarse[k]!))
  return err
}

/** FSS per threshold and neighbourhood of a probability (or 0/1) field. */
function fssTable(ctx: ScoringContext, probability: (t: number) => ArrayLike<number>): (number | null)[][] {
  return ctx.thresholds.map((_, t) => {
    const p = probability(t)
    return ctx.sizes.map((n, s) => finiteOrNull(fssOfFractions(ctx.observedFractions[t]![s]!, neighbourhoodFractions(p, ctx.nx, ctx.ny, n))))
  })
}

function brierTable(ctx: ScoringContext, probability: (t: number) => ArrayLike<number>) {
  return ctx.thresholds.map((_, t) => brierScore(probability(t), ctx.truthEvents[t]!))
}

function scoreField(ctx: ScoringContext, who: ForecastIdentity, field: Float64Array): ForecastScores {
  const mse = meanSquaredError(field, ctx.truth)
  const mae = meanAbsoluteError(field, ctx.truth)
  const events = ctx.thresholds.map((t) => eventField(field, t, 'above'))
  return {
    ...who,
    blockMeanError: blockMeanError(ctx, field),
    mse, rmse: Math.sqrt(mse), mae, crps: mae,
    fss: fssTable(ctx, (t) => events[t]!),
    brier: brierTable(ctx, (t) => events[t]!).map(({ score, reliability, resolution, uncertainty }) => ({ score, reliability, resolution, uncertainty })),
    subgridPowerRatio: who.kind === 'sample' ? null : finiteOrNull(ctx.subgridShare(ctx.spectrum(field).power)),
  }
}

function scoreEnsemble(ctx: ScoringContext, stack: EnsembleStack, seed: number): { scores: ForecastScores; details: MethodCheckReport['ensemble'] } {
  const n = stack.members.length
  const mean = ensembleMean(stack)
  const mse = meanSquaredError(mean, ctx.truth)
  const sorted = sortByPixel(stack)
  const probabilities = ctx.thresholds.map((t) => exceedanceProbability(stack, t, 'above'))
  const brier = brierTable(ctx, (t) => probabilities[t]!)
  const spreadField = ensembleSpread(stack, mean)
  const spread = Math.sqrt(spreadField.reduce((a, s) => a + s * s, 0) / spreadField.length)
  const ranks = rankHistogram(sorted, ctx.truth, seed)
  const cells = ctx.truth.length
  const scores: ForecastScores = {
    id: 'ensemble', label: `Sample ensemble (${n})`, kind: 'ensemble', preservesBlockMeans: true,
    blockMeanError: Math.max(...stack.members.map((m) => blockMeanError(ctx, m as Float64Array))),
    mse, rmse: Math.sqrt(mse), mae: meanAbsoluteError(mean, ctx.truth),
    crps: ensembleCrpsField(sorted, ctx.truth, 'fair').mean,
    fss: fssTable(ctx, (t) => probabilities[t]!),
    brier: brier.map(({ score, reliability, resolution, uncertainty }) => ({ score, reliability, resolution, uncertainty })),
    subgridPowerRatio: null, // filled from the samples' mean spectrum
  }
  return {
    scores,
    details: {
      members: n,
      crpsEnsemble: ensembleCrpsField(sorted, ctx.truth, 'ensemble').mean,
      spread,
      spreadSkill: mse > 0 ? finiteOrNull(Math.sqrt((n + 1) / n) * spread / Math.sqrt(mse)) : null,
      rankHistogram: ranks,
      outside: { below: ranks[0]! / cells, above: ranks[n]! / cells, expectedEach: 1 / (n + 1) },
      reliability: brier.map((x) => x.bins),
    },
  }
}

function posteriorScores(truth: Float64Array, mean: Float64Array, std: Float64Array): MethodCheckReport['posterior'] {
  let variance = 0, z2 = 0, zCells = 0, crps = 0
  for (let k = 0; k < truth.length; k++) {
    const s = std[k]!
    variance += s * s
    crps += gaussianCrps(mean[k]!, s, truth[k]!)
    if (s > 0) { const z = (truth[k]! - mean[k]!) / s; z2 += z * z; zCells++ }
  }
  return {
    meanVariance: variance / truth.length,
    standardisedErrorVariance: zCells > 0 ? z2 / zCells : null,
    gaussianCrps: crps / truth.length,
  }
}

function spectrumSeries(ctx: ScoringContext, id: string, label: string, power: ArrayLike<number>): SpectrumSeries {
  return { id, label, power: jsonArray(power), ratio: jsonArray(spectrumRatio(power, ctx.truthSpectrum.power)) }
}

function fieldStats(f: Float64Array): MethodCheckReport['truth'] {
  let sum = 0, min = Infinity, max = -Infinity
  for (const v of f) { sum += v; if (v < min) min = v; if (v > max) max = v }
  const mean = sum / f.length
  let ss = 0
  for (const v of f) ss += (v - mean) * (v - mean)
  return { mean, std: Math.sqrt(ss / f.length), min, max }
}

/** The key numbers of a report, for lists and batch summaries. */
export function methodCheckHeadline(r: Pick<MethodCheckReport, 'forecasts' | 'samples' | 'ensemble'>): MethodCheckHeadline {
  const byId = (id: string) => r.forecasts.find((f) => f.id === id)!
  const baselines = r.forecasts.filter((f) => f.kind === 'baseline')
  const best = baselines.reduce((p, q) => (q.mse < p.mse ? q : p))
  const bestMae = Math.min(...baselines.map((f) => f.mae))
  const ens = byId('ensemble')
  const smallest = (f: ForecastScores) => f.fss[0]?.[0] ?? null
  const baselineSmall = baselines.map(smallest).filter((v): v is number => v !== null)
  return {
    rmseMean: byId('mean').rmse,
    rmseSampleAverage: Math.sqrt(r.samples.reduce((a, s) => a + s.mse, 0) / r.samples.length),
    bestBaseline: best.id,
    rmseBestBaseline: best.rmse,
    crpsSamples: ens.crps,
    maeBestBaseline: bestMae,
    subgridPowerSamples: ens.subgridPowerRatio,
    subgridPowerBestBaseline: best.subgridPowerRatio,
    fssSmallSamples: smallest(ens),
    fssSmallBestBaseline: baselineSmall.length ? Math.max(...baselineSmall) : null,
    spreadSkill: r.ensemble.spreadSkill,
  }
}

function finiteOrNull(x: number): number | null {
  return Number.isFinite(x) ? x : null
}

function jsonArray(a: ArrayLike<number>): (number | null)[] {
  return Array.from(a, (v) => (Number.isFinite(v) ? v : null))
}
