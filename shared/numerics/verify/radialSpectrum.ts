/**
 * Radially averaged power spectral density: the 2-D periodogram (periodogram.ts) averaged over
 * rings of constant |k| = √(kx² + ky²) (common practice; GUIDE §4).
 *
 * Rings: width Δk = 1/min(nx, ny) cycles per cell; a mode belongs to ring r when
 * (r − ½)Δk ≤ |k| < (r + ½)Δk (ties, possible on non-square grids, decided exactly and going to
 * the outer ring); rings r = 1 … ⌊min(nx, ny)/2⌋ are reported, centred at r·Δk, up to the Nyquist wavenumber
 * 0.5 cycles per cell. Ring 0 (the mean and, on elongated grids, the longest waves) and the
 * corner modes beyond 0.5 are left out. Power: mean S over the ring's modes, in field²·cell²;
 * with a grid spacing Δx (km), also per km: k/Δx cycles per km and S·Δx² in field²·km².
 * Compare slopes, not only totals: a power law S ∝ |k|^(−β) has slope −β on log–log axes.
 */
import { periodogram, signedIndex, type PeriodogramOptions, type SpectrumWindow } from './periodogram'

export interface RadialSpectrum {
  /** Ring centres, cycles per grid cell. */
  wavenumber: Float64Array
  /** Mean periodogram over each ring, field² · cell². */
  power: Float64Array
  /** Number of DFT modes in each ring. */
  modes: Int32Array
  /** Ring width, cycles per grid cell. */
  binWidth: number
  /** Present when a spacing was given: cycles per km, and power in field² · km². */
  wavenumberPerKm?: Float64Array
  powerKm?: Float64Array
  window: SpectrumWindow
  removeMean: boolean
}

export interface RadialSpectrumOptions extends PeriodogramOptions {
  /** Grid spacing in km (optional). */
  spacing?: number
}

/**
 * Ring r = ⌊|k|/Δk + ½⌋ of the mode with signed DFT indices (p, q). |k|/Δk = √(a² + b²) with
 * a = p·m/nx, b = q·m/ny, m = min(nx, ny); near a half-integer the comparison is redone in exact
 * integer arithmetic: 4(A² + B²) vs (2r + 1)²L², with L = lcm(nx, ny), A = a·L, B = b·L.
 */
export function ringIndex(p: number, q: number, nx: number, ny: number): number {
  const m = Math.min(nx, ny)
  const a = (p * m) / nx, b = (q * m) / ny
  const rho = Math.sqrt(a * a + b * b)
  const edge = Math.round(rho + 0.5) // nearest ring boundary is at edge − ½
  if (Math.abs(rho + 0.5 - edge) > 1e-9 * (1 + rho)) return Math.floor(rho + 0.5)
  // rho is within rounding of the boundary edge − ½: decide exactly whether 4(A² + B²) ≥ (2·edge − 1)²L².
  const l = BigInt(lcm(nx, ny))
  const A = (BigInt(p * m) * l) / BigInt(nx), B = (BigInt(q * m) * l) / BigInt(ny)
  // BigInt(…) rather than literals: the server bundle targets a syntax level without BigInt literals.
  const boundary = BigInt(2 * edge - 1)
  return BigInt(4) * (A * A + B * B) >= boundary * boundary * l * l ? edge : edge - 1
}

function lcm(x: number, y: number): number {
  let a = x, b = y
  while (b) [a, b] = [b, a % b]
  return (x / a) * y
}

/** Radially averaged PSD of a row-major nx×ny field. */
export function radialSpectrum(field: ArrayLike<number>, nx: number, ny: number, options: RadialSpectrumOptions = {}): RadialSpectrum {
  const s = periodogram(field, nx, ny, options)
  const binWidth = 1 / Math.min(nx, ny)
  const rings = Math.floor(Math.min(nx, ny) / 2)
  const sum = new Float64Array(rings + 1)
  const modes = new Int32Array(rings + 1)
  for (let q = 0; q < ny; q++) {
    const kq = signedIndex(q, ny)
    for (let p = 0; p < nx; p++) {
      const r = ringIndex(signedIndex(p, nx), kq, nx, ny)
      if (r >= 1 && r <= rings) { sum[r]! += s[q * nx + p]!; modes[r]!++ }
    }
  }
  const wavenumber = Float64Array.from({ length: rings }, (_, k) => (k + 1) * binWidth)
  const power = Float64Array.from({ length: rings }, (_, k) => (modes[k + 1]! > 0 ? sum[k + 1]! / modes[k + 1]! : NaN))
  const out: RadialSpectrum = {
    wavenumber, power, modes: modes.slice(1), binWidth,
    window: options.window ?? 'hann', removeMean: options.removeMean ?? true,
  }
  if (options.spacing !== undefined) {
    const dx = options.spacing
    if (!(dx > 0)) throw new Error(`grid spacing must be a positive number of km, got ${dx}`)
    out.wavenumberPerKm = wavenumber.map((k) => k / dx)
    out.powerKm = power.map((v) => v * dx * dx)
  }
  return out
}
