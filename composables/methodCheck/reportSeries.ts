/** Chart series built from a method-check report (pure; the chart components draw them). */
import type { MethodCheckReport } from '#shared/numerics/pipeline/methodCheckReport'
import { BASELINES_SHOWN_FIRST, formatNumber, seriesStyle, type SeriesStyle } from './display'

export type Point = readonly [number, number] | null
export interface ChartSeries { id: string; label: string; points: Point[]; style: SeriesStyle; band?: { low: Point[]; high: Point[] } }
export interface ChartReference { axis: 'x' | 'y'; value: number; label: string }

const BASELINE_IDS = ['nearest', 'bilinear', 'bilinear-bm', 'bicubic', 'bicubic-bm']

/** x values of the spectrum: cycles per km when the spacing is known, else per cell. */
function spectrumX(r: MethodCheckReport): number[] {
  return r.spectrum.wavenumberPerKm ?? r.spectrum.wavenumber
}

function zip(xs: number[], ys: (number | null)[]): Point[] {
  return xs.map((x, k) => (ys[k] === null || ys[k] === undefined ? null : [x, ys[k]!] as const))
}

/** Axis facts of the spectrum charts: the unit of x and the coarse grid's Nyquist wavenumber on it. */
export function spectrumAxis(r: MethodCheckReport) {
  const perKm = r.spectrum.wavenumberPerKm !== null
  const dx = r.grid.spacingKm
  const nyquist = perKm && dx ? r.spectrum.coarseNyquist / dx : r.spectrum.coarseNyquist
  const unit = perKm ? 'km' : 'cells'
  return {
    perKm, unit,
    /** Tick label: the wavelength 1/k. */
    tick: (k: number) => formatNumber(1 / k),
    coarse: { axis: 'x' as const, value: nyquist, label: `two coarse cells (${formatNumber(1 / nyquist)} ${unit})` },
  }
}

/** Power spectra of the truth, the samples (mean, with the band from lowest to highest), the mean and the baselines. */
export function spectrumSeries(r: MethodCheckReport): ChartSeries[] {
  const xs = spectrumX(r)
  const scale = r.grid.spacingKm && r.spectrum.wavenumberPerKm ? r.grid.spacingKm ** 2 : 1
  const power = (p: (number | null)[]) => p.map((v) => (v === null ? null : v * scale))
  const by = (id: string) => r.spectrum.series.find((s) => s.id === id)!
  const out: ChartSeries[] = [
    { id: 'truth', label: 'Truth', points: zip(xs, power(r.spectrum.truth)), style: seriesStyle('truth') },
    {
      id: 'samples', label: 'Samples (mean spectrum; band: lowest–highest)', points: zip(xs, power(by('samples').power)), style: seriesStyle('samples'),
      band: { low: zip(xs, power(by('samples-low').power)), high: zip(xs, power(by('samples-high').power)) },
    },
    { id: 'mean', label: 'Posterior mean', points: zip(xs, power(by('mean').power)), style: seriesStyle('mean') },
  ]
  for (const id of BASELINE_IDS) out.push({ id, label: by(id).label, points: zip(xs, power(by(id).power)), style: seriesStyle(id) })
  return out
}

/** Ratio of each spectrum to the truth's (1 = same power at that scale). */
export function spectrumRatioSeries(r: MethodCheckReport): ChartSeries[] {
  const xs = spectrumX(r)
  const by = (id: string) => r.spectrum.series.find((s) => s.id === id)!
  return ['samples', 'mean', ...BASELINE_IDS].map((id) => ({
    id, label: id === 'samples' ? 'Samples (mean spectrum)' : by(id).label, points: zip(xs, by(id).ratio), style: seriesStyle(id),
  }))
}

/** Series hidden at first in the spectrum and FSS charts (the legend switches them on). */
export function initiallyHiddenBaselines(): string[] {
  return BASELINE_IDS.filter((id) => !BASELINES_SHOWN_FIRST.includes(id))
}

/** FSS against neighbourhood size at threshold t: the samples' probabilities, the mean and the baselines. */
export function fssSeries(r: MethodCheckReport, t: number): ChartSeries[] {
  const dx = r.grid.spacingKm
  const xs = r.neighbourhoods.map((n) => (dx ? n * dx : n))
  return r.forecasts.map((f) => ({
    id: f.id, label: f.kind === 'ensemble' ? `Samples (probabilities from ${r.ensemble.members})` : f.label,
    points: zip(xs, f.fss[t]!), style: seriesStyle(f.id),
  }))
}

export function fssReferences(r: MethodCheckReport, t: number): ChartReference[] {
  const th = r.thresholds[t]!
  return [{ axis: 'y', value: th.useful, label: `useful: 0.5 + f₀/2 = ${formatNumber(th.useful)}` }]
}

/** Reliability diagram points of the samples' probabilities at threshold t (bins with at least one cell). */
export function reliabilitySeries(r: MethodCheckReport, t: number): ChartSeries[] {
  return [{
    id: 'samples', label: 'Samples: observed frequency per forecast probability',
    points: r.ensemble.reliability[t]!.map((b) => [b.probability, b.observedFrequency] as const), style: seriesStyle('samples'),
  }]
}

/** "≥ 12.3 m/s (90th percentile)". */
export function thresholdLabel(r: MethodCheckReport, t: number): string {
  const th = r.thresholds[t]!
  return `≥ ${formatNumber(th.value)}${r.grid.units ? ` ${r.grid.units}` : ''}${th.percentile !== null ? ` (${formatNumber(th.percentile)}th percentile)` : ''}`
}
