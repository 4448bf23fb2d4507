/**
 * The coarse covariance C = A K Aᵀ of the observed block means, as the restriction of a circulant
 * on the coarse torus (Ncx×Ncy) to the nx×ny window: C is block-Toeplitz with Toeplitz blocks,
 * its products cost one pair of coarse FFTs, and by Cauchy interlacing its eigenvalues lie in
 * [min γ, max γ] of the torus symbol γ. Coarse vectors are row-major nx×ny (index J·nx + I);
 * missing cells are excluded by zeroing them (observed[k] = 0).
 */
import { fft2d, fft2dRowPruned } from '../fft/fft2d'

export interface CoarseSolveResult {
  solutions: Float64Array[]
  /** Iterations of an iterative method (0 for direct ones). */
  iterations: number
  /** Largest relative residual ‖r − C w‖/‖r‖ over the right-hand sides (as measured by the method). */
  residual: number
}

/** Solves C w = r on the observed cells (entries at missing cells are ignored and returned as 0). */
export interface CoarseSolver {
  readonly method: 'kronecker' | 'dense' | 'pcg'
  /** Set when the solver changed route on its own (e.g. a PCG that fell back to dense Cholesky). */
  readonly note?: string
  /** For PCG: the preconditioner in use, e.g. 'edge (strips 12/12, corners 6)' or 'torus'. */
  readonly preconditioner?: string
  solve(rhs: Float64Array[]): CoarseSolveResult
}

export class CoarseCovariance {
  /** c(Δ) on the coarse torus (row-major Ncx×Ncy): the covariance between blocks Δ apart. */
  readonly firstColumn: Float64Array
  readonly observedCount: number
  readonly complete: boolean
  private readonly bufRe: Float64Array
  private readonly bufIm: Float64Array

  constructor(
    readonly nx: number, readonly ny: number,
    readonly torusNx: number, readonly torusNy: number,
    /** γ(κ), real, Ncx×Ncy. */
    readonly symbol: Float64Array,
    /** 1 = observed, 0 = missing, length nx·ny. */
    readonly observed: Uint8Array,
  ) {
    if (torusNx < nx || torusNy < ny) throw new Error('coarse torus smaller than the window')
    const re = Float64Array.from(symbol), im = new Float64Array(symbol.length)
    fft2d(re, im, torusNx, torusNy, true)
    this.firstColumn = re
    let count = 0
    for (const o of observed) count += o
    this.observedCount = count
    this.complete = count === nx * ny
    this.bufRe = new Float64Array(torusNx * torusNy)
    this.bufIm = new Float64Array(torusNx * torusNy)
  }

  /** Covariance between blocks at coarse lag (dx, dy), |dx| < Ncx, |dy| < Ncy. */
  entry(dx: number, dy: number): number {
    const i = ((dx % this.torusNx) + this.torusNx) % this.torusNx, j = ((dy % this.torusNy) + this.torusNy) % this.torusNy
    return this.firstColumn[j * this.torusNx + i]!
  }

  /** out[j] ← C·input[j] for one or two vectors (two are packed into one complex FFT pair). */
  apply(input: Float64Array[], out: Float64Array[]): void {
    for (let start = 0; start < input.length; start += 2) {
      this.applyComplex(this.symbol, input[start]!, input[start + 1], out[start]!, start + 1 < input.length ? out[start + 1]! : undefined)
    }
  }

  /** out[j] ← P Γ⁻¹ Pᵀ input[j]: the inverse of the torus circulant restricted to the window (a preconditioner). */
  applyTorusInverse(input: Float64Array[], out: Float64Array[]): void {
    if (!this.inverseSymbol) this.inverseSymbol = this.symbol.map((v) => (v > 0 ? 1 / v : 0))
    for (let start = 0; start < input.length; start += 2) {
      this.applyComplex(this.inverseSymbol, input[start]!, input[start + 1], out[start]!, start + 1 < input.length ? out[start + 1]! : undefined)
    }
  }

  private inverseSymbol?: Float64Array

  /** Circulant product with a given symbol on the window (masked), two real vectors per complex FFT pair. */
  private applyComplex(symbol: Float64Array, a: Float64Array, b: Float64Array | undefined, outA: Float64Array, outB: Float64Array | undefined): void {
    const { nx, ny, torusNx: tx, torusNy: ty, bufRe: re, bufIm: im, observed } = this
    re.fill(0); im.fill(0)
    for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
      const k = j * nx + i
      if (!observed[k]) continue
      re[j * tx + i] = a[k]!
      if (b) im[j * tx + i] = b[k]!
    }
    // Input lives on rows < ny and only rows < ny of the output are read: prune the row passes.
    fft2dRowPruned(re, im, tx, ty, ny)
    for (let k = 0; k < re.length; k++) { re[k]! *= symbol[k]!; im[k]! *= symbol[k]! }
    fft2dRowPruned(re, im, tx, ty, ny, true)
    for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
      const k = j * nx + i
      outA[k] = observed[k] ? re[j * tx + i]! : 0
      if (outB) outB[k] = observed[k] ? im[j * tx + i]! : 0
    }
  }

  /** Indices (J·nx + I) of the observed cells, in order. */
  observedIndices(): Int32Array {
    const idx = new Int32Array(this.observedCount)
    let c = 0
    for (let k = 0; k < this.observed.length; k++) if (this.observed[k]) idx[c++] = k
    return idx
  }

  /** Dense covariance matrix of the observed cells (row-major, order of observedIndices()). */
  denseObserved(): { matrix: Float64Array; index: Int32Array } {
    const index = this.observedIndices(), n = index.length, nx = this.nx
    const matrix = new Float64Array(n * n)
    for (let r = 0; r < n; r++) {
      const ir = index[r]! % nx, jr = (index[r]! - ir) / nx
      for (let c = 0; c <= r; c++) {
        const ic = index[c]! % nx, jc = (index[c]! - ic) / nx
        const v = this.entry(ir - ic, jr - jc)
        matrix[r * n + c] = v; matrix[c * n + r] = v
      }
    }
    return { matrix, index }
  }

  /** Largest and smallest value of the torus symbol: bounds on the eigenvalues of C. */
  symbolRange(): { min: number; max: number } {
    let min = Infinity, max = -Infinity
    for (const v of this.symbol) { if (v < min) min = v; if (v > max) max = v }
    return { min, max }
  }
}
