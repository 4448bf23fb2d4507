// Formatting and defaults of the runs pages (pure helpers, no Vue).
import { describe, expect, it } from 'vitest'
import {
  defaultBlockFactor, formatBytes, formatDuration, formatForecastPeriod, formatIsoUtc, formatKm, formatLat, formatLon,
  formatSignificant, standardDeviation, summariseLeadTimes, TARGET_FINE_SPACING_KM,
} from '../../../composables/runs/display'
import { estimateSampleBytes } from '../../../shared/schemas/runs'

describe('defaultBlockFactor', () => {
  it('picks the factor whose fine spacing is nearest 2.5 km, by brute force over 2–16', () => {
    for (const spacing of [4, 7.3, 12, 18.8, 20.6, 27, 40, 55]) {
      const b = defaultBlockFactor(spacing)
      for (let other = 2; other <= 16; other++) {
        expect(Math.abs(spacing / b - TARGET_FINE_SPACING_KM)).toBeLessThanOrEqual(Math.abs(spacing / other - TARGET_FINE_SPACING_KM))
      }
    }
  })
  it('gives 2–3 km fine spacing for typical coarse grids and stays inside the allowed range', () => {
    // 20.6 km is about the demo grid's spacing (0.26° × 0.19° near 45° S); 8 gives 2.6 km.
    expect(defaultBlockFactor(20.6)).toBe(8)
    expect(20.6 / defaultBlockFactor(20.6)).toBeGreaterThanOrEqual(2)
    expect(defaultBlockFactor(1)).toBe(2)
    expect(defaultBlockFactor(500)).toBe(16)
    expect(defaultBlockFactor(Number.NaN)).toBe(4)
  })
})

describe('number formats', () => {
  it('rounds to significant digits', () => {
    expect(formatSignificant(1234.5678, 3)).toBe('1235')
    expect(formatSignificant(0.012345, 3)).toBe('0.0123')
    expect(formatSignificant(-1.5, 3)).toBe('-1.50')
    expect(formatSignificant(Number.NaN)).toBe('—')
  })
  it('formats km, bytes and durations', () => {
    expect(formatKm(2.575)).toBe('2.6 km')
    expect(formatKm(123.4)).toBe('123 km')
    expect(formatBytes(999)).toBe('999 B')
    expect(formatBytes(27_648)).toBe('27.6 kB')
    expect(formatBytes(1.5e9)).toBe('1.50 GB')
    expect(formatDuration(850)).toBe('850 ms')
    expect(formatDuration(65_000)).toBe('1 min 05 s')
    expect(formatDuration(3_720_000)).toBe('1 h 02 min')
    expect(formatDuration(null)).toBe('—')
  })
  it('writes times, periods and coordinates the way forecasters read them', () => {
    expect(formatIsoUtc('2031-11-14T06:00:00.000Z')).toBe('2031-11-14T06:00:00Z')
    expect(formatForecastPeriod(6)).toBe('T+6 h')
    expect(formatForecastPeriod(1.5)).toBe('T+1.5 h')
    expect(formatLon(-23.25, 2)).toBe('23.25°W')
    expect(formatLon(190)).toBe('170.0°W')
    expect(formatLat(-45)).toBe('45.0°S')
    expect(summariseLeadTimes(['a', 'b', 'c'], (s) => s.toUpperCase(), 2)).toBe('A … C (3 times)')
  })
  it('σ is the square root of the variance', () => {
    expect(standardDeviation(2.25)).toBe(1.5)
    expect(standardDeviation(-1)).toBeNaN()
  })
})

describe('storage estimate shown before a job', () => {
  it('is members × lead times × samples × fine cells × 2 bytes (int16)', () => {
    // The e2e run: 3 members, 2 lead times, 3 samples, 8×6 coarse, b = 4 → 32×24 fine cells.
    expect(estimateSampleBytes(3, 2, 3, 8, 6, 4)).toBe(3 * 2 * 3 * 32 * 24 * 2)
  })
})
