import { describe, expect, it } from 'vitest'
import { EigenvalueDecomposition, Matrix } from 'ml-matrix'
import { blockMeans, createDownscaler, type DownscalerSpec, type WhiteNoiseSource } from '../../../shared/numerics/grf/downscaler'
import { denseConditioning } from '../../../shared/numerics/grf/denseConditioning'
import { Xoshiro128 } from '../../../shared/numerics/random/xoshiro128'
import { fillStandardNormal } from '../../../shared/numerics/random/normal'

function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let m = 0
  for (let k = 0; k < a.length; k++) m = Math.max(m, Math.abs(a[k]! - b[k]!))
  return m
}

/** Invented coarse values. */
function coarseField(nx: number, ny: number, missing: number[] = []): Float64Array {
  const y = Float64Array.from({ length: nx * ny }, (_, k) => 0.8 + Math.cos(0.7 * (k % nx)) - 0.5 * Math.sin(1.1 * Math.floor(k / nx) + 0.3 * k))
  for (const k of missing) y[k] = NaN
  return y
}

/** Seeded white noise filling both planes (pair-indexed streams). */
const seededNoise = (seed: number): WhiteNoiseSource => (pair, re, im) => {
  const rng = new Xoshiro128(seed, pair)
  fillStandardNormal(rng, re)
  fillStandardNormal(rng, im)
}

const specs: { name: string; spec: DownscalerSpec }[] = [
  // Small on purpose: the reference builds the dense 256×256 torus covariance and its square root.
  { name: 'Matérn-3/2, missing cells', spec: { coarse: coarseField(4, 3, [6]), nx: 4, ny: 3, factor: 2, kernel: { kernel: 'matern32', lengthScale: 1, variance: 1.3 }, mean: 0.4 } },
  { name: 'se (Kronecker)', spec: { coarse: coarseField(3, 3), nx: 3, ny: 3, factor: 2, kernel: { kernel: 'se', lengthScale: 1.2, variance: 0.7 }, mean: -0.2 } },
]

describe('samples from supplied spatial white noise', () => {
  for (const { name, spec } of specs) {
    it(`${name}: equals the dense kriging of C^{1/2} w, C the torus covariance (reference: ml-matrix eigen square root)`, () => {
      const d = createDownscaler(spec)
      const [tx, ty] = d.diagnostics.torus
      const M = tx * ty
      // Torus covariance c(Δ) = IDFT(λ)(Δ), computed here by a direct separable sum (not by the engine's FFT).
      const lambda = d.model.lambda
      const c = new Float64Array(M), partial = new Float64Array(M)
      for (let ky = 0; ky < ty; ky++) for (let dx = 0; dx < tx; dx++) {
        let s = 0
        for (let kx = 0; kx < tx; kx++) s += lambda[ky * tx + kx]! * Math.cos(2 * Math.PI * kx * dx / tx)
        partial[ky * tx + dx] = s
      }
      for (let dy = 0; dy < ty; dy++) for (let dx = 0; dx < tx; dx++) {
        let s = 0
        for (let ky = 0; ky < ty; ky++) s += partial[ky * tx + dx]! * Math.cos(2 * Math.PI * ky * dy / ty)
        c[dy * tx + dx] = s / M
      }
      const C = new Matrix(M, M)
      for (let a = 0; a < M; a++) for (let b = 0; b < M; b++) {
        const dx = ((a % tx) - (b % tx) + tx) % tx, dy = ((Math.floor(a / tx) - Math.floor(b / tx)) + ty) % ty
        C.set(a, b, c[dy * tx + dx]!)
      }
      const eig = new EigenvalueDecomposition(C, { assumeSymmetric: true })
      const V = eig.eigenvectorMatrix
      const root = V.mmul(Matrix.diag(eig.realEigenvalues.map((v) => Math.sqrt(Math.max(v, 0))))).mmul(V.transpose())
      const noise = seededNoise(5)
      const samples = d.samplesFromNoise(3, noise)
      const ref = denseConditioning(spec)
      for (let pair = 0; pair < 2; pair++) {
        const re = new Float64Array(M), im = new Float64Array(M)
        noise(pair, re, im, tx, ty, d.nx, d.ny)
        for (const [part, w] of [re, im].entries()) {
          const index = 2 * pair + part
          if (index >= samples.length) continue
          const u = root.mmul(Matrix.columnVector(Array.from(w))).to1DArray()
          const window = new Float64Array(d.nx * d.ny)
          for (let j = 0; j < d.ny; j++) for (let i = 0; i < d.nx; i++) window[j * d.nx + i] = u[j * tx + i]!
          // Both routes are exact; the differences are eigen-solver and FFT rounding.
          expect(maxAbsDiff(samples[index]!, ref.condition(window))).toBeLessThan(1e-9)
        }
      }
    })
  }
})

describe('re-conditioning to a new target', () => {
  for (const { name, spec } of specs) {
    it(`${name}: x + K Aᵀ C⁻¹ Δ is the same unconditional field conditioned on y + Δ`, () => {
      const d = createDownscaler(spec)
      const change = Float64Array.from({ length: spec.nx * spec.ny }, (_, k) => 0.3 * Math.sin(1.7 * k) + 0.1)
      const shifted = createDownscaler({ ...spec, coarse: spec.coarse.map((v, k) => v + change[k]!) })
      const z = [d.unconditional(9, 0), d.unconditional(9, 1), d.unconditional(9, 2)]
      const before = z.map((f) => d.condition(f))
      const after = d.recondition(before, before.map(() => change))
      expect(after).toHaveLength(3)
      for (let s = 0; s < 3; s++) {
        // Linearity of conditioning by kriging: reference is the second downscaler's own spatial route.
        expect(maxAbsDiff(after[s]!, shifted.condition(z[s]!))).toBeLessThan(1e-10)
        const means = blockMeans(after[s]!, d.nx, spec.nx, spec.ny, spec.factor)
        for (let k = 0; k < means.length; k++) if (Number.isFinite(spec.coarse[k]!)) expect(Math.abs(means[k]! - spec.coarse[k]! - change[k]!)).toBeLessThan(1e-11)
      }
      // The input fields are left untouched.
      expect(maxAbsDiff(before[0]!, d.condition(z[0]!))).toBe(0)
    })
  }

  it('rejects mismatched inputs', () => {
    const d = createDownscaler(specs[0]!.spec)
    expect(() => d.recondition([d.mean()], [])).toThrow(/one change per field/)
    expect(() => d.recondition([d.mean()], [new Float64Array(3)])).toThrow(/expected 12/)
  })
})
