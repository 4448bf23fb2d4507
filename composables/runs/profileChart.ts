/**
 * Prepares a profile likelihood curve for plotting: ℓ (km) against log-likelihood relative to
 * the maximum, with the ~95 % profile-likelihood interval of ℓ.
 */
import type { ProfilePoint } from './types'

/**
 * Half the 0.95 quantile of χ² with one degree of freedom (3.841458820694124 / 2, the value
 * scipy.stats.chi2.ppf(0.95, 1) gives): points whose log-likelihood is within this of the
 * maximum form the ~95 % interval (Wilks' theorem), the same rule the fit uses.
 */
export const HALF_CHI2_95 = 3.841458820694124 / 2

/** The lowest relative log-likelihood drawn; lower parts of the curve run off the bottom. */
export const PROFILE_FLOOR = -25

export interface PreparedProfile {
  /** Finite points sorted by ℓ, with log-likelihood minus the maximum. */
  points: { lengthScaleKm: number; logLikelihood: number; relative: number }[]
  maximum: { lengthScaleKm: number; logLikelihood: number }
  /** Lowest relative value on the vertical axis (≤ −2.5 so the interval threshold shows). */
  floor: number
  /** True when some points lie below `floor`. */
  clipped: boolean
}

/**
 * Sorts and filters the curve and measures it against the fitted maximum. The maximum is the
 * fit's own (ℓ̂, log L̂) when given, else the highest point of the curve; a fitted maximum
 * below a curve point (it should not happen) yields to the curve.
 */
export function prepareProfile(profile: ProfilePoint[], fitted?: { lengthScaleKm: number; logLikelihood: number }): PreparedProfile | null {
  const finite = profile.filter((p) => Number.isFinite(p.lengthScaleKm) && p.lengthScaleKm > 0 && Number.isFinite(p.logLikelihood))
  if (finite.length === 0) return null
  finite.sort((a, b) => a.lengthScaleKm - b.lengthScaleKm)
  let top = finite[0]!
  for (const p of finite) if (p.logLikelihood > top.logLikelihood) top = p
  const maximum = fitted && Number.isFinite(fitted.logLikelihood) && fitted.logLikelihood >= top.logLikelihood && fitted.lengthScaleKm > 0
    ? fitted
    : { lengthScaleKm: top.lengthScaleKm, logLikelihood: top.logLikelihood }
  const points = finite.map((p) => ({ ...p, relative: p.logLikelihood - maximum.logLikelihood }))
  const lowest = Math.min(...points.map((p) => p.relative))
  const floor = Math.min(-2.5, Math.max(lowest, PROFILE_FLOOR))
  return { points, maximum, floor, clipped: lowest < floor }
}
