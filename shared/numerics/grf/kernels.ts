/**
 * Stationary covariance kernels of the prior Gaussian random field.
 * Distances r are in fine-grid cells; variance σ² in the field's units squared.
 * Parameterisations follow Rasmussen & Williams (2006), GPML ch. 4.
 */

export type KernelName = 'se' | 'matern12' | 'matern32' | 'matern52' | 'matern'

export interface KernelParams {
  kernel: KernelName
  /** ℓ, in fine-grid cells. */
  lengthScale: number
  /** σ², the marginal variance (without nugget). */
  variance: number
  /** Matérn smoothness ν, only for kernel 'matern' (general ν). */
  nu?: number
  /** Variance of uncorrelated noise added at zero lag (default 0). */
  nugget?: number
}

/** Smoothness ν implied by a kernel name (Infinity for the squared-exponential). */
export function smoothnessOf(p: KernelParams): number {
  switch (p.kernel) {
    case 'se': return Infinity
    case 'matern12': return 0.5
    case 'matern32': return 1.5
    case 'matern52': return 2.5
    case 'matern':
      if (p.nu === undefined || !(p.nu > 0)) throw new Error('kernel "matern" needs a smoothness nu > 0')
      return p.nu
  }
}

/**
 * Correlation ρ(r) ∈ [0, 1] (covariance divided by σ², nugget excluded) at distance r ≥ 0 fine cells.
 * se: exp(−r²/(2ℓ²)); Matérn closed forms for ν = 1/2, 3/2, 5/2 (GPML eq. 4.17).
 */
export function correlationAt(p: KernelParams, r: number): number {
  const l = p.lengthScale
  switch (p.kernel) {
    case 'se': return Math.exp(-(r * r) / (2 * l * l))
    case 'matern12': return Math.exp(-r / l)
    case 'matern32': { const s = Math.sqrt(3) * r / l; return (1 + s) * Math.exp(-s) }
    case 'matern52': { const s = Math.sqrt(5) * r / l; return (1 + s + s * s / 3) * Math.exp(-s) }
    case 'matern': return generalMaternCorrelation(smoothnessOf(p), r / l)
  }
}

/** Hook for the general-ν Matérn, filled in by the modified Bessel function module. */
let generalMaternCorrelation: (nu: number, rOverL: number) => number = () => {
  throw new Error('general-ν Matérn is not available: import shared/numerics/grf/maternGeneral')
}
/** Installs the general-ν Matérn correlation (called once by maternGeneral.ts). */
export function setGeneralMatern(fn: (nu: number, rOverL: number) => number): void { generalMaternCorrelation = fn }

/** Covariance k(r) = σ² ρ(r) (+ nugget at r = 0). */
export function covarianceAt(p: KernelParams, r: number): number {
  const c = p.variance * correlationAt(p, r)
  return r === 0 ? c + (p.nugget ?? 0) : c
}

/** Stationary covariance as a function of the fine-grid offset (dx, dy), in cells. */
export function covarianceFunction(p: KernelParams): (dx: number, dy: number) => number {
  return (dx, dy) => covarianceAt(p, Math.hypot(dx, dy))
}

/**
 * Distance beyond which the correlation is below `tolerance` (fine cells); used to size
 * circulant-embedding padding. se: ℓ√(2 ln(1/tol)); Matérn: found by bisection on ρ.
 */
export function decayRadius(p: KernelParams, tolerance = 1e-12): number {
  if (p.kernel === 'se') return p.lengthScale * Math.sqrt(2 * Math.log(1 / tolerance))
  let lo = 0, hi = p.lengthScale
  while (correlationAt(p, hi) > tolerance) hi *= 2
  for (let k = 0; k < 60; k++) { const mid = (lo + hi) / 2; if (correlationAt(p, mid) > tolerance) lo = mid; else hi = mid }
  return hi
}
