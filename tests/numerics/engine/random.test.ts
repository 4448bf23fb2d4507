import { describe, expect, it } from 'vitest'
import { readFileSync } from 'node:fs'
import { Xoshiro128 } from '../../../shared/numerics/random/xoshiro128'
import { fillStandardNormal } from '../../../shared/numerics/random/normal'

const fixture = JSON.parse(readFileSync(new URL('./fixtures/normal_cdf.json', import.meta.url), 'utf8')) as
  { edges: number[]; cdf: number[]; tail_r: number; tail_prob_two_sided: number }

describe('Xoshiro128', () => {
  it('is reproducible from the seed and the stream, and streams differ', () => {
    const a = new Xoshiro128(42), b = new Xoshiro128(42), c = new Xoshiro128(42, 1), d = new Xoshiro128(43)
    const xa = Array.from({ length: 5 }, () => a.nextUint32())
    expect(Array.from({ length: 5 }, () => b.nextUint32())).toEqual(xa)
    expect(Array.from({ length: 5 }, () => c.nextUint32())).not.toEqual(xa)
    expect(Array.from({ length: 5 }, () => d.nextUint32())).not.toEqual(xa)
    expect(() => new Xoshiro128(1.5)).toThrow(/safe integer/)
  })

  it('uniform doubles have mean 1/2 and variance 1/12', () => {
    const rng = new Xoshiro128(7), n = 200_000
    let s = 0, s2 = 0, outside = 0
    for (let k = 0; k < n; k++) { const u = rng.nextDouble(); if (!(u >= 0 && u < 1)) outside++; s += u; s2 += u * u }
    expect(outside).toBe(0)
    const mean = s / n, variance = s2 / n - mean * mean
    // Standard errors: √(1/12/n) ≈ 6.5e-4 for the mean; allow 5 of them.
    expect(Math.abs(mean - 0.5)).toBeLessThan(5 * Math.sqrt(1 / 12 / n))
    expect(Math.abs(variance - 1 / 12)).toBeLessThan(5 * Math.sqrt(1 / 180 / n))
  })

  it('32-bit outputs have balanced bits', () => {
    const rng = new Xoshiro128(2024), n = 50_000, counts = new Array<number>(32).fill(0)
    for (let k = 0; k < n; k++) { const u = rng.nextUint32(); for (let b = 0; b < 32; b++) counts[b]! += (u >>> b) & 1 }
    // Binomial(n, 1/2): sd = √n/2 ≈ 112; 5 sd per bit.
    for (const c of counts) expect(Math.abs(c - n / 2)).toBeLessThan(5 * Math.sqrt(n) / 2)
  })
})

describe('ziggurat standard normal', () => {
  const n = 400_000
  const x = fillStandardNormal(new Xoshiro128(12345), new Float64Array(n))

  it('is reproducible', () => {
    const y = fillStandardNormal(new Xoshiro128(12345), new Float64Array(1000))
    expect(Array.from(y)).toEqual(Array.from(x.subarray(0, 1000)))
  })

  it('moments: mean 0, variance 1, skewness 0, kurtosis 3', () => {
    let s = 0, s2 = 0, s3 = 0, s4 = 0
    for (const v of x) { s += v; s2 += v * v; s3 += v * v * v; s4 += v * v * v * v }
    // Standard errors of the sample moments of N(0,1): √(1/n), √(2/n), √(15/n), √(96/n).
    expect(Math.abs(s / n)).toBeLessThan(5 * Math.sqrt(1 / n))
    expect(Math.abs(s2 / n - 1)).toBeLessThan(5 * Math.sqrt(2 / n))
    expect(Math.abs(s3 / n)).toBeLessThan(5 * Math.sqrt(15 / n))
    expect(Math.abs(s4 / n - 3)).toBeLessThan(5 * Math.sqrt(96 / n))
  })

  it('bin frequencies match the normal CDF (chi-square, reference: scipy.stats.norm.cdf fixture)', () => {
    const { edges, cdf } = fixture
    const counts = new Array<number>(edges.length + 1).fill(0)
    for (const v of x) {
      let b = 0
      while (b < edges.length && v >= edges[b]!) b++
      counts[b]!++
    }
    let chi2 = 0
    for (let b = 0; b <= edges.length; b++) {
      const p = (b === edges.length ? 1 : cdf[b]!) - (b === 0 ? 0 : cdf[b - 1]!)
      chi2 += (counts[b]! - n * p) ** 2 / (n * p)
    }
    // 34 bins → 33 degrees of freedom; the 0.999 quantile of χ²(33) is 63.87 (scipy.stats.chi2.ppf).
    expect(chi2).toBeLessThan(63.87)
  })

  it('tail beyond the base layer r = 3.4426 has the right mass', () => {
    let tail = 0
    for (const v of x) if (Math.abs(v) > fixture.tail_r) tail++
    const p = fixture.tail_prob_two_sided
    expect(Math.abs(tail / n - p)).toBeLessThan(5 * Math.sqrt(p * (1 - p) / n))
  })
})
