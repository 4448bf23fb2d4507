/**
 * `tessera score`: score forecast members against a truth grid.
 *
 *   tessera score --truth fine.json --forecast members.json (--threshold T | --percentile P)
 *                 [--neighbourhoods 1,3,5,9] [--seed S] [--window hann|none] [--keep-mean]
 *                 [--member-spectra] [--out scores.json]
 *
 * truth: grid JSON { nx, ny, values, spacing? } without missing cells; members.json:
 * { nx, ny, members } of the same shape (as for `products`). --percentile P sets the threshold to
 * the P-th percentile of the truth (type 7). Prints (or writes) JSON:
 * { nx, ny, members, threshold, mse, rmse, fss: { "<n>": … }, fssUseful, baseRate, crps,
 *   crpsEnsemble, brier: { score, reliability, resolution, uncertainty, bins }, rankHistogram,
 *   psd: { wavenumber, wavenumberPerKm?, truth, forecastMean, members?, window, removeMean } }.
 * Conventions (shared/numerics/verify/scoreEnsemble.ts): event = value ≥ threshold; FSS
 * fractions over n×n squares centred on each cell with outside cells as non-events (denominator
 * n²), forecast fractions = mean of member fractions; mse of the ensemble mean; crps = fair CRPS
 * averaged over cells (null for one member); Brier probabilities = share of members with an
 * event; FSS is null where neither field has an event. Wavenumbers in cycles per grid cell
 * (per km when the truth gives a spacing), power in field² · cell².
 */
import { percentileThreshold } from '../shared/numerics/verify/percentileThreshold'
import { scoreEnsemble } from '../shared/numerics/verify/scoreEnsemble'
import type { SpectrumWindow } from '../shared/numerics/verify/periodogram'
import { joinNegativeValues, numberOption, parseOptions, UsageError } from './args'
import { readGridFile, readMembersFile, toJsonArray, writeJson } from './gridFiles'

function neighbourhoodList(text: string | undefined): number[] {
  const raw = text ?? '1,3,5,9'
  const sizes = raw.split(',').map((s) => s.trim())
  if (sizes.some((s) => !/^\d+$/.test(s) || Number(s) % 2 === 0)) {
    throw new UsageError(`--neighbourhoods must be odd positive integers separated by commas (e.g. 1,3,5,9), got "${raw}"`)
  }
  return [...new Set(sizes.map(Number))]
}

export async function run(argv: string[]): Promise<void> {
  const { values, positionals } = parseOptions(joinNegativeValues(argv, ['threshold']), {
    truth: { type: 'string' },
    forecast: { type: 'string' },
    threshold: { type: 'string' },
    percentile: { type: 'string' },
    neighbourhoods: { type: 'string' },
    seed: { type: 'string' },
    window: { type: 'string' },
    'keep-mean': { type: 'boolean' },
    'member-spectra': { type: 'boolean' },
    out: { type: 'string' },
  })
  if (positionals.length) throw new UsageError(`unexpected argument "${positionals[0]}"`)
  if (!values.truth) throw new UsageError('--truth is required')
  if (!values.forecast) throw new UsageError('--forecast is required')
  if ((values.threshold === undefined) === (values.percentile === undefined)) throw new UsageError('give exactly one of --threshold T or --percentile P')
  const sizes = neighbourhoodList(values.neighbourhoods)
  const seed = values.seed === undefined ? 1 : numberOption(values.seed, 'seed', { integer: true })
  const window = (values.window ?? 'hann') as SpectrumWindow
  if (window !== 'hann' && window !== 'none') throw new UsageError(`--window must be hann or none, got "${values.window}"`)

  const truth = readGridFile(values.truth)
  const forecast = readMembersFile(values.forecast)
  if (truth.nx !== forecast.nx || truth.ny !== forecast.ny) {
    throw new UsageError(`shape mismatch: truth is ${truth.nx}×${truth.ny}, forecast is ${forecast.nx}×${forecast.ny}`)
  }
  const missing = truth.values.findIndex((v) => Number.isNaN(v))
  if (missing >= 0) throw new UsageError(`${values.truth}: missing value at column ${missing % truth.nx}, row ${Math.floor(missing / truth.nx)}; the truth must be complete`)
  let threshold: number
  let percentile: number | undefined
  if (values.percentile !== undefined) {
    percentile = numberOption(values.percentile, 'percentile', { min: 0 })
    if (percentile > 100) throw new UsageError(`--percentile must be within [0, 100], got "${values.percentile}"`)
    threshold = percentileThreshold(truth.values, percentile)
  } else {
    threshold = numberOption(values.threshold, 'threshold')
  }

  const s = scoreEnsemble(truth.values, forecast, {
    threshold, neighbourhoods: sizes, seed,
    spectrum: { window, removeMean: !values['keep-mean'], spacing: truth.spacing },
    memberSpectra: values['member-spectra'] ?? false,
  })
  const { bins, score, reliability, resolution, uncertainty } = s.brier
  writeJson(values.out, {
    nx: truth.nx,
    ny: truth.ny,
    members: s.members,
    threshold,
    ...(percentile !== undefined ? { percentile } : {}),
    mse: s.mse,
    rmse: s.rmse,
    fss: Object.fromEntries([...s.fss].map(([n, v]) => [String(n), Number.isFinite(v) ? v : null])),
    fssUseful: s.fssUseful,
    baseRate: s.baseRate,
    crps: Number.isFinite(s.crps) ? s.crps : null,
    crpsEnsemble: s.crpsEnsemble,
    brier: { score, reliability, resolution, uncertainty, bins },
    rankHistogram: s.rankHistogram,
    psd: {
      wavenumber: toJsonArray(s.psd.wavenumber),
      ...(s.psd.wavenumberPerKm ? { wavenumberPerKm: toJsonArray(s.psd.wavenumberPerKm) } : {}),
      truth: toJsonArray(s.psd.truth),
      forecastMean: toJsonArray(s.psd.forecastMean),
      ...(s.psd.members ? { members: s.psd.members.map(toJsonArray) } : {}),
      window: s.psd.window,
      removeMean: s.psd.removeMean,
    },
  })
}
