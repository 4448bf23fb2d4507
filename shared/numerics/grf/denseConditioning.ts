/**
 * The exact dense method, for reference and small grids: builds the fine covariance matrix K
 * (W×W, W = fine cells) on the plane, the block-mean operator A of the observed blocks, C = A K Aᵀ,
 * and applies the kriging formulas directly with ml-matrix:
 *   mean = m + K Aᵀ C⁻¹ (y − A m),  Σ = K − K Aᵀ C⁻¹ A K,  z_c = m + z + K Aᵀ C⁻¹ (y − A m − A z).
 * O(W²) memory and O(W·m² + m³) time: a few thousand fine cells at most. Unconditional samples
 * use the Cholesky factor of K (+ `jitter`·k(0) on the diagonal, default 1e-10, because K of a smooth
 * kernel is numerically singular).
 */
import { CholeskyDecomposition, Matrix } from 'ml-matrix'
import { covarianceFunction } from './kernels'
import './maternGeneral' // installs the general-ν Matérn used by kernel 'matern'
import type { ConditioningSpec, LinearTrend } from './conditioningModel'
import { Xoshiro128 } from '../random/xoshiro128'
import { fillStandardNormal } from '../random/normal'

export interface DenseConditioning {
  fineNx: number
  fineNy: number
  mean: Float64Array
  std: Float64Array
  /** Posterior covariance Σ (W×W). */
  posteriorCovariance: Matrix
  /** Prior covariance K (W×W) and cross-covariance A K (m_obs × W). */
  priorCovariance: Matrix
  blockCross: Matrix
  /** Coarse covariance C of the observed blocks and their indices. */
  coarseCovariance: Matrix
  observed: number[]
  condition(z: Float64Array): Float64Array
  /** A zero-mean unconditional sample L ξ (L = chol(K + jitter·k(0)·I)), seeded. */
  unconditional(seed: number): Float64Array
}

/** Builds everything densely. Throws if C is not positive definite. */
export function denseConditioning(spec: ConditioningSpec, jitter = 1e-10): DenseConditioning {
  const { nx, ny, factor: b } = spec
  const fineNx = b * nx, fineNy = b * ny, W = fineNx * fineNy
  const cov = covarianceFunction(spec.kernel)
  const K = new Matrix(W, W)
  for (let p = 0; p < W; p++) {
    const px = p % fineNx, py = (p - px) / fineNx
    for (let q = 0; q <= p; q++) {
      const qx = q % fineNx, qy = (q - qx) / fineNx
      const v = cov(px - qx, py - qy)
      K.set(p, q, v); K.set(q, p, v)
    }
  }
  const observed: number[] = []
  for (let k = 0; k < nx * ny; k++) if (Number.isFinite(spec.coarse[k]!)) observed.push(k)
  const m = observed.length
  // (A K)[r, q] = mean over the cells of block observed[r] of K[cell, q].
  const AK = new Matrix(m, W)
  for (let r = 0; r < m; r++) {
    const I = observed[r]! % nx, J = (observed[r]! - I) / nx
    for (let dy = 0; dy < b; dy++) for (let dx = 0; dx < b; dx++) {
      const cell = (J * b + dy) * fineNx + I * b + dx
      for (let q = 0; q < W; q++) AK.set(r, q, AK.get(r, q) + K.get(cell, q) / (b * b))
    }
  }
  const C = new Matrix(m, m)
  for (let r = 0; r < m; r++) {
    const I = observed[r]! % nx, J = (observed[r]! - I) / nx
    for (let c = 0; c <= r; c++) {
      let s = 0
      for (let dy = 0; dy < b; dy++) for (let dx = 0; dx < b; dx++) s += AK.get(c, (J * b + dy) * fineNx + I * b + dx)
      C.set(r, c, s / (b * b)); C.set(c, r, s / (b * b))
    }
  }
  const chol = new CholeskyDecomposition(C)
  if (!chol.isPositiveDefinite()) throw new Error('dense conditioning: C = A K Aᵀ is not positive definite')
  const prior = priorFine(spec.mean, fineNx, fineNy)
  const blockMeanOf = (f: ArrayLike<number>, r: number) => {
    const I = observed[r]! % nx, J = (observed[r]! - I) / nx
    let s = 0
    for (let dy = 0; dy < b; dy++) for (let dx = 0; dx < b; dx++) s += f[(J * b + dy) * fineNx + I * b + dx]!
    return s / (b * b)
  }
  const krige = (z: Float64Array) => {
    const rhs = Matrix.columnVector(observed.map((k, r) => spec.coarse[k]! - blockMeanOf(prior, r) - blockMeanOf(z, r)))
    const w = chol.solve(rhs)
    const corr = AK.transpose().mmul(w)
    return Float64Array.from({ length: W }, (_, q) => prior[q]! + z[q]! + corr.get(q, 0))
  }
  const CinvAK = chol.solve(AK)
  const post = K.clone().sub(AK.transpose().mmul(CinvAK))
  const std = Float64Array.from({ length: W }, (_, q) => Math.sqrt(Math.max(post.get(q, q), 0)))
  let sampler: Matrix | undefined
  return {
    fineNx, fineNy,
    mean: krige(new Float64Array(W)),
    std, posteriorCovariance: post, priorCovariance: K, blockCross: AK, coarseCovariance: C, observed,
    condition: krige,
    unconditional(seed: number) {
      if (!sampler) {
        const jittered = K.clone()
        for (let q = 0; q < W; q++) jittered.set(q, q, jittered.get(q, q) + jitter * K.get(q, q))
        const c = new CholeskyDecomposition(jittered)
        if (!c.isPositiveDefinite()) throw new Error('dense conditioning: K + jitter is not positive definite')
        sampler = c.lowerTriangularMatrix
      }
      const xi = fillStandardNormal(new Xoshiro128(seed), new Float64Array(W))
      return Float64Array.from(sampler.mmul(Matrix.columnVector(Array.from(xi))).getColumn(0))
    },
  }
}

function priorFine(mean: number | LinearTrend, fineNx: number, fineNy: number): Float64Array {
  const t = typeof mean === 'number' ? { b0: mean, b1: 0, b2: 0 } : mean
  const out = new Float64Array(fineNx * fineNy)
  for (let j = 0; j < fineNy; j++) for (let i = 0; i < fineNx; i++) out[j * fineNx + i] = t.b0 + t.b1 * i + t.b2 * j
  return out
}
