import { describe, expect, it } from 'vitest'
import {
  briefingWhenText, briefingWindowBounds, formatBriefingLocal, formatBriefingTimePair, formatBriefingUtc, parseUtcOffset, utcOffsetText,
} from '../../../shared/utils/briefingTimes'

const instant = { leadTimes: ['2031-11-14T06:00:00Z', '2031-11-14T12:00:00Z', '2031-11-14T18:00:00Z', '2031-11-15T00:00:00Z'], cellMethods: null, forecastPeriodsHours: [6, 12, 18, 24] }
const gusts = { ...instant, cellMethods: 'time: maximum' }
const local = { name: 'Serevan Coast time', offsetMinutes: -120 }

describe('briefing times', () => {
  it('prints offsets with a true minus sign and parses them back', () => {
    expect(utcOffsetText(-120)).toBe('UTC−02:00')
    expect(utcOffsetText(330)).toBe('UTC+05:30')
    expect(utcOffsetText(0)).toBe('UTC+00:00')
    expect(parseUtcOffset('-02:00')).toBe(-120)
    expect(parseUtcOffset('−2')).toBe(-120)
    expect(parseUtcOffset('+5:30')).toBe(330)
    expect(parseUtcOffset('15:00')).toBeNull()
    expect(parseUtcOffset('2:75')).toBeNull()
  })

  it('prints UTC and local time; local time may fall on the previous day', () => {
    expect(formatBriefingUtc('2031-11-14T01:00:00Z')).toBe('14 Nov 2031 01:00 UTC')
    expect(formatBriefingLocal('2031-11-14T01:00:00Z', local)).toBe('13 Nov 2031 23:00 Serevan Coast time (UTC−02:00)')
    expect(formatBriefingTimePair('2031-11-14T12:00:00Z', local)).toBe('14 Nov 2031 12:00 UTC (14 Nov 2031 10:00 Serevan Coast time, UTC−02:00)')
    expect(formatBriefingTimePair('2031-11-14T12:00:00Z', { name: 'UTC', offsetMinutes: 0 })).toBe('14 Nov 2031 12:00 UTC')
  })

  it('starts the window of a period quantity one period before its first valid time', () => {
    expect(briefingWindowBounds(instant, 1, 2).start.toISOString()).toBe('2031-11-14T12:00:00.000Z')
    expect(briefingWindowBounds(gusts, 1, 2).start.toISOString()).toBe('2031-11-14T06:00:00.000Z')
    expect(briefingWindowBounds(gusts, 0, 0).start.toISOString()).toBe('2031-11-14T00:00:00.000Z')
    expect(() => briefingWindowBounds(instant, 2, 1)).toThrow()
    expect(() => briefingWindowBounds(instant, 0, 4)).toThrow()
  })

  it('says exactly which times a statement covers', () => {
    expect(briefingWhenText(instant, 1, 1)).toBe('at 12 UTC 14 Nov 2031')
    expect(briefingWhenText(instant, 0, 1)).toBe('at one or both of the valid times 06 UTC and 12 UTC 14 Nov 2031')
    expect(briefingWhenText(instant, 0, 3)).toBe('at one or more of the 4 valid times from 06 UTC 14 Nov to 00 UTC 15 Nov 2031')
    expect(briefingWhenText(gusts, 1, 1)).toBe('in the period 06–12 UTC 14 Nov 2031')
    expect(briefingWhenText(gusts, 0, 1)).toBe('in one or more of the 2 periods of 6 hours between 00 UTC and 12 UTC 14 Nov 2031')
  })
})
