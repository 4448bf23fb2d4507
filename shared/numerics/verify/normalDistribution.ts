/**
 * Standard normal density and distribution function.
 * Φ by Marsaglia's Taylor series (Marsaglia 2004, J. Stat. Softw. 11(4)):
 * Φ(x) = ½ + φ(x)·(x + x³/3 + x⁵/(3·5) + …), all terms positive, absolute error ≈ 1e-15;
 * for |x| > 8 the tail (< 7e-16) is rounded to 0 or 1.
 */

const INV_SQRT_2PI = 1 / Math.sqrt(2 * Math.PI)

/** φ(x) = exp(−x²/2)/√(2π). */
export function normalDensity(x: number): number {
  return INV_SQRT_2PI * Math.exp(-0.5 * x * x)
}

/** Φ(x) = P(Z ≤ x) for a standard normal Z. */
export function normalCdf(x: number): number {
  if (Number.isNaN(x)) return NaN
  if (x < -8) return 0
  if (x > 8) return 1
  let term = x, sum = x
  const x2 = x * x
  for (let k = 3; sum + term !== sum; k += 2) { term *= x2 / k; sum += term }
  return 0.5 + sum * normalDensity(x)
}
