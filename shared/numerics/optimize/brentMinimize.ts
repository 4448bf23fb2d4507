/**
 * Bounded one-dimensional minimisation by Brent's method: golden-section steps safeguarding
 * successive parabolic interpolation (Brent 1973, "Algorithms for Minimization without Derivatives",
 * ch. 5, procedure localmin). Finds a local minimum of f on [lower, upper]; f is never evaluated outside.
 */

export interface MinimizeResult {
  /** Location of the minimum found. */
  x: number
  /** f(x). */
  value: number
  /** Number of calls to f made by this search (the optional start value is not counted). */
  evaluations: number
}

export interface MinimizeOptions {
  /** Absolute tolerance on x (default 1e-6 of the interval). */
  tolerance?: number
  /** Cap on function calls (default 100). */
  maxEvaluations?: number
  /** A known interior point and its value, e.g. the best point of a coarse grid search (saves a call). */
  start?: { x: number; value: number }
}

const GOLDEN = (3 - Math.sqrt(5)) / 2
const SQRT_EPS = Math.sqrt(Number.EPSILON)

/** Minimises f on [lower, upper] (Brent 1973). Non-finite values of f are treated as +Infinity. */
export function minimizeBounded(f: (x: number) => number, lower: number, upper: number, options: MinimizeOptions = {}): MinimizeResult {
  if (!(lower < upper)) throw new RangeError(`minimizeBounded: need lower < upper, got [${lower}, ${upper}]`)
  const tol = options.tolerance ?? 1e-6 * (upper - lower)
  const maxEvaluations = options.maxEvaluations ?? 100
  let evaluations = 0
  const call = (x: number) => { evaluations++; const v = f(x); return Number.isFinite(v) ? v : Infinity }

  let a = lower, b = upper
  let x: number, fx: number
  if (options.start && options.start.x > lower && options.start.x < upper) ({ x, value: fx } = options.start)
  else { x = a + GOLDEN * (b - a); fx = call(x) }
  if (!Number.isFinite(fx)) fx = Infinity
  let w = x, v = x, fw = fx, fv = fx
  let d = 0, e = 0 // last step and the step before it

  while (evaluations < maxEvaluations) {
    const mid = 0.5 * (a + b)
    const tol1 = SQRT_EPS * Math.abs(x) + tol / 3
    const tol2 = 2 * tol1
    if (Math.abs(x - mid) <= tol2 - 0.5 * (b - a)) break

    let parabolic = false
    if (Math.abs(e) > tol1) {
      // Parabola through (v, fv), (w, fw), (x, fx); step p/q from x to its vertex.
      let r = (x - w) * (fx - fv)
      let q = (x - v) * (fx - fw)
      let p = (x - v) * q - (x - w) * r
      q = 2 * (q - r)
      if (q > 0) p = -p
      else q = -q
      r = e
      e = d
      // Accept only a step that stays inside (a, b) and is less than half the step before last.
      if (Math.abs(p) < Math.abs(0.5 * q * r) && p > q * (a - x) && p < q * (b - x)) {
        d = p / q
        const u = x + d
        if (u - a < tol2 || b - u < tol2) d = x < mid ? tol1 : -tol1
        parabolic = true
      }
    }
    if (!parabolic) {
      e = x < mid ? b - x : a - x
      d = GOLDEN * e
    }
    const u = Math.abs(d) >= tol1 ? x + d : x + (d > 0 ? tol1 : -tol1)
    const fu = call(u)
    if (fu <= fx) {
      if (u < x) b = x
      else a = x
      v = w; fv = fw
      w = x; fw = fx
      x = u; fx = fu
    } else {
      if (u < x) a = u
      else b = u
      if (fu <= fw || w === x) { v = w; fv = fw; w = u; fw = fu }
      else if (fu <= fv || v === x || v === w) { v = u; fv = fu }
    }
  }
  return { x, value: fx, evaluations }
}
