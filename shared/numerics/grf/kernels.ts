/**
 * Stationary covariance kernels of the prior Gaussian random field.
 * Distances r are in fine-grid cells; variance σ² in the field's units squared.
 * Parameterisations follow Rasmussen & Williams (2006), GPML ch. 4.
 *
 * Geometric anisotropy (Chilès & Delfiner 2012, Geostatistics, §2.5.2): the kernel is the isotropic one
 * evaluated at the scaled distance r = ℓ₁·√(hᵀ Rθᵀ diag(1/ℓ₁², 1/ℓ₂²) Rθ h), so that correlation falls off
 * with length ℓ₁ along the major axis (angle θ) and ℓ₂ = ratio·ℓ₁ across it. Offsets h = (dx, dy) are in
 * fine cells along the column index i (dx) and the row index j (dy); θ turns from +i towards +j.
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
  /** Geometric anisotropy; absent (or ratio 1) = isotropic. `lengthScale` is then ℓ₁, the major axis. */
  anisotropy?: Anisotropy
}

export interface Anisotropy {
  /** ℓ₂/ℓ₁ ∈ (0, 1]: minor over major length scale. */
  ratio: number
  /** θ, radians: direction of the major axis, from the +i (column) axis towards the +j (row) axis. */
  angle: number
}

/** True when the kernel has no (or trivial) anisotropy. */
export function isIsotropic(p: KernelParams): boolean {
  return p.anisotropy === undefined || p.anisotropy.ratio === 1
}

/** Throws a one-line Error unless the anisotropy (if any) has ratio ∈ (0, 1] and a finite angle. */
export function checkAnisotropy(a: Anisotropy | undefined): void {
  if (a === undefined) return
  if (!(a.ratio > 0 && a.ratio <= 1)) throw new Error(`anisotropy ratio ℓ₂/ℓ₁ must be in (0, 1], got ${a.ratio}`)
  if (!Number.isFinite(a.angle)) throw new Error(`anisotropy angle must be a finite number of radians, got ${a.angle}`)
}

/**
 * Coefficients [a, c, d] of the quadratic form r² = a·dx² + 2c·dx·dy + d·dy² giving the scaled distance
 * (fine cells along the major axis) of an offset: with u = cosθ·dx + sinθ·dy, v = −sinθ·dx + cosθ·dy,
 * r² = u² + (v/ratio)². Isotropic: [1, 0, 1].
 */
export function anisotropyMetric(a: Anisotropy | undefined): [number, number, number] {
  if (a === undefined || a.ratio === 1) return [1, 0, 1]
  const c = Math.cos(a.angle), s = Math.sin(a.angle), k2 = 1 / (a.ratio * a.ratio)
  return [c * c + s * s * k2, s * c * (1 - k2), s * s + c * c * k2]
}

/**
 * Length scales along the grid axes [ℓx, ℓy] (fine cells) when the kernel's axes are the grid's
 * (isotropic, or anisotropic at θ ≡ 0 or π/2 modulo π), otherwise undefined.
 */
export function axisAlignedLengthScales(p: KernelParams): [number, number] | undefined {
  const l = p.lengthScale
  if (isIsotropic(p)) return [l, l]
  const { ratio, angle } = p.anisotropy!
  if (Math.abs(Math.sin(angle)) < 1e-12) return [l, ratio * l]
  if (Math.abs(Math.cos(angle)) < 1e-12) return [ratio * l, l]
  return undefined
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

/** Stationary covariance as a function of the fine-grid offset (dx, dy), in cells (anisotropy included). */
export function covarianceFunction(p: KernelParams): (dx: number, dy: number) => number {
  if (isIsotropic(p)) return (dx, dy) => covarianceAt(p, Math.hypot(dx, dy))
  const [a, c, d] = anisotropyMetric(p.anisotropy)
  return (dx, dy) => covarianceAt(p, Math.sqrt(Math.max(0, a * dx * dx + 2 * c * dx * dy + d * dy * dy)))
}

/**
 * Distance beyond which the correlation is below `tolerance` (fine cells); used to size
 * circulant-embedding padding. se: ℓ√(2 ln(1/tol)); Matérn: found by bisection on ρ.
 * With anisotropy this is the radius along the major axis (ℓ = ℓ₁), so it bounds every direction.
 */
export function decayRadius(p: KernelParams, tolerance = 1e-12): number {
  if (p.kernel === 'se') return p.lengthScale * Math.sqrt(2 * Math.log(1 / tolerance))
  let lo = 0, hi = p.lengthScale
  while (correlationAt(p, hi) > tolerance) hi *= 2
  for (let k = 0; k < 60; k++) { const mid = (lo + hi) / 2; if (correlationAt(p, mid) > tolerance) lo = mid; else hi = mid }
  return hi
}
