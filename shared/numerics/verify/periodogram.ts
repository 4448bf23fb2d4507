/**
 * Two-dimensional periodogram of a row-major nx×ny field (common practice in spectral
 * verification, e.g. Harris et al. 2001, J. Hydrometeor. 2:406).
 *
 * S(kx, ky) = |F(kx, ky)|² / (nx·ny·U), F the DFT of (x − x̄)·w (mean removal optional), w the
 * window and U = mean(w²) (1 without a window), so that Σ S·Δkx·Δky = mean((x − x̄)²) exactly
 * without a window (Parseval) and approximately with one. Wavenumbers in cycles per grid cell:
 * kx = p/nx, ky = q/ny with p, q the signed DFT indices; units of S: field² · cell².
 * Any grid size (the FFT handles non-powers of two exactly, fft/fftPlan.ts).
 */
import { fft2d } from '../fft/fft2d'

/** 'hann': separable w(i, j) = sin²(π(i + ½)/nx)·sin²(π(j + ½)/ny), tapering to ~0 at the edges. */
export type SpectrumWindow = 'none' | 'hann'

export interface PeriodogramOptions {
  /** Subtract the field mean before windowing (default true). */
  removeMean?: boolean
  /** Default 'hann': real fields are not periodic, and an untapered edge leaks power to small scales. */
  window?: SpectrumWindow
}

/** Signed DFT index of position p on an axis of length n: 0, 1, …, ⌈n/2⌉ − 1, −⌊n/2⌋, …, −1. */
export function signedIndex(p: number, n: number): number {
  return p < Math.ceil(n / 2) ? p : p - n
}

function hann(n: number): Float64Array {
  return Float64Array.from({ length: n }, (_, i) => Math.sin((Math.PI * (i + 0.5)) / n) ** 2)
}

/** S(kx, ky) on the DFT grid (row-major, index q·nx + p, unshifted: zero frequency at 0). */
export function periodogram(field: ArrayLike<number>, nx: number, ny: number, options: PeriodogramOptions = {}): Float64Array {
  const n = nx * ny
  if (field.length !== n) throw new Error(`field has ${field.length} values, expected ${nx}×${ny}`)
  const removeMean = options.removeMean ?? true
  const window = options.window ?? 'hann'
  let mean = 0
  if (removeMean) { for (let k = 0; k < n; k++) mean += field[k]!; mean /= n }
  const re = new Float64Array(n), im = new Float64Array(n)
  let u = 1
  if (window === 'hann') {
    const wx = hann(nx), wy = hann(ny)
    let w2 = 0
    for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
      const w = wx[i]! * wy[j]!
      re[j * nx + i] = (field[j * nx + i]! - mean) * w
      w2 += w * w
    }
    u = w2 / n
  } else {
    for (let k = 0; k < n; k++) re[k] = field[k]! - mean
  }
  for (let k = 0; k < n; k++) if (!Number.isFinite(re[k]!)) throw new Error('field has missing or non-finite values')
  fft2d(re, im, nx, ny)
  const scale = 1 / (n * u)
  const s = new Float64Array(n)
  for (let k = 0; k < n; k++) s[k] = (re[k]! * re[k]! + im[k]! * im[k]!) * scale
  return s
}
