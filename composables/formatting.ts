/**
 * Dates are shown in UTC with an explicit "UTC" so that server-rendered and browser-rendered
 * text agree and nobody misreads a local time in a forecasting office.
 */
export function formatDateTime(value: string | number | Date | null | undefined): string {
  if (value === null || value === undefined || value === '') return '—'
  const date = value instanceof Date ? value : new Date(value)
  if (Number.isNaN(date.getTime())) return '—'
  const iso = date.toISOString()
  return `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`
}

/** Compact one-line rendering of an audit value: strings bare, everything else as JSON. */
export function formatAuditValue(value: unknown, maxLength = 60): string {
  if (value === undefined) return '—'
  const text = typeof value === 'string' ? value : JSON.stringify(value)
  return text.length > maxLength ? `${text.slice(0, maxLength - 1)}…` : text
}
