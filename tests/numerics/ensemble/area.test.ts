import { describe, expect, it } from 'vitest'
import { areaMask } from '#shared/numerics/ensemble/areaMask'
import { areaCrossing, areaProducts } from '#shared/numerics/ensemble/areaProducts'
import { areaSamples } from '#shared/numerics/ensemble/areaSamples'
import { normalGenerator, randomStack, uniformGenerator } from './seededRandom'

/** Standard normal CDF by Simpson's rule on the density (accurate to ~1e-12 here). */
function normalCdf(x: number): number {
  const steps = 2000
  const h = x / steps
  const f = (t: number) => Math.exp(-t * t / 2) / Math.sqrt(2 * Math.PI)
  let s = f(0) + f(x)
  for (let i = 1; i < steps; i++) s += (i % 2 ? 4 : 2) * f(i * h)
  return 0.5 + (s * h) / 3
}

/** n joint samples of two standard normal pixels with correlation ρ, as a 2 × 1 grid stack. */
function correlatedPair(rho: number, n: number, seed: number) {
  const z = normalGenerator(seed)
  const members = Array.from({ length: n }, () => {
    const a = z()
    const b = rho * a + Math.sqrt(1 - rho * rho) * z()
    return Float64Array.of(a, b)
  })
  return { nx: 2, ny: 1, members }
}

describe('area probabilities from joint samples', () => {
  const n = 40_000
  const mask = areaMask([1, 1], 2, 1)

  for (const rho of [-0.8, 0, 0.5, 0.95]) {
    it(`ρ = ${rho}: P(max > 0) = 3/4 − arcsin(ρ)/(2π) (bivariate-normal orthant probability, Sheppard 1899) within 4σ of sampling`, () => {
      const stack = correlatedPair(rho, n, 1000 + Math.round(rho * 100))
      const p = 0.75 - Math.asin(rho) / (2 * Math.PI)
      const tol = 4 * Math.sqrt(p * (1 - p) / n)
      const products = areaProducts(stack, mask, 0, 'above')
      expect(Math.abs(products.anywhere - p)).toBeLessThan(tol)
      // By symmetry of the standard normal, P(min ≤ 0) is the same number.
      expect(Math.abs(areaProducts(stack, mask, 0, 'below').anywhere - p)).toBeLessThan(tol)
      // The mean of two centred normals is symmetric about 0: P(mean ≥ 0) = 1/2; E[fraction ≥ 0] = 1/2.
      expect(Math.abs(products.areaMean - 0.5)).toBeLessThan(4 * Math.sqrt(0.25 / n))
      expect(Math.abs(products.fractionExpected - 0.5)).toBeLessThan(4 * Math.sqrt(0.25 / n))
    })
  }

  it('median of the area maximum of two independent normals: Φ(q)² = 1/2 (CDF of a maximum), within sampling error', () => {
    const products = areaProducts(correlatedPair(0, n, 77), mask, 0, 'above', { percents: [50] })
    const q = products.maxPercentiles[0]!
    expect(Math.abs(normalCdf(q) ** 2 - 0.5)).toBeLessThan(4 * Math.sqrt(0.25 / n))
    // Minimum: P(min ≤ q) = 1 − (1 − Φ(q))² = 1/2.
    expect(Math.abs(1 - (1 - normalCdf(products.minPercentiles[0]!)) ** 2 - 0.5)).toBeLessThan(4 * Math.sqrt(0.25 / n))
  })

  it('uses joint samples, not marginals: perfectly correlated vs independent pixels give different P(anywhere) with the same marginals', () => {
    const joint = areaProducts(correlatedPair(1, 4000, 3), mask, 0, 'above')
    const indep = areaProducts(correlatedPair(0, 4000, 3), mask, 0, 'above')
    expect(Math.abs(joint.anywhere - 0.5)).toBeLessThan(0.04)
    expect(Math.abs(indep.anywhere - 0.75)).toBeLessThan(0.04)
  })

  it('matches a brute-force computation with fractional weights, for one lead time and a time window', () => {
    const nx = 6
    const ny = 5
    const u = uniformGenerator(9)
    const weights = Array.from({ length: nx * ny }, () => { const r = u(); return r < 0.4 ? 0 : r < 0.7 ? 1 : Math.round(r * 100) / 100 })
    const m = areaMask(weights, nx, ny)
    const leads = [randomStack(21, nx, ny, 15), randomStack(22, nx, ny, 15), randomStack(23, nx, ny, 15)]
    const inArea = weights.map((w, k) => [w, k] as const).filter(([w]) => w > 0)
    const W = inArea.reduce((s, [w]) => s + w, 0)
    for (const d of ['above', 'below'] as const) for (const t of [4, 5.3, 7]) {
      const hit = (x: number) => (d === 'above' ? x >= t : x <= t)
      for (const window of [leads.slice(0, 1), leads]) {
        let anywhere = 0
        let mean = 0
        let fraction = 0
        for (let s = 0; s < 15; s++) {
          if (window.some((st) => inArea.some(([, k]) => hit(st.members[s]![k]!)))) anywhere++
          if (window.some((st) => hit(inArea.reduce((a, [w, k]) => a + w * st.members[s]![k]!, 0) / W))) mean++
          fraction += inArea.reduce((a, [w, k]) => a + (window.some((st) => hit(st.members[s]![k]!)) ? w : 0), 0) / W
        }
        const got = areaProducts(window.length === 1 ? window[0]! : window, m, t, d)
        expect(got.anywhere).toBe(anywhere / 15)
        expect(got.areaMean).toBe(mean / 15)
        expect(Math.abs(got.fractionExpected - fraction / 15)).toBeLessThan(1e-12)
      }
    }
    // Area maxima over the cells with weight > 0, one per sample.
    const s0 = areaSamples(leads[0]!, m)
    expect(s0.max[3]).toBe(Math.max(...inArea.map(([, k]) => leads[0]!.members[3]![k]!)))
    expect(areaCrossing(s0, Infinity, 'above').anywhere).toBe(0)
  })

  it('rejects bad masks', () => {
    expect(() => areaMask([0, 0], 2, 1)).toThrow('covers no grid cell')
    expect(() => areaMask([0, 2], 2, 1)).toThrow('column 1, row 0')
    expect(() => areaMask([0, NaN], 2, 1)).toThrow('[0, 1]')
    expect(() => areaMask([1], 2, 1)).toThrow('expected nx·ny = 2')
    expect(() => areaSamples({ nx: 1, ny: 2, members: [new Float64Array(2)] }, areaMask([1, 1], 2, 1))).toThrow('grid is 1×2')
  })
})
