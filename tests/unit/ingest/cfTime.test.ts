import { describe, expect, it } from 'vitest'
import { cfTimeToMs, durationUnitMs, formatIsoUtc, parseIsoTime, parseTimeUnits } from '../../../server/ingest/cfTime'
import { IngestError } from '../../../server/ingest/errors'

const iso = (value: number, units: string, calendar?: string) => formatIsoUtc(cfTimeToMs(value, parseTimeUnits(units, calendar, 't'), 't'))

function codeOf(f: () => unknown): string | undefined {
  try { f() } catch (err) { return err instanceof IngestError ? err.code : 'not an IngestError' }
  return undefined
}

// Expected instants worked out by hand from the calendar (CF Conventions §4.4 semantics).
describe('CF time coordinates', () => {
  it('reads "<unit> since <date>" in the usual spellings', () => {
    expect(iso(6, 'hours since 2031-03-04 00:00:00')).toBe('2031-03-04T06:00:00Z')
    expect(iso(720, 'minutes since 2031-03-03 12:00:00')).toBe('2031-03-04T00:00:00Z')
    expect(iso(3, 'days since 2031-03-01')).toBe('2031-03-04T00:00:00Z')
    expect(iso(32400, 'seconds since 2031-03-04T00:00:00Z')).toBe('2031-03-04T09:00:00Z')
    expect(iso(1.5, 'hours since 2031-3-4 0:00:00')).toBe('2031-03-04T01:30:00Z')
    expect(iso(0, 'hours since 1970-01-01 00:00:00.0')).toBe('1970-01-01T00:00:00Z')
    expect(iso(0.1, 'hours since 2031-03-04')).toBe('2031-03-04T00:06:00Z') // 0.1 h = 6 min, float noise rounded away
  })

  it('applies time zone offsets of the reference date', () => {
    expect(iso(0, 'hours since 2031-03-04 00:00:00 +02:00')).toBe('2031-03-03T22:00:00Z')
    expect(iso(0, 'hours since 2031-03-04 00:00 -0530')).toBe('2031-03-04T05:30:00Z')
    expect(iso(0, 'hours since 2031-03-04 00:00:00 UTC')).toBe('2031-03-04T00:00:00Z')
  })

  it('counts leap days (2032 is a leap year, 2031 is not)', () => {
    expect(iso(1, 'days since 2032-02-28')).toBe('2032-02-29T00:00:00Z')
    expect(iso(1, 'days since 2031-02-28')).toBe('2031-03-01T00:00:00Z')
    expect(codeOf(() => parseTimeUnits('days since 2031-02-29', undefined, 't'))).toBe('bad_time_units')
  })

  it('accepts the standard, gregorian and proleptic_gregorian calendars only', () => {
    for (const cal of ['standard', 'gregorian', 'proleptic_gregorian', 'Gregorian', undefined]) {
      expect(iso(6, 'hours since 2031-03-04', cal)).toBe('2031-03-04T06:00:00Z')
    }
    for (const cal of ['360_day', 'noleap', '365_day', 'all_leap', 'julian', 'none']) {
      expect(codeOf(() => parseTimeUnits('hours since 2031-03-04', cal, 't'))).toBe('unsupported_calendar')
    }
    expect(codeOf(() => parseTimeUnits('days since 1500-01-01', 'standard', 't'))).toBe('unsupported_calendar')
  })

  it('refuses units it cannot read', () => {
    expect(codeOf(() => parseTimeUnits('months since 2031-01-01', undefined, 't'))).toBe('bad_time_units')
    expect(codeOf(() => parseTimeUnits('hours', undefined, 't'))).toBe('bad_time_units')
    expect(codeOf(() => parseTimeUnits('hours since yesterday', undefined, 't'))).toBe('bad_time_units')
    expect(codeOf(() => durationUnitMs('fortnights', 't'))).toBe('bad_time_units')
    expect(durationUnitMs('seconds', 't')).toBe(1000)
    expect(durationUnitMs('hours', 't')).toBe(3_600_000)
  })

  it('reads ISO 8601 times and prints them in UTC', () => {
    expect(formatIsoUtc(parseIsoTime('2031-03-04T06:00:00Z', 't'))).toBe('2031-03-04T06:00:00Z')
    expect(formatIsoUtc(parseIsoTime('2031-03-04T08:00:00+02:00', 't'))).toBe('2031-03-04T06:00:00Z')
    expect(formatIsoUtc(parseIsoTime('2031-03-04T06:00:00.250Z', 't'))).toBe('2031-03-04T06:00:00.250Z')
    expect(codeOf(() => parseIsoTime(20310304, 't'))).toBe('bad_time_units')
  })
})
