/**
 * Words and geometry for the structure a task's fit describes beyond ℓ and σ: the fitted anisotropy
 * ellipse, the latent transform, the regime windows, and the all-dry case (nothing fitted). Pure helpers
 * for the parameter table (components/runs/FitTable.vue); the fit fields are those written by
 * shared/numerics/pipeline/downscaleMember.ts.
 */
import type { TaskAnisotropy, TaskFit, TaskRegimes, TaskTransform } from './types'
import { formatKm, formatSignificant } from './display'

/**
 * True for a member whose blocks are all dry under the censored model: its samples are zero and the
 * stored ℓ, σ², μ are placeholders (0), not estimates.
 */
export function isAllDryFit(fit: TaskFit | null | undefined): boolean {
  if (!fit) return false
  const t = fit.transform
  if (t?.name === 'censored' && t.wetBlocks === 0) return true
  return t?.name === 'censored' && fit.lengthScale === 0 && fit.variance === 0
}

/** Km per fine cell implied by the fit itself (ℓ km / ℓ cells), else `fallbackKm` (the run's fine spacing). */
export function kmPerFineCell(fit: TaskFit, fallbackKm: number | null): number | null {
  if (fit.lengthScale > 0 && Number.isFinite(fit.lengthScaleKm / fit.lengthScale)) return fit.lengthScaleKm / fit.lengthScale
  return fallbackKm
}

/** θ folded into [0, 180): an axis has no sign. */
export function foldAxisDegrees(angleDegrees: number): number {
  return ((angleDegrees % 180) + 180) % 180
}

const COMPASS_16 = ['N', 'NNE', 'NE', 'ENE', 'E', 'ESE', 'SE', 'SSE', 'S', 'SSW', 'SW', 'WSW', 'W', 'WNW', 'NW', 'NNW'] as const

/**
 * The long axis as a pair of 16-point compass directions, northern end first ("NE–SW"), for an axis
 * θ degrees anticlockwise from east on a north-up map (grid rows increase northwards).
 */
export function axisCompassPair(angleDegrees: number): string {
  // Compass bearing is clockwise from north: β = 90° − θ; the axis runs from β to β + 180°.
  const bearing = (((90 - foldAxisDegrees(angleDegrees)) % 360) + 360) % 360
  const sector = (b: number) => Math.round(b / 22.5) % 16
  // Northern end: the end whose bearing lies within 90° of north (E–W counts from its east end).
  const northern = bearing <= 90 || bearing > 270 ? bearing : (bearing + 180) % 360
  // A near east–west axis is named from its east end whichever side of east it leans.
  const first = sector(northern) === 12 ? 4 : sector(northern)
  return `${COMPASS_16[first]}–${COMPASS_16[(first + 8) % 16]}`
}

/**
 * SVG rotation (degrees, clockwise positive as SVG's rotate() is, since its y axis points down) that
 * turns an ellipse drawn with its long axis along +x into an axis θ anticlockwise from east on a
 * north-up glyph: −θ.
 */
export function svgRotationDegrees(angleDegrees: number): number {
  const folded = foldAxisDegrees(angleDegrees)
  return folded === 0 ? 0 : -folded
}

/** End of the long axis at distance `radius` from the glyph centre, in SVG coordinates (y down): (r cos θ, −r sin θ). */
export function svgMajorAxisEnd(angleDegrees: number, radius: number): [number, number] {
  const theta = (foldAxisDegrees(angleDegrees) * Math.PI) / 180
  const x = radius * Math.cos(theta), y = -radius * Math.sin(theta)
  return [Math.abs(x) < 1e-12 ? 0 : x, Math.abs(y) < 1e-12 ? 0 : y]
}

export type AnisotropyView =
  | { kind: 'adopted'; majorKm: number; minorKm: number; ratio: number; angleDegrees: number; text: string; parts: [string, string]; label: string }
  | { kind: 'isotropic'; text: string; label: string }
  | { kind: 'off' | 'none'; text: string; label: string }

/** The two halves of formatEllipseText: ["12.0 × 6.0 km", "NE–SW (35° from east)"] (table cells keep each on one line). */
export function formatEllipseParts(majorKm: number, minorKm: number, angleDegrees: number): [string, string] {
  const km = formatKm(majorKm).replace(/ km$/, '')
  return [`${km} × ${formatKm(minorKm)}`, `${axisCompassPair(angleDegrees)} (${Math.round(foldAxisDegrees(angleDegrees)) % 180}° from east)`]
}

/** "12.0 × 6.0 km, NE–SW (35° from east)": long and short length scale, then the long axis' direction. */
export function formatEllipseText(majorKm: number, minorKm: number, angleDegrees: number): string {
  return formatEllipseParts(majorKm, minorKm, angleDegrees).join(', ')
}

/** The sentence a screen reader hears for the glyph and its text. */
export function ellipseAccessibleLabel(majorKm: number, minorKm: number, angleDegrees: number, ratio: number): string {
  const degrees = Math.round(foldAxisDegrees(angleDegrees)) % 180
  return `Anisotropic correlation: long length scale ${formatKm(majorKm)} along ${axisCompassPair(angleDegrees).replace('–', ' to ')}, `
    + `${degrees} degrees anticlockwise from east; short length scale ${formatKm(minorKm)} (ratio ${formatSignificant(ratio, 2)}).`
}

/**
 * What the Shape column shows for one fit. `settingOn`: the run's anisotropy setting was 'fit';
 * `kmPerFine` converts the fitted ℓ₁, ℓ₂ (fine cells) to km.
 */
export function anisotropyView(fit: TaskFit, settingOn: boolean, kmPerFine: number | null): AnisotropyView {
  const a: TaskAnisotropy | undefined = fit.anisotropy
  if (!a) {
    return settingOn
      ? { kind: 'none', text: '—', label: 'No anisotropy result stored for this member.' }
      : { kind: 'off', text: '—', label: 'Anisotropy not fitted in this run.' }
  }
  if (!a.adopted || !(a.ratio < 1) || kmPerFine === null) {
    return {
      kind: 'isotropic', text: 'isotropic (test not significant)',
      label: 'Isotropic: a stretched shape did not fit the coarse field significantly better (likelihood-ratio test at 5 %).',
    }
  }
  const majorKm = a.majorLengthScale * kmPerFine, minorKm = a.minorLengthScale * kmPerFine
  return {
    kind: 'adopted', majorKm, minorKm, ratio: a.ratio, angleDegrees: foldAxisDegrees(a.angleDegrees),
    text: formatEllipseText(majorKm, minorKm, a.angleDegrees), parts: formatEllipseParts(majorKm, minorKm, a.angleDegrees), label: ellipseAccessibleLabel(majorKm, minorKm, a.angleDegrees, a.ratio),
  }
}

/** Sort value of the Shape column: ℓ₂/ℓ₁ of the model used (1 when isotropic), null when not fitted. */
export function anisotropySortValue(fit: TaskFit | null | undefined): number | null {
  if (!fit || isAllDryFit(fit) || !fit.anisotropy) return null
  return fit.anisotropy.adopted ? fit.anisotropy.ratio : 1
}

const TRANSFORM_NAMES: Record<Exclude<TaskTransform['name'], 'none'>, string> = {
  boxcox: 'Box–Cox',
  log: 'log',
  censored: 'censored power',
}

/** True when ℓ, σ and the mean of this fit describe a transformed (latent) field. */
export function isLatentFit(fit: TaskFit | null | undefined): boolean {
  return Boolean(fit?.transform && fit.transform.name !== 'none')
}

/** "Box–Cox λ = 0.42 (fitted)", "… (fitted, at upper bound)", "log", "censored power λ = 0.50 (set)"; null for no transform. */
export function transformLabel(t: TaskTransform | undefined): string | null {
  if (!t || t.name === 'none') return null
  if (t.name === 'log') return 'log'
  const how = !t.lambdaFitted ? 'set' : t.lambdaAtBound ? `fitted, at ${t.lambdaAtBound} bound` : 'fitted'
  // The censored model's change-of-support correction replaced the coarse fit's λ (and the latent σ and mean).
  const corrected = t.lambdaMethod === 'indirect' && t.coarseLambda !== undefined ? `, corrected for block averaging from ${t.coarseLambda.toFixed(2)}` : ''
  return `${TRANSFORM_NAMES[t.name]} λ = ${t.lambda.toFixed(2)} (${how}${corrected})`
}

/**
 * The sentence above the table when some members were transformed: which transform, with λ (or its
 * range over the members when fitted per member). Null when no fit is latent. All-dry members are left out
 * (their λ is a default, nothing was fitted).
 */
export function latentNote(fits: (TaskFit | null | undefined)[]): string | null {
  const transformed = fits.filter((f): f is TaskFit => isLatentFit(f) && !isAllDryFit(f))
  if (transformed.length === 0) return null
  const names = [...new Set(transformed.map((f) => f.transform!.name))].sort()
  const parts = names.map((name) => {
    const group = transformed.filter((f) => f.transform!.name === name)
    if (name === 'log') return 'log transform'
    const lambdas = group.map((f) => f.transform!.lambda)
    const lo = Math.min(...lambdas), hi = Math.max(...lambdas)
    const lambda = lo.toFixed(2) === hi.toFixed(2) ? `λ = ${lo.toFixed(2)}` : `λ = ${lo.toFixed(2)}–${hi.toFixed(2)}`
    const what = name === 'censored' ? 'censored latent Gaussian (dry where the latent field is ≤ 0), power' : TRANSFORM_NAMES[name as 'boxcox']
    return `${what} ${lambda}`
  })
  const some = transformed.length < fits.filter((f) => f && !isAllDryFit(f)).length ? ' (marked “latent”)' : ''
  const corrected = transformed.some((f) => f.transform!.lambdaMethod === 'indirect')
    ? ' Where λ was corrected for block averaging, σ and the mean are the fine-scale latent values of the correction; the log-likelihood is the coarse fit\'s.'
    : ''
  return `ℓ, σ and the mean${some} are of the latent (transformed) field, not of the values themselves: ${parts.join('; ')}.${corrected}`
}

/** "3 of 9 windows local, ℓ 4.0–11.0 km", or why the stationary model was kept. */
export function regimeText(r: TaskRegimes | undefined): string | null {
  if (!r) return null
  const total = r.windows.length
  if (!r.used) return `not used${r.note ? `: ${r.note}` : ''}`
  const local = r.windows.filter((w) => w.departs).map((w) => w.lengthScaleKm).filter(Number.isFinite)
  if (local.length === 0) return `0 of ${total} windows local`
  const lo = Math.min(...local), hi = Math.max(...local)
  const range = lo === hi ? formatKm(lo) : `${formatKm(lo).replace(/ km$/, '')}–${formatKm(hi)}`
  return `${r.departures} of ${total} windows local, ℓ ${range}`
}
