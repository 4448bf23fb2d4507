import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { boxCox, boxCoxLogLikelihood, fitBoxCox, inverseBoxCox, inverseBoxCoxDerivative } from '../../../shared/numerics/transform/boxCox'
import { censoredPowerLogLikelihood, censoredToPhysical, fitCensoredNormal, fitCensoredPower } from '../../../shared/numerics/transform/censoredPower'
import { defaultTransform, latentTransform, resolveTransform } from '../../../shared/numerics/transform/latentTransform'
import { inverseMillsRatio, logNormalCdf } from '../../../shared/numerics/transform/logNormalCdf'
import { prepareLatentCoarse } from '../../../shared/numerics/transform/latentCoarse'
import { createDownscaler } from '../../../shared/numerics/grf/downscaler'

// Made by fixtures/make_transform_fixture.py (scipy 1.17: special.log_ndtr, stats.boxcox, optimize).
const reference = JSON.parse(readFileSync(new URL('./fixtures/transform_reference.json', import.meta.url), 'utf8')) as {
  log_ndtr: { x: number; value: number }[]
  boxcox: { trueLambda: number; x: number[]; lambdaHat: number; llf: { lambda: number; value: number }[] }[]
  censored: { trueLambda: number; x: number[]; fixed: { lambda: number; mean: number; sd: number; logLikelihood: number }; lambdaHat: number }[]
}

describe('ln Φ and the inverse Mills ratio', () => {
  it('match scipy.special.log_ndtr deep into the lower tail', () => {
    for (const { x, value } of reference.log_ndtr) expect(Math.abs(logNormalCdf(x) - value)).toBeLessThan(1e-12 * Math.max(1, Math.abs(value)))
  })
  it('inverse Mills ratio tends to −x in the lower tail (Mills 1926; asymptotic −x + 1/x·…)', () => {
    for (const x of [-10, -30]) expect(Math.abs(inverseMillsRatio(x) - (-x - 1 / x))).toBeLessThan(3 / Math.abs(x) ** 3)
    // φ(0)/Φ(0) = 2/√(2π), closed form.
    expect(inverseMillsRatio(0)).toBeCloseTo(2 / Math.sqrt(2 * Math.PI), 14)
  })
})

describe('Box–Cox', () => {
  it('inverse and derivative are consistent with the forward map, log at λ = 0', () => {
    for (const lambda of [0, 0.3, 1, 1.7]) for (const x of [0.05, 1, 7.5, 40]) {
      const g = boxCox(x, lambda)
      expect(inverseBoxCox(g, lambda)).toBeCloseTo(x, 10)
      const h = 1e-6
      expect(inverseBoxCoxDerivative(g, lambda)).toBeCloseTo((inverseBoxCox(g + h, lambda) - inverseBoxCox(g - h, lambda)) / (2 * h), 5)
    }
    expect(boxCox(3, 0)).toBe(Math.log(3))
    expect(inverseBoxCox(-5, 0.5)).toBe(0) // below the bound −1/λ: the physical lower limit
  })

  it('profile log-likelihood equals scipy.stats.boxcox_llf and λ̂ equals scipy.stats.boxcox', () => {
    for (const c of reference.boxcox) {
      for (const { lambda, value } of c.llf) expect(Math.abs(boxCoxLogLikelihood(c.x, lambda) - value)).toBeLessThan(1e-8 * Math.abs(value))
      const fit = fitBoxCox(c.x)
      // scipy's optimiser stops at its own tolerance (Brent, xtol 1.48e-8 in λ from memory).
      expect(Math.abs(fit.lambda - Math.max(0, c.lambdaHat))).toBeLessThan(1e-5)
      expect(fit.standardError).toBeGreaterThan(0)
    }
  })

  it('recovers λ from correlated coarse fields (independence likelihood is unbiased; mean of 12 replicates)', () => {
    const nx = 24, ny = 24, lambda = 0.4
    const engine = createDownscaler({ coarse: new Float64Array(nx * ny), nx, ny, factor: 2, kernel: { kernel: 'matern32', lengthScale: 3, variance: 0.81 }, mean: 0 })
    const estimates: number[] = []
    for (let r = 0; r < 12; r++) {
      const g = engine.unconditional(77, r)
      // Take every other fine cell: a 48×48 → 24×24 correlated field, ℓ = 1.5 cells.
      const x = Array.from({ length: nx * ny }, (_, k) => inverseBoxCox(6 + g[(2 * Math.floor(k / nx)) * 2 * nx + 2 * (k % nx)]!, lambda))
      estimates.push(fitBoxCox(x).lambda)
    }
    const mean = estimates.reduce((a, b) => a + b, 0) / estimates.length
    const sd = Math.sqrt(estimates.reduce((a, b) => a + (b - mean) ** 2, 0) / (estimates.length - 1))
    // Sampling theory: the replicate mean is within 3 standard errors of the truth.
    expect(Math.abs(mean - lambda)).toBeLessThan(3 * sd / Math.sqrt(estimates.length))
    // Informative: a replicate spread well below the search range, and a mean away from log (λ = 0) and linear (λ = 1).
    expect(sd).toBeLessThan(0.3)
    expect(Math.abs(mean - lambda)).toBeLessThan(0.15)
  })

  it('rejects non-positive values', () => {
    expect(() => fitBoxCox([1, 2, 0])).toThrow(/positive/)
  })
})

describe('censored latent Gaussian (Tobit)', () => {
  it('likelihood and maximum at fixed λ, and the profile λ̂, equal scipy.optimize on the written-out likelihood', () => {
    for (const c of reference.censored) {
      const { lambda, mean, sd, logLikelihood } = c.fixed
      expect(Math.abs(censoredPowerLogLikelihood(c.x, lambda) - logLikelihood)).toBeLessThan(1e-6 * Math.abs(logLikelihood))
      const wet = c.x.filter((v) => v > 0).map((v) => v ** lambda)
      const m = fitCensoredNormal(wet, c.x.length - wet.length)
      // Nelder–Mead stops at xatol 1e-10 in (μ, ln σ): agreement to ~1e-7.
      expect(Math.abs(m.mean - mean)).toBeLessThan(1e-6)
      expect(Math.abs(m.sd - sd)).toBeLessThan(1e-6)
      const fit = fitCensoredPower(c.x)
      expect(fit.lambdaFitted).toBe(true)
      expect(Math.abs(fit.lambda - c.lambdaHat)).toBeLessThan(1e-4)
    }
  })

  it('never returns a negative amount, and maps latent ≤ 0 to exactly 0', () => {
    for (const g of [-3, -1e-12, 0, 1e-9, 2]) expect(censoredToPhysical(g, 0.7)).toBeGreaterThanOrEqual(0)
    expect(censoredToPhysical(-0.5, 0.7)).toBe(0)
    expect(censoredToPhysical(0, 0.7)).toBe(0)
  })

  it('dry blocks get the truncated-normal mean E[g | g ≤ 0] = μ − σ φ(α)/Φ(α) as latent target', () => {
    const x = reference.censored[0]!.x
    const prepared = prepareLatentCoarse(x, 'censored')
    const s = prepared.summary
    const alpha = -s.latentMean! / s.latentSd!
    // Closed form (Johnson & Kotz, truncated normal mean).
    expect(s.dryTarget).toBeCloseTo(s.latentMean! - s.latentSd! * Math.exp(-0.5 * alpha * alpha) / Math.sqrt(2 * Math.PI) / Math.exp(logNormalCdf(alpha)), 12)
    const dry = x.findIndex((v) => v === 0)
    expect(prepared.targets[dry]).toBe(s.dryTarget)
    expect(prepared.fitField[dry]).toBe(s.dryTarget)
  })
})

describe('choice of transform', () => {
  it('defaults from the CF standard name', () => {
    expect(defaultTransform('wind_speed_of_gust')).toBe('boxcox')
    expect(defaultTransform('precipitation_amount')).toBe('censored')
    expect(defaultTransform('lwe_thickness_of_precipitation_amount')).toBe('censored')
    expect(defaultTransform('precipitation_flux')).toBe('censored')
    expect(defaultTransform('air_temperature')).toBe('none')
    expect(defaultTransform('wet_bulb_temperature')).toBe('none')
    expect(defaultTransform(undefined)).toBe('none')
  })
  it('auto falls back to none when Box–Cox cannot take the data; an explicit choice throws', () => {
    expect(resolveTransform('auto', 'wind_speed_of_gust', [3, 0, 5])).toEqual({ name: 'none', note: expect.stringContaining('not positive') })
    expect(() => resolveTransform('boxcox', 'air_temperature', [3, -1])).toThrow(/positive/)
    expect(resolveTransform('log', 'air_temperature', [3, NaN, 2]).name).toBe('log')
  })
  it('negative precipitation inputs are treated as dry and counted; an all-dry field needs no fit', () => {
    const p = prepareLatentCoarse([0, -0.01, 0, NaN], 'auto', 'precipitation_amount')
    expect(p.allDry).toBe(true)
    expect(p.summary.negativeInputs).toBe(1)
    expect(p.physical[1]).toBe(0)
  })
  it('latent transforms round-trip', () => {
    for (const t of [latentTransform('log'), latentTransform('boxcox', 0.6), latentTransform('censored', 0.7), latentTransform('none')]) {
      for (const x of [0.2, 3, 25]) {
        expect(t.toPhysical(t.toLatent(x))).toBeCloseTo(x, 10)
        // The hot-loop slope from the value equals the derivative (and a central difference).
        const g = t.toLatent(x), h = 1e-6
        expect(t.slopeAt(g, t.toPhysical(g))).toBeCloseTo(t.derivative(g), 10)
        expect(t.derivative(g)).toBeCloseTo((t.toPhysical(g + h) - t.toPhysical(g - h)) / (2 * h), 5)
      }
    }
  })
})
