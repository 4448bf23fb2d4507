import { describe, expect, it } from 'vitest'
import { readFileSync } from 'node:fs'
import { besselK, besselKScaled, logBesselK } from '../../../shared/numerics/grf/besselK'
import { logGamma } from '../../../shared/numerics/grf/logGamma'
import { maternCorrelation } from '../../../shared/numerics/grf/maternGeneral'
import { correlationAt } from '../../../shared/numerics/grf/kernels'

interface Fixture {
  bessel: { nu: number; x: number; kv: number | null; kve: number | null; logk: number }[]
  logGamma: { x: number; lgamma: number }[]
  matern: { nu: number; rOverL: number; rho: number }[]
}
// Made by make_bessel_fixture.py (scipy.special.kv/kve/gammaln and mpmath.besselk).
const fixture = JSON.parse(readFileSync(new URL('./bessel_fixture.json', import.meta.url), 'utf8')) as Fixture

const relErr = (a: number, b: number) => Math.abs(a - b) / Math.abs(b)

describe('modified Bessel function K_ν', () => {
  // SciPy's own error near x = 2 reaches 6e-14 (checked against mpmath); ours stays below 4e-15 there.
  it('matches scipy.special.kv to 1e-13 relative over ν ∈ [0, 20], x ∈ [1e-6, 150]', () => {
    let worst = 0
    for (const { nu, x, kv } of fixture.bessel) {
      if (kv === null) continue
      worst = Math.max(worst, relErr(besselK(nu, x), kv))
    }
    expect(worst).toBeLessThan(1e-13)
  })

  it('matches scipy.special.kve (scaled) including x = 800 where K itself underflows', () => {
    let worst = 0
    for (const { nu, x, kve } of fixture.bessel) {
      if (kve === null) continue
      worst = Math.max(worst, relErr(besselKScaled(nu, x), kve))
    }
    expect(worst).toBeLessThan(1e-13)
  })

  it('ln K matches mpmath.besselk to 1e-14 (relative to max(1, |ln K|)), also where K overflows (ν = 20, x = 1e-6)', () => {
    let worst = 0
    for (const { nu, x, logk } of fixture.bessel) worst = Math.max(worst, Math.abs(logBesselK(nu, x) - logk) / Math.max(1, Math.abs(logk)))
    expect(worst).toBeLessThan(1e-14)
  })

  it('reproduces the half-integer closed forms K_{1/2}, K_{3/2}, K_{5/2} (A&S 10.2.17)', () => {
    for (const x of [0.01, 0.7, 1.99, 2.01, 6, 40]) {
      const k12 = Math.sqrt(Math.PI / (2 * x)) * Math.exp(-x)
      expect(relErr(besselK(0.5, x), k12)).toBeLessThan(1e-14)
      expect(relErr(besselK(1.5, x), k12 * (1 + 1 / x))).toBeLessThan(1e-14)
      expect(relErr(besselK(2.5, x), k12 * (1 + 3 / x + 3 / (x * x)))).toBeLessThan(1e-14)
    }
  })

  it('rejects a negative order or a non-positive argument', () => {
    expect(() => besselK(-1, 1)).toThrow(/order/)
    expect(() => besselK(1, 0)).toThrow(/argument/)
  })
})

describe('ln Γ (Lanczos)', () => {
  it('matches scipy.special.gammaln to 1e-14 (relative to max(1, |ln Γ|))', () => {
    for (const { x, lgamma } of fixture.logGamma) {
      expect(Math.abs(logGamma(x) - lgamma) / Math.max(1, Math.abs(lgamma))).toBeLessThan(1e-14)
    }
  })
})

describe('general-ν Matérn correlation', () => {
  it('matches the mpmath Matérn (GPML eq. 4.14) to 1e-12 (worst case 1.1e-13 at ν = 40, r/ℓ = 1e-9), for ν up to 40 and r/ℓ from 1e-9 to 40', () => {
    let worst = 0
    for (const { nu, rOverL, rho } of fixture.matern) {
      if (rho < 1e-300) continue
      worst = Math.max(worst, relErr(maternCorrelation(nu, rOverL), rho))
    }
    expect(worst).toBeLessThan(1e-12)
  })

  it('is exactly 1 at r = 0 and never exceeds 1', () => {
    for (const nu of [0.3, 1.5, 7, 60]) {
      expect(maternCorrelation(nu, 0)).toBe(1)
      for (const r of [1e-300, 1e-12, 1e-6]) expect(maternCorrelation(nu, r)).toBeLessThanOrEqual(1)
    }
  })

  it("agrees with kernels.ts closed forms (GPML eq. 4.17) through the 'matern' kernel hook", () => {
    for (const [nu, name] of [[0.5, 'matern12'], [1.5, 'matern32'], [2.5, 'matern52']] as const) {
      for (const r of [0.001, 0.3, 1, 3.3, 9, 25]) {
        const closed = correlationAt({ kernel: name, lengthScale: 2.5, variance: 1 }, r)
        const general = correlationAt({ kernel: 'matern', nu, lengthScale: 2.5, variance: 1 }, r)
        expect(relErr(general, closed)).toBeLessThan(1e-13)
      }
    }
  })

  it('tends to the squared-exponential as ν grows (GPML §4.2.1: the ν → ∞ limit)', () => {
    for (const r of [0.3, 1, 2]) expect(Math.abs(maternCorrelation(400, r) - Math.exp(-r * r / 2))).toBeLessThan(5e-3)
  })
})
