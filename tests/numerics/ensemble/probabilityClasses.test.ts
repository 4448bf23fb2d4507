import { describe, expect, it } from 'vitest'
import { probabilityClasses } from '#shared/numerics/ensemble/probabilityClasses'

describe('probability display classes', () => {
  it('small ensembles: one class per member count, plus "no scenario" for 0 of N', () => {
    const c = probabilityClasses(5)
    expect(c.classes.map((x) => x.label)).toEqual(['no scenario (0 of 5)', '1 of 5', '2 of 5', '3 of 5', '4 of 5', '5 of 5'])
    for (let k = 0; k <= 5; k++) expect(c.classOfCount(k)).toBe(k)
    expect(c.classOfProbability(0.6)).toBe(3)
    expect(c.edges).toEqual([0, 0.2, 0.4, 0.6, 0.8, 1])
  })

  for (const n of [1, 9, 10, 11, 15, 18, 37, 180]) {
    it(`N = ${n}: every class holds at least one attainable k/N, counts are covered once, 0 alone is "no scenario"`, () => {
      const c = probabilityClasses(n)
      const seen = new Array(n + 1).fill(0)
      for (const cl of c.classes) {
        expect(cl.maxCount).toBeGreaterThanOrEqual(cl.minCount)
        for (let k = cl.minCount; k <= cl.maxCount; k++) {
          seen[k]++
          expect(c.classOfCount(k)).toBe(cl.index)
          // k/N lies inside (lower, upper] of its class (the no-scenario class is exactly 0).
          if (!cl.noScenario) { expect(k / n).toBeGreaterThan(cl.lower); expect(k / n).toBeLessThanOrEqual(cl.upper + 1e-12) }
        }
      }
      expect(seen.every((v) => v === 1)).toBe(true)
      expect(c.classes.filter((x) => x.noScenario).map((x) => [x.minCount, x.maxCount])).toEqual([[0, 0]])
      expect(c.edges.at(-1)).toBe(1)
    })
  }

  it('large ensembles: 10 bins of 10 % after the no-scenario class', () => {
    const c = probabilityClasses(180)
    expect(c.classes).toHaveLength(11)
    expect(c.classes[1]).toMatchObject({ minCount: 1, maxCount: 18, label: 'above 0 %, up to 10 %' })
    expect(c.classes[10]).toMatchObject({ minCount: 163, maxCount: 180, label: '90 %–100 %' })
    expect(probabilityClasses(180, 0.25).classes).toHaveLength(5)
  })

  it('rejects bad input', () => {
    expect(() => probabilityClasses(0)).toThrow('positive integer')
    expect(() => probabilityClasses(10, 0.3)).toThrow('divide 1')
    expect(() => probabilityClasses(10).classOfCount(11)).toThrow('[0, 10]')
  })
})
