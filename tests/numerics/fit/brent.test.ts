import { describe, expect, it } from 'vitest'
import { minimizeBounded } from '../../../shared/numerics/optimize/brentMinimize'
import { findRootBracketed } from '../../../shared/numerics/optimize/brentRoot'

describe('Brent bounded minimisation (Brent 1973, ch. 5)', () => {
  it('finds the vertex of a parabola in a few evaluations (parabolic steps are exact there)', () => {
    const r = minimizeBounded((x) => (x - 2.3) ** 2 + 1, -5, 10, { tolerance: 1e-10 })
    expect(Math.abs(r.x - 2.3)).toBeLessThan(1e-8)
    expect(r.value).toBeCloseTo(1, 14)
    expect(r.evaluations).toBeLessThan(12)
  })

  it('minimises cos on [0, 2π] at π (closed form)', () => {
    const r = minimizeBounded(Math.cos, 0, 2 * Math.PI, { tolerance: 1e-9 })
    expect(Math.abs(r.x - Math.PI)).toBeLessThan(1e-7)
  })

  it('stops at the bound when the minimum lies outside, without evaluating outside', () => {
    const seen: number[] = []
    const r = minimizeBounded((x) => { seen.push(x); return x }, 1, 3, { tolerance: 1e-8 })
    expect(r.x - 1).toBeLessThan(1e-6)
    expect(Math.min(...seen)).toBeGreaterThanOrEqual(1)
    expect(Math.max(...seen)).toBeLessThanOrEqual(3)
  })

  it('uses a supplied start point and treats NaN as +Infinity', () => {
    const f = (x: number) => (x < 0.5 ? NaN : (x - 4) ** 4)
    const r = minimizeBounded(f, 0, 10, { start: { x: 3, value: f(3) }, tolerance: 1e-6 })
    expect(Math.abs(r.x - 4)).toBeLessThan(1e-2) // quartic: flat bottom, x is determined only to tol^(1/2)-ish
  })

  it('respects the evaluation cap', () => {
    const r = minimizeBounded((x) => Math.sin(40 * x), 0, 1, { maxEvaluations: 5 })
    expect(r.evaluations).toBeLessThanOrEqual(5)
  })
})

describe('Brent root finding (Brent 1973, ch. 4)', () => {
  it("solves x³ − 2x − 5 = 0 (Wallis's classic test equation; root 2.0945514815423265, from memory, re-checked by the residual)", () => {
    const f = (x: number) => x ** 3 - 2 * x - 5
    const r = findRootBracketed(f, 2, 3, f(2), f(3), 1e-14)
    expect(Math.abs(f(r.x))).toBeLessThan(1e-12)
    expect(Math.abs(r.x - 2.0945514815423265)).toBeLessThan(1e-13)
    expect(r.evaluations).toBeLessThan(15)
  })

  it('finds the root of a function with a steep and a flat side', () => {
    const f = (x: number) => Math.exp(x) - 1e3
    const r = findRootBracketed(f, 0, 20, f(0), f(20), 1e-12)
    expect(Math.abs(r.x - Math.log(1e3))).toBeLessThan(1e-10)
  })

  it('rejects an interval that does not bracket a root', () => {
    expect(() => findRootBracketed((x) => x * x + 1, -1, 1, 2, 2)).toThrow(/opposite signs/)
  })
})
