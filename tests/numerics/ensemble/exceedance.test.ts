import { describe, expect, it } from 'vitest'
import { eventField, exceedanceProbability } from '#shared/numerics/ensemble/exceedance'
import { crossingCount, sortByPixel, sortedExceedance } from '#shared/numerics/ensemble/sortedStack'
import { checkStack, timeExtremeStack } from '#shared/numerics/ensemble/stack'
import { ProductPlan } from '#shared/numerics/ensemble/productPlan'
import { bruteProbability } from './bruteForce'
import { randomStack } from './seededRandom'

describe('per-pixel exceedance probability', () => {
  const stack = randomStack(11, 7, 5, 23)
  // Thresholds at values present in the data (ties) and between them.
  const thresholds = [stack.members[0]![3]!, stack.members[4]![17]!, 5, 5.05, -100, 100]

  it('matches the brute-force share of members for both directions, ties included (reference: definition, GUIDE §4)', () => {
    for (const t of thresholds) for (const d of ['above', 'below'] as const) {
      const expected = bruteProbability(stack, t, d)
      expect(Array.from(exceedanceProbability(stack, t, d))).toEqual(expected)
      expect(Array.from(sortedExceedance(sortByPixel(stack), t, d))).toEqual(expected)
    }
  })

  it('product plan gives the same maps before and after sorting its pixels (count vs binary search)', () => {
    const plan = new ProductPlan(stack)
    const before = thresholds.map((t) => plan.probabilityMaps(t, 'below', 1.5))
    plan.sortPixels()
    thresholds.forEach((t, q) => {
      const after = plan.probabilityMaps(t, 'below', 1.5)
      expect(Array.from(after.probability)).toEqual(bruteProbability(stack, t, 'below'))
      expect(Array.from(before[q]!.probability)).toEqual(Array.from(after.probability))
      expect(Array.from(before[q]!.nep)).toEqual(Array.from(after.nep))
    })
  })

  it('is inclusive on both sides: a value equal to T counts for above and for below', () => {
    const s = { nx: 1, ny: 1, members: [Float64Array.of(2), Float64Array.of(3), Float64Array.of(3), Float64Array.of(4)] }
    const sorted = sortByPixel(s)
    expect(crossingCount(sorted, 0, 3, 'above')).toBe(3)
    expect(crossingCount(sorted, 0, 3, 'below')).toBe(3)
    expect(Array.from(eventField(Float64Array.of(2, 3, 4), 3, 'above'))).toEqual([0, 1, 1])
    expect(Array.from(eventField(Float64Array.of(2, 3, 4), 3, 'below'))).toEqual([1, 1, 0])
  })

  it('keeps Float32 input exact in the sorted copy', () => {
    const s = { nx: 2, ny: 1, members: [Float32Array.of(0.1, 2), Float32Array.of(0.3, 1)] }
    const sorted = sortByPixel(s)
    expect(sorted.values).toBeInstanceOf(Float32Array)
    // 0.1 in single precision is slightly above 0.1 in double: the exact comparison must see that.
    expect(crossingCount(sorted, 0, Math.fround(0.1), 'above')).toBe(2)
    expect(crossingCount(sorted, 0, 0.1, 'above')).toBe(2)
    expect(crossingCount(sorted, 0, Math.fround(0.1), 'below')).toBe(1)
  })

  it('rejects bad stacks with a message naming the place', () => {
    expect(() => checkStack({ nx: 2, ny: 2, members: [new Float64Array(3)] })).toThrow('member 0 has 3 values, expected nx·ny = 4')
    expect(() => checkStack({ nx: 2, ny: 2, members: [Float64Array.of(0, 0, NaN, 0)] })).toThrow('column 0, row 1')
    expect(() => checkStack({ nx: 2, ny: 2, members: [] })).toThrow('no members')
  })

  it('time-window extreme keeps Float32 grids Float32 and exact (the extreme is one of the inputs)', () => {
    const a = { nx: 2, ny: 1, members: [Float32Array.of(0.1, 5)] }
    const b = { nx: 2, ny: 1, members: [Float32Array.of(0.3, 2)] }
    const max = timeExtremeStack([a, b], 'max')
    expect(max.members[0]).toBeInstanceOf(Float32Array)
    expect(Array.from(max.members[0]!)).toEqual([Math.fround(0.3), 5])
    expect(timeExtremeStack([a, { nx: 2, ny: 1, members: [Float64Array.of(0.3, 2)] }], 'min').members[0]).toBeInstanceOf(Float64Array)
  })

  it('time-window extreme: P(x ≥ T at some time) per pixel equals the brute-force share of samples', () => {
    const leads = [randomStack(1, 4, 3, 9), randomStack(2, 4, 3, 9), randomStack(3, 4, 3, 9)]
    const t = 6
    const any = exceedanceProbability(timeExtremeStack(leads, 'max'), t, 'above')
    const anyBelow = exceedanceProbability(timeExtremeStack(leads, 'min'), t, 'below')
    for (let k = 0; k < 12; k++) {
      let a = 0
      let b = 0
      for (let m = 0; m < 9; m++) {
        if (leads.some((s) => s.members[m]![k]! >= t)) a++
        if (leads.some((s) => s.members[m]![k]! <= t)) b++
      }
      expect(any[k]).toBe(a / 9)
      expect(anyBelow[k]).toBe(b / 9)
    }
  })
})
