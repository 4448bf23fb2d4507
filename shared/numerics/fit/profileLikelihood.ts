/**
 * Gaussian log-likelihood with the mean μ and the variance σ² profiled out in closed form.
 * Model y ~ N(μ1, σ²R) with R the (block-mean) correlation matrix of the m valid cells:
 * μ̂ = 1ᵀR⁻¹y / 1ᵀR⁻¹1 (generalised least squares), σ̂² = (y − μ̂1)ᵀR⁻¹(y − μ̂1) / m,
 * profile ℓ = −m/2 (ln(2π σ̂²) + 1) − ½ ln|R| (e.g. Rasmussen & Williams 2006, §5.4; Mardia & Marshall 1984).
 */

export interface ProfiledFit {
  logLikelihood: number
  /** μ̂ in the units of y. */
  mean: number
  /** σ̂², the variance of the (unit-variance) correlation model's scale. */
  variance: number
}

/**
 * Assembles the profile from the quadratic forms of centred data y_c = y − offset:
 * qyy = y_cᵀR⁻¹y_c, q1y = 1ᵀR⁻¹y_c, q11 = 1ᵀR⁻¹1, and logDet = ln|R|.
 */
export function profileFromQuadraticForms(qyy: number, q1y: number, q11: number, logDet: number, m: number, offset: number): ProfiledFit {
  const shift = q1y / q11
  const residual = qyy - q1y * shift
  const variance = residual / m
  if (!(variance > 0) || !Number.isFinite(logDet)) return { logLikelihood: -Infinity, mean: offset + shift, variance: NaN }
  return { logLikelihood: -0.5 * m * (Math.log(2 * Math.PI * variance) + 1) - 0.5 * logDet, mean: offset + shift, variance }
}
