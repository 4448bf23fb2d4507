/**
 * Root of a continuous function on a bracketing interval by Brent's method: bisection safeguarding
 * the secant step and inverse quadratic interpolation (Brent 1973, "Algorithms for Minimization without
 * Derivatives", ch. 4, procedure zero).
 */

export interface RootResult {
  /** The root (within the tolerance). */
  x: number
  /** Number of calls to f made by this search (the two given end values are not counted). */
  evaluations: number
}

const EPS = Number.EPSILON

/**
 * Finds x in [a, b] with f(x) = 0, given f(a) = fa and f(b) = fb of opposite signs (or one of them 0).
 * Absolute tolerance `tolerance` on x (default 1e-9 of the interval).
 */
export function findRootBracketed(f: (x: number) => number, a: number, b: number, fa: number, fb: number, tolerance = 1e-9 * Math.abs(b - a), maxEvaluations = 100): RootResult {
  if (fa === 0) return { x: a, evaluations: 0 }
  if (fb === 0) return { x: b, evaluations: 0 }
  if ((fa > 0) === (fb > 0)) throw new RangeError('findRootBracketed: f(a) and f(b) must have opposite signs')
  let c = a, fc = fa
  let d = b - a, e = d
  let evaluations = 0
  while (evaluations < maxEvaluations) {
    if ((fb > 0) === (fc > 0)) { c = a; fc = fa; d = b - a; e = d }
    if (Math.abs(fc) < Math.abs(fb)) { a = b; b = c; c = a; fa = fb; fb = fc; fc = fa }
    const tol1 = 2 * EPS * Math.abs(b) + 0.5 * tolerance
    const half = 0.5 * (c - b)
    if (Math.abs(half) <= tol1 || fb === 0) break
    if (Math.abs(e) >= tol1 && Math.abs(fa) > Math.abs(fb)) {
      const s = fb / fa
      let p: number, q: number
      if (a === c) { // secant
        p = 2 * half * s
        q = 1 - s
      } else { // inverse quadratic interpolation
        const qa = fa / fc, r = fb / fc
        p = s * (2 * half * qa * (qa - r) - (b - a) * (r - 1))
        q = (qa - 1) * (r - 1) * (s - 1)
      }
      if (p > 0) q = -q
      else p = -p
      if (2 * p < Math.min(3 * half * q - Math.abs(tol1 * q), Math.abs(e * q))) { e = d; d = p / q }
      else { d = half; e = d }
    } else { d = half; e = d }
    a = b; fa = fb
    b += Math.abs(d) > tol1 ? d : (half > 0 ? tol1 : -tol1)
    fb = f(b)
    evaluations++
  }
  return { x: b, evaluations }
}
