/**
 * Log–log slope of a radially averaged spectrum: least squares of log10 S on log10 k over the
 * rings with k in [minWavenumber, maxWavenumber] (cycles per cell) and S > 0, each ring weighted
 * by its number of modes when `modes` is given (the variance of a ring's log-mean periodogram
 * falls roughly as 1/modes for a Gaussian field, so this is close to inverse-variance weighting).
 * A power law S ∝ |k|^(−β) gives slope −β (common practice in spectral verification).
 */
import type { RadialSpectrum } from './radialSpectrum'

export interface SlopeFit { slope: number; intercept: number; rings: number }

/** Least-squares slope of log10 power against log10 wavenumber in the band (NaN with < 2 rings). */
export function spectralSlope(spectrum: Pick<RadialSpectrum, 'wavenumber' | 'power'> & { modes?: ArrayLike<number> }, minWavenumber = 0, maxWavenumber = 0.5): SlopeFit {
  const xs: number[] = [], ys: number[] = [], ws: number[] = []
  spectrum.wavenumber.forEach((k, r) => {
    const p = spectrum.power[r]!
    if (k >= minWavenumber && k <= maxWavenumber && p > 0) {
      xs.push(Math.log10(k)); ys.push(Math.log10(p)); ws.push(spectrum.modes ? spectrum.modes[r]! : 1)
    }
  })
  const n = xs.length
  if (n < 2) return { slope: NaN, intercept: NaN, rings: n }
  const wsum = ws.reduce((a, b) => a + b, 0)
  const mx = xs.reduce((a, x, k) => a + ws[k]! * x, 0) / wsum
  const my = ys.reduce((a, y, k) => a + ws[k]! * y, 0) / wsum
  let sxy = 0, sxx = 0
  for (let k = 0; k < n; k++) { sxy += ws[k]! * (xs[k]! - mx) * (ys[k]! - my); sxx += ws[k]! * (xs[k]! - mx) ** 2 }
  const slope = sxy / sxx
  return { slope, intercept: my - slope * mx, rings: n }
}
