import { describe, expect, it } from 'vitest'
import { diskChords, diskSize } from '#shared/numerics/ensemble/disk'
import { diskExtreme } from '#shared/numerics/ensemble/diskExtreme'
import { neighbourhoodMean } from '#shared/numerics/ensemble/neighbourhoodMean'
import { neighbourhoodEnsembleProbability, neighbourhoodMaximumProbability } from '#shared/numerics/ensemble/neighbourhoodProbability'
import { ProductPlan } from '#shared/numerics/ensemble/productPlan'
import { bruteDiskExtreme, bruteNeighbourhood, neighbours } from './bruteForce'
import { randomStack, uniformGenerator } from './seededRandom'

const close = (a: ArrayLike<number>, b: ArrayLike<number>, tol = 1e-12) => {
  expect(a.length).toBe(b.length)
  for (let k = 0; k < a.length; k++) expect(Math.abs(a[k]! - b[k]!), `index ${k}: ${a[k]} vs ${b[k]}`).toBeLessThanOrEqual(tol)
}

describe('disk neighbourhood', () => {
  it('counts the lattice points of the disk: 1, 5, 13, 29, 49, 81, 113, 149, 197, 253, 317 for R = 0..10 (Gauss circle problem, OEIS A000328; from memory)', () => {
    const expected = [1, 5, 13, 29, 49, 81, 113, 149, 197, 253, 317]
    expected.forEach((count, r) => expect(diskSize(diskChords(r))).toBe(count))
  })

  it('R = 1.5 is exactly the 3 × 3 square (R = √2 would be too, in exact arithmetic, but Math.SQRT2² > 2 in floating point)', () => {
    expect(diskSize(diskChords(1.5))).toBe(9)
    expect(Array.from(diskChords(1.5).halfWidth)).toEqual([1, 1])
  })

  it('rejects a negative or non-finite radius', () => {
    expect(() => diskChords(-1)).toThrow('radius')
    expect(() => diskChords(NaN)).toThrow('radius')
  })

  it('disk mean and disk max/min match brute force, edges truncated', () => {
    const u = uniformGenerator(5)
    const nx = 9
    const ny = 6
    const field = Float64Array.from({ length: nx * ny }, () => Math.round(u() * 20))
    for (const r of [0, 0.7, 1, 1.5, 2, 2.3, 3.2, 5, 12]) {
      const bruteMean = Array.from({ length: nx * ny }, (_, k) => {
        const nb = neighbours(nx, ny, k % nx, Math.floor(k / nx), r)
        return nb.reduce((s, c) => s + field[c]!, 0) / nb.length
      })
      close(neighbourhoodMean(field, nx, ny, r), bruteMean)
      expect(Array.from(diskExtreme(field, nx, ny, r, 'max'))).toEqual(bruteDiskExtreme(field, nx, ny, r, 'max'))
      expect(Array.from(diskExtreme(field, nx, ny, r, 'min'))).toEqual(bruteDiskExtreme(field, nx, ny, r, 'min'))
    }
  })
})

describe('NEP and NMEP (Schwartz & Sobash 2017)', () => {
  it('worked case: one member, one exceeding pixel, R = 1.5 (3 × 3 square): NEP = 1/9 and NMEP = 1 around it, 0 elsewhere', () => {
    const nx = 7
    const ny = 6
    const g = new Float64Array(nx * ny)
    g[3 * nx + 2] = 10 // column 2, row 3
    const stack = { nx, ny, members: [g] }
    const nep = neighbourhoodEnsembleProbability(stack, 5, 'above', 1.5)
    const nmep = neighbourhoodMaximumProbability(stack, 5, 'above', 1.5)
    for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
      const inside = Math.abs(i - 2) <= 1 && Math.abs(j - 3) <= 1
      expect(nep[j * nx + i]).toBeCloseTo(inside ? 1 / 9 : 0, 14)
      expect(nmep[j * nx + i]).toBe(inside ? 1 : 0)
    }
  })

  it('edge truncation: an exceeding corner pixel gives NEP 1/4 at the corner, 1/6 beside it, 1/9 diagonally in', () => {
    const nx = 5
    const ny = 5
    const g = new Float64Array(nx * ny)
    g[0] = 1
    const nep = neighbourhoodEnsembleProbability({ nx, ny, members: [g] }, 1, 'above', 1.5)
    expect(nep[0]).toBeCloseTo(1 / 4, 14) // 2 × 2 cells of the square lie inside the grid
    expect(nep[1]).toBeCloseTo(1 / 6, 14) // 3 × 2
    expect(nep[nx]).toBeCloseTo(1 / 6, 14)
    expect(nep[nx + 1]).toBeCloseTo(1 / 9, 14)
    expect(nep[2]).toBe(0)
  })

  it('match the brute-force definition on random fixtures, for the direct and the prepared paths', () => {
    const stack = randomStack(42, 11, 8, 13)
    const plan = new ProductPlan(stack)
    for (const r of [0, 1, 1.5, 2.5, 4]) for (const d of ['above', 'below'] as const) {
      for (const t of [3, 5, stack.members[2]![40]!, 8]) {
        const ref = bruteNeighbourhood(stack, t, d, r)
        close(neighbourhoodEnsembleProbability(stack, t, d, r), ref.nep)
        close(neighbourhoodMaximumProbability(stack, t, d, r), ref.nmep)
        const direct = plan.probabilityMaps(t, d, r)
        plan.prepareNeighbourhood(r, d)
        expect(plan.isPrepared(r, d)).toBe(true)
        const prepared = plan.probabilityMaps(t, d, r)
        for (const maps of [direct, prepared]) {
          close(maps.nep, ref.nep)
          close(maps.nmep, ref.nmep)
        }
      }
    }
  })

  it('R = 0 gives NEP = NMEP = the per-pixel probability', () => {
    const stack = randomStack(7, 6, 4, 5)
    const maps = new ProductPlan(stack).probabilityMaps(5, 'above', 0)
    expect(Array.from(maps.nep)).toEqual(Array.from(maps.probability))
    expect(Array.from(maps.nmep)).toEqual(Array.from(maps.probability))
  })

  it('NMEP ≥ NEP everywhere (a neighbourhood maximum is at least its mean)', () => {
    const stack = randomStack(8, 12, 9, 10)
    const maps = new ProductPlan(stack).probabilityMaps(6, 'above', 2)
    for (let k = 0; k < maps.nep.length; k++) expect(maps.nmep[k]!).toBeGreaterThanOrEqual(maps.nep[k]! - 1e-15)
  })
})

describe('NMEP on rows wider than one 32-cell word', () => {
  it('matches brute force for nx = 70 with radii below and above 32 cells (word-crossing shifts)', () => {
    const stack = randomStack(99, 70, 4, 3)
    for (const r of [1, 3, 7.5, 31, 33, 40]) for (const d of ['above', 'below'] as const) {
      const ref = bruteNeighbourhood(stack, 7.5, d, r)
      close(neighbourhoodMaximumProbability(stack, 7.5, d, r), ref.nmep)
    }
  })

  it('keeps events at both row ends (column 0 and column nx − 1 of a 64-wide grid)', () => {
    const g = new Float64Array(64 * 1)
    g[0] = 1
    g[63] = 1
    const nmep = neighbourhoodMaximumProbability({ nx: 64, ny: 1, members: [g] }, 1, 'above', 3)
    expect(Array.from(nmep).map((v, i) => (v ? i : -1)).filter((i) => i >= 0)).toEqual([0, 1, 2, 3, 60, 61, 62, 63])
  })
})
