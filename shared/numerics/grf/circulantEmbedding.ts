/**
 * Circulant embedding of a stationary covariance on a padded torus (Dietrich & Newsam 1997,
 * SIAM J. Sci. Comput. 18:1088; Wood & Chan 1994, J. Comput. Graph. Stat. 3:409).
 *
 * The fine window (wx×wy cells) sits in the corner of an Nx×Ny torus. The torus covariance is the
 * kernel at the minimum-image offset, so on the window it equals the plane covariance exactly for
 * every lag shorter than N/2, and to the decay tolerance for every lag shorter than N − R, where R
 * is the kernel's decay radius (see `torusSide` for the two sizes this allows).
 * The torus covariance matrix is circulant: its eigenvalues λ(k) are the 2-D DFT of its first row.
 * Negative eigenvalues are set to zero only when that changes no covariance entry by more than a
 * stated bound (Σ|λ₋|/M, see `clampBound`); otherwise the torus is enlarged (doubled) and, after
 * `maxEnlargements` doublings, construction fails with a message: it never returns a wrong covariance.
 */
import { realFft2d } from '../fft/fft2d'
import { oddPart } from '../fft/fftPlan'

export interface EmbeddingOptions {
  /** Largest allowed change of any covariance entry from clamping negative eigenvalues, as a fraction of k(0) (default 1e-10). */
  clampTolerance?: number
  /** Torus doublings allowed after the first size (default 3). */
  maxEnlargements?: number
  /** Largest torus (points) the caller accepts (default 2^25 ≈ 33.5 M, i.e. 268 MB per plane). */
  maxPoints?: number
}

export interface CirculantEmbedding {
  /** Torus size in fine cells (multiples of the block factor). */
  nx: number
  ny: number
  /** λ(k) ≥ 0, row-major nx×ny (index ky·nx + kx), after clamping. Sums to M·k(0). */
  eigenvalues: Float64Array
  /** Smallest and largest eigenvalue before clamping. */
  minEigenvalue: number
  maxEigenvalue: number
  /** Upper bound on |Δk(h)| over all lags caused by clamping negative eigenvalues to zero (field units²). */
  clampBound: number
  /** How many times the torus was doubled because the eigenvalue check failed. */
  enlargements: number
  /** For a separable kernel k = s·kx(dx)·ky(dy): the 1-D torus spectra (λ = s·λx⊗λy). */
  separable?: { scale: number; x: Float64Array; y: Float64Array }
}

/**
 * Smallest admissible torus side for a window of `window` fine cells, decay radius `radius` (fine cells)
 * and block factor b, a multiple of b of the form oddPart(b)·2^k (fast radix-2/4 FFT passes plus one
 * small odd step). Two sizes are exact on the window: max(window + radius, 2·radius), where every
 * window lag is either exact or beyond the decay radius, and the minimal embedding 2·window, where
 * every window lag is shorter than half the torus and so taken at its true offset (Dietrich & Newsam
 * 1997). The smaller one is used: long length scales (radius ≫ window) take the minimal embedding,
 * whose positive semi-definiteness is then checked by `embedCovariance` (and the torus doubled if
 * it fails), as the method requires.
 */
export function torusSide(window: number, radius: number, b: number): number {
  const r = Math.ceil(radius)
  const need = Math.max(Math.min(Math.max(window + r, 2 * r), 2 * window), 2)
  const odd = oddPart(b)
  let n = odd
  while (n < need || n % b !== 0) n *= 2
  return n
}

function checkSize(nx: number, ny: number, options: EmbeddingOptions, enlargements: number): void {
  const maxPoints = options.maxPoints ?? 2 ** 25
  if (nx * ny > maxPoints) {
    throw new Error(`circulant embedding needs a ${nx}×${ny} torus (${enlargements} enlargement(s)), above the limit of ${maxPoints} points: the kernel is too long-range for this window`)
  }
}

/** Minimum-image offset of lag h on a torus of side n (in (−n/2, n/2]). */
function minimumImage(h: number, n: number): number {
  return h <= n / 2 ? h : h - n
}

function clampSpectrum(lambda: Float64Array): { min: number; max: number; bound: number } {
  let min = Infinity, max = -Infinity, negative = 0
  for (let k = 0; k < lambda.length; k++) {
    const v = lambda[k]!
    if (v < min) min = v
    if (v > max) max = v
    if (v < 0) { negative -= v; lambda[k] = 0 }
  }
  return { min, max, bound: negative / lambda.length }
}

/**
 * Embeds the stationary covariance `cov(dx, dy)` (fine cells, must satisfy cov(−h) = cov(h)) for a
 * wx×wy window. `radius` is the decay radius R (fine cells), `b` the block factor.
 */
export function embedCovariance(
  cov: (dx: number, dy: number) => number, wx: number, wy: number, b: number, radius: number, options: EmbeddingOptions = {},
): CirculantEmbedding {
  const variance = cov(0, 0)
  const tolerance = (options.clampTolerance ?? 1e-10) * Math.abs(variance)
  let nx = torusSide(wx, radius, b), ny = torusSide(wy, radius, b)
  const maxEnlargements = options.maxEnlargements ?? 3
  for (let enlargements = 0; ; enlargements++) {
    checkSize(nx, ny, options, enlargements)
    const lambda = torusSpectrum(cov, nx, ny)
    const { min, max, bound } = clampSpectrum(lambda)
    if (bound <= tolerance) return { nx, ny, eigenvalues: lambda, minEigenvalue: min, maxEigenvalue: max, clampBound: bound, enlargements }
    if (enlargements >= maxEnlargements) {
      throw new Error(`circulant embedding is not positive semi-definite on a ${nx}×${ny} torus after ${enlargements} enlargement(s): `
        + `min eigenvalue ${min.toExponential(3)}, clamping would change covariances by up to ${bound.toExponential(3)} (limit ${tolerance.toExponential(3)})`)
    }
    nx *= 2; ny *= 2
  }
}

/** Eigenvalues of the torus covariance: the real 2-D DFT of its (even) first row, expanded to the full grid. */
function torusSpectrum(cov: (dx: number, dy: number) => number, nx: number, ny: number): Float64Array {
  const row = new Float64Array(nx * ny)
  for (let j = 0; j < ny; j++) {
    const dy = minimumImage(j, ny)
    for (let i = 0; i < nx; i++) row[j * nx + i] = cov(minimumImage(i, nx), dy)
  }
  const half = realFft2d(row, nx, ny)
  const lambda = row // reuse: overwritten with the spectrum
  const hx = half.width
  for (let ky = 0; ky < ny; ky++) {
    for (let kx = 0; kx < hx; kx++) lambda[ky * nx + kx] = half.re[ky * hx + kx]!
    // Even sequence ⇒ real spectrum with λ(−k) = λ(k): the missing columns are mirrored.
    const myRow = ((ny - ky) % ny) * hx
    for (let kx = hx; kx < nx; kx++) lambda[ky * nx + kx] = half.re[myRow + (nx - kx)]!
  }
  return lambda
}

/**
 * Embedding of a separable covariance scale·kx(dx)·ky(dy) (e.g. the squared-exponential): the
 * spectrum is the outer product of two 1-D torus spectra, so the coarse operator keeps its
 * Kronecker structure exactly. Each 1-D spectrum is clamped; the bound is accumulated accordingly.
 */
export function embedSeparableCovariance(
  scale: number, kx: (h: number) => number, ky: (h: number) => number,
  wx: number, wy: number, b: number, radius: number, options: EmbeddingOptions = {},
): CirculantEmbedding {
  const tolerance = (options.clampTolerance ?? 1e-10) * Math.abs(scale * kx(0) * ky(0))
  let nx = torusSide(wx, radius, b), ny = torusSide(wy, radius, b)
  const maxEnlargements = options.maxEnlargements ?? 3
  for (let enlargements = 0; ; enlargements++) {
    checkSize(nx, ny, options, enlargements)
    const sx = torusSpectrum((dx) => kx(dx), nx, 1), sy = torusSpectrum((dx) => ky(dx), ny, 1)
    const cx = clampSpectrum(sx), cy = clampSpectrum(sy)
    // Clamping changes kx by ≤ cx.bound and ky by ≤ cy.bound, so k by ≤ s(|ky|max·bx + |kx|max·by + bx·by).
    const bound = Math.abs(scale) * (Math.abs(ky(0)) * cx.bound + Math.abs(kx(0)) * cy.bound + cx.bound * cy.bound)
    if (bound <= tolerance) {
      const lambda = new Float64Array(nx * ny)
      let min = Infinity, max = -Infinity
      for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
        const v = scale * sx[i]! * sy[j]!
        lambda[j * nx + i] = v
        if (v < min) min = v
        if (v > max) max = v
      }
      const rawMin = Math.min(scale * Math.min(cx.min * cy.max, cx.max * cy.min, cx.min * cy.min), min)
      return { nx, ny, eigenvalues: lambda, minEigenvalue: rawMin, maxEigenvalue: max, clampBound: bound, enlargements, separable: { scale, x: sx, y: sy } }
    }
    if (enlargements >= maxEnlargements) {
      throw new Error(`circulant embedding is not positive semi-definite on a ${nx}×${ny} torus after ${enlargements} enlargement(s): `
        + `clamping would change covariances by up to ${bound.toExponential(3)} (limit ${tolerance.toExponential(3)})`)
    }
    nx *= 2; ny *= 2
  }
}
