/**
 * Comparing a radially averaged spectrum with a reference one (radialSpectrum.ts), ring by ring:
 * the ratio, the shortest wavelength down to which the ratio stays within a factor of the reference,
 * and the share of the reference's variance carried in a wavenumber band. Compare spectra by ratio
 * on log axes, not by totals (common practice; GUIDE §4). Arrays are indexed by ring, ascending
 * wavenumber, as radialSpectrum returns them.
 */

/** power[r] / reference[r]; NaN where either is missing or the reference is not positive. */
export function spectrumRatio(power: ArrayLike<number>, reference: ArrayLike<number>): Float64Array {
  if (power.length !== reference.length) throw new Error(`spectra have ${power.length} and ${reference.length} rings`)
  return Float64Array.from({ length: power.length }, (_, r) => {
    const p = power[r]!, q = reference[r]!
    return Number.isFinite(p) && q > 0 && Number.isFinite(q) ? p / q : NaN
  })
}

/**
 * Index of the last ring, counting from the longest wave, up to which every defined ratio lies in
 * [1/factor, factor]; −1 when the first ring already lies outside. Rings with an undefined ratio
 * (NaN) are skipped, neither breaking nor extending the run.
 */
export function agreementLimit(ratio: ArrayLike<number>, factor = 2): number {
  if (!(factor > 1)) throw new Error(`agreement factor must exceed 1, got ${factor}`)
  let last = -1
  for (let r = 0; r < ratio.length; r++) {
    const x = ratio[r]!
    if (Number.isNaN(x)) continue
    if (x < 1 / factor || x > factor) break
    last = r
  }
  return last
}

/**
 * Σ power·modes / Σ reference·modes over the rings with wavenumber > minWavenumber: the share of the
 * reference's variance in that band that the spectrum carries (ring power is a mean over the ring's
 * modes, so the modes weight it back to a sum). NaN when the reference has no power in the band.
 */
export function bandPowerRatio(power: ArrayLike<number>, reference: ArrayLike<number>, modes: ArrayLike<number>, wavenumber: ArrayLike<number>, minWavenumber: number): number {
  let num = 0, den = 0
  for (let r = 0; r < wavenumber.length; r++) {
    if (!(wavenumber[r]! > minWavenumber)) continue
    const p = power[r]!, q = reference[r]!
    if (!Number.isFinite(p) || !Number.isFinite(q)) continue
    num += p * modes[r]!
    den += q * modes[r]!
  }
  return den > 0 ? num / den : NaN
}
