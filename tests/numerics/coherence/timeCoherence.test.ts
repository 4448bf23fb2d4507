import { describe, expect, it } from 'vitest'
import { createDownscaler, type DownscalerSpec } from '../../../shared/numerics/grf/downscaler'
import { coherentNoiseMatchingSpectrum, coherentSpectralNoise, coherentWhiteNoise, sideSplit } from '../../../shared/numerics/coherence/coherentNoise'
import { torusSide } from '../../../shared/numerics/grf/circulantEmbedding'
import { fitTimeScale } from '../../../shared/numerics/coherence/fitTimeScale'
import { isIsolatedLead, leadCorrelation, leadNoiseWeights } from '../../../shared/numerics/coherence/leadNoiseWeights'
import { sampleMember } from '../../../shared/numerics/pipeline/downscaleMember'
import { Xoshiro128 } from '../../../shared/numerics/random/xoshiro128'
import { fillStandardNormal } from '../../../shared/numerics/random/normal'

const mean = (a: number[]) => a.reduce((s, v) => s + v, 0) / a.length
const standardError = (a: number[]) => { const m = mean(a); return Math.sqrt(a.reduce((s, v) => s + (v - m) ** 2, 0) / (a.length - 1) / a.length) }

function correlation(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let ab = 0, aa = 0, bb = 0
  for (let k = 0; k < a.length; k++) { ab += a[k]! * b[k]!; aa += a[k]! ** 2; bb += b[k]! ** 2 }
  return ab / Math.sqrt(aa * bb)
}

describe('lead-time noise weights (Ornstein–Uhlenbeck sampled at the lead times)', () => {
  const hours = [0, 3, 9, 12, 24, 48]
  it('unit variance at every lead and corr = exp(−|ΔT|/τ) between any two leads, uneven spacing included (closed form)', () => {
    for (const tau of [4, 10, 60]) {
      const w = hours.map((_, t) => leadNoiseWeights(hours, t, tau, 0))
      for (const x of w) expect(x.weights.reduce((s, c) => s + c * c, 0)).toBeCloseTo(1, 14)
      for (let t = 0; t < hours.length; t++) for (let u = 0; u < t; u++) {
        let c = 0
        for (let s = 0; s <= u; s++) c += w[t]!.weights[s]! * w[u]!.weights[s]!
        expect(c).toBeCloseTo(Math.exp(-(hours[t]! - hours[u]!) / tau), 14)
        expect(leadCorrelation(hours[t]!, hours[u]!, tau)).toBeCloseTo(Math.exp(-(hours[t]! - hours[u]!) / tau), 15)
      }
    }
  })
  it('truncation drops old innovations and changes correlations by at most √(dropped weight) (Cauchy–Schwarz)', () => {
    const tau = 4, truncation = 1e-4
    const w5 = leadNoiseWeights(hours, 5, tau, truncation), w4 = leadNoiseWeights(hours, 4, tau, truncation)
    expect(w5.first).toBeGreaterThan(0)
    expect(w5.dropped).toBeLessThanOrEqual(truncation)
    let c = 0
    for (let s = Math.max(w5.first, w4.first); s <= 4; s++) c += w5.weights[s - w5.first]! * w4.weights[s - w4.first]!
    expect(Math.abs(c - Math.exp(-24 / tau))).toBeLessThanOrEqual(Math.sqrt(w5.dropped) + 1e-15)
    // Neighbouring leads: the same bound with the later lead's dropped weight.
    const w3 = leadNoiseWeights(hours, 3, tau, truncation)
    let near = 0
    for (let s = Math.max(w4.first, w3.first); s <= 3; s++) near += w4.weights[s - w4.first]! * w3.weights[s - w3.first]!
    expect(Math.abs(near - Math.exp(-12 / tau))).toBeLessThanOrEqual(Math.sqrt(w4.dropped) + 1e-15)
    expect(Math.sqrt(w4.dropped)).toBeLessThanOrEqual(Math.sqrt(truncation))
  })
  it('τ = 0 gives independent leads, τ = ∞ one shared noise', () => {
    expect(Array.from(leadNoiseWeights(hours, 3, 0).weights)).toEqual([1])
    expect(leadNoiseWeights(hours, 3, 0).first).toBe(3)
    const shared = leadNoiseWeights(hours, 3, Infinity, 0)
    expect(Array.from(shared.weights)).toEqual([1, 0, 0, 0])
  })
  it('a lead is isolated only when it uses its own innovation alone and the next lead has dropped it', () => {
    const h = [0, 6, 12]
    expect(isIsolatedLead(h, 1, 1.3)).toBe(true) // ρ² = e^{−12/1.3} ≈ 1e-4 below the truncation
    expect(isIsolatedLead(h, 1, 12)).toBe(false)
    expect(isIsolatedLead(h, 0, 12)).toBe(false) // lead 1 uses lead 0's noise
    expect(isIsolatedLead([0, 6], 1, 1.3)).toBe(false) // the next lead is unknown
    expect(isIsolatedLead([0, 6], 1, 1.3, undefined, true)).toBe(true)
  })
  it('rejects bad lead times', () => {
    expect(() => leadNoiseWeights([0, 6, 6], 2, 5)).toThrow(/increasing/)
    expect(() => leadNoiseWeights([0, 6], 2, 5)).toThrow(/outside/)
  })
})

describe('coherent white noise', () => {
  it('splits the padding: ⌈P/2⌉ cells to the right of the window, ⌊P/2⌋ to the left', () => {
    expect(sideSplit(8, 5)).toEqual({ right: 7, left: 1 })
    expect(sideSplit(64, 20)).toEqual({ right: 42, left: 22 })
  })

  it('tori of different sizes share the noise of every cell both contain (by signed coordinate)', () => {
    const noise = coherentWhiteNoise({ noiseSeed: 12, leadHours: [0, 6, 12], leadIndex: 2, timeScaleHours: 9 })
    const wx = 16, wy = 12
    const sizes = [[24, 20], [32, 32]] as const
    const planes = sizes.map(([tx, ty]) => { const re = new Float64Array(tx * ty), im = new Float64Array(tx * ty); noise(3, re, im, tx, ty, wx, wy); return { re, im, tx, ty } })
    const signed = (i: number, n: number, w: number) => (i < w + Math.ceil((n - w) / 2) ? i : i - n)
    let compared = 0
    const [a, b] = planes as [typeof planes[0], typeof planes[0]]
    for (let j = 0; j < a.ty; j++) for (let i = 0; i < a.tx; i++) {
      const si = signed(i, a.tx, wx), sj = signed(j, a.ty, wy)
      const bi = si < 0 ? si + b.tx : si, bj = sj < 0 ? sj + b.ty : sj
      if (si >= wx + Math.ceil((b.tx - wx) / 2) || sj >= wy + Math.ceil((b.ty - wy) / 2)) continue
      expect(b.re[bj * b.tx + bi]).toBe(a.re[j * a.tx + i])
      expect(b.im[bj * b.tx + bi]).toBe(a.im[j * a.tx + i])
      compared++
    }
    expect(compared).toBe(24 * 20)
  })

  it('unit-variance white noise, lag correlation ρ between leads (sampling theory: se (1 − ρ²)/√n)', () => {
    const hours = [0, 6], tau = 10, rho = Math.exp(-6 / tau)
    const n = 128 * 128
    const at = (t: number) => { const re = new Float64Array(n), im = new Float64Array(n); coherentWhiteNoise({ noiseSeed: 3, leadHours: hours, leadIndex: t, timeScaleHours: tau })(0, re, im, 128, 128, 64, 64); return { re, im } }
    const l0 = at(0), l1 = at(1)
    const variance = l1.re.reduce((s, v) => s + v * v, 0) / n
    expect(Math.abs(variance - 1)).toBeLessThan(4 * Math.SQRT2 / Math.sqrt(n))
    expect(Math.abs(correlation(l0.re, l1.re) - rho)).toBeLessThan(4 * (1 - rho * rho) / Math.sqrt(n))
    expect(Math.abs(correlation(l0.im, l1.im) - rho)).toBeLessThan(4 * (1 - rho * rho) / Math.sqrt(n))
    // Real and imaginary planes (two different samples) are independent.
    expect(Math.abs(correlation(l0.re, l1.im))).toBeLessThan(4 / Math.sqrt(n))
  })
})

describe('time-coherent conditional samples', () => {
  const nx = 12, ny = 10, factor = 3
  const field = (phase: number) => Float64Array.from({ length: nx * ny }, (_, k) => Math.sin(0.5 * (k % nx) + phase) + 0.7 * Math.cos(0.8 * Math.floor(k / nx) - phase))
  const spec = (phase: number, lengthScale = 4): DownscalerSpec => ({ coarse: field(phase), nx, ny, factor, kernel: { kernel: 'matern32', lengthScale, variance: 1 }, mean: 0 })
  const hours = [0, 6], tau = 12, rho = Math.exp(-6 / tau)
  const S = 24

  function lagCorrelations(d0: ReturnType<typeof createDownscaler>, d1: ReturnType<typeof createDownscaler>, s0: Float64Array[], s1: Float64Array[]): number[] {
    const m0 = d0.mean(), m1 = d1.mean()
    return s0.map((a, s) => correlation(a.map((v, k) => v - m0[k]!), s1[s]!.map((v, k) => v - m1[k]!)))
  }

  it('residuals from the conditional mean have the lag-1 correlation that was set (mean of 24 samples within 4 se)', () => {
    const d0 = createDownscaler(spec(0)), d1 = createDownscaler(spec(0.9))
    const noise = (t: number) => coherentWhiteNoise({ noiseSeed: 21, leadHours: hours, leadIndex: t, timeScaleHours: tau })
    const r = lagCorrelations(d0, d1, d0.samplesFromNoise(S, noise(0)), d1.samplesFromNoise(S, noise(1)))
    // Same kernel at both leads: residual = P u with the same projector P, so corr = ρ exactly per pixel.
    expect(standardError(r)).toBeLessThan(0.05)
    expect(Math.abs(mean(r) - rho)).toBeLessThan(4 * standardError(r))
  })

  it('independent seeds (coherence off) give no lag correlation: the check can fail', () => {
    const d0 = createDownscaler(spec(0)), d1 = createDownscaler(spec(0.9))
    const r = lagCorrelations(d0, d1, d0.samples(S, 5), d1.samples(S, 6))
    expect(Math.abs(mean(r))).toBeLessThan(4 * standardError(r))
    expect(Math.abs(mean(r) - rho)).toBeGreaterThan(0.3)
  })

  it('a lead with a different fitted length scale (and torus) keeps most of the correlation', () => {
    const d0 = createDownscaler(spec(0, 3)), d1 = createDownscaler(spec(0.9, 10))
    expect(d1.diagnostics.torus).not.toEqual(d0.diagnostics.torus)
    const noise = (t: number) => coherentWhiteNoise({ noiseSeed: 21, leadHours: hours, leadIndex: t, timeScaleHours: tau })
    const r = lagCorrelations(d0, d1, d0.samplesFromNoise(S, noise(0)), d1.samplesFromNoise(S, noise(1)))
    // Not exact any more (different square-root kernels); measured ≈ 0.9 ρ. Without signed-coordinate keys the
    // noise would not line up across the two tori at all.
    expect(mean(r)).toBeGreaterThan(0.8 * rho)
    expect(mean(r)).toBeLessThan(rho + 4 * standardError(r))
  })

  it('downscaleMember: the coherent path is reproducible per lead and reports its settings', () => {
    const input = { coarse: field(0.3), nx, ny, factor, kernel: 'matern32' as const, samples: 3, seed: 1, spacingKm: 3 }
    const tc = (t: number) => ({ leadIndex: t, leadHours: [0, 6, 12], timeScaleHours: tau, noiseSeed: 77 })
    const a = sampleMember({ ...input, timeCoherence: tc(1) }), b = sampleMember({ ...input, timeCoherence: tc(1) })
    expect(a.samples[2]).toEqual(b.samples[2])
    expect(a.diagnostics.timeCoherence).toMatchObject({ leadIndex: 1, correlationWithPreviousLead: expect.closeTo(rho, 12), innovations: 2 })
    expect(a.blockMeanError).toBeLessThan(1e-12)
    // τ short against the spacing: the lead shares nothing with the others and takes the seeded draw.
    const isolated = sampleMember({ ...input, timeCoherence: { ...tc(1), timeScaleHours: 1 } })
    expect(isolated.diagnostics.timeCoherence).toMatchObject({ isolated: true, innovations: 1 })
    expect(isolated.samples[0]).not.toEqual(a.samples[0])
  })
})

describe('time-coherent noise drawn in the spectrum of a reference torus', () => {
  const hours = [0, 6, 12], tau = 12, rho = Math.exp(-6 / tau)
  const spectral = (t: number, noiseSeed = 21) => coherentSpectralNoise({ noiseSeed, leadHours: hours, leadIndex: t, timeScaleHours: tau })
  const nx = 16, ny = 16, factor = 4 // fine 64 × 64; reference torus 128 × 128
  const reference: [number, number] = [torusSide(64, Infinity, factor), torusSide(64, Infinity, factor)]
  const field = (phase: number) => Float64Array.from({ length: nx * ny }, (_, k) => Math.sin(0.5 * (k % nx) + phase) + 0.7 * Math.cos(0.8 * Math.floor(k / nx) - phase))
  const spec = (phase: number, lengthScale: number): DownscalerSpec => ({ coarse: field(phase), nx, ny, factor, kernel: { kernel: 'matern32', lengthScale, variance: 1 }, mean: 0 })
  const residualCorrelations = (d0: ReturnType<typeof createDownscaler>, d1: ReturnType<typeof createDownscaler>, s0: Float64Array[], s1: Float64Array[]) => {
    const m0 = d0.mean(), m1 = d1.mean()
    return s0.map((a, k) => correlation(a.map((v, i) => v - m0[i]!), s1[k]!.map((v, i) => v - m1[i]!)))
  }

  it('unit variance per mode, lag correlation ρ between leads, nothing shared between torus sizes (sampling theory)', () => {
    const n = 128 * 128
    const at = (t: number, side = 128) => { const re = new Float64Array(side * side), im = new Float64Array(side * side); spectral(t)(0, re, im, side, side); return { re, im } }
    const l0 = at(0), l1 = at(1)
    const variance = l1.re.reduce((s, v) => s + v * v, 0) / n
    expect(Math.abs(variance - 1)).toBeLessThan(4 * Math.SQRT2 / Math.sqrt(n))
    expect(Math.abs(correlation(l0.re, l1.re) - rho)).toBeLessThan(4 * (1 - rho * rho) / Math.sqrt(n))
    expect(Math.abs(correlation(l0.im, l1.im) - rho)).toBeLessThan(4 * (1 - rho * rho) / Math.sqrt(n))
    expect(Math.abs(correlation(l0.re, l1.im))).toBeLessThan(4 / Math.sqrt(n))
    const other = at(1, 64)
    expect(Math.abs(correlation(l0.re.subarray(0, 64 * 64), other.re))).toBeLessThan(4 / 64)
  })

  it('on the reference torus, the matching spatial noise gives exactly the spectral draw (w = √M·IFFT(ξ))', () => {
    const d = createDownscaler(spec(0, 3))
    expect(d.diagnostics.torus).toEqual(reference)
    const tc = { noiseSeed: 21, leadHours: hours, leadIndex: 1, timeScaleHours: tau }
    const a = d.samplesFromSpectralNoise(4, coherentSpectralNoise(tc)), b = d.samplesFromNoise(4, coherentNoiseMatchingSpectrum(tc, reference))
    for (let k = 0; k < 4; k++) for (let i = 0; i < a[k]!.length; i += 37) expect(b[k]![i]).toBeCloseTo(a[k]![i]!, 10)
  })

  it('residuals have the lag-1 correlation that was set; a lead on a doubled torus still shares most of it', () => {
    const S = 24
    const d0 = createDownscaler(spec(0, 3)), d1 = createDownscaler(spec(0.9, 3)), dLong = createDownscaler(spec(0.9, 20))
    expect(dLong.diagnostics.torus).not.toEqual(reference) // enlarged by the positive-definiteness check
    const s0 = d0.samplesFromSpectralNoise(S, spectral(0))
    const same = residualCorrelations(d0, d1, s0, d1.samplesFromSpectralNoise(S, spectral(1)))
    expect(standardError(same)).toBeLessThan(0.05)
    expect(Math.abs(mean(same) - rho)).toBeLessThan(4 * standardError(same))
    const matching = coherentNoiseMatchingSpectrum({ noiseSeed: 21, leadHours: hours, leadIndex: 1, timeScaleHours: tau }, reference)
    const doubled = residualCorrelations(d0, dLong, s0, dLong.samplesFromNoise(S, matching))
    // Different square-root kernels: not exact, as with two tori of the spatial streams (≈ 0.9 ρ there).
    expect(mean(doubled)).toBeGreaterThan(0.7 * rho)
    expect(mean(doubled)).toBeLessThan(rho + 4 * standardError(doubled))
  })

  it('the pipeline draws in the spectrum on the reference torus and keeps the spatial streams with regimes on', () => {
    const rng = new Xoshiro128(5)
    const rough = new Float64Array(nx * ny)
    fillStandardNormal(rng, rough) // short correlation: the fitted ℓ keeps the reference torus
    const input = { coarse: rough, nx, ny, factor, kernel: 'matern32' as const, samples: 3, seed: 1, spacingKm: 3 }
    const tc = { leadIndex: 1, leadHours: hours, timeScaleHours: tau, noiseSeed: 77 }
    const out = sampleMember({ ...input, timeCoherence: tc })
    const torus = (out.diagnostics as { torus: number[] }).torus
    expect(out.diagnostics.timeCoherence).toMatchObject({ noise: torus[0] === reference[0] && torus[1] === reference[1] ? 'spectral' : 'spatial, matching the spectrum', innovations: 2 })
    expect(torus).toEqual(reference)
    expect(out.blockMeanError).toBeLessThan(1e-12)
    const windows = sampleMember({ ...input, regimes: 'windows', timeCoherence: tc })
    expect(windows.diagnostics.timeCoherence).toMatchObject({ noise: 'spatial' })
  })
})

describe('time scale from the coarse members', () => {
  it('recovers τ of synthetic AR(1) anomalies with uneven lead spacing (within 10 %)', () => {
    const hours = [0, 6, 12, 18, 30], tau = 15, members = 10, cells = 500
    const rng = new Xoshiro128(8)
    const fields: Float64Array[][] = hours.map(() => [])
    const state = Array.from({ length: members }, () => fillStandardNormal(rng, new Float64Array(cells)))
    for (let t = 0; t < hours.length; t++) {
      const rho = t === 0 ? 0 : Math.exp(-(hours[t]! - hours[t - 1]!) / tau)
      for (let m = 0; m < members; m++) {
        const eps = fillStandardNormal(rng, new Float64Array(cells))
        state[m] = state[m]!.map((v, k) => rho * v + Math.sqrt(1 - rho * rho) * eps[k]!)
        // A lead-dependent ensemble mean, which the anomalies remove.
        fields[t]!.push(state[m]!.map((v, k) => 10 + 0.5 * t + Math.sin(k + t) + 2 * v))
      }
    }
    const fit = fitTimeScale(fields, hours)
    expect(fit.fallback).toBe(false)
    expect(fit.pairs).toHaveLength(4)
    // Pooled over 5000 pairs each, a lag correlation has se ≈ (1 − r²)/√5000 ≈ 0.01: τ̂ within a few %.
    expect(Math.abs(fit.timeScaleHours - tau) / tau).toBeLessThan(0.1)
    expect(fit.pairs[3]!.correlation).toBeCloseTo(Math.exp(-12 / tau), 1)
  })
  it('falls back to the set value when there is nothing to fit', () => {
    const one = fitTimeScale([[new Float64Array([1, 2]), new Float64Array([2, 3])]], [6], 9)
    expect(one).toMatchObject({ timeScaleHours: 9, fallback: true })
  })
})
