/**
 * Exact structured solver for a separable kernel on a complete grid (Saatçi 2011, PhD thesis, ch. 5):
 * C = s·Cx ⊗ Cy + τ·I, with Cx, Cy the 1-D block-mean covariances (from the 1-D torus symbols), so
 * with Cx = Qx Dx Qxᵀ and Cy = Qy Dy Qyᵀ,  C⁻¹ r = (Qy ⊗ Qx)(s·Dy⊗Dx + τ)⁻¹(Qy ⊗ Qx)ᵀ r.
 * On an nx×ny coarse grid stored as the ny×nx matrix R: W = Qy [(Qyᵀ R Qx) ⊘ (s·dy dxᵀ + τ)] Qxᵀ.
 * Cost O(nx³ + ny³) once, then O(nx·ny·(nx + ny)) per solve; accuracy independent of the condition number
 * up to the eigen-solver's backward error (absolute ε·‖C‖ per eigenvalue).
 */
import { fft2d } from '../fft/fft2d'
import { matmul, symmetricEigen } from '../linalg/denseMatrix'
import type { CoarseSolver } from './coarseCovariance'

/** Dense n×n Toeplitz matrix of the restriction of a 1-D coarse circulant with symbol γ (length N ≥ n). */
export function toeplitzFromSymbol(gamma: Float64Array, n: number): Float64Array {
  const N = gamma.length
  const re = Float64Array.from(gamma), im = new Float64Array(N)
  fft2d(re, im, N, 1, true)
  const t = new Float64Array(n * n)
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) t[i * n + j] = re[(((i - j) % N) + N) % N]!
  return t
}

export class KroneckerCoarseSolver implements CoarseSolver {
  readonly method = 'kronecker' as const
  readonly qx: Float64Array
  readonly dx: Float64Array
  readonly qy: Float64Array
  readonly dy: Float64Array

  /** `gammaX`, `gammaY`: 1-D coarse symbols; C = scale·Cx⊗Cy + nugget·I on the nx×ny window. */
  constructor(readonly nx: number, readonly ny: number, gammaX: Float64Array, gammaY: Float64Array, readonly scale: number, readonly nugget: number) {
    const ex = symmetricEigen(toeplitzFromSymbol(gammaX, nx), nx)
    const ey = symmetricEigen(toeplitzFromSymbol(gammaY, ny), ny)
    this.qx = ex.vectors; this.dx = ex.values
    this.qy = ey.vectors; this.dy = ey.values
  }

  /** Eigenvalue of C for the pair (eigenvector j of Cy, eigenvector i of Cx). */
  eigenvalue(j: number, i: number): number {
    return this.scale * this.dy[j]! * this.dx[i]! + this.nugget
  }

  solve(rhs: Float64Array[]) {
    const { nx, ny, qx, qy } = this
    const solutions = rhs.map((r) => {
      // R is ny×nx (row J = coarse row). R̃ = Qyᵀ R Qx.
      const t = matmul(matmul(qy, r, ny, ny, nx, true), qx, ny, nx, nx)
      for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) t[j * nx + i]! /= this.eigenvalue(j, i)
      return matmul(matmul(qy, t, ny, ny, nx), qx, ny, nx, nx, false, true)
    })
    return { solutions, iterations: 0, residual: NaN }
  }
}
