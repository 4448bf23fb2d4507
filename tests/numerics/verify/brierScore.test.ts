import { describe, expect, it } from 'vitest'
import { brierScore } from '../../../shared/numerics/verify/brierScore'
import { exceedanceProbability } from '../../../shared/numerics/ensemble/exceedance'
import { uniformSource } from './testRandom'

describe('Brier score', () => {
  it('climatology with base rate 0.2 forecasting 0.2 scores 0.2·0.8² + 0.8·0.2² = 0.16 (reliability 0, resolution 0)', () => {
    const outcome = Float64Array.from({ length: 100 }, (_, k) => (k % 5 === 0 ? 1 : 0))
    const r = brierScore(new Float64Array(100).fill(0.2), outcome)
    expect(r.score).toBeCloseTo(0.16, 15)
    expect(r.uncertainty).toBeCloseTo(0.16, 15)
    expect(r.reliability).toBeCloseTo(0, 15)
    expect(r.resolution).toBeCloseTo(0, 15)
  })

  it('a perfect 0/1 forecast scores 0 with resolution = uncertainty', () => {
    const o = Float64Array.of(0, 1, 1, 0, 0)
    const r = brierScore(o, o)
    expect(r.score).toBe(0)
    expect(r.resolution).toBeCloseTo(r.uncertainty, 15)
  })

  it('reliability − resolution + uncertainty = score to rounding for ensemble probabilities k/N (Murphy 1973)', () => {
    const u = uniformSource(17)
    for (const n of [1, 3, 10, 51]) {
      const cells = 997
      const members = Array.from({ length: n }, () => Float64Array.from({ length: cells }, u))
      const truth = Float64Array.from({ length: cells }, u)
      const p = exceedanceProbability({ nx: cells, ny: 1, members }, 0.7, 'above')
      const o = truth.map((v) => (v >= 0.7 ? 1 : 0))
      const r = brierScore(p, o)
      // Exact in real arithmetic; a few ulps of terms of order 0.1–1 in floating point.
      expect(Math.abs(r.reliability - r.resolution + r.uncertainty - r.score)).toBeLessThan(1e-14)
      expect(r.bins.length).toBeLessThanOrEqual(n + 1)
      expect(r.bins.reduce((s, b) => s + b.count, 0)).toBe(cells)
      let direct = 0
      for (let k = 0; k < cells; k++) direct += (p[k]! - o[k]!) ** 2
      expect(r.score).toBeCloseTo(direct / cells, 15)
    }
  })

  it('rejects probabilities outside [0, 1] and non-binary outcomes', () => {
    expect(() => brierScore(Float64Array.of(1.2), Float64Array.of(1))).toThrow(/outside/)
    expect(() => brierScore(Float64Array.of(0.5), Float64Array.of(0.5))).toThrow(/0 or 1/)
  })
})
