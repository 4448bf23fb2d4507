/**
 * T. Chan's optimal circulant preconditioner (T. Chan 1988, SIAM J. Sci. Stat. Comput. 9:766),
 * in its level-2 form for block-Toeplitz matrices with Toeplitz blocks (Chan & Olkin 1994):
 * the circulant nearest to C in the Frobenius norm, with first column
 *   c(kx, ky) = Σ over the four wrapped lags of the Toeplitz entries, weighted (nx−|·|)(ny−|·|)/(nx·ny).
 * It is diagonalised by the nx×ny DFT, so applying its inverse costs one complex FFT pair (two
 * real vectors at once). With missing cells it is applied to the vector with zeros at those cells.
 */
import { fft2d } from '../fft/fft2d'
import type { CoarseCovariance } from './coarseCovariance'

export class ChanPreconditioner {
  /** Eigenvalues of the circulant (real, nx×ny), floored at a small positive value. */
  readonly eigenvalues: Float64Array
  /** How many eigenvalues were raised to the floor (0 for a well-posed system). */
  readonly floored: number
  private readonly re: Float64Array
  private readonly im: Float64Array

  constructor(private readonly covariance: CoarseCovariance) {
    const { nx, ny } = covariance
    const re = new Float64Array(nx * ny), im = new Float64Array(nx * ny)
    for (let ky = 0; ky < ny; ky++) for (let kx = 0; kx < nx; kx++) {
      const t = (dx: number, dy: number) => covariance.entry(dx, dy)
      re[ky * nx + kx] = ((nx - kx) * (ny - ky) * t(kx, ky) + kx * (ny - ky) * t(kx - nx, ky)
        + (nx - kx) * ky * t(kx, ky - ny) + kx * ky * t(kx - nx, ky - ny)) / (nx * ny)
    }
    fft2d(re, im, nx, ny)
    let max = 0
    for (const v of re) max = Math.max(max, v)
    const floor = max * 1e-15
    let floored = 0
    for (let k = 0; k < re.length; k++) if (!(re[k]! > floor)) { re[k] = floor; floored++ }
    this.eigenvalues = re
    this.floored = floored
    this.re = new Float64Array(nx * ny)
    this.im = new Float64Array(nx * ny)
  }

  /** out[j] ← P⁻¹ input[j] (masked cells kept at zero). */
  apply(input: Float64Array[], out: Float64Array[]): void {
    const { nx, ny, observed } = this.covariance
    for (let start = 0; start < input.length; start += 2) {
      const a = input[start]!, b = input[start + 1]
      const { re, im } = this
      for (let k = 0; k < re.length; k++) { re[k] = observed[k] ? a[k]! : 0; im[k] = b && observed[k] ? b[k]! : 0 }
      fft2d(re, im, nx, ny)
      const lam = this.eigenvalues
      for (let k = 0; k < re.length; k++) { re[k]! /= lam[k]!; im[k]! /= lam[k]! }
      fft2d(re, im, nx, ny, true)
      const oa = out[start]!, ob = b ? out[start + 1]! : undefined
      for (let k = 0; k < re.length; k++) { oa[k] = observed[k] ? re[k]! : 0; if (ob) ob[k] = observed[k] ? im[k]! : 0 }
    }
  }
}
