/**
 * Modified Bessel function of the second kind K_ν(x), real order ν ≥ 0, argument x > 0.
 *
 * Method: the combined scheme known as "bessik" (Press et al., Numerical Recipes, 2nd ed., §6.7):
 * the order is split as ν = μ + n with |μ| ≤ 1/2; K_μ and K_{μ+1} come from Temme's series for x ≤ 2
 * (Temme 1975, J. Comput. Phys. 19:324) or from Steed's evaluation of the continued fraction CF2
 * (Thompson & Barnett 1987, J. Comput. Phys. 64:490) for x > 2; then the forward recurrence
 * K_{μ+k+1} = K_{μ+k−1} + (2(μ+k)/x) K_{μ+k}, which is stable for K.
 * Temme's gam1/gam2 are evaluated from the Taylor series of 1/Γ (A&S 6.1.34) instead of Chebyshev fits.
 */

/** Taylor coefficients c_k of 1/Γ(z) = Σ_{k≥1} c_k z^k (A&S 6.1.34; recomputed by tests/numerics/kernels/make_reciprocal_gamma_coefficients.py). */
const RECIPROCAL_GAMMA = [
  1.0, 5.7721566490153286e-1, -6.5587807152025388e-1, -4.2002635034095236e-2, 1.6653861138229149e-1,
  -4.2197734555544337e-2, -9.6219715278769736e-3, 7.2189432466630995e-3, -1.1651675918590651e-3,
  -2.1524167411495097e-4, 1.2805028238811619e-4, -2.0134854780788239e-5, -1.2504934821426707e-6,
  1.1330272319816959e-6, -2.0563384169776071e-7, 6.1160951044814158e-9, 5.0020076444692229e-9,
  -1.1812745704870201e-9, 1.0434267116911005e-10, 7.7822634399050713e-12, -3.6968056186422057e-12,
  5.100370287454476e-13, -2.0583260535665068e-14, -5.348122539423018e-15, 1.2267786282382608e-15,
  -1.1812593016974588e-16,
]

/**
 * Temme's auxiliary functions for |μ| ≤ 1/2:
 * gam1 = (1/Γ(1−μ) − 1/Γ(1+μ))/(2μ), gam2 = (1/Γ(1−μ) + 1/Γ(1+μ))/2, and 1/Γ(1±μ) themselves.
 * With 1/Γ(1+μ) = Σ c_k μ^{k−1}: gam1 = −Σ_{k even} c_k μ^{k−2}, gam2 = Σ_{k odd} c_k μ^{k−1} (no cancellation at μ → 0).
 */
function temmeGammas(mu: number): { gam1: number; gam2: number; gamPlus: number; gamMinus: number } {
  const mu2 = mu * mu
  let gam1 = 0, gam2 = 0
  // Horner in μ² from the highest coefficient down; index k−1 holds c_k.
  for (let k = 26; k >= 2; k -= 2) gam1 = gam1 * mu2 + RECIPROCAL_GAMMA[k - 1]!
  for (let k = 25; k >= 1; k -= 2) gam2 = gam2 * mu2 + RECIPROCAL_GAMMA[k - 1]!
  gam1 = -gam1
  return { gam1, gam2, gamPlus: gam2 - mu * gam1, gamMinus: gam2 + mu * gam1 }
}

const EPS = 1e-16
const MAX_ITERATIONS = 10000
/** Values above this are rescaled during the recurrence (their logarithm is carried separately). */
const RESCALE_AT = 1e250

/** K_μ(x), K_{μ+1}(x) for |μ| ≤ 1/2, 0 < x ≤ 2, by Temme's series. */
function temmeSeries(mu: number, x: number): [number, number] {
  const halfX = 0.5 * x
  const piMu = Math.PI * mu
  const fact = Math.abs(piMu) < EPS ? 1 : piMu / Math.sin(piMu)
  const d = -Math.log(halfX)
  const e = mu * d
  const fact2 = Math.abs(e) < EPS ? 1 : Math.sinh(e) / e
  const { gam1, gam2, gamPlus, gamMinus } = temmeGammas(mu)
  let f = fact * (gam1 * Math.cosh(e) + gam2 * fact2 * d)
  let sum = f
  const expE = Math.exp(e)
  let p = 0.5 * expE / gamPlus // ½ (x/2)^{−μ} Γ(1+μ)
  let q = 0.5 / (expE * gamMinus) // ½ (x/2)^{μ} Γ(1−μ)
  let c = 1
  const quarterX2 = halfX * halfX
  let sum1 = p
  const mu2 = mu * mu
  for (let i = 1; i <= MAX_ITERATIONS; i++) {
    f = (i * f + p + q) / (i * i - mu2)
    c *= quarterX2 / i
    p /= i - mu
    q /= i + mu
    const del = c * f
    sum += del
    sum1 += c * (p - i * f)
    if (Math.abs(del) < Math.abs(sum) * EPS) break
  }
  return [sum, sum1 * (2 / x)]
}

/** e^x K_μ(x), e^x K_{μ+1}(x) for |μ| ≤ 1/2, x > 2, by Steed's algorithm for CF2. */
function steedContinuedFraction(mu: number, x: number): [number, number] {
  const mu2 = mu * mu
  let b = 2 * (1 + x)
  let d = 1 / b
  let delh = d
  let h = d
  let q1 = 0, q2 = 1
  const a1 = 0.25 - mu2
  let q = a1
  let c = a1
  let a = -a1
  let s = 1 + q * delh
  for (let i = 2; i <= MAX_ITERATIONS; i++) {
    a -= 2 * (i - 1)
    c = -a * c / i
    const qNew = (q1 - b * q2) / a
    q1 = q2
    q2 = qNew
    q += c * qNew
    b += 2
    d = 1 / (b + a * d)
    delh = (b * d - 1) * delh
    h += delh
    const dels = q * delh
    s += dels
    if (Math.abs(dels / s) < EPS) break
  }
  h = a1 * h
  const kMu = Math.sqrt(Math.PI / (2 * x)) / s
  return [kMu, kMu * (mu + x + 0.5 - h) / x]
}

/**
 * K_ν(x) as value · exp(logFactor), so that callers can avoid overflow (large ν, small x)
 * and underflow (large x). For x > 2 logFactor includes −x.
 */
export function besselKParts(nu: number, x: number): { value: number; logFactor: number } {
  if (!(nu >= 0) || !Number.isFinite(nu)) throw new RangeError(`besselK: order must be finite and ≥ 0, got ${nu}`)
  if (!(x > 0)) throw new RangeError(`besselK: argument must be > 0, got ${x}`)
  const n = Math.floor(nu + 0.5)
  const mu = nu - n
  let [kMu, kMu1] = x <= 2 ? temmeSeries(mu, x) : steedContinuedFraction(mu, x)
  let logFactor = x <= 2 ? 0 : -x
  const twoOverX = 2 / x
  for (let i = 1; i <= n; i++) {
    const next = (mu + i) * twoOverX * kMu1 + kMu
    kMu = kMu1
    kMu1 = next
    if (kMu1 > RESCALE_AT) { kMu /= RESCALE_AT; kMu1 /= RESCALE_AT; logFactor += Math.log(RESCALE_AT) }
  }
  return { value: kMu, logFactor }
}

/** K_ν(x) for ν ≥ 0, x > 0 (may overflow to Infinity or underflow to 0 at the extremes; see logBesselK). */
export function besselK(nu: number, x: number): number {
  const { value, logFactor } = besselKParts(nu, x)
  return logFactor === 0 ? value : value * Math.exp(logFactor)
}

/** Exponentially scaled e^x K_ν(x) for ν ≥ 0, x > 0 (does not underflow for large x). */
export function besselKScaled(nu: number, x: number): number {
  const { value, logFactor } = besselKParts(nu, x)
  const f = logFactor + x
  return f === 0 ? value : value * Math.exp(f)
}

/** ln K_ν(x) for ν ≥ 0, x > 0, without overflow or underflow. */
export function logBesselK(nu: number, x: number): number {
  const { value, logFactor } = besselKParts(nu, x)
  return Math.log(value) + logFactor
}
