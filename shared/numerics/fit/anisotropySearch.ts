/**
 * Maximum-likelihood search for geometric anisotropy (grf/kernels.ts; Chilès & Delfiner 2012) on a coarse
 * field, over three coordinates in which the likelihood is smooth and the isotropic model is an ordinary
 * interior point:
 *   s = ln √(ℓ₁ℓ₂),  (p, q) = ρ·(cos 2θ, sin 2θ),  ρ = ln(ℓ₁/ℓ₂) = −ln ratio ≥ 0.
 * In these the log of the kernel's metric tensor is linear, ln M = −2s·I − ρ·[[cos 2θ, sin 2θ], [sin 2θ, −cos 2θ]],
 * so the angle's period π and its indeterminacy at ratio 1 disappear. The search is Nelder–Mead
 * (optimize/nelderMead.ts) from a moment estimate: the covariance tensor of the field's central differences
 * (the "structure tensor"), which is proportional to M for a smooth field, so its eigenvectors give the axes
 * and √(λmin/λmax) the ratio (biased towards 1 for rough fields; only a starting point).
 * Bounds: ℓ₁ ≤ upper, ℓ₂ ≥ lower, ratio ≥ minRatio, kept by projection plus a quadratic penalty (common practice).
 */
import type { Anisotropy } from '../grf/kernels'
import { nelderMead } from '../optimize/nelderMead'
import type { CoarseField } from './coarseField'

/** (s, p, q) ↔ (ℓ₁, ratio, θ ∈ [0, π)). */
export function shapeFromCoordinates(s: number, p: number, q: number): { lengthScale: number; anisotropy: Anisotropy } {
  const rho = Math.hypot(p, q)
  let angle = rho > 0 ? 0.5 * Math.atan2(q, p) : 0
  if (angle < 0) angle += Math.PI
  return { lengthScale: Math.exp(s + rho / 2), anisotropy: { ratio: Math.exp(-rho), angle } }
}

/** Inverse of shapeFromCoordinates. */
export function coordinatesFromShape(lengthScale: number, a: Anisotropy): [number, number, number] {
  const rho = -Math.log(a.ratio)
  return [Math.log(lengthScale) - rho / 2, rho * Math.cos(2 * a.angle), rho * Math.sin(2 * a.angle)]
}

/**
 * Moment estimate of the anisotropy from the covariance of central differences over cells whose four
 * neighbours are valid. Returns ratio 1 when there are too few such cells or no variation.
 */
export function structureTensorAnisotropy(field: CoarseField): Anisotropy {
  const { nx, ny, centred, mask } = field
  let gxx = 0, gxy = 0, gyy = 0, n = 0
  for (let j = 1; j < ny - 1; j++) for (let i = 1; i < nx - 1; i++) {
    const k = j * nx + i
    if (!mask[k - 1] || !mask[k + 1] || !mask[k - nx] || !mask[k + nx]) continue
    const gx = (centred[k + 1]! - centred[k - 1]!) / 2, gy = (centred[k + nx]! - centred[k - nx]!) / 2
    gxx += gx * gx; gxy += gx * gy; gyy += gy * gy; n++
  }
  if (n < 4 || !(gxx + gyy > 0)) return { ratio: 1, angle: 0 }
  // Eigenvalues of [[gxx, gxy], [gxy, gyy]]; the major (long-correlation) axis has the smaller gradient variance.
  const half = (gxx - gyy) / 2, r = Math.hypot(half, gxy), mid = (gxx + gyy) / 2
  const small = Math.max(mid - r, 0), large = mid + r
  // Eigenvector of the larger eigenvalue is at φ = ½ atan2(2gxy, gxx − gyy); the major axis is perpendicular.
  let angle = 0.5 * Math.atan2(2 * gxy, gxx - gyy) + Math.PI / 2
  angle = ((angle % Math.PI) + Math.PI) % Math.PI
  return { ratio: Math.max(Math.sqrt(small / large), 1e-3), angle }
}

export interface AnisotropySearchInput {
  /** Log-likelihood at major length scale ℓ₁ (fine cells) and shape; −Infinity when it cannot be evaluated. */
  logLikelihood: (lengthScale: number, anisotropy: Anisotropy) => number
  /** Isotropic estimate to start from (fine cells). */
  isotropicLengthScale: number
  /** Starting shape (e.g. structureTensorAnisotropy). */
  start: Anisotropy
  /** Bounds on ℓ₂ (below) and ℓ₁ (above), fine cells. */
  bounds: [number, number]
  /** Smallest ratio searched. */
  minRatio: number
  maxEvaluations?: number
}

export interface AnisotropySearchResult {
  lengthScale: number
  anisotropy: Anisotropy
  logLikelihood: number
  evaluations: number
  converged: boolean
}

/** Penalty weight per squared unit of (s, p, q) outside the feasible set. */
const PENALTY = 1e3

/** Nelder–Mead search of (s, p, q); see the module comment. */
export function searchAnisotropy(input: AnisotropySearchInput): AnisotropySearchResult {
  const lnLo = Math.log(input.bounds[0]), lnHi = Math.log(input.bounds[1])
  const rhoMax = Math.min(-Math.log(input.minRatio), lnHi - lnLo)
  const project = (x: number[]): number[] => {
    let [s, p, q] = x as [number, number, number]
    const rho = Math.hypot(p, q)
    if (rho > rhoMax) { p *= rhoMax / rho; q *= rhoMax / rho }
    const r = Math.min(rho, rhoMax) / 2
    s = Math.min(Math.max(s, lnLo + r), lnHi - r)
    return [s, p, q]
  }
  let best: AnisotropySearchResult | undefined
  const objective = (x: number[]) => {
    const y = project(x)
    const { lengthScale, anisotropy } = shapeFromCoordinates(y[0]!, y[1]!, y[2]!)
    const ll = input.logLikelihood(lengthScale, anisotropy)
    if (Number.isFinite(ll) && (!best || ll > best.logLikelihood)) best = { lengthScale, anisotropy, logLikelihood: ll, evaluations: 0, converged: false }
    let d2 = 0
    for (let i = 0; i < 3; i++) d2 += (x[i]! - y[i]!) ** 2
    return -ll + PENALTY * d2
  }
  // Start at the isotropic scale, stretched to the moment estimate's shape (same geometric-mean length).
  const [, p0, q0] = coordinatesFromShape(1, input.start)
  const s0 = Math.log(input.isotropicLengthScale)
  const result = nelderMead(objective, project([s0, p0, q0]), {
    steps: [0.15, 0.3, 0.3], valueTolerance: 1e-3, pointTolerance: 5e-3, maxEvaluations: input.maxEvaluations ?? 150,
  })
  if (!best) throw new Error('anisotropy search: the likelihood could not be evaluated at any trial shape')
  return { ...best, evaluations: result.evaluations, converged: result.converged }
}
