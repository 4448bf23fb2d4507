/**
 * Words, icons and number formats for forecast runs. Status is always told by a word and an
 * icon together (never colour alone); numbers carry their units.
 */
import type { FitMethod, FittedKernel, KernelChoice, RunStatus, TaskStatus } from './types'

/** Icon names drawn by components/runs/StatusIcon.vue. */
export type StatusIconName = 'circle' | 'clock' | 'spinner' | 'check' | 'cross' | 'stop' | 'upload'

export interface StatusInfo {
  label: string
  icon: StatusIconName
  /** Tailwind classes; every pair meets 4.5:1 (see tailwind.config.ts). */
  tone: string
  /** One sentence for screen readers and the run page. */
  explanation: string
}

/** Badge tones for any status list (contrast: tide-800 on tide-50 9.13, on tide-100 8.14, berry-700 on berry-50 8.53, ink-900 on ink-50). */
export const STATUS_TONES = {
  neutral: 'border-ink-300 bg-ink-50 text-ink-900',
  active: 'border-tide-600 bg-tide-50 text-tide-800',
  done: 'border-tide-700 bg-tide-100 text-tide-800',
  error: 'border-berry-700 bg-berry-50 text-berry-700',
} as const
const { neutral: TONE_NEUTRAL, active: TONE_ACTIVE, done: TONE_DONE, error: TONE_ERROR } = STATUS_TONES

export const RUN_STATUS_INFO: Record<RunStatus, StatusInfo> = {
  staged: { label: 'Waiting for confirmation', icon: 'upload', tone: TONE_NEUTRAL, explanation: 'The file has been read; nobody has confirmed the preview yet.' },
  ready: { label: 'Ready to downscale', icon: 'circle', tone: TONE_NEUTRAL, explanation: 'The coarse ensemble is stored; downscaling has not been started.' },
  queued: { label: 'Queued', icon: 'clock', tone: TONE_ACTIVE, explanation: 'Downscaling is waiting for a worker to pick it up.' },
  running: { label: 'Downscaling', icon: 'spinner', tone: TONE_ACTIVE, explanation: 'Workers are fitting and sampling the members.' },
  completed: { label: 'Completed', icon: 'check', tone: TONE_DONE, explanation: 'Every member at every lead time has fine-scale samples.' },
  failed: { label: 'Failed', icon: 'cross', tone: TONE_ERROR, explanation: 'At least one member could not be downscaled; see the errors below.' },
  cancelled: { label: 'Cancelled', icon: 'stop', tone: TONE_NEUTRAL, explanation: 'Downscaling was stopped before it finished.' },
}

export const TASK_STATUS_INFO: Record<TaskStatus, StatusInfo> = {
  pending: { label: 'Waiting', icon: 'clock', tone: TONE_NEUTRAL, explanation: 'Not started yet.' },
  running: { label: 'Running', icon: 'spinner', tone: TONE_ACTIVE, explanation: 'A worker is fitting or sampling this member.' },
  done: { label: 'Done', icon: 'check', tone: TONE_DONE, explanation: 'Fitted and sampled.' },
  failed: { label: 'Failed', icon: 'cross', tone: TONE_ERROR, explanation: 'This member could not be downscaled.' },
  cancelled: { label: 'Cancelled', icon: 'stop', tone: TONE_NEUTRAL, explanation: 'Stopped before it was done.' },
}

/** Runs whose downscaling is in progress (the page polls while a run is in one of these). */
export const ACTIVE_RUN_STATUSES: readonly RunStatus[] = ['queued', 'running']
/** Runs from which downscaling may be (re)started. */
export const STARTABLE_RUN_STATUSES: readonly RunStatus[] = ['ready', 'cancelled', 'failed']

export const KERNEL_LABELS: Record<KernelChoice, string> = {
  auto: 'Automatic: the best likelihood of the four',
  se: 'Squared exponential (very smooth)',
  matern52: 'Matérn ν = 5/2 (smooth)',
  matern32: 'Matérn ν = 3/2 (moderately rough)',
  matern12: 'Matérn ν = 1/2, exponential (rough)',
}

/** Short kernel name for tables. */
export function kernelShortLabel(kernel: FittedKernel, nu?: number): string {
  switch (kernel) {
    case 'se': return 'Squared exp.'
    case 'matern12': return 'Matérn 1/2'
    case 'matern32': return 'Matérn 3/2'
    case 'matern52': return 'Matérn 5/2'
    case 'matern': return nu === undefined ? 'Matérn' : `Matérn ν=${formatSignificant(nu, 3)}`
  }
}

export const FIT_METHOD_LABELS: Record<FitMethod, string> = {
  exact: 'Exact',
  kronecker: 'Exact (separable)',
  whittle: 'Whittle approx.',
}

export const FIT_METHOD_EXPLANATIONS: Record<FitMethod, string> = {
  exact: 'Exact Gaussian likelihood of the coarse field (dense Cholesky factorisation).',
  kronecker: 'Exact Gaussian likelihood, computed through the separable (Kronecker) structure of the squared-exponential covariance.',
  whittle: 'Debiased Whittle approximation in the Fourier domain, used for large grids.',
}

export const BOUND_EXPLANATIONS: Record<'lower' | 'upper', string> = {
  lower: 'The likelihood was still rising at the shortest length scale searched: the coarse field shows almost no correlation between neighbouring cells, so ℓ is not pinned down by the data and the samples vary freely inside each block.',
  upper: 'The likelihood was still rising at the longest length scale searched: the field is smoother than the domain can show, so ℓ is not pinned down by the data and the samples vary little inside each block.',
}

/** A number rounded to `digits` significant digits, without exponent notation for everyday sizes. */
export function formatSignificant(value: number, digits = 3): string {
  if (!Number.isFinite(value)) return '—'
  if (value === 0) return '0'
  const magnitude = Math.floor(Math.log10(Math.abs(value)))
  const decimals = Math.max(0, digits - 1 - magnitude)
  if (decimals > 6) return value.toExponential(digits - 1)
  return value.toFixed(decimals)
}

/** A length in km: one decimal below 100 km, whole km above. */
export function formatKm(km: number | null | undefined): string {
  if (km === null || km === undefined || !Number.isFinite(km)) return '—'
  return `${Math.abs(km) >= 100 ? Math.round(km) : km.toFixed(1)} km`
}

/** A field value followed by its display units ("12.3 °C"). */
export function formatWithUnits(value: number | null | undefined, units: string, digits = 3): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—'
  return units ? `${formatSignificant(value, digits)} ${units}` : formatSignificant(value, digits)
}

/** Bytes as B / kB / MB / GB (powers of 1000, as storage is usually quoted). */
export function formatBytes(bytes: number | null | undefined): string {
  if (bytes === null || bytes === undefined || !Number.isFinite(bytes)) return '—'
  const units = ['B', 'kB', 'MB', 'GB', 'TB']
  let value = bytes
  let u = 0
  while (value >= 1000 && u < units.length - 1) {
    value /= 1000
    u++
  }
  return u === 0 ? `${Math.round(value)} B` : `${formatSignificant(value, 3)} ${units[u]}`
}

/** A duration: "850 ms", "12 s", "3 min 05 s", "1 h 02 min". */
export function formatDuration(ms: number | null | undefined): string {
  if (ms === null || ms === undefined || !Number.isFinite(ms) || ms < 0) return '—'
  if (ms < 1000) return `${Math.round(ms)} ms`
  const totalSeconds = Math.round(ms / 1000)
  if (totalSeconds < 60) return `${totalSeconds} s`
  const minutes = Math.floor(totalSeconds / 60)
  if (minutes < 60) return `${minutes} min ${String(totalSeconds % 60).padStart(2, '0')} s`
  return `${Math.floor(minutes / 60)} h ${String(minutes % 60).padStart(2, '0')} min`
}

/** A valid time as ISO 8601 UTC without milliseconds ("2031-11-14T06:00:00Z"). */
export function formatIsoUtc(value: string | null | undefined): string {
  if (!value) return '—'
  const date = new Date(value)
  if (Number.isNaN(date.getTime())) return '—'
  return date.toISOString().replace('.000Z', 'Z')
}

/** "T+6 h" for a forecast period in hours. */
export function formatForecastPeriod(hours: number | undefined): string {
  if (hours === undefined || !Number.isFinite(hours)) return ''
  return `T+${Number(hours.toPrecision(6))} h`
}

/** Longitude / latitude in degrees with hemisphere letters ("23.5°W", "45.0°S"). */
export function formatLon(lon: number, decimals = 1): string {
  const wrapped = ((((lon + 180) % 360) + 360) % 360) - 180
  const letter = wrapped < 0 ? 'W' : wrapped > 0 ? 'E' : ''
  return `${Math.abs(wrapped).toFixed(decimals)}°${letter}`
}

export function formatLat(lat: number, decimals = 1): string {
  const letter = lat < 0 ? 'S' : lat > 0 ? 'N' : ''
  return `${Math.abs(lat).toFixed(decimals)}°${letter}`
}

/** The smallest and largest block factors the server accepts (shared/schemas/runs.ts). */
export const BLOCK_FACTOR_RANGE = { min: 2, max: 16 } as const

/** Fine spacing aimed at by the default block factor (km): kilometre-scale but affordable. */
export const TARGET_FINE_SPACING_KM = 2.5

/**
 * The block factor whose fine spacing (coarse spacing / b) is closest to 2.5 km, within the
 * allowed range; for coarse grids already finer than 5 km this is the smallest factor.
 */
export function defaultBlockFactor(coarseSpacingKm: number): number {
  const { min, max } = BLOCK_FACTOR_RANGE
  if (!Number.isFinite(coarseSpacingKm) || coarseSpacingKm <= 0) return 4
  let best: number = min
  for (let b = min; b <= max; b++) {
    if (Math.abs(coarseSpacingKm / b - TARGET_FINE_SPACING_KM) < Math.abs(coarseSpacingKm / best - TARGET_FINE_SPACING_KM)) best = b
  }
  return best
}

/** Lead times as "2031-11-14 06:00 UTC" strings, shortened to first, last and a count when many. */
export function summariseLeadTimes(leadTimes: string[], format: (iso: string) => string, maxShown = 4): string {
  if (leadTimes.length === 0) return '—'
  if (leadTimes.length <= maxShown) return leadTimes.map(format).join(', ')
  return `${format(leadTimes[0]!)} … ${format(leadTimes[leadTimes.length - 1]!)} (${leadTimes.length} times)`
}

export const FORMAT_LABELS: Record<string, string> = {
  'netcdf-classic': 'NetCDF classic',
  'netcdf-4': 'NetCDF-4',
  geotiff: 'GeoTIFF (one band per member)',
  'tessera-json': 'Tessera JSON grid',
}

/** The standard deviation σ = √σ² (NaN for a negative or missing variance). */
export function standardDeviation(variance: number | null | undefined): number {
  return variance !== null && variance !== undefined && variance >= 0 ? Math.sqrt(variance) : Number.NaN
}

/** "2031-11-14 06:00" for table cells whose header already says UTC. */
export function formatUtcCompact(value: string | null | undefined): string {
  const iso = formatIsoUtc(value)
  return iso === '—' ? iso : `${iso.slice(0, 10)} ${iso.slice(11, 16)}`
}
