import { describe, expect, it } from 'vitest'
import { complexFftPlan } from '../../../shared/numerics/fft/fftPlan'
import { fft2d, realFft2d } from '../../../shared/numerics/fft/fft2d'
import { Xoshiro128 } from '../../../shared/numerics/random/xoshiro128'

/** The DFT straight from its definition, O(n²) per axis: the reference for every check below. */
function naiveDft2d(re: Float64Array, im: Float64Array, nx: number, ny: number, sign: number) {
  const outRe = new Float64Array(nx * ny), outIm = new Float64Array(nx * ny)
  for (let ky = 0; ky < ny; ky++) for (let kx = 0; kx < nx; kx++) {
    let sr = 0, si = 0
    for (let y = 0; y < ny; y++) for (let x = 0; x < nx; x++) {
      const a = sign * 2 * Math.PI * (kx * x / nx + ky * y / ny)
      const c = Math.cos(a), s = Math.sin(a), fr = re[y * nx + x]!, fi = im[y * nx + x]!
      sr += fr * c - fi * s; si += fr * s + fi * c
    }
    outRe[ky * nx + kx] = sr; outIm[ky * nx + kx] = si
  }
  return { re: outRe, im: outIm }
}

function randomField(n: number, seed: number): Float64Array {
  const rng = new Xoshiro128(seed)
  return Float64Array.from({ length: n }, () => rng.nextDouble() * 2 - 1)
}

function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let m = 0
  for (let k = 0; k < a.length; k++) m = Math.max(m, Math.abs(a[k]! - b[k]!))
  return m
}

describe('1-D complex plans (reference: naive DFT)', () => {
  // Lengths exercising each route: fft.js powers of two, the odd·2^k mixed-radix step, Bluestein.
  for (const n of [1, 2, 8, 64, 3, 12, 40, 96, 31, 37, 97, 250]) {
    it(`length ${n}`, () => {
      const re = randomField(n, n), im = randomField(n, n + 1000)
      const ref = naiveDft2d(re, im, n, 1, -1)
      const buf = new Float64Array(2 * n)
      for (let k = 0; k < n; k++) { buf[2 * k] = re[k]!; buf[2 * k + 1] = im[k]! }
      const out = new Float64Array(2 * n)
      complexFftPlan(n).forward(out, buf)
      const gotRe = out.filter((_, k) => k % 2 === 0), gotIm = out.filter((_, k) => k % 2 === 1)
      // Rounding of an FFT grows like ε·log n·‖x‖; 1e-12·n is a loose envelope (common practice).
      expect(maxAbsDiff(gotRe, ref.re)).toBeLessThan(1e-12 * n)
      expect(maxAbsDiff(gotIm, ref.im)).toBeLessThan(1e-12 * n)
      const back = new Float64Array(2 * n)
      complexFftPlan(n).inverse(back, out)
      expect(maxAbsDiff(back, buf)).toBeLessThan(1e-13 * n)
    })
  }
})

describe('fft2d (reference: naive 2-D DFT)', () => {
  for (const [nx, ny] of [[8, 4], [16, 16], [6, 5], [37, 3], [1, 7], [7, 1]] as const) {
    it(`${nx}×${ny} forward and inverse`, () => {
      const re = randomField(nx * ny, 7), im = randomField(nx * ny, 8)
      const ref = naiveDft2d(re, im, nx, ny, -1)
      const r = Float64Array.from(re), i = Float64Array.from(im)
      fft2d(r, i, nx, ny)
      expect(maxAbsDiff(r, ref.re)).toBeLessThan(1e-11)
      expect(maxAbsDiff(i, ref.im)).toBeLessThan(1e-11)
      const inv = naiveDft2d(ref.re, ref.im, nx, ny, +1)
      fft2d(r, i, nx, ny, true)
      // Inverse includes 1/(nx·ny): it must return the input.
      expect(maxAbsDiff(r, re)).toBeLessThan(1e-13)
      expect(maxAbsDiff(i, im)).toBeLessThan(1e-13)
      expect(maxAbsDiff(r, inv.re.map((v) => v / (nx * ny)))).toBeLessThan(1e-13)
    })
  }
  it('rejects a wrong plane length', () => {
    expect(() => fft2d(new Float64Array(5), new Float64Array(6), 2, 3)).toThrow(/length 5/)
  })
})

describe('realFft2d (reference: naive 2-D DFT of the real field)', () => {
  for (const [nx, ny] of [[16, 8], [12, 6], [2, 2], [5, 4]] as const) {
    it(`${nx}×${ny}`, () => {
      const data = randomField(nx * ny, 3)
      const ref = naiveDft2d(data, new Float64Array(nx * ny), nx, ny, -1)
      const { re, im, width } = realFft2d(data, nx, ny)
      expect(width).toBe(Math.floor(nx / 2) + 1)
      for (let ky = 0; ky < ny; ky++) for (let kx = 0; kx < width; kx++) {
        expect(Math.abs(re[ky * width + kx]! - ref.re[ky * nx + kx]!)).toBeLessThan(1e-11)
        expect(Math.abs(im[ky * width + kx]! - ref.im[ky * nx + kx]!)).toBeLessThan(1e-11)
      }
    })
  }
})
