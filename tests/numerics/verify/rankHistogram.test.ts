import { describe, expect, it } from 'vitest'
import { rankHistogram } from '../../../shared/numerics/verify/rankHistogram'
import { sortByPixel } from '../../../shared/numerics/ensemble/sortedStack'
import { normalSource, uniformSource } from './testRandom'

const sorted = (nx: number, members: Float64Array[]) => sortByPixel({ nx, ny: 1, members })

/** |count − expected| within 4 binomial standard deviations (normal approximation). */
function expectBinomial(count: number, cells: number, p: number): void {
  expect(Math.abs(count - cells * p)).toBeLessThan(4 * Math.sqrt(cells * p * (1 - p)))
}

describe('rank histogram', () => {
  it('without ties the rank is the number of members below the truth (brute force)', () => {
    const u = uniformSource(2)
    const cells = 500, n = 7
    const members = Array.from({ length: n }, () => Float64Array.from({ length: cells }, u))
    const truth = Float64Array.from({ length: cells }, u)
    const expected = new Array(n + 1).fill(0)
    for (let c = 0; c < cells; c++) expected[members.filter((m) => m[c]! < truth[c]!).length]++
    expect(rankHistogram(sorted(cells, members), truth)).toEqual(expected)
  })

  it('truth below / above every member lands in the first / last bin', () => {
    const members = [Float64Array.of(1, 1), Float64Array.of(2, 2), Float64Array.of(3, 3)]
    expect(rankHistogram(sorted(2, members), Float64Array.of(0, 4))).toEqual([1, 0, 0, 1])
  })

  it('ties are spread uniformly over the tied ranks (all members equal the truth: flat over 0…N)', () => {
    const cells = 20000, n = 4
    const members = Array.from({ length: n }, () => new Float64Array(cells))
    const h = rankHistogram(sorted(cells, members), new Float64Array(cells), 7)
    for (const c of h) expectBinomial(c, cells, 1 / (n + 1))
  })

  it('partial ties: one member below, two equal → ranks 1, 2, 3 only, equally often', () => {
    const cells = 9000
    const members = [new Float64Array(cells).fill(-1), new Float64Array(cells), new Float64Array(cells), new Float64Array(cells).fill(5)]
    const h = rankHistogram(sorted(cells, members), new Float64Array(cells), 3)
    expect(h[0]).toBe(0)
    expect(h[4]).toBe(0)
    for (const c of h.slice(1, 4)) expectBinomial(c, cells, 1 / 3)
  })

  it('is reproducible from the seed', () => {
    const members = Array.from({ length: 3 }, () => new Float64Array(1000))
    const s = sorted(1000, members)
    const t = new Float64Array(1000)
    expect(rankHistogram(s, t, 5)).toEqual(rankHistogram(s, t, 5))
    expect(rankHistogram(s, t, 5)).not.toEqual(rankHistogram(s, t, 6))
  })

  it('a calibrated ensemble (truth drawn like the members) is flat within sampling error (Hamill 2001)', () => {
    const g = normalSource(12)
    const cells = 12000, n = 9
    const members = Array.from({ length: n }, () => Float64Array.from({ length: cells }, g))
    const h = rankHistogram(sorted(cells, members), Float64Array.from({ length: cells }, g))
    expect(h.reduce((a, b) => a + b, 0)).toBe(cells)
    for (const c of h) expectBinomial(c, cells, 1 / (n + 1))
  })
})
