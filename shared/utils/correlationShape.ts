/**
 * The fitted correlation shape of a lead time's members, for the map glyph: one ellipse whose
 * semi-axes are the fitted length scales ℓ₁ ≥ ℓ₂ (fine cells) and whose major axis points at
 * angle θ from the grid's column (+i, "grid east") axis toward its row (+j, "grid north") axis.
 * Isotropic fits are circles (ℓ₁ = ℓ₂ = ℓ).
 */

/** The median shape of a lead time as the products summary returns it (lengths in km), with its map ring. */
export interface LeadStructure {
  members: number
  anisotropic: number
  majorKm: number
  minorKm: number
  /** Major axis from grid east toward grid north, degrees in [0, 180). */
  angleDegrees: number
  /** Transform of the fits ('none' when ℓ is of the values themselves, else of the latent field; 'mixed'). */
  transform: string
  /** Whether the run's fits searched for a stretched shape at all (anisotropy 'fit'). */
  anisotropySearched: boolean
  /** The ellipse as a closed [lon, lat] ring. */
  ring: [number, number][]
}

/** What one task's fit says about the shape (from its stored fit JSON). */
export interface FittedShape {
  /** Isotropic ℓ in fine cells (0 for an all-dry member: nothing fitted). */
  lengthScale: number
  anisotropy?: { adopted: boolean; majorLengthScale: number; minorLengthScale: number; angle: number } | null
}

export interface ShapeSummary {
  /** Members whose fit entered the summary (all-dry members are left out). */
  members: number
  /** Of them, members whose anisotropic model was adopted. */
  anisotropic: number
  /** Median ℓ₁ and ℓ₂ over the members (fine cells); equal when most members are isotropic. */
  major: number
  minor: number
  /** Axial mean direction of the adopted major axes, radians in [0, π); 0 when none was adopted. */
  angle: number
}

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b)
  const h = s.length >> 1
  return s.length % 2 ? s[h]! : (s[h - 1]! + s[h]!) / 2
}

/**
 * Median shape over members. Anisotropy counts when more than half of the fitted members adopted
 * it; then ℓ₁, ℓ₂ are medians over the adopted members and θ their axial mean
 * ½·atan2(Σ sin 2θ, Σ cos 2θ) (axes are directions modulo π, so angles are doubled first —
 * the usual mean of axial data). Otherwise a circle of the median ℓ. Null when nothing was fitted.
 */
export function summariseShapes(fits: readonly FittedShape[]): ShapeSummary | null {
  const fitted = fits.filter((f) => f.lengthScale > 0 && Number.isFinite(f.lengthScale))
  if (fitted.length === 0) return null
  const adopted = fitted.filter((f) => f.anisotropy?.adopted)
  if (2 * adopted.length <= fitted.length) {
    const l = median(fitted.map((f) => f.lengthScale))
    return { members: fitted.length, anisotropic: adopted.length, major: l, minor: l, angle: 0 }
  }
  let s = 0, c = 0
  for (const f of adopted) { s += Math.sin(2 * f.anisotropy!.angle); c += Math.cos(2 * f.anisotropy!.angle) }
  let angle = Math.atan2(s, c) / 2
  if (angle < 0) angle += Math.PI
  return {
    members: fitted.length, anisotropic: adopted.length,
    major: median(adopted.map((f) => f.anisotropy!.majorLengthScale)),
    minor: median(adopted.map((f) => f.anisotropy!.minorLengthScale)),
    angle,
  }
}

/**
 * Points of the ellipse in fine-cell offsets (di along grid east, dj along grid north) from its
 * centre, closed (the first point repeated): (a cos t cos θ − b sin t sin θ, a cos t sin θ + b sin t cos θ).
 */
export function ellipseOffsets(major: number, minor: number, angle: number, points = 64): [number, number][] {
  const out: [number, number][] = []
  const ct = Math.cos(angle), st = Math.sin(angle)
  for (let k = 0; k <= points; k++) {
    const t = (2 * Math.PI * (k % points)) / points
    const u = major * Math.cos(t), v = minor * Math.sin(t)
    out.push([u * ct - v * st, u * st + v * ct])
  }
  return out
}
