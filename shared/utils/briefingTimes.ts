/**
 * Times in briefings: validity windows from a run's lead times, and every time printed in UTC
 * and in the recipients' local time with its offset ("10:00 Serevan Coast time (UTC−02:00)").
 * A fixed offset per briefing, chosen by the forecaster (no daylight-saving rules are applied).
 */

/** The invented demo region's local time: a fictional fixed zone, two hours behind UTC. */
export const DEMO_LOCAL_TIME = { name: 'Serevan Coast time', offsetMinutes: -120 } as const

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec']
const pad = (n: number) => String(n).padStart(2, '0')

/** "UTC−02:00", "UTC+05:30", "UTC+00:00" (true minus sign). */
export function utcOffsetText(offsetMinutes: number): string {
  const sign = offsetMinutes < 0 ? '−' : '+'
  const m = Math.abs(offsetMinutes)
  return `UTC${sign}${pad(Math.floor(m / 60))}:${pad(m % 60)}`
}

/** Parses "-02:00", "+5:30", "−2" into minutes (null when not an offset between −14 h and +14 h). */
export function parseUtcOffset(text: string): number | null {
  const m = /^\s*([+\-−])?\s*(\d{1,2})(?::?(\d{2}))?\s*$/.exec(text)
  if (!m) return null
  const minutes = Number(m[2]) * 60 + Number(m[3] ?? 0)
  const value = m[1] === '-' || m[1] === '−' ? -minutes : minutes
  return Math.abs(value) <= 14 * 60 && Number(m[3] ?? 0) < 60 ? value : null
}

function parts(d: Date) {
  return { y: d.getUTCFullYear(), mo: MONTHS[d.getUTCMonth()]!, d: d.getUTCDate(), h: pad(d.getUTCHours()), mi: pad(d.getUTCMinutes()) }
}

/** "14 Nov 2031 12:00 UTC". */
export function formatBriefingUtc(value: Date | string): string {
  const p = parts(new Date(value))
  return `${p.d} ${p.mo} ${p.y} ${p.h}:${p.mi} UTC`
}

/** "14 Nov 2031 10:00 Serevan Coast time (UTC−02:00)". */
export function formatBriefingLocal(value: Date | string, local: { name: string; offsetMinutes: number }): string {
  const shifted = new Date(new Date(value).getTime() + local.offsetMinutes * 60_000)
  const p = parts(shifted)
  return `${p.d} ${p.mo} ${p.y} ${p.h}:${p.mi} ${local.name} (${utcOffsetText(local.offsetMinutes)})`
}

/** Both forms, UTC first: "14 Nov 2031 12:00 UTC (14 Nov 2031 10:00 Serevan Coast time, UTC−02:00)". */
export function formatBriefingTimePair(value: Date | string, local: { name: string; offsetMinutes: number }): string {
  if (local.offsetMinutes === 0 && local.name === 'UTC') return formatBriefingUtc(value)
  const shifted = new Date(new Date(value).getTime() + local.offsetMinutes * 60_000)
  const p = parts(shifted)
  return `${formatBriefingUtc(value)} (${p.d} ${p.mo} ${p.y} ${p.h}:${p.mi} ${local.name}, ${utcOffsetText(local.offsetMinutes)})`
}

export interface LeadTimeFacts {
  /** Valid times, ISO 8601 UTC, ascending (the end of the period for accumulations and extremes). */
  leadTimes: readonly string[]
  /** CF cell_methods, e.g. "time: maximum" (a period quantity) or null (an instant). */
  cellMethods: string | null
  forecastPeriodsHours: readonly number[]
}

/** Whether values are over a period ending at the valid time (CF "time: sum / mean / maximum / minimum"). */
export function isPeriodQuantity(run: Pick<LeadTimeFacts, 'cellMethods'>): boolean {
  return /time:\s*(sum|mean|maximum|minimum)/.test(run.cellMethods ?? '')
}

/** Length in hours of the period ending at lead `l` (spacing to the previous lead; the first uses the next). */
export function periodHoursAt(run: LeadTimeFacts, l: number): number | null {
  const t = run.leadTimes
  if (l > 0) return (Date.parse(t[l]!) - Date.parse(t[l - 1]!)) / 3600_000
  if (t.length > 1) return (Date.parse(t[1]!) - Date.parse(t[0]!)) / 3600_000
  return run.forecastPeriodsHours[0] ?? null
}

/** Start and end (UTC) of the window of leads [from, to]: periods start an accumulation period earlier. */
export function briefingWindowBounds(run: LeadTimeFacts, from: number, to: number): { start: Date; end: Date } {
  if (!(from >= 0 && to < run.leadTimes.length && from <= to)) throw new Error(`lead window ${from}–${to} is outside the run's ${run.leadTimes.length} lead times`)
  const end = new Date(run.leadTimes[to]!)
  const first = new Date(run.leadTimes[from]!)
  const hours = isPeriodQuantity(run) ? periodHoursAt(run, from) : null
  return { start: hours ? new Date(first.getTime() - hours * 3600_000) : first, end }
}

function hourText(d: Date): string {
  return d.getUTCMinutes() ? `${pad(d.getUTCHours())}:${pad(d.getUTCMinutes())}` : pad(d.getUTCHours())
}
function dayText(d: Date, withYear = true): string {
  return `${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]}${withYear ? ` ${d.getUTCFullYear()}` : ''}`
}
const sameDay = (a: Date, b: Date) => a.toISOString().slice(0, 10) === b.toISOString().slice(0, 10)

/** "06 UTC 14 Nov 2031", or a range "06–12 UTC 14 Nov 2031" / "18 UTC 14 Nov – 06 UTC 15 Nov 2031". */
export function utcRangeText(start: Date, end: Date): string {
  if (start.getTime() === end.getTime()) return `${hourText(end)} UTC ${dayText(end)}`
  if (sameDay(start, end)) return `${hourText(start)}–${hourText(end)} UTC ${dayText(end)}`
  return `${hourText(start)} UTC ${dayText(start, start.getUTCFullYear() !== end.getUTCFullYear())} – ${hourText(end)} UTC ${dayText(end)}`
}

/** "06 UTC and 12 UTC 14 Nov 2031" / "18 UTC 14 Nov and 06 UTC 15 Nov 2031" (joined by `joiner`). */
function pairText(a: Date, b: Date, joiner: string): string {
  const first = sameDay(a, b) ? `${hourText(a)} UTC` : `${hourText(a)} UTC ${dayText(a, a.getUTCFullYear() !== b.getUTCFullYear())}`
  return `${first} ${joiner} ${hourText(b)} UTC ${dayText(b)}`
}

/**
 * What a statement's time refers to, exactly as computed: one valid time (or period), or "one or
 * more of" the valid times (periods) of the window, counted per scenario.
 */
export function briefingWhenText(run: LeadTimeFacts, from: number, to: number): string {
  const times = run.leadTimes.slice(from, to + 1).map((t) => new Date(t))
  const { start, end } = briefingWindowBounds(run, from, to)
  if (isPeriodQuantity(run)) {
    if (times.length === 1) return `in the period ${utcRangeText(start, end)}`
    const hours = periodHoursAt(run, from)
    return `in one or more of the ${times.length} periods${hours ? ` of ${hours} hours` : ''} between ${pairText(start, end, 'and')}`
  }
  if (times.length === 1) return `at ${utcRangeText(end, end)}`
  if (times.length === 2) return `at one or both of the valid times ${pairText(times[0]!, times[1]!, 'and')}`
  return `at one or more of the ${times.length} valid times from ${pairText(start, end, 'to')}`
}
