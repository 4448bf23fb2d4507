/**
 * CSV exports of method-check reports (RFC 4180: comma-separated, CRLF line ends, fields quoted when
 * they hold a comma, quote or line break). One "tidy" table per report: every row is one number, the
 * columns saying what it is, so a spreadsheet filter or a pivot gives any view; empty = not applicable.
 * Numbers are written with full precision (shortest round-trip form).
 */
import type { MethodCheckHeadline, MethodCheckReport } from '../pipeline/methodCheckReport'

const REPORT_COLUMNS = ['section', 'forecast', 'threshold', 'neighbourhood_cells', 'wavenumber_per_cell', 'wavelength_km', 'quantity', 'value'] as const
type ReportRow = Partial<Record<(typeof REPORT_COLUMNS)[number], string | number | null>>

/** One CSV field. */
export function csvField(v: string | number | null | undefined): string {
  if (v === null || v === undefined) return ''
  const s = typeof v === 'number' ? (Number.isFinite(v) ? String(v) : '') : v
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s
}

function table(columns: readonly string[], rows: Record<string, string | number | null | undefined>[]): string {
  return [columns.join(','), ...rows.map((r) => columns.map((c) => csvField(r[c])).join(','))].join('\r\n') + '\r\n'
}

/** The whole report as one tidy CSV table. */
export function methodCheckReportCsv(r: MethodCheckReport): string {
  const rows: ReportRow[] = []
  const scalar = ['mse', 'rmse', 'mae', 'crps', 'blockMeanError', 'subgridPowerRatio'] as const
  for (const f of [...r.forecasts, ...r.samples]) {
    for (const q of scalar) rows.push({ section: 'score', forecast: f.id, quantity: q, value: f[q] })
    r.thresholds.forEach((t, ti) => {
      r.neighbourhoods.forEach((n, ni) => rows.push({ section: 'fss', forecast: f.id, threshold: t.value, neighbourhood_cells: n, quantity: 'fss', value: f.fss[ti]![ni] }))
      const b = f.brier[ti]!
      for (const q of ['score', 'reliability', 'resolution', 'uncertainty'] as const) rows.push({ section: 'brier', forecast: f.id, threshold: t.value, quantity: q, value: b[q] })
    })
  }
  r.thresholds.forEach((t) => {
    rows.push({ section: 'threshold', threshold: t.value, quantity: 'percentile', value: t.percentile })
    rows.push({ section: 'threshold', threshold: t.value, quantity: 'base_rate', value: t.baseRate })
    rows.push({ section: 'threshold', threshold: t.value, quantity: 'fss_useful', value: t.useful })
  })
  const sp = r.spectrum
  const wavelength = (k: number) => (sp.wavenumberPerKm ? 1 / sp.wavenumberPerKm[k]! : null)
  sp.wavenumber.forEach((w, k) => rows.push({ section: 'spectrum', forecast: 'truth', wavenumber_per_cell: w, wavelength_km: wavelength(k), quantity: 'power', value: sp.truth[k] }))
  for (const s of sp.series) {
    sp.wavenumber.forEach((w, k) => {
      rows.push({ section: 'spectrum', forecast: s.id, wavenumber_per_cell: w, wavelength_km: wavelength(k), quantity: 'power', value: s.power[k] })
      rows.push({ section: 'spectrum', forecast: s.id, wavenumber_per_cell: w, wavelength_km: wavelength(k), quantity: 'ratio_to_truth', value: s.ratio[k] })
    })
  }
  r.ensemble.rankHistogram.forEach((c, rank) => rows.push({ section: 'rank_histogram', forecast: 'ensemble', quantity: `rank_${rank}`, value: c }))
  r.ensemble.reliability.forEach((bins, ti) => bins.forEach((b) => {
    rows.push({ section: 'reliability', forecast: 'ensemble', threshold: r.thresholds[ti]!.value, quantity: `count_at_${b.probability}`, value: b.count })
    rows.push({ section: 'reliability', forecast: 'ensemble', threshold: r.thresholds[ti]!.value, quantity: `observed_frequency_at_${b.probability}`, value: b.observedFrequency })
  }))
  for (const [q, v] of Object.entries({ ...r.posterior, spread: r.ensemble.spread, spread_skill: r.ensemble.spreadSkill, crps_ensemble: r.ensemble.crpsEnsemble })) {
    rows.push({ section: 'ensemble', forecast: 'ensemble', quantity: q, value: v })
  }
  return table(REPORT_COLUMNS, rows)
}

export interface BatchCaseRow { id: number; name: string; truth: string; factor: number; status: string; headline: MethodCheckHeadline | null }

const HEADLINE_KEYS: (keyof MethodCheckHeadline)[] = [
  'rmseMean', 'rmseSampleAverage', 'bestBaseline', 'rmseBestBaseline', 'crpsSamples', 'maeBestBaseline',
  'subgridPowerSamples', 'subgridPowerBestBaseline', 'fssSmallSamples', 'fssSmallBestBaseline', 'spreadSkill',
]

/** One row per case of a batch with its headline numbers (empty for unfinished cases). */
export function batchCsv(cases: readonly BatchCaseRow[]): string {
  const columns = ['id', 'name', 'truth', 'factor', 'status', ...HEADLINE_KEYS]
  return table(columns, cases.map((c) => ({ id: c.id, name: c.name, truth: c.truth, factor: c.factor, status: c.status, ...(c.headline ?? {}) })))
}
