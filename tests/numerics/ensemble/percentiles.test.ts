import { describe, expect, it } from 'vitest'
import { readFileSync } from 'node:fs'
import { ensembleMean, ensembleSpread } from '#shared/numerics/ensemble/moments'
import { pixelPercentiles } from '#shared/numerics/ensemble/percentiles'
import { samplePercentiles } from '#shared/numerics/ensemble/areaProducts'
import { sortByPixel } from '#shared/numerics/ensemble/sortedStack'

// Made by fixtures/make_percentiles.py: numpy.percentile (default "linear" = Hyndman & Fan type 7),
// numpy.mean and numpy.std(ddof=1).
interface Case { n: number; members: number[][]; percentiles: Record<string, number[]>; mean: number[]; spread: number[] | null }
const fixture = JSON.parse(readFileSync(new URL('./fixtures/percentiles.json', import.meta.url), 'utf8')) as { nx: number; ny: number; percents: number[]; cases: Case[] }

const within = (a: number, b: number, rel = 1e-12) => expect(Math.abs(a - b), `${a} vs ${b}`).toBeLessThanOrEqual(rel * Math.max(1, Math.abs(b)))

describe('per-pixel percentiles, mean and spread', () => {
  for (const c of fixture.cases) {
    const stack = { nx: fixture.nx, ny: fixture.ny, members: c.members.map((m) => Float64Array.from(m)) }

    it(`N = ${c.n}: type-7 percentiles equal numpy.percentile's defaults (fixture)`, () => {
      const grids = pixelPercentiles(sortByPixel(stack), fixture.percents)
      fixture.percents.forEach((p, q) => c.percentiles[String(p)]!.forEach((v, k) => within(grids[q]![k]!, v)))
      // The same definition on a plain list of sample values (used for area maxima).
      const pixel0 = c.members.map((m) => m[0]!)
      samplePercentiles(pixel0, fixture.percents).forEach((v, q) => within(v, c.percentiles[String(fixture.percents[q])]![0]!))
    })

    it(`N = ${c.n}: mean equals numpy.mean; spread equals numpy.std(ddof=1), i.e. divisor N − 1 (fixture)`, () => {
      const mean = ensembleMean(stack)
      c.mean.forEach((v, k) => within(mean[k]!, v))
      const spread = ensembleSpread(stack)
      if (c.spread === null) expect(Array.from(spread).every(Number.isNaN)).toBe(true)
      else c.spread.forEach((v, k) => within(spread[k]!, v))
    })
  }

  it('spread follows the N − 1 formula on a hand case: values 1, 2, 3, 4 give sqrt(5/3) (textbook sample variance)', () => {
    const stack = { nx: 1, ny: 1, members: [1, 2, 3, 4].map((v) => Float64Array.of(v)) }
    within(ensembleSpread(stack)[0]!, Math.sqrt(5 / 3))
  })

  it('rejects percentiles outside [0, 100]', () => {
    const stack = { nx: 1, ny: 1, members: [Float64Array.of(1)] }
    expect(() => pixelPercentiles(sortByPixel(stack), [101])).toThrow('[0, 100]')
  })
})
