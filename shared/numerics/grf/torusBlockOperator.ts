/**
 * The block-mean operator A (mean over each b×b block) and its adjoint, applied in the Fourier
 * domain of an Nx×Ny fine torus whose sides are multiples of b.
 *
 * Block (I, J) covers fine cells [bI, bI + b) × [bJ, bJ + b). With the box transfer function
 * Ĥ(k) = Ĥx(kx)·Ĥy(ky), Ĥx(kx) = (1/b) Σ_{d<b} e^{−2πi kx d/Nx}, and the coarse torus Ncx×Ncy = N/b:
 *  - block means of a field with spectrum Z:  (A z)^(κ) = (1/b²) Σ_{k ≡ κ (mod Nc)} conj(Ĥ(k)) Z(k)
 *    (box filter, then sampling every b cells, which aliases the spectrum onto the coarse torus);
 *  - the adjoint of a coarse field w:        (Aᵀ w)^(k) = Ĥ(k) Ŵ(k mod Nc)  (Aᵀ spreads w/b² over each block).
 * So A K Aᵀ on the torus is the coarse circulant with symbol γ(κ) = (1/b²) Σ_{k≡κ} λ(k)|Ĥ(k)|².
 * Spectra follow fft2d's convention (unnormalised forward DFT).
 */

export class TorusBlockOperator {
  readonly coarseNx: number
  readonly coarseNy: number
  private readonly hxRe: Float64Array
  private readonly hxIm: Float64Array
  private readonly hyRe: Float64Array
  private readonly hyIm: Float64Array

  constructor(readonly nx: number, readonly ny: number, readonly factor: number) {
    if (nx % factor !== 0 || ny % factor !== 0) throw new Error(`torus ${nx}×${ny} is not a whole number of ${factor}×${factor} blocks`)
    this.coarseNx = nx / factor
    this.coarseNy = ny / factor
    ;[this.hxRe, this.hxIm] = boxTransfer(nx, factor)
    ;[this.hyRe, this.hyIm] = boxTransfer(ny, factor)
  }

  /** out ← spectrum of the block means (coarse torus, row-major Ncx×Ncy) of the field with spectrum (re, im). */
  foldBlockMeans(re: Float64Array, im: Float64Array, outRe: Float64Array, outIm: Float64Array): void {
    const { nx, ny, coarseNx: cx, coarseNy: cy, hxRe, hxIm } = this
    outRe.fill(0); outIm.fill(0)
    const s = 1 / (this.factor * this.factor)
    for (let ky = 0; ky < ny; ky++) {
      const yr = this.hyRe[ky]! * s, yi = this.hyIm[ky]! * s
      const orow = (ky % cy) * cx, frow = ky * nx
      // kx = base + κx: walking the aliases segment by segment avoids a modulo per point.
      for (let base = 0; base < nx; base += cx) for (let q = 0; q < cx; q++) {
        const kx = base + q
        const xr = hxRe[kx]!, xi = hxIm[kx]!
        const hr = xr * yr - xi * yi, hi = xr * yi + xi * yr
        const zr = re[frow + kx]!, zi = im[frow + kx]!
        const o = orow + q
        // conj(h)·z
        outRe[o]! += hr * zr + hi * zi
        outIm[o]! += hr * zi - hi * zr
      }
    }
  }

  /** (re, im) += λ(k)·Ĥ(k)·W(k mod Nc): adds the spectrum of K Aᵀ w, given the coarse spectrum W of w. */
  addLiftedCoarse(re: Float64Array, im: Float64Array, lambda: Float64Array, wRe: Float64Array, wIm: Float64Array): void {
    const { nx, ny, coarseNx: cx, coarseNy: cy, hxRe, hxIm } = this
    for (let ky = 0; ky < ny; ky++) {
      const yr = this.hyRe[ky]!, yi = this.hyIm[ky]!
      const crow = (ky % cy) * cx, frow = ky * nx
      for (let base = 0; base < nx; base += cx) for (let q = 0; q < cx; q++) {
        const kx = base + q
        const xr = hxRe[kx]!, xi = hxIm[kx]!
        const l = lambda[frow + kx]!
        const hr = (xr * yr - xi * yi) * l, hi = (xr * yi + xi * yr) * l
        const c = crow + q
        const wr = wRe[c]!, wi = wIm[c]!
        re[frow + kx]! += hr * wr - hi * wi
        im[frow + kx]! += hr * wi + hi * wr
      }
    }
  }

  /** Coarse symbol γ(κ) = (1/b²) Σ_{k≡κ} λ(k)|Ĥ(k)|² (real, Ncx×Ncy): eigenvalues of A K Aᵀ on the coarse torus. */
  coarseSymbol(lambda: Float64Array): Float64Array {
    const { nx, ny, coarseNx: cx, coarseNy: cy, hxRe, hxIm } = this
    const gamma = new Float64Array(cx * cy)
    const s = 1 / (this.factor * this.factor)
    for (let ky = 0; ky < ny; ky++) {
      const hy2 = (this.hyRe[ky]! ** 2 + this.hyIm[ky]! ** 2) * s
      const orow = (ky % cy) * cx, frow = ky * nx
      for (let kx = 0; kx < nx; kx++) gamma[orow + (kx % cx)]! += lambda[frow + kx]! * (hxRe[kx]! ** 2 + hxIm[kx]! ** 2) * hy2
    }
    return gamma
  }
}

/** One-dimensional box transfer Ĥ(k) = (1/b) Σ_{d<b} e^{−2πi k d/n}, k ∈ [0, n). */
export function boxTransfer(n: number, b: number): [Float64Array, Float64Array] {
  const re = new Float64Array(n), im = new Float64Array(n)
  for (let k = 0; k < n; k++) {
    let sr = 0, si = 0
    for (let d = 0; d < b; d++) {
      const a = -2 * Math.PI * ((k * d) % n) / n
      sr += Math.cos(a); si += Math.sin(a)
    }
    re[k] = sr / b; im[k] = si / b
  }
  return [re, im]
}

/**
 * One-dimensional coarse symbol γ(κ) = (1/b) Σ_{k≡κ (mod N/b)} λ(k)|Ĥ(k)|² of a 1-D torus spectrum λ
 * (length N, a multiple of b): for a separable kernel the 2-D symbol is the outer product of two of these.
 */
export function coarseSymbol1d(lambda: Float64Array, b: number): Float64Array {
  const n = lambda.length
  if (n % b !== 0) throw new Error(`torus side ${n} is not a multiple of the block factor ${b}`)
  const nc = n / b
  const [hr, hi] = boxTransfer(n, b)
  const gamma = new Float64Array(nc)
  for (let k = 0; k < n; k++) gamma[k % nc]! += lambda[k]! * (hr[k]! ** 2 + hi[k]! ** 2) / b
  return gamma
}
