import { describe, expect, it } from 'vitest'
import { readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { normalCdf } from '../../../shared/numerics/verify/normalDistribution'
import { ensembleCrpsField, gaussianCrps } from '../../../shared/numerics/verify/crps'
import { fractionsSkill } from '../../../shared/numerics/verify/fractionsSkillScore'
import { percentileThreshold } from '../../../shared/numerics/verify/percentileThreshold'
import { meanSquaredError } from '../../../shared/numerics/verify/squaredError'
import { ensembleMean } from '../../../shared/numerics/ensemble/moments'
import { sortByPixel } from '../../../shared/numerics/ensemble/sortedStack'
import { radialSpectrum } from '../../../shared/numerics/verify/radialSpectrum'

// Made by fixtures/make_verify_fixture.py with numpy/scipy (independent implementations).
const ref = JSON.parse(readFileSync(fileURLToPath(new URL('./fixtures/verify_reference.json', import.meta.url)), 'utf8'))

describe('scores against numpy/scipy reference values', () => {
  it('normal CDF matches scipy.stats.norm.cdf to 1e-15 absolute', () => {
    for (const [x, p] of ref.normalCdf as number[][]) expect(Math.abs(normalCdf(x!) - p!)).toBeLessThan(1e-15)
  })

  it('Gaussian CRPS closed form matches scipy quad integration of the definition', () => {
    for (const [mu, s, y, v] of ref.gaussianCrps as number[][]) expect(gaussianCrps(mu!, s!, y!)).toBeCloseTo(v!, 10)
  })

  const f = ref.field
  const truth = Float64Array.from(f.truth as number[])
  const members = (f.members as number[][]).map((m) => Float64Array.from(m))
  const stack = { nx: f.nx as number, ny: f.ny as number, members }

  it('FSS matches scipy.ndimage.uniform_filter (constant 0 outside) fractions', () => {
    const r = fractionsSkill(truth, stack, f.threshold, f.sizes)
    for (const n of f.sizes as number[]) expect(r.fss.get(n)).toBeCloseTo(f.fss[String(n)], 13)
    expect(r.baseRate).toBeCloseTo(f.baseRate, 15)
  })

  it('field CRPS (plain and fair), MSE of the mean and type-7 percentiles match numpy', () => {
    const sorted = sortByPixel(stack)
    expect(ensembleCrpsField(sorted, truth, 'ensemble').mean).toBeCloseTo(f.crpsEnsemble, 13)
    expect(ensembleCrpsField(sorted, truth, 'fair').mean).toBeCloseTo(f.crpsFair, 13)
    expect(meanSquaredError(ensembleMean(stack), truth)).toBeCloseTo(f.mseOfMean, 12)
    for (const [p, v] of f.percentiles as number[][]) expect(percentileThreshold(truth, p!)).toBeCloseTo(v!, 13)
  })
})

describe('radially averaged spectrum against numpy.fft', () => {
  it('matches an independent numpy implementation of the same convention (no window and Hann)', () => {
    const s = ref.spectrum
    const field = Float64Array.from(s.field as number[])
    for (const window of ['none', 'hann'] as const) {
      const r = radialSpectrum(field, s.nx, s.ny, { window })
      const expected = s[window] as number[]
      expect(r.power.length).toBe(expected.length)
      expected.forEach((v, k) => expect(r.power[k]! / v).toBeCloseTo(1, 12))
    }
  })
})
