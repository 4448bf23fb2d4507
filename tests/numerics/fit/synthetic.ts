/**
 * Synthetic coarse fields for the fitting tests: y = μ + σ·L z with L Lᵀ = R + ηI the block-mean
 * correlation of the coarse grid (from the change-of-support table, itself checked against A K Aᵀ),
 * z standard normal from the seeded generator. This is exactly the law of the block means of a fine
 * Gaussian field with that kernel (plus coarse white noise of variance ησ²).
 */
import { choleskyFactor } from '../../../shared/numerics/linalg/cholesky'
import { Xoshiro128 } from '../../../shared/numerics/random/xoshiro128'
import { fillStandardNormal } from '../../../shared/numerics/random/normal'
import { coarseCorrelationTable } from '../../../shared/numerics/fit/coarseCorrelation'
import { validCellCorrelation } from '../../../shared/numerics/fit/denseLikelihood'
import { prepareCoarseField } from '../../../shared/numerics/fit/coarseField'
import type { KernelName } from '../../../shared/numerics/grf/kernels'
import { EigenvalueDecomposition, Matrix } from 'ml-matrix'
import { seCoarseCorrelation1d } from '../../../shared/numerics/fit/coarseCorrelation'

export interface SyntheticSpec { kernel: KernelName; lengthScale: number; variance: number; mean: number; factor: number; nx: number; ny: number; nugget?: number; nu?: number }

/** Returns a generator of independent replicates (row-major nx×ny) for one specification. */
export function coarseSampler(spec: SyntheticSpec): (seed: number) => Float64Array {
  const { nx, ny } = spec
  const table = coarseCorrelationTable(spec.kernel, spec.lengthScale, spec.factor, nx, ny, spec.nu)
  // Any non-constant field gives the full-grid layout needed to read the table.
  const layout = prepareCoarseField(Float64Array.from({ length: nx * ny }, (_, k) => k), nx, ny, spec.factor)
  const m = nx * ny
  const L = choleskyFactor(validCellCorrelation(layout, table, spec.nugget ?? 1e-10), m)
  const sd = Math.sqrt(spec.variance)
  return (seed) => {
    const z = fillStandardNormal(new Xoshiro128(seed), new Float64Array(m))
    const y = new Float64Array(m)
    for (let r = 0; r < m; r++) {
      let s = 0
      for (let k = 0; k <= r; k++) s += L[r * m + k]! * z[k]!
      y[r] = spec.mean + sd * s
    }
    return y
  }
}

/**
 * Fine-field sampler by dense Cholesky of the fine covariance (plus a 1e-10·σ² jitter, so it is positive
 * definite in floating point) on an nx×ny fine grid: O((nx·ny)³) once, then one triangular product per field.
 */
export function fineFieldSampler(cov: (dx: number, dy: number) => number, nx: number, ny: number, mean: number, jitter = 1e-10): (seed: number) => Float64Array {
  const n = nx * ny
  const K = new Float64Array(n * n)
  for (let p = 0; p < n; p++) {
    for (let q = 0; q <= p; q++) {
      const v = cov((q % nx) - (p % nx), Math.floor(q / nx) - Math.floor(p / nx))
      K[p * n + q] = v; K[q * n + p] = v
    }
    K[p * n + p]! += jitter * cov(0, 0)
  }
  const L = choleskyFactor(K, n)
  return (seed) => {
    const z = fillStandardNormal(new Xoshiro128(seed), new Float64Array(n))
    const x = new Float64Array(n)
    for (let r = 0; r < n; r++) {
      let s = 0
      for (let k = 0; k <= r; k++) s += L[r * n + k]! * z[k]!
      x[r] = mean + s
    }
    return x
  }
}

/** Mean and standard deviation (n − 1) of a list. */
export function meanAndSpread(values: number[]): { mean: number; sd: number } {
  const mean = values.reduce((s, v) => s + v, 0) / values.length
  const sd = Math.sqrt(values.reduce((s, v) => s + (v - mean) ** 2, 0) / (values.length - 1))
  return { mean, sd }
}

/** Symmetric square root Q√Λ (ml-matrix eigendecomposition) of the Toeplitz matrix with entries c[i − k + n − 1]. */
function toeplitzRoot(c: Float64Array, n: number): Matrix {
  const T = new Matrix(n, n)
  for (let i = 0; i < n; i++) for (let k = 0; k < n; k++) T.set(i, k, c[i - k + n - 1]!)
  const e = new EigenvalueDecomposition(T, { assumeSymmetric: true })
  const V = e.eigenvectorMatrix
  const root = new Matrix(n, n)
  for (let i = 0; i < n; i++) for (let k = 0; k < n; k++) root.set(i, k, V.get(i, k) * Math.sqrt(Math.max(0, e.realEigenvalues[k]!)))
  return root
}

/**
 * se fields of any size without a big factorisation (coarse, or fine with factor 1): block means of the separable se kernel have
 * covariance σ²(Ry ⊗ Rx), so Y = σ·Sy Z Sxᵀ with S S ᵀ = R (1-D, ml-matrix), plus white noise of variance ησ².
 */
export function seKroneckerSampler(lengthScale: number, factor: number, nx: number, ny: number, variance: number, mean: number, nugget = 1e-10): (seed: number) => Float64Array {
  const Sx = toeplitzRoot(seCoarseCorrelation1d(lengthScale, factor, nx), nx)
  const Sy = ny === nx ? Sx : toeplitzRoot(seCoarseCorrelation1d(lengthScale, factor, ny), ny)
  const sd = Math.sqrt(variance)
  return (seed) => {
    const rng = new Xoshiro128(seed)
    const z = fillStandardNormal(rng, new Float64Array(nx * ny))
    const Z = new Matrix(ny, nx)
    for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) Z.set(j, i, z[j * nx + i]!)
    const Y = Sy.mmul(Z).mmul(Sx.transpose())
    const noise = fillStandardNormal(rng, new Float64Array(nx * ny))
    return Float64Array.from({ length: nx * ny }, (_, k) => mean + sd * (Y.get(Math.floor(k / nx), k % nx) + Math.sqrt(nugget) * noise[k]!))
  }
}
