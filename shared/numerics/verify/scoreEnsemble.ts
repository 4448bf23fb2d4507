/**
 * All verification scores of a forecast ensemble against one truth field, as used by
 * `tessera score` and the method check. Fields row-major nx×ny, complete (no missing cells).
 *
 * Conventions: an event is value ≥ threshold; FSS fractions over n×n squares (odd n) centred
 * on each cell, outside cells non-events (denominator n²), sums over the whole grid, forecast
 * fractions = mean over members of member fractions; `mse` is that of the ensemble mean;
 * `crps` the fair CRPS (Ferro 2014) averaged over cells, `crpsEnsemble` the CRPS of the
 * members' empirical distribution (Hersbach 2000); Brier probabilities are the per-cell share of
 * members with an event; rank-histogram ties are broken with xoshiro128** from `seed`; spectra
 * follow radialSpectrum.ts (cycles per cell; per km when a spacing is given).
 */
import { eventField, exceedanceProbability } from '../ensemble/exceedance'
import { ensembleMean } from '../ensemble/moments'
import { sortByPixel } from '../ensemble/sortedStack'
import type { EnsembleStack, Grid } from '../ensemble/stack'
import { brierScore, type BrierDecomposition } from './brierScore'
import { ensembleCrpsField } from './crps'
import { fractionsSkill } from './fractionsSkillScore'
import { radialSpectrum, type RadialSpectrumOptions } from './radialSpectrum'
import { rankHistogram } from './rankHistogram'
import { meanSquaredError } from './squaredError'

export interface ScoreOptions {
  threshold: number
  /** Odd neighbourhood sizes for the FSS, in cells. */
  neighbourhoods: readonly number[]
  /** Seed of the rank-histogram tie-break (default 1). */
  seed?: number
  spectrum?: RadialSpectrumOptions
  /** Also return the spectrum of every member (default false). */
  memberSpectra?: boolean
}

export interface EnsembleScores {
  members: number
  threshold: number
  mse: number
  rmse: number
  fss: Map<number, number>
  fssUseful: number
  baseRate: number
  crps: number
  crpsEnsemble: number
  brier: BrierDecomposition
  rankHistogram: number[]
  psd: {
    wavenumber: Float64Array
    wavenumberPerKm?: Float64Array
    truth: Float64Array
    forecastMean: Float64Array
    members?: Float64Array[]
    window: string
    removeMean: boolean
  }
}

/** Scores `forecast` against `truth` (same nx×ny). */
export function scoreEnsemble(truth: Grid, forecast: EnsembleStack, options: ScoreOptions): EnsembleScores {
  const { nx, ny } = forecast
  if (truth.length !== nx * ny) throw new Error(`truth has ${truth.length} cells, forecast is ${nx}×${ny}`)
  const missing = truth.findIndex((v) => !Number.isFinite(v))
  if (missing >= 0) throw new Error(`truth has a missing value at column ${missing % nx}, row ${Math.floor(missing / nx)}`)
  const { threshold } = options
  const mean = ensembleMean(forecast)
  const mse = meanSquaredError(mean, truth)
  const skill = fractionsSkill(truth, forecast, threshold, options.neighbourhoods)
  const sorted = sortByPixel(forecast)
  const spectrum = (f: Grid) => radialSpectrum(f, nx, ny, options.spectrum)
  const truthSpectrum = spectrum(truth)
  return {
    members: forecast.members.length,
    threshold,
    mse,
    rmse: Math.sqrt(mse),
    fss: skill.fss,
    fssUseful: skill.useful,
    baseRate: skill.baseRate,
    crps: ensembleCrpsField(sorted, truth, 'fair').mean,
    crpsEnsemble: ensembleCrpsField(sorted, truth, 'ensemble').mean,
    brier: brierScore(exceedanceProbability(forecast, threshold, 'above'), eventField(truth, threshold, 'above')),
    rankHistogram: rankHistogram(sorted, truth, options.seed ?? 1),
    psd: {
      wavenumber: truthSpectrum.wavenumber,
      ...(truthSpectrum.wavenumberPerKm ? { wavenumberPerKm: truthSpectrum.wavenumberPerKm } : {}),
      truth: truthSpectrum.power,
      forecastMean: spectrum(mean).power,
      ...(options.memberSpectra ? { members: forecast.members.map((m) => spectrum(m).power) } : {}),
      window: truthSpectrum.window,
      removeMean: truthSpectrum.removeMean,
    },
  }
}
