// Spectrum comparison helpers (shared/numerics/verify/spectrumAgreement.ts), on values worked out by hand
// and on a field whose spectrum is split exactly between two bands.
import { describe, expect, it } from 'vitest'
import { agreementLimit, bandPowerRatio, spectrumRatio } from '../../../shared/numerics/verify/spectrumAgreement'
import { radialSpectrum } from '../../../shared/numerics/verify/radialSpectrum'

describe('spectrum agreement', () => {
  it('divides ring by ring and leaves undefined rings undefined', () => {
    const r = spectrumRatio([2, 3, NaN, 4], [1, 0, 5, 8])
    expect(r[0]).toBe(2)
    expect(r[1]).toBeNaN()
    expect(r[2]).toBeNaN()
    expect(r[3]).toBe(0.5)
    expect(() => spectrumRatio([1], [1, 2])).toThrow(/1 and 2 rings/)
  })

  it('finds the last ring of an unbroken run within the factor, from the longest wave', () => {
    expect(agreementLimit([1, 1.5, 0.6, 3, 1], 2)).toBe(2)
    expect(agreementLimit([1, 1.9, 0.51, 0.5, 2], 2)).toBe(4) // the ends of [½, 2] count as agreeing
    expect(agreementLimit([2.5, 1, 1], 2)).toBe(-1)
    expect(agreementLimit([1, NaN, 1.2, 0.2], 2)).toBe(2) // undefined rings are skipped
    expect(agreementLimit([1, 1.4, 1.6], 1.5)).toBe(1)
    expect(() => agreementLimit([1], 1)).toThrow(/exceed 1/)
  })

  it('weights ring powers by their modes to share out variance by band', () => {
    // Hand-made: rings at k = 0.1, 0.2, 0.3 with 4, 8, 12 modes; band k > 0.15 holds rings 2 and 3.
    expect(bandPowerRatio([9, 2, 1], [1, 4, 2], [4, 8, 12], [0.1, 0.2, 0.3], 0.15)).toBeCloseTo((2 * 8 + 1 * 12) / (4 * 8 + 2 * 12), 15)
    expect(bandPowerRatio([1], [0], [4], [0.3], 0.1)).toBeNaN()
    // A field = long wave + short wave; dropping the short wave leaves none of the band above 0.25
    // cycles/cell and all of the band below (plane waves sit in single rings; no window, exact periods).
    const n = 32
    const long = Float64Array.from({ length: n * n }, (_, k) => Math.cos((2 * Math.PI * 2 * (k % n)) / n))
    const both = long.map((v, k) => v + 0.5 * Math.cos((2 * Math.PI * 12 * Math.floor(k / n)) / n))
    const opts = { window: 'none' as const }
    const s = radialSpectrum(both, n, n, opts), l = radialSpectrum(long, n, n, opts)
    expect(bandPowerRatio(l.power, s.power, s.modes, s.wavenumber, 0.25)).toBeCloseTo(0, 12)
    const low = (p: Float64Array) => Array.from(p, (v, r) => (s.wavenumber[r]! <= 0.25 ? v : 0))
    expect(bandPowerRatio(low(l.power), low(s.power), s.modes, s.wavenumber, 0)).toBeCloseTo(1, 12)
  })
})
