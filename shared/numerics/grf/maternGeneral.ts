/**
 * General-ν Matérn correlation (Rasmussen & Williams 2006, GPML eq. 4.14):
 * ρ(r) = 2^(1−ν)/Γ(ν) · s^ν K_ν(s), s = √(2ν) r/ℓ, with our own K_ν (besselK.ts).
 * Importing this module installs it behind kernel 'matern' in kernels.ts.
 */
import { besselKParts } from './besselK'
import { logGamma } from './logGamma'
import { setGeneralMatern } from './kernels'

/**
 * Matérn correlation at scaled distance rOverL = r/ℓ ≥ 0 for smoothness ν > 0.
 * ρ(0) = 1 exactly. The product s^ν K_ν(s) is formed directly when it cannot overflow; otherwise
 * (large ν with small s, or s so large that K_ν underflows) it is assembled in logarithms.
 */
export function maternCorrelation(nu: number, rOverL: number): number {
  if (!(nu > 0) || !Number.isFinite(nu)) throw new RangeError(`Matérn smoothness must be finite and > 0, got ${nu}`)
  if (!(rOverL >= 0)) throw new RangeError(`Matérn distance must be ≥ 0, got ${rOverL}`)
  if (rOverL === 0) return 1
  const s = Math.sqrt(2 * nu) * rOverL
  const { value, logFactor } = besselKParts(nu, s)
  const logPrefactor = (1 - nu) * Math.LN2 - logGamma(nu)
  const power = Math.pow(s, nu)
  // Each factor is accurate to about one ulp; summing logarithms instead would lose |ln| · ε, so
  // logarithms are the fallback only when the direct product over- or underflows.
  // (A subnormal s^ν has lost digits, hence the bound on `power`.)
  let rho = power > 1e-290 && power < 1e290 ? Math.exp(logPrefactor) * Math.exp(logFactor) * power * value : NaN
  if (!(rho > 1e-300 && rho < Infinity)) rho = Math.exp(logPrefactor + nu * Math.log(s) + Math.log(value) + logFactor)
  // Rounding can push ρ a hair above 1 at tiny s; a correlation never exceeds 1.
  return rho > 1 ? 1 : rho
}

setGeneralMatern(maternCorrelation)
