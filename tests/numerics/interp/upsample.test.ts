import { describe, expect, it } from 'vitest'
import { upsample, type InterpolationMethod } from '../../../shared/numerics/interp/upsample'
import { blockAverage } from '../../../shared/numerics/interp/blockAverage'
import { keysKernel } from '../../../shared/numerics/interp/axisWeights'
import { randomField } from '../verify/testRandom'

/** Fine field f(i, j) on index coordinates (cell centres at integers). */
function fineOf(nx: number, ny: number, f: (x: number, y: number) => number): Float64Array {
  const out = new Float64Array(nx * ny)
  for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) out[j * nx + i] = f(i, j)
  return out
}

/** Point values of f at coarse centres, which sit at fine coordinate bI + (b − 1)/2. */
function centresOf(mx: number, my: number, b: number, f: (x: number, y: number) => number): Float64Array {
  const c = (I: number) => b * I + (b - 1) / 2
  return fineOf(mx, my, (I, J) => f(c(I), c(J)))
}

function maxAbsDiff(a: Float64Array, b: Float64Array): number {
  expect(a.length).toBe(b.length)
  let m = 0
  for (let k = 0; k < a.length; k++) m = Math.max(m, Math.abs(a[k]! - b[k]!))
  return m
}

const linear = (x: number, y: number) => 2 + 0.3 * x - 0.7 * y + 0.01 * x * y
// Degree ≤ 2 in each coordinate (tensor-product quadratic space).
const quadratic = (x: number, y: number) => 1 + 0.3 * x - 0.2 * y + 0.05 * x * x + 0.01 * x * y - 0.03 * y * y + 0.001 * x * x * y * y

describe('Keys kernel', () => {
  it('is 1 at 0, 0 at the other integers, and its integer shifts sum to 1 (partition of unity, Keys 1981)', () => {
    expect(keysKernel(0)).toBe(1)
    for (const s of [1, -1, 2, -2, 3]) expect(keysKernel(s)).toBe(0)
    for (const t of [0.1, 0.25, 0.5, 0.9]) {
      expect(keysKernel(t + 1) + keysKernel(t) + keysKernel(1 - t) + keysKernel(2 - t)).toBeCloseTo(1, 14)
    }
  })
})

describe('upsample', () => {
  it('factor 1 is the identity for every method', () => {
    const y = randomField(5 * 4, 1)
    for (const method of ['nearest', 'bilinear', 'bicubic'] as const) {
      for (const preserveBlockMeans of [false, true]) {
        expect(maxAbsDiff(upsample(y, 5, 4, 1, { method, preserveBlockMeans }), y)).toBeLessThan(1e-14)
      }
    }
  })

  it('nearest is block-constant', () => {
    const y = randomField(3 * 2, 2)
    const x = upsample(y, 3, 2, 4, { method: 'nearest' })
    for (let j = 0; j < 8; j++) for (let i = 0; i < 12; i++) expect(x[j * 12 + i]).toBe(y[Math.floor(j / 4) * 3 + Math.floor(i / 4)])
  })

  it('bilinear reproduces f = a + bx + cy + dxy exactly from point values, edges included (linear ghosts)', () => {
    for (const b of [2, 3, 4, 5]) {
      const x = upsample(centresOf(6, 5, b, linear), 6, 5, b, { method: 'bilinear' })
      expect(maxAbsDiff(x, fineOf(6 * b, 5 * b, linear))).toBeLessThan(1e-12)
    }
  })

  it('bicubic reproduces tensor-product quadratics exactly from point values (Keys 1981: exact to degree 2)', () => {
    for (const b of [2, 3, 4, 7]) {
      const x = upsample(centresOf(7, 6, b, quadratic), 7, 6, b, { method: 'bicubic' })
      const f = fineOf(7 * b, 6 * b, quadratic)
      expect(maxAbsDiff(x, f) / Math.max(...f.map(Math.abs))).toBeLessThan(1e-13)
    }
  })

  it('bicubic does not reproduce cubics; its error falls ~8× when the field is twice as smooth (third order, Keys 1981)', () => {
    const cubic = (x: number) => (x - 10) ** 3 / 1000
    const x = upsample(centresOf(10, 1, 4, (u) => cubic(u)), 10, 1, 4, { method: 'bicubic' })
    expect(maxAbsDiff(x.subarray(0, 40), fineOf(40, 1, (u) => cubic(u)))).toBeGreaterThan(1e-6)
    const interiorError = (wavelength: number) => {
      const f = (u: number) => Math.sin((2 * Math.PI * u) / wavelength)
      const m = 64, b = 4
      const out = upsample(centresOf(m, 1, b, f), m, 1, b, { method: 'bicubic' })
      let e = 0
      // Row 0 of the fine output; interior only, away from the extrapolated edges.
      for (let i = 4 * b; i < (m - 4) * b; i++) e = Math.max(e, Math.abs(out[i]! - f(i)))
      return e
    }
    const ratio = interiorError(40) / interiorError(80)
    expect(ratio).toBeGreaterThan(6.5)
    expect(ratio).toBeLessThan(9.5)
  })

  it('bicubic of block means of x² is x² + (b² − 1)/12 (variance of b consecutive integers): block means are not point values', () => {
    for (const b of [2, 3, 4]) {
      const f = (x: number) => 0.01 * x * x
      const y = blockAverage(fineOf(8 * b, b, f), 8 * b, b, b)
      const x = upsample(y, 8, 1, b, { method: 'bicubic' })
      expect(maxAbsDiff(x, fineOf(8 * b, b, (u) => f(u) + 0.01 * (b * b - 1) / 12))).toBeLessThan(1e-12)
    }
  })

  const shapes: Array<[number, number]> = [[1, 1], [1, 4], [2, 3], [3, 3], [7, 5], [16, 9]]
  for (const method of ['nearest', 'bilinear', 'bicubic'] as InterpolationMethod[]) {
    it(`${method} with preserveBlockMeans averages back to the coarse field to rounding`, () => {
      let seed = 10
      for (const [mx, my] of shapes) {
        for (const b of [1, 2, 3, 4, 5, 8]) {
          const y = randomField(mx * my, seed++, 10)
          const x = upsample(y, mx, my, b, { method, preserveBlockMeans: true })
          expect(maxAbsDiff(blockAverage(x, b * mx, b * my, b), y)).toBeLessThan(1e-12)
        }
      }
    })
  }

  it('without the correction bilinear and bicubic do not keep block means of a rough field', () => {
    const y = randomField(8 * 8, 3)
    for (const method of ['bilinear', 'bicubic'] as const) {
      expect(maxAbsDiff(blockAverage(upsample(y, 8, 8, 4, { method }), 32, 32, 4), y)).toBeGreaterThan(0.01)
    }
  })

  it('preserving variants recover a field in their polynomial space from its block means exactly', () => {
    for (const b of [2, 3, 5]) {
      for (const [method, f] of [['bilinear', linear], ['bicubic', quadratic]] as const) {
        const truth = fineOf(6 * b, 5 * b, f)
        const y = blockAverage(truth, 6 * b, 5 * b, b)
        const x = upsample(y, 6, 5, b, { method, preserveBlockMeans: true })
        expect(maxAbsDiff(x, truth) / Math.max(...truth.map(Math.abs))).toBeLessThan(1e-12)
      }
    }
  })

  it('rejects bad input', () => {
    expect(() => upsample(new Float64Array(4), 2, 2, 0, { method: 'bilinear' })).toThrow(/factor/)
    expect(() => upsample(new Float64Array(4), 2, 2, 1.5, { method: 'bilinear' })).toThrow(/factor/)
    expect(() => upsample(new Float64Array(3), 2, 2, 2, { method: 'bilinear' })).toThrow(/expected 2×2/)
    expect(() => upsample(Float64Array.of(1, NaN, 0, 0), 2, 2, 2, { method: 'nearest' })).toThrow(/finite/)
  })
})
