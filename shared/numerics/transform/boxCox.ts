/**
 * Box–Cox power transform (Box & Cox 1964, JRSS B 26:211) of a positive variable:
 *   g = (x^λ − 1)/λ  (λ ≠ 0),  g = ln x  (λ = 0),
 * with λ fitted by maximising the profile log-likelihood of an independent normal sample,
 *   L(λ) = −(n/2) ln σ̂²(λ) + (λ − 1) Σ ln xᵢ,  σ̂² the maximum-likelihood variance of the gᵢ,
 * the form scipy.stats.boxcox_llf evaluates. Applied to a coarse field, whose cells are correlated,
 * this is an independence (composite) likelihood: the estimating equation stays unbiased for the
 * marginal transform; only its variance is larger than the nominal one.
 */
import { minimizeBounded } from '../optimize/brentMinimize'

/** Search interval for λ. λ < 0 is excluded on purpose: its inverse is bounded above (x → ∞ as g → −1/λ). */
export const BOX_COX_LAMBDA_RANGE: [number, number] = [0, 2]

/** g = (x^λ − 1)/λ, or ln x at λ = 0 (continuous in λ; expm1 keeps small λ accurate). x > 0. */
export function boxCox(x: number, lambda: number): number {
  return lambda === 0 ? Math.log(x) : Math.expm1(lambda * Math.log(x)) / lambda
}

/**
 * Inverse x = (1 + λ g)^{1/λ}, or e^g at λ = 0. For λ > 0 the inverse exists only for g > −1/λ;
 * below it the value is 0, the physical lower bound (reached only > 1/(λ σ) latent standard deviations out).
 */
export function inverseBoxCox(g: number, lambda: number): number {
  if (lambda === 0) return Math.exp(g)
  const base = 1 + lambda * g
  return base > 0 ? Math.exp(Math.log(base) / lambda) : 0
}

/** dx/dg of the inverse: (1 + λ g)^{1/λ − 1} (e^g at λ = 0), 0 below the bound. */
export function inverseBoxCoxDerivative(g: number, lambda: number): number {
  if (lambda === 0) return Math.exp(g)
  const base = 1 + lambda * g
  return base > 0 ? Math.exp((1 / lambda - 1) * Math.log(base)) : 0
}

/** Profile log-likelihood L(λ) (additive constants dropped) of positive values. */
export function boxCoxLogLikelihood(values: ArrayLike<number>, lambda: number): number {
  const n = values.length
  let sum = 0, sumSq = 0, sumLog = 0
  // Centre on the first transformed value: one pass, no catastrophic cancellation for tight samples.
  const shift = boxCox(values[0]!, lambda)
  for (let k = 0; k < n; k++) {
    const x = values[k]!
    const g = boxCox(x, lambda) - shift
    sum += g; sumSq += g * g; sumLog += Math.log(x)
  }
  const variance = sumSq / n - (sum / n) ** 2
  return -0.5 * n * Math.log(variance) + (lambda - 1) * sumLog
}

export interface BoxCoxFit {
  lambda: number
  logLikelihood: number
  /** Approximate standard error of λ̂ from the profile's curvature (NaN at a bound), independence assumed. */
  standardError: number
  atBound: 'lower' | 'upper' | null
}

/** Maximum-likelihood λ over BOX_COX_LAMBDA_RANGE for positive, finite values (at least 3, not all equal). */
export function fitBoxCox(values: ArrayLike<number>, range: [number, number] = BOX_COX_LAMBDA_RANGE): BoxCoxFit {
  if (values.length < 3) throw new Error(`Box–Cox fit needs at least 3 values, got ${values.length}`)
  let lo = Infinity, hi = -Infinity
  for (let k = 0; k < values.length; k++) {
    const v = values[k]!
    if (!(v > 0) || !Number.isFinite(v)) throw new Error(`Box–Cox needs positive finite values, got ${v}`)
    lo = Math.min(lo, v); hi = Math.max(hi, v)
  }
  if (hi - lo <= 1e-12 * hi) throw new Error('Box–Cox fit: all values are equal')
  const [a, b] = range
  const best = minimizeBounded((l) => -boxCoxLogLikelihood(values, l), a, b, { tolerance: 1e-7 })
  const lambda = best.x
  const span = b - a
  const atBound = lambda - a < 1e-4 * span ? 'lower' : b - lambda < 1e-4 * span ? 'upper' : null
  let standardError = NaN
  if (!atBound) {
    const h = Math.min(1e-3, (lambda - a) / 2, (b - lambda) / 2)
    const curvature = (2 * best.value - (-boxCoxLogLikelihood(values, lambda + h)) - (-boxCoxLogLikelihood(values, lambda - h))) / (h * h)
    standardError = curvature < 0 ? 1 / Math.sqrt(-curvature) : NaN
  }
  return { lambda: atBound === 'lower' ? a : atBound === 'upper' ? b : lambda, logLikelihood: -best.value, standardError, atBound }
}
