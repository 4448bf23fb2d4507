/**
 * ln Φ(x) for the standard normal distribution, accurate far into the lower tail where Φ underflows:
 * for x ≥ −2.5, ln of Marsaglia's series (verify/normalDistribution.ts; absolute error ~1e-15, so
 * relative ≤ 2e-13 there); below, Laplace's continued fraction Φ(−t) = φ(t) / (t + 1/(t + 2/(t + …)))
 * (Abramowitz & Stegun 1964, 26.2.14), evaluated bottom-up with 100 terms (relative error ~2e-16
 * for t ≥ 2.5, checked against scipy.special.log_ndtr).
 */
import { normalCdf } from '../verify/normalDistribution'

const HALF_LOG_2PI = 0.5 * Math.log(2 * Math.PI)

export function logNormalCdf(x: number): number {
  if (x >= -2.5) return Math.log(normalCdf(x))
  const t = -x
  let f = t
  for (let k = 100; k >= 1; k--) f = t + k / f
  return -0.5 * t * t - HALF_LOG_2PI - Math.log(f)
}

/** Inverse Mills ratio φ(x)/Φ(x), stable for very negative x (where it tends to −x). */
export function inverseMillsRatio(x: number): number {
  return Math.exp(-0.5 * x * x - HALF_LOG_2PI - logNormalCdf(x))
}
