/**
 * Censored latent Gaussian for precipitation (Allcroft & Glasbey 2003, JRSS C 52:487): a latent
 * Gaussian g is dry (x = 0) where g ≤ 0 and wet above, with a power law x = g^{1/λ} for the amount,
 * so the dry fraction and the skew of wet amounts come from one field. The marginal of g, N(μ, σ²),
 * and λ are fitted by maximum likelihood of the censored sample (the Tobit likelihood, Tobin 1958):
 *   L = Σ_wet [ln φ((xᵢ^λ − μ)/σ) − ln σ + ln λ + (λ − 1) ln xᵢ] + Σ_dry ln Φ(−μ/σ),
 * maximised over (μ, σ) by Newton's method in Olsen's (1978, Econometrica 46:1211) parameters
 * β = μ/σ, θ = 1/σ, where L is concave, and over λ by Brent's method. As for Box–Cox, on a coarse
 * field this is an independence (composite) likelihood of the block values.
 */
import { minimizeBounded } from '../optimize/brentMinimize'
import { inverseMillsRatio, logNormalCdf } from './logNormalCdf'

/** Search interval for λ (λ = 1: censored Gaussian amounts; smaller λ: more skewed wet amounts). */
export const CENSORED_LAMBDA_RANGE: [number, number] = [0.2, 1.5]
/** λ used when there are too few wet values to fit it: the square-root transform, common practice for rain. */
export const DEFAULT_CENSORED_LAMBDA = 0.5
/** Fewest wet values for which λ is fitted. */
export const MIN_WET_FOR_LAMBDA = 8

const HALF_LOG_2PI = 0.5 * Math.log(2 * Math.PI)

/** Latent value of a wet amount x > 0: x^λ (dry amounts have no single latent value). */
export function censoredToLatent(x: number, lambda: number): number {
  return Math.pow(x, lambda)
}

/** Amount of a latent value: 0 for g ≤ 0, g^{1/λ} above. Never negative. */
export function censoredToPhysical(g: number, lambda: number): number {
  return g > 0 ? Math.exp(Math.log(g) / lambda) : 0
}

/** dx/dg: (1/λ) g^{1/λ − 1} for g > 0, 0 for g ≤ 0. */
export function censoredDerivative(g: number, lambda: number): number {
  return g > 0 ? Math.pow(g, 1 / lambda - 1) / lambda : 0
}

export interface CensoredMarginal {
  /** Latent mean and standard deviation. */
  mean: number
  sd: number
  logLikelihood: number
  /** Newton iterations used. */
  iterations: number
}

/**
 * Maximum-likelihood N(μ, σ²) of latent values censored at 0: `wet` are the latent values of the wet
 * cells (xᵢ^λ), `dryCount` the number of dry cells. Needs at least two distinct wet values.
 */
export function fitCensoredNormal(wet: ArrayLike<number>, dryCount: number): CensoredMarginal {
  const n = wet.length
  if (n < 2) throw new Error(`censored fit needs at least 2 wet values, got ${n}`)
  let s = 0, ss = 0
  for (let k = 0; k < n; k++) { s += wet[k]!; ss += wet[k]! * wet[k]! }
  const m0 = s / n, v0 = ss / n - m0 * m0
  if (!(v0 > 1e-24 * (m0 * m0 + 1e-300))) throw new Error('censored fit: the wet values are all equal')
  let beta = m0 / Math.sqrt(v0), theta = 1 / Math.sqrt(v0)
  const logLik = (b: number, t: number): number => {
    if (!(t > 0)) return -Infinity
    let l = n * Math.log(t) + dryCount * logNormalCdf(-b)
    for (let k = 0; k < n; k++) { const r = t * wet[k]! - b; l -= 0.5 * r * r }
    return l
  }
  let current = logLik(beta, theta), iterations = 0
  for (; iterations < 100; iterations++) {
    // Gradient and Hessian of L(β, θ) (concave: Olsen 1978).
    let gb = 0, gt = n / theta, hbb = 0, hbt = 0, htt = -n / (theta * theta)
    for (let k = 0; k < n; k++) {
      const z = wet[k]!, r = theta * z - beta
      gb += r; gt -= r * z
      hbb -= 1; hbt += z; htt -= z * z
    }
    if (dryCount > 0) {
      const u = -beta, mills = inverseMillsRatio(u)
      gb -= dryCount * mills
      hbb -= dryCount * mills * (u + mills)
    }
    const det = hbb * htt - hbt * hbt
    // Newton step −H⁻¹ g, halved until the likelihood increases.
    let db = -(htt * gb - hbt * gt) / det, dt = -(hbb * gt - hbt * gb) / det
    let step = 1, next = -Infinity
    for (let halvings = 0; halvings < 40; halvings++, step /= 2) {
      next = logLik(beta + step * db, theta + step * dt)
      if (next >= current) break
    }
    if (!(next >= current)) break
    beta += step * db; theta += step * dt
    const gain = next - current
    current = next
    if ((Math.abs(step * db) < 1e-12 * (1 + Math.abs(beta)) && Math.abs(step * dt) < 1e-12 * theta) || gain < 1e-14 * (1 + Math.abs(current))) break
  }
  return { mean: beta / theta, sd: 1 / theta, logLikelihood: current - n * HALF_LOG_2PI, iterations }
}

export interface CensoredPowerFit extends CensoredMarginal {
  lambda: number
  /** Fitted probability that a cell of the fitted field is dry, Φ(−μ/σ). */
  dryProbability: number
  lambdaFitted: boolean
  atBound: 'lower' | 'upper' | null
}

/** Profile log-likelihood in λ of non-negative amounts (0 = dry) under the censored power model. */
export function censoredPowerLogLikelihood(values: ArrayLike<number>, lambda: number): number {
  const { wet, dry, sumLog } = splitWet(values, lambda)
  const marginal = fitCensoredNormal(wet, dry)
  return marginal.logLikelihood + wet.length * Math.log(lambda) + (lambda - 1) * sumLog
}

/**
 * Fits λ (Brent over CENSORED_LAMBDA_RANGE, or DEFAULT_CENSORED_LAMBDA when fewer than
 * MIN_WET_FOR_LAMBDA wet values; `fixedLambda` skips the search) and the latent marginal, from
 * finite non-negative amounts.
 */
export function fitCensoredPower(values: ArrayLike<number>, range: [number, number] = CENSORED_LAMBDA_RANGE, fixedLambda?: number): CensoredPowerFit {
  let wetCount = 0
  for (let k = 0; k < values.length; k++) {
    const v = values[k]!
    if (!(v >= 0) || !Number.isFinite(v)) throw new Error(`censored model needs finite non-negative amounts, got ${v}`)
    if (v > 0) wetCount++
  }
  let lambda = fixedLambda ?? DEFAULT_CENSORED_LAMBDA, lambdaFitted = false, atBound: CensoredPowerFit['atBound'] = null
  if (fixedLambda === undefined && wetCount >= MIN_WET_FOR_LAMBDA) {
    const [a, b] = range
    const best = minimizeBounded((l) => -censoredPowerLogLikelihood(values, l), a, b, { tolerance: 1e-6 })
    lambda = best.x
    lambdaFitted = true
    const span = b - a
    atBound = lambda - a < 1e-4 * span ? 'lower' : b - lambda < 1e-4 * span ? 'upper' : null
  }
  const { wet, dry } = splitWet(values, lambda)
  const marginal = fitCensoredNormal(wet, dry)
  return { ...marginal, lambda, dryProbability: Math.exp(logNormalCdf(-marginal.mean / marginal.sd)), lambdaFitted, atBound }
}

function splitWet(values: ArrayLike<number>, lambda: number): { wet: Float64Array; dry: number; sumLog: number } {
  let count = 0
  for (let k = 0; k < values.length; k++) if (values[k]! > 0) count++
  const wet = new Float64Array(count)
  let sumLog = 0, w = 0
  for (let k = 0; k < values.length; k++) {
    const x = values[k]!
    if (x > 0) { wet[w++] = Math.pow(x, lambda); sumLog += Math.log(x) }
  }
  return { wet, dry: values.length - count, sumLog }
}
