import { describe, expect, it } from 'vitest'
import { fft2d } from '../../../shared/numerics/fft/fft2d'
import { periodogram, signedIndex } from '../../../shared/numerics/verify/periodogram'
import { radialSpectrum, ringIndex } from '../../../shared/numerics/verify/radialSpectrum'
import { spectralSlope } from '../../../shared/numerics/verify/spectralSlope'
import { randomField } from './testRandom'

/**
 * Real field with amplitude exactly |k|^(−β/2) and random phases: the phases of the DFT of seeded
 * white noise (Hermitian, so the inverse transform is real), the amplitudes replaced.
 */
function powerLawField(nx: number, ny: number, beta: number, seed: number): Float64Array {
  const re = randomField(nx * ny, seed), im = new Float64Array(nx * ny)
  fft2d(re, im, nx, ny)
  for (let q = 0; q < ny; q++) for (let p = 0; p < nx; p++) {
    const k = Math.hypot(signedIndex(p, nx) / nx, signedIndex(q, ny) / ny)
    const c = q * nx + p
    const a = k === 0 ? 0 : k ** (-beta / 2) / Math.hypot(re[c]!, im[c]!)
    re[c]! *= a; im[c]! *= a
  }
  fft2d(re, im, nx, ny, true)
  return re
}

function variance(x: Float64Array): number {
  const m = x.reduce((a, b) => a + b, 0) / x.length
  return x.reduce((a, b) => a + (b - m) ** 2, 0) / x.length
}

describe('periodogram', () => {
  it('Parseval: Σ S·Δkx·Δky = variance exactly without a window, any grid size', () => {
    for (const [nx, ny] of [[16, 16], [12, 7], [30, 45]] as const) {
      const x = randomField(nx * ny, nx + ny, 3)
      const s = periodogram(x, nx, ny, { window: 'none' })
      expect(s.reduce((a, b) => a + b, 0) / (nx * ny)).toBeCloseTo(variance(x), 12)
    }
  })

  it('with the Hann window the total is normalised by mean(w²), so white noise keeps its variance on average', () => {
    const x = randomField(64 * 64, 5, 2)
    const s = periodogram(x, 64, 64, { window: 'hann' })
    expect(s.reduce((a, b) => a + b, 0) / (64 * 64) / variance(x)).toBeCloseTo(1, 1)
  })

  it('a single cosine puts all its power at ±k₀ (window none)', () => {
    const nx = 32, ny = 24
    const x = new Float64Array(nx * ny)
    for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) x[j * nx + i] = Math.cos(2 * Math.PI * (3 * i / nx + 2 * j / ny))
    const s = periodogram(x, nx, ny, { window: 'none' })
    // ½ variance at each of (3, 2) and (−3, −2): S = ½·nx·ny·... → Σ S/(nx ny) = ½ over the two modes.
    expect(s[2 * nx + 3]! / (nx * ny)).toBeCloseTo(0.25, 12)
    expect(s[(ny - 2) * nx + nx - 3]! / (nx * ny)).toBeCloseTo(0.25, 12)
  })
})

describe('radially averaged spectrum', () => {
  it('ring boundaries: (r − ½)Δk ≤ |k| < (r + ½)Δk, exact ties going outwards', () => {
    // 24×18: Δk = 1/18; mode (2, 0) has |k|/Δk = 2·18/24 = 1.5 exactly, (1, 0) 0.75, (0, 1) 1.
    expect(ringIndex(2, 0, 24, 18)).toBe(2)
    expect(ringIndex(-2, 0, 24, 18)).toBe(2)
    expect(ringIndex(1, 0, 24, 18)).toBe(1)
    expect(ringIndex(0, 1, 24, 18)).toBe(1)
    // 20×10: a = p·10/20, b = q; (p, q) = (3, 0) → 1.5 → ring 2; (1, 1) → √1.25 ≈ 1.118 → ring 1.
    expect(ringIndex(3, 0, 20, 10)).toBe(2)
    expect(ringIndex(1, 1, 20, 10)).toBe(1)
    // Square grids: |k|/Δk = √(p² + q²) never hits a half-integer.
    expect(ringIndex(3, 4, 64, 64)).toBe(5)
  })

  it('ring sums plus the left-out modes account for the whole periodogram', () => {
    const nx = 40, ny = 28
    const x = randomField(nx * ny, 2)
    const s = periodogram(x, nx, ny, { window: 'none' })
    const r = radialSpectrum(x, nx, ny, { window: 'none' })
    let inRings = 0
    r.power.forEach((p, k) => { if (r.modes[k]! > 0) inRings += p * r.modes[k]! })
    let leftOut = 0
    for (let q = 0; q < ny; q++) for (let p = 0; p < nx; p++) {
      const ring = ringIndex(signedIndex(p, nx), signedIndex(q, ny), nx, ny)
      if (ring < 1 || ring > Math.floor(Math.min(nx, ny) / 2)) leftOut += s[q * nx + p]!
    }
    expect(inRings + leftOut).toBeCloseTo(s.reduce((a, b) => a + b, 0), 9)
    expect(r.wavenumber[r.wavenumber.length - 1]).toBeCloseTo(0.5, 15)
  })

  // Amplitudes are exact by construction, so without a window the estimate is deterministic.
  for (const [nx, ny] of [[128, 128], [96, 80]] as const) {
    it(`recovers a power-law slope −β within 0.1 without a window (${nx}×${ny})`, () => {
      for (const beta of [2, 3, 11 / 3]) {
        const x = powerLawField(nx, ny, beta, nx + ny)
        const fit = spectralSlope(radialSpectrum(x, nx, ny, { window: 'none' }), 2 / Math.min(nx, ny), 0.35)
        expect(Math.abs(fit.slope + beta)).toBeLessThan(0.1)
      }
    })
  }

  it('recovers the slope within 0.1 with the Hann window, from the mean spectrum of 8 seeded fields (128×96)', () => {
    // The window mixes neighbouring modes of random phase, so a single field's slope scatters by
    // ~0.1 (measured); the mean of 8 spectra cuts that by √8.
    const nx = 128, ny = 96
    for (const beta of [2, 3, 11 / 3]) {
      const spectra = Array.from({ length: 8 }, (_, s) => radialSpectrum(powerLawField(nx, ny, beta, 1000 + s), nx, ny, { window: 'hann' }))
      const power = spectra[0]!.power.map((_, k) => spectra.reduce((a, r) => a + r.power[k]!, 0) / spectra.length)
      const fit = spectralSlope({ ...spectra[0]!, power }, 2 / ny, 0.35)
      expect(Math.abs(fit.slope + beta)).toBeLessThan(0.1)
    }
  })

  it('reports per-km wavenumbers and power when the spacing is given', () => {
    const x = randomField(32 * 32, 9)
    const a = radialSpectrum(x, 32, 32)
    const b = radialSpectrum(x, 32, 32, { spacing: 2.5 })
    expect(b.wavenumberPerKm![0]).toBeCloseTo(a.wavenumber[0]! / 2.5, 15)
    expect(b.powerKm![3]).toBeCloseTo(a.power[3]! * 6.25, 12)
    expect(() => radialSpectrum(x, 32, 32, { spacing: 0 })).toThrow(/spacing/)
  })
})

describe('spectral slope', () => {
  it('fits an exact power law exactly and ignores rings outside the band', () => {
    const wavenumber = Float64Array.from({ length: 20 }, (_, k) => (k + 1) / 40)
    const power = wavenumber.map((k) => 7 * k ** -2.5)
    power[19] = 1e9
    const fit = spectralSlope({ wavenumber, power }, 0, 0.48)
    expect(fit.slope).toBeCloseTo(-2.5, 12)
    expect(fit.intercept).toBeCloseTo(Math.log10(7), 12)
    expect(fit.rings).toBe(19)
  })
})
