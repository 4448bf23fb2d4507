/**
 * CF time coordinates ("<unit> since <reference date>", CF Conventions §4.4) for the standard
 * (mixed Gregorian) and proleptic Gregorian calendars, restricted to dates from 1582-10-15 on,
 * where both agree with JavaScript's proleptic Gregorian Date. Other calendars are refused:
 * converting a 360-day model calendar silently would shift valid times.
 */
import { IngestError } from './errors'

const MS_PER: Record<string, number> = {}
for (const [ms, names] of [
  [1000, ['s', 'sec', 'secs', 'second', 'seconds']],
  [60_000, ['min', 'mins', 'minute', 'minutes']],
  [3_600_000, ['h', 'hr', 'hrs', 'hour', 'hours']],
  [86_400_000, ['d', 'day', 'days']],
] as const) for (const n of names) MS_PER[n] = ms

const GREGORIAN_CALENDARS = new Set(['standard', 'gregorian', 'proleptic_gregorian'])
const GREGORIAN_START_MS = Date.UTC(1582, 9, 15)

/** A parsed "<unit> since <date>": value v means epochMs + v·unitMs (milliseconds since 1970-01-01T00:00Z). */
export interface CfTimeAxis { unitMs: number; epochMs: number }

/** Milliseconds in one duration unit ('hours', 's', …); months and years are refused (their length varies). */
export function durationUnitMs(units: string, what: string): number {
  const unit = units.trim().toLowerCase()
  const ms = MS_PER[unit]
  if (ms === undefined) {
    throw new IngestError('bad_time_units', `${what} has units "${units}"; expected seconds, minutes, hours or days.`)
  }
  return ms
}

/** Parses CF time units and checks the calendar attribute (absent = standard). */
export function parseTimeUnits(units: string, calendar: string | undefined, what: string): CfTimeAxis {
  const cal = (calendar ?? 'standard').trim().toLowerCase()
  if (!GREGORIAN_CALENDARS.has(cal)) {
    throw new IngestError('unsupported_calendar',
      `${what} uses the "${calendar}" calendar; Tessera reads only the standard (Gregorian) calendar. Convert the times first.`)
  }
  const match = /^\s*(\S+)\s+since\s+(.+?)\s*$/i.exec(units)
  if (!match) throw new IngestError('bad_time_units', `${what} has units "${units}"; expected e.g. "hours since 2031-03-04 00:00:00".`)
  const unitMs = durationUnitMs(match[1]!, what)
  const epochMs = parseReferenceDate(match[2]!, what)
  if (epochMs < GREGORIAN_START_MS) {
    throw new IngestError('unsupported_calendar', `${what} counts from ${match[2]}, before the Gregorian calendar began (1582-10-15).`)
  }
  return { unitMs, epochMs }
}

/** UDUNITS-style date: YYYY-M-D, then optionally [T or space]h[:m[:s[.fff]]], then optionally Z/UTC or ±h[:mm]. */
function parseReferenceDate(text: string, what: string): number {
  const m = /^(\d{1,4})-(\d{1,2})-(\d{1,2})(?:[T\s]+(\d{1,2})(?::(\d{1,2})(?::(\d{1,2}(?:\.\d*)?))?)?)?\s*(Z|UTC|GMT|[+-]?\d{1,2}(?::?\d{2})?)?$/i.exec(text.trim())
  if (!m) throw new IngestError('bad_time_units', `${what}: cannot read the date "${text}".`)
  const [year, month, day, hour, minute] = [1, 2, 3, 4, 5].map((k) => Number(m[k] ?? 0)) as [number, number, number, number, number]
  const second = Number(m[6] ?? 0)
  if (month < 1 || month > 12 || day < 1 || day > 31 || hour > 24 || minute > 59 || second >= 61) {
    throw new IngestError('bad_time_units', `${what}: the date "${text}" is not a valid date.`)
  }
  const date = new Date(0)
  date.setUTCFullYear(year, month - 1, day) // setUTCFullYear keeps years 0–99 literal (Date.UTC would add 1900)
  date.setUTCHours(hour, minute, 0, 0)
  if (date.getUTCDate() !== day) throw new IngestError('bad_time_units', `${what}: the date "${text}" does not exist.`)
  return date.getTime() + second * 1000 - zoneOffsetMs(m[7])
}

function zoneOffsetMs(zone: string | undefined): number {
  if (!zone || /^(Z|UTC|GMT)$/i.test(zone)) return 0
  const m = /^([+-]?)(\d{1,2})(?::?(\d{2}))?$/.exec(zone)!
  const sign = m[1] === '-' ? -1 : 1
  return sign * (Number(m[2]) * 3_600_000 + Number(m[3] ?? 0) * 60_000)
}

/** Epoch milliseconds of one coordinate value, rounded to the millisecond (float noise such as 0.1 h). */
export function cfTimeToMs(value: number, axis: CfTimeAxis, what: string): number {
  const ms = Math.round(axis.epochMs + value * axis.unitMs)
  if (!Number.isFinite(ms) || Math.abs(ms) > 8.64e15) throw new IngestError('bad_time_units', `${what} has an impossible value ${value}.`)
  if (ms < GREGORIAN_START_MS) throw new IngestError('unsupported_calendar', `${what} reaches back before 1582-10-15.`)
  return ms
}

/** ISO 8601 UTC without milliseconds when they are zero: '2031-03-04T06:00:00Z'. */
export function formatIsoUtc(ms: number): string {
  const iso = new Date(ms).toISOString()
  return iso.endsWith('.000Z') ? iso.slice(0, -5) + 'Z' : iso
}

/** Reads an ISO 8601 date-time (Tessera JSON, GeoTIFF metadata); no zone means UTC, as in CF. */
export function parseIsoTime(text: unknown, what: string): number {
  if (typeof text !== 'string') throw new IngestError('bad_time_units', `${what} must be an ISO 8601 time such as "2031-03-04T06:00:00Z".`)
  const ms = parseReferenceDate(text, what)
  if (ms < GREGORIAN_START_MS) throw new IngestError('unsupported_calendar', `${what} is before 1582-10-15.`)
  return ms
}
