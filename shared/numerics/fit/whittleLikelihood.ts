/**
 * Debiased Whittle likelihood of a coarse field (Guillaumin, Sykulski, Olhede & Simons 2022,
 * JRSS B 84:1526), on the nx×ny Fourier grid of the coarse field itself.
 *
 * Plain Whittle (Whittle 1954) compares the periodogram I(ω) with the spectral density; on a finite,
 * non-periodic grid that is biased (edge effects/leakage). The debiased form compares I(ω) with its exact
 * expectation Ī(ω) = Σ_τ c(τ) ρ_g(τ) e^{−iω·τ}, where c is the block-mean covariance from the
 * change-of-support table (aliasing and the box filter are already in it) and ρ_g(τ) = Σ_s g_s g_{s+τ} / Σ g²
 * the autocorrelation of the data weights g: the mask (1 valid, 0 missing, so missing cells are handled too)
 * times an optional split-cosine taper, which the same paper allows and which we use by default (fitCoarse.ts:
 * on 48×48 se fields the untapered form had 3× the spread of ℓ̂ and intervals covering 4 of 10; taper 0.3 fixed both).
 * Ī is one FFT of the τ-table folded onto the periodic grid: O(m log m) per length scale.
 */
import { fft2d } from '../fft/fft2d'
import type { CoarseField } from './coarseField'
import type { ProfiledFit } from './profileLikelihood'

export interface WhittleData {
  field: CoarseField
  /** I(ω_k) = |Σ_s g_s (y_s − ȳ_g) e^{−iω_k·s}|² / Σ g², row-major nx×ny over ky, kx. */
  periodogram: Float64Array
  /** ρ_g(τ) = Σ_s g_s g_{s+τ} / Σ g² in the change-of-support table layout, (2nx−1)×(2ny−1). */
  maskAutocorrelation: Float64Array
  /**
   * Effective number of data over the number of Fourier frequencies, (Σg²)²/Σg⁴ / (nx·ny): keeps the
   * likelihood's curvature on the scale of the information in the data (1 for a complete, untapered grid).
   */
  weight: number
}

/**
 * Split-cosine-bell (Tukey) taper of length n: cosine ramps over `fraction`/2 of the length at each end
 * (fraction 0: no taper, 1: Hann). Tapering lowers leakage (Dahlhaus & Künsch 1987, Biometrika 74:877),
 * which makes periodogram ordinates closer to independent, as the Whittle likelihood assumes.
 */
export function splitCosineTaper(n: number, fraction: number): Float64Array {
  const h = new Float64Array(n).fill(1)
  const ramp = 0.5 * fraction * n
  if (!(ramp > 0)) return h
  for (let i = 0; i < n; i++) {
    const d = Math.min(i + 0.5, n - i - 0.5) // distance of the cell centre from the nearer edge
    if (d < ramp) h[i] = 0.5 * (1 - Math.cos(Math.PI * d / ramp))
  }
  return h
}

/**
 * Periodogram and weight autocorrelation of a prepared field; computed once per fit.
 * Weights g_s = mask_s · h_x(i) · h_y(j) with the split-cosine taper of `taperFraction` (0 = none).
 */
export function prepareWhittle(field: CoarseField, taperFraction = 0): WhittleData {
  const { nx, ny, centred, mask } = field
  const n = nx * ny
  const hx = splitCosineTaper(nx, taperFraction), hy = splitCosineTaper(ny, taperFraction)
  const g = new Float64Array(n)
  let sumG = 0, sumGy = 0, sumG2 = 0, sumG4 = 0
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const k = j * nx + i, w = mask[k]! * hx[i]! * hy[j]!
      g[k] = w; sumG += w; sumGy += w * centred[k]!; sumG2 += w * w; sumG4 += w * w * w * w
    }
  }
  // Centring on the g-weighted mean makes the zero frequency exactly empty.
  const shift = sumGy / sumG
  const re = new Float64Array(n), im = new Float64Array(n)
  for (let k = 0; k < n; k++) re[k] = g[k]! * (centred[k]! - shift)
  fft2d(re, im, nx, ny)
  const periodogram = new Float64Array(n)
  for (let k = 0; k < n; k++) periodogram[k] = (re[k]! * re[k]! + im[k]! * im[k]!) / sumG2
  // Linear autocorrelation of g by FFT on a 2nx×2ny zero-padded grid (no wrap-around).
  const px = 2 * nx, py = 2 * ny
  const gr = new Float64Array(px * py), gi = new Float64Array(px * py)
  for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) gr[j * px + i] = g[j * nx + i]!
  fft2d(gr, gi, px, py)
  for (let k = 0; k < px * py; k++) { gr[k] = gr[k]! * gr[k]! + gi[k]! * gi[k]!; gi[k] = 0 }
  fft2d(gr, gi, px, py, true)
  const untapered = !(taperFraction > 0)
  const wx = 2 * nx - 1
  const rho = new Float64Array(wx * (2 * ny - 1))
  for (let ty = -(ny - 1); ty <= ny - 1; ty++) {
    for (let tx = -(nx - 1); tx <= nx - 1; tx++) {
      let pairs = gr[((ty + py) % py) * px + ((tx + px) % px)]!
      if (untapered) pairs = Math.round(pairs) // pair counts are integers: rounding removes FFT round-off
      rho[(ty + ny - 1) * wx + tx + nx - 1] = pairs / sumG2
    }
  }
  return { field, periodogram, maskAutocorrelation: rho, weight: (sumG2 * sumG2) / sumG4 / n }
}

/**
 * Expected periodogram Ī(ω_k) for the unit-variance block-mean correlation `table` plus a white `nugget`
 * (ratio to σ² on each coarse cell), on the nx×ny Fourier grid (row-major over ky, kx).
 */
export function expectedPeriodogram(data: WhittleData, table: Float64Array, nugget: number): Float64Array {
  const { nx, ny } = data.field
  const wx = 2 * nx - 1
  const re = new Float64Array(nx * ny), im = new Float64Array(nx * ny)
  const rho = data.maskAutocorrelation
  for (let ty = -(ny - 1); ty <= ny - 1; ty++) {
    const fy = ((ty + ny) % ny) * nx, row = (ty + ny - 1) * wx
    for (let tx = -(nx - 1); tx <= nx - 1; tx++) {
      const t = row + tx + nx - 1
      re[fy + ((tx + nx) % nx)]! += table[t]! * rho[t]!
    }
  }
  re[0]! += nugget // ρ_g(0) = 1
  fft2d(re, im, nx, ny)
  return re // the folded table is even, so the transform is real
}

/**
 * Debiased Whittle log-likelihood with σ² profiled out: over the K = nx·ny − 1 non-zero frequencies,
 * σ̂² = (1/K) Σ I/Ī₁ and ℓ = w·(−K/2 (ln 2πσ̂² + 1) − ½ Σ ln Ī₁), w = the weight of WhittleData.
 * The zero frequency is left out (it carries the unknown mean); the mean reported is the sample mean.
 * Returns a function of the nugget η: a white nugget adds η to Ī₁ at every frequency, so the
 * expected periodogram is computed once per table and every η costs one pass over the frequencies.
 */
export function whittleProfile(data: WhittleData, table: Float64Array): (nugget: number) => ProfiledFit {
  const expected = expectedPeriodogram(data, table, 0)
  const P = data.periodogram
  const n = P.length
  let peak = 0
  for (let k = 1; k < n; k++) peak = Math.max(peak, expected[k]!)
  // Ī is a variance, so ≥ 0; a floor keeps FFT round-off at near-singular spectra from producing ln(≤ 0).
  const floor = 1e-15 * peak
  const K = n - 1
  return (nugget) => {
    let ratio = 0, logSum = 0
    for (let k = 1; k < n; k++) {
      const e = Math.max(expected[k]! + nugget, floor)
      ratio += P[k]! / e
      logSum += Math.log(e)
    }
    const variance = ratio / K
    if (!(variance > 0)) return { logLikelihood: -Infinity, mean: data.field.offset, variance: NaN }
    const logLikelihood = data.weight * (-0.5 * K * (Math.log(2 * Math.PI * variance) + 1) - 0.5 * logSum)
    return { logLikelihood, mean: data.field.offset, variance }
  }
}

/** whittleProfile(data, table) at one nugget η. */
export function whittleLogLikelihood(data: WhittleData, table: Float64Array, nugget: number): ProfiledFit {
  return whittleProfile(data, table)(nugget)
}
