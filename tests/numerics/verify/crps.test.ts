import { describe, expect, it } from 'vitest'
import { crpsOfSorted, ensembleCrps, ensembleCrpsField, gaussianCrps } from '../../../shared/numerics/verify/crps'
import { sortByPixel } from '../../../shared/numerics/ensemble/sortedStack'
import { meanAbsoluteError } from '../../../shared/numerics/verify/absoluteError'
import { normalSource, uniformSource } from './testRandom'

/** O(N²) energy form (Gneiting & Raftery 2007, JASA 102:359, eq. 21): E|X − y| − ½E|X − X'|. */
function crpsEnergy(x: number[], y: number, fair: boolean): number {
  const n = x.length
  let a = 0, d = 0
  for (const xi of x) { a += Math.abs(xi - y); for (const xj of x) d += Math.abs(xi - xj) }
  return a / n - d / (fair ? 2 * n * (n - 1) : 2 * n * n)
}

/** The definition ∫(F_N(t) − 1{t ≥ y})² dt, integrated exactly: the integrand is a step function. */
function crpsByIntegral(x: number[], y: number): number {
  const points = [...x, y].sort((a, b) => a - b)
  let s = 0
  for (let k = 0; k + 1 < points.length; k++) {
    const mid = (points[k]! + points[k + 1]!) / 2
    const F = x.filter((v) => v <= mid).length / x.length
    const H = mid >= y ? 1 : 0
    s += (F - H) ** 2 * (points[k + 1]! - points[k]!)
  }
  return s
}

describe('ensemble CRPS', () => {
  it('a one-member ensemble scores its absolute error', () => {
    for (const [x, y] of [[1.5, 0.2], [-3, 4], [2, 2]]) expect(ensembleCrps([x!], y!, 'ensemble')).toBeCloseTo(Math.abs(x! - y!), 15)
    expect(ensembleCrps([1], 0, 'fair')).toBeNaN()
  })

  it('the sorting formula equals the O(N²) energy form and the integral definition (Hersbach 2000)', () => {
    const u = uniformSource(11)
    for (const n of [2, 3, 5, 10, 31]) {
      for (let rep = 0; rep < 20; rep++) {
        const x = Array.from({ length: n }, () => Math.round(u() * 40) / 4 - 5) // includes ties
        const y = rep % 5 === 0 ? x[0]! : u() * 12 - 6
        expect(ensembleCrps(x, y, 'ensemble')).toBeCloseTo(crpsEnergy(x, y, false), 12)
        expect(ensembleCrps(x, y, 'ensemble')).toBeCloseTo(crpsByIntegral(x, y), 12)
        expect(ensembleCrps(x, y, 'fair')).toBeCloseTo(crpsEnergy(x, y, true), 12)
      }
    }
  })

  it('a one-member field forecast scores its mean absolute error (the deterministic baseline comparison)', () => {
    const g = normalSource(6)
    const f = Float64Array.from({ length: 30 }, g), truth = Float64Array.from({ length: 30 }, g)
    let mae = 0
    for (let k = 0; k < 30; k++) mae += Math.abs(f[k]! - truth[k]!) / 30
    expect(meanAbsoluteError(f, truth)).toBeCloseTo(mae, 14)
    expect(ensembleCrpsField(sortByPixel({ nx: 30, ny: 1, members: [f] }), truth, 'ensemble').mean).toBeCloseTo(mae, 14)
  })

  it('field mean over cells equals the per-cell scores averaged', () => {
    const g = normalSource(4)
    const nx = 5, ny = 4
    const members = [0, 1, 2, 3, 4].map(() => Float64Array.from({ length: nx * ny }, g))
    const truth = Float64Array.from({ length: nx * ny }, g)
    const r = ensembleCrpsField(sortByPixel({ nx, ny, members }), truth, 'fair')
    let s = 0
    for (let c = 0; c < nx * ny; c++) {
      const v = crpsEnergy(members.map((m) => m[c]!), truth[c]!, true)
      expect(r.perCell[c]).toBeCloseTo(v, 13)
      s += v
    }
    expect(r.mean).toBeCloseTo(s / (nx * ny), 13)
  })
})

describe('Gaussian CRPS', () => {
  it('μ = 0, σ = 1, y = 0 gives (√2 − 1)/√π = 0.2336949773 (Gneiting et al. 2005 closed form at z = 0)', () => {
    expect(gaussianCrps(0, 1, 0)).toBeCloseTo(0.2336949773, 10)
    expect(gaussianCrps(0, 1, 0)).toBeCloseTo((Math.SQRT2 - 1) / Math.sqrt(Math.PI), 15)
  })

  it('scales with σ, shifts with μ; σ = 0 is the absolute error', () => {
    expect(gaussianCrps(3, 2, 4)).toBeCloseTo(2 * gaussianCrps(0, 1, 0.5), 14)
    expect(gaussianCrps(1, 0, -2)).toBe(3)
    expect(() => gaussianCrps(0, -1, 0)).toThrow(/sigma/)
  })

  it('a large seeded ensemble approaches the closed form (empirical-CDF CRPS bias is E|X − X′|/(2N) = 1/(N√π))', () => {
    const g = normalSource(21)
    const n = 20000
    const x = Float64Array.from({ length: n }, g).sort()
    // Sampling error of the CRPS of N draws is O(1/√N) ≈ 0.007·σ here; allow 0.01.
    expect(Math.abs(crpsOfSorted(x, 0, n, 0, 'fair') - 0.2336949773)).toBeLessThan(0.01)
  })

  it('fair CRPS is unbiased in expectation for small ensembles; the plain ensemble CRPS is biased by 1/(N√π) (Ferro 2014)', () => {
    const g = normalSource(33)
    const reps = 20000, y = 0.7
    const target = gaussianCrps(0, 1, y)
    for (const n of [2, 5]) {
      let sf = 0, sf2 = 0, se = 0
      const x = new Float64Array(n)
      for (let r = 0; r < reps; r++) {
        for (let k = 0; k < n; k++) x[k] = g()
        x.sort()
        const f = crpsOfSorted(x, 0, n, y, 'fair')
        sf += f; sf2 += f * f
        se += crpsOfSorted(x, 0, n, y, 'ensemble')
      }
      const mean = sf / reps
      const standardError = Math.sqrt((sf2 / reps - mean * mean) / reps)
      // 4 standard errors of the mean of i.i.d. scores (central limit theorem).
      expect(Math.abs(mean - target)).toBeLessThan(4 * standardError)
      // E[plain] − E[fair] = E|X − X′|/(2N) with E|X − X′| = 2/√π for N(0, 1): checked loosely.
      expect(se / reps - target).toBeCloseTo(1 / (n * Math.sqrt(Math.PI)), 1)
    }
  })
})
