/**
 * Plain-language summary of a method-check report: each sentence is chosen and filled in by a rule on
 * the report's numbers (none is fixed text), so that a forecaster reads at a glance where the samples
 * beat interpolation and where the posterior mean wins. Thresholds of the rules (Tessera's own, stated
 * in the sentences where they matter): spectra agree within the report's agreement factor; a field is
 * "smoother than the truth" when it keeps under half of the truth's sub-grid variance; an ensemble is
 * under- (over-) dispersed when the truth falls outside all samples more than 1.5× (less than 2/3×) as
 * often as the 1/(N+1) a calibrated ensemble gives on each side.
 */
import type { ForecastScores, MethodCheckReport } from './methodCheckReport'

/** Three significant digits, no exponent for everyday magnitudes. */
export function formatNumber(x: number | null | undefined): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—'
  if (x === 0) return '0'
  const a = Math.abs(x)
  if (a >= 1e5 || a < 1e-3) return x.toExponential(2)
  return String(Number(x.toPrecision(3)))
}

function percent(x: number): string {
  const p = 100 * x
  return `${Math.abs(p) >= 10 || p === 0 ? Math.round(p) : Number(p.toFixed(1))} %`
}

/** A length given in fine cells, also in km when the grid spacing is known. */
function distance(cells: number, spacingKm: number | null): string {
  if (spacingKm) {
    const km = cells * spacingKm
    return `${km >= 10 ? Math.round(km) : Number(km.toFixed(1))} km`
  }
  return `${formatNumber(cells)} cells`
}

function neighbourhood(n: number, spacingKm: number | null): string {
  return spacingKm ? `${n}×${n} cells (${distance(n, spacingKm)})` : `${n}×${n} cells`
}

/** How a sentence names a forecast ("the posterior mean" or "the mean of the samples", "bicubic with block means kept"). */
function nameOf(f: ForecastScores): string {
  if (f.kind === 'mean') return `the ${f.label.charAt(0).toLowerCase()}${f.label.slice(1)}`
  const label = f.label.replace(' (block means kept)', ' with block means kept')
  return label.charAt(0).toLowerCase() + label.slice(1)
}

/** Sentences describing the report, in reading order. */
export function summariseMethodCheck(r: MethodCheckReport): string[] {
  const u = r.grid.units ? ` ${r.grid.units}` : ''
  const dx = r.grid.spacingKm
  const out: string[] = []
  const find = (id: string) => r.forecasts.find((f) => f.id === id)!
  const mean = find('mean'), ens = find('ensemble')
  const theMean = nameOf(mean)
  const TheMean = theMean.charAt(0).toUpperCase() + theMean.slice(1)
  const baselines = r.forecasts.filter((f) => f.kind === 'baseline')
  const smooth = baselines.filter((f) => f.method !== 'nearest')

  // Prior.
  const fit = r.fit
  const transformName = fit.transform ? ({ boxcox: 'Box–Cox', log: 'log', censored: 'censored latent' } as Record<string, string>)[fit.transform] ?? fit.transform : null
  const ell = `ℓ = ${distance(fit.lengthScale, dx)}`
  if (fit.source === 'given') out.push(`Prior given, not fitted: ${fit.kernel}, ${ell}, σ = ${formatNumber(Math.sqrt(fit.variance))}${u}.`)
  else {
    let s = `Prior fitted to the coarse field alone, as for a forecast run: ${fit.kernel}, ${ell}, σ = ${formatNumber(Math.sqrt(fit.variance))}${transformName ? ` (of the ${transformName}-transformed field)` : u}.`
    if (transformName) s += ` The field was downscaled in ${transformName}-transformed values, as a run of this variable is; the mean of the samples stands in for the posterior mean, which is Gaussian only in those values.`
    if (fit.atBound === 'upper') s += ` ℓ reached the upper end of the search (${distance(fit.lengthScaleCap ?? fit.lengthScale, dx)}): the coarse field asks for longer correlation than the method allows.`
    if (fit.atBound === 'lower') s += ' ℓ reached the lower end of the search: the coarse field looks almost uncorrelated.'
    out.push(s)
  }

  // Spectrum.
  const sp = r.spectrum
  const factor = sp.agreementFactor
  const samplesRatio = sp.series.find((s) => s.id === 'samples')!.ratio
  const agree = sp.samplesAgreeDownTo
  if (!agree) out.push(`The samples' spectrum differs from the truth's by more than a factor of ${factor} even at the longest waves.`)
  else {
    const next = samplesRatio.slice(agree.ring + 1).find((x) => x !== null)
    if (next === undefined) out.push(`The samples reproduce the truth's spectrum within a factor of ${factor} at every scale the grid resolves (down to ${distance(agree.cells, dx)}).`)
    else out.push(`The samples reproduce the truth's spectrum within a factor of ${factor} down to ${distance(agree.cells, dx)}; shorter waves have ${next > 1 ? 'too much' : 'too little'} power (${formatNumber(next)}× the truth's just below).`)
  }
  const sub = (f: ForecastScores) => f.subgridPowerRatio
  const coarseScale = distance(1 / sp.coarseNyquist, dx)
  if (ens.subgridPowerRatio !== null && mean.subgridPowerRatio !== null) {
    const smoothShares = smooth.map(sub).filter((v): v is number => v !== null)
    const range = smoothShares.length ? `${percent(Math.min(...smoothShares))}–${percent(Math.max(...smoothShares))}` : '—'
    const nearest = baselines.find((f) => f.method === 'nearest')
    let s = `At wavelengths shorter than two coarse cells (${coarseScale}), which the coarse field cannot resolve, the samples carry ${percent(ens.subgridPowerRatio)} of the truth's variance, ${theMean} ${percent(mean.subgridPowerRatio)} and bilinear/bicubic interpolation ${range}`
    if (nearest && sub(nearest) !== null && sub(nearest)! >= 0.1) s += ` (block-constant fields ${percent(sub(nearest)!)}, from the steps at block edges rather than real detail)`
    out.push(s + '.')
    if (mean.subgridPowerRatio < 0.5) out.push(`${TheMean} is smoother than the truth, as an average over all possible fine fields must be: take fine-scale detail from the samples, not from the mean.`)
  }

  // MSE.
  const points = [mean, ...baselines]
  const best = points.reduce((p, q) => (q.mse < p.mse ? q : p))
  if (best === mean) {
    const runnerUp = baselines.reduce((p, q) => (q.mse < p.mse ? q : p))
    out.push(`On MSE ${theMean} is best (RMSE ${formatNumber(mean.rmse)}${u}); the best interpolation, ${nameOf(runnerUp)}, has ${percent(runnerUp.mse / mean.mse - 1)} higher MSE.`)
  } else {
    out.push(`${best.label} beats ${theMean} on MSE by ${percent(1 - best.mse / mean.mse)} (RMSE ${formatNumber(best.rmse)} against ${formatNumber(mean.rmse)}${u}).`)
  }
  if (r.samples.length) {
    const ratio = r.samples.reduce((a, s) => a + s.mse, 0) / r.samples.length / mean.mse
    let s = `A single sample's MSE is ${formatNumber(ratio)}× that of ${theMean} on average (about 2× is expected: a sample adds its own spread to the mean's error), so for point values use the mean`
    if (ratio < 1.5) s += '; a ratio this low suggests the samples spread too little'
    if (ratio > 2.5) s += '; a ratio this high suggests the samples spread too much'
    out.push(s + '.')
  }

  // CRPS.
  const bestAbs = baselines.reduce((p, q) => (q.mae < p.mae ? q : p))
  const crpsChange = ens.crps / bestAbs.mae - 1
  out.push(`The samples' fair CRPS (${formatNumber(ens.crps)}${u}) is ${percent(Math.abs(crpsChange))} ${crpsChange <= 0 ? 'lower' : 'higher'} than the absolute error of the best interpolation (${nameOf(bestAbs)}, ${formatNumber(bestAbs.mae)}${u}), the CRPS of a single field${r.posterior.gaussianCrps !== null ? `; the Gaussian posterior itself scores ${formatNumber(r.posterior.gaussianCrps)}${u}` : ''}.`)

  // FSS per threshold.
  r.thresholds.forEach((t, ti) => {
    const label = `≥ ${formatNumber(t.value)}${u}${t.percentile !== null ? ` (${formatNumber(t.percentile)}th percentile)` : ''}`
    if (t.baseRate === 0 || t.baseRate === 1) {
      out.push(`Events ${label}: ${t.baseRate === 0 ? 'no' : 'every'} truth cell is an event, so the FSS says nothing here.`)
      return
    }
    const usefulFrom = (f: ForecastScores) => {
      const k = f.fss[ti]!.findIndex((v) => v !== null && v >= t.useful)
      return k < 0 ? null : r.neighbourhoods[k]!
    }
    const bestSmall = baselines.reduce((p, q) => ((q.fss[ti]![0] ?? -1) > (p.fss[ti]![0] ?? -1) ? q : p))
    const from = (n: number | null) => (n === null ? `not within ${neighbourhood(r.neighbourhoods.at(-1)!, dx)}` : `from ${neighbourhood(n, dx)}`)
    const baselineFrom = baselines.map(usefulFrom).filter((n): n is number => n !== null)
    const samplesFrom = usefulFrom(ens), interpolationFrom = baselineFrom.length ? Math.min(...baselineFrom) : null
    const useful = `useful (FSS ≥ ${formatNumber(t.useful)})`
    const usefulText = samplesFrom === interpolationFrom
      ? `${useful} for the samples and for interpolation alike ${from(samplesFrom)}`
      : `${useful} for the samples ${from(samplesFrom)}, for interpolation ${from(interpolationFrom)}`
    out.push(`Events ${label}, ${percent(t.baseRate)} of cells: at ${neighbourhood(r.neighbourhoods[0]!, dx)} the samples' FSS is ${formatNumber(ens.fss[ti]![0])} against ${formatNumber(bestSmall.fss[ti]![0])} for ${nameOf(bestSmall)} and ${formatNumber(mean.fss[ti]![0])} for ${theMean}; ${usefulText}.`)
  })

  // Brier.
  const brierParts = r.thresholds.map((t, ti) => {
    const bestPoint = points.reduce((p, q) => (q.brier[ti]!.score < p.brier[ti]!.score ? q : p))
    const b = ens.brier[ti]!
    return `≥ ${formatNumber(t.value)}${u}: ${formatNumber(b.score)} (reliability ${formatNumber(b.reliability)}, resolution ${formatNumber(b.resolution)}) against ${formatNumber(bestPoint.brier[ti]!.score)} for ${nameOf(bestPoint)}`
  })
  out.push(`Brier scores of the samples' probabilities: ${brierParts.join('; ')}.`)

  // Spread.
  const e = r.ensemble
  const outer = (e.outside.below + e.outside.above) / 2
  const verdict = outer > 1.5 * e.outside.expectedEach ? 'the samples spread too little (under-dispersed)'
    : outer < e.outside.expectedEach / 1.5 ? 'the samples spread too much (over-dispersed)' : 'the spread is about right'
  out.push(`The truth lies below every sample in ${percent(e.outside.below)} of cells and above every sample in ${percent(e.outside.above)} (a calibrated ensemble of ${e.members} gives ${percent(e.outside.expectedEach)} each): ${verdict}; spread–skill ratio ${formatNumber(e.spreadSkill)} (1 is ideal).`)

  // Block means.
  const worst = Math.max(ens.blockMeanError, mean.blockMeanError)
  const scale = Math.max(1e-12, r.truth.std, Math.abs(r.truth.mean))
  out.push(worst <= 1e-8 * scale
    ? `Every sample and ${theMean} average back to the coarse values (largest difference ${formatNumber(worst)}${u}, rounding).`
    : `Warning: block means of the samples differ from the coarse values by up to ${formatNumber(worst)}${u}.`)
  return out
}
