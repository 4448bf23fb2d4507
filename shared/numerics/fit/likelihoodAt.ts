/**
 * Log-likelihood of a coarse field at given covariance parameters (no search), with the mean profiled
 * and the variance either profiled or fixed — the ingredient of likelihood-ratio tests between a fitted
 * model and a given one (e.g. a local window against the whole-domain fit).
 *
 * With σ² fixed instead of profiled, a Gaussian log-likelihood changes by (m/2)(ln(σ̂²/σ²) + 1 − σ̂²/σ²)
 * (the profile is its maximum over σ², attained at σ̂²). m is the number of data for the exact likelihoods
 * and the Whittle weight times the number of non-zero frequencies for the debiased Whittle one (its
 * profile has the same form, see whittleLikelihood.ts).
 */
import type { Anisotropy, KernelName } from '../grf/kernels'
import { coarseCorrelationTable } from './coarseCorrelation'
import { prepareCoarseField } from './coarseField'
import { denseProfile } from './denseLikelihood'
import { DEFAULT_WHITTLE_TAPER, type FitMethod } from './fitCoarse'
import { kroneckerProfile } from './kroneckerLikelihood'
import { prepareWhittle, whittleProfile } from './whittleLikelihood'

export interface LikelihoodAtParameters {
  factor: number
  kernel: KernelName
  nu?: number
  /** ℓ (ℓ₁ with anisotropy), fine cells. */
  lengthScale: number
  anisotropy?: Anisotropy
  /** Coarse-cell nugget as a fraction of σ² (FitResult.nuggetRatio). */
  nuggetRatio: number
  /** σ² (field units²); profiled when absent. */
  variance?: number
  method: FitMethod
  /** Whittle taper fraction (default DEFAULT_WHITTLE_TAPER, as fitCoarse.ts). */
  whittleTaper?: number
}

/** Log-likelihood (and the profiled μ̂, σ̂²) of a row-major nx×ny coarse field (NaN = missing) at the given parameters. */
export function logLikelihoodAt(coarse: ArrayLike<number>, nx: number, ny: number, p: LikelihoodAtParameters): { logLikelihood: number; mean: number; variance: number } {
  const field = prepareCoarseField(coarse, nx, ny, p.factor)
  let profiled
  let dataCount = field.valid.length
  if (p.method === 'kronecker') {
    if (p.anisotropy && p.anisotropy.ratio !== 1) throw new Error('the Kronecker likelihood needs an isotropic kernel')
    profiled = kroneckerProfile(field, p.factor, p.lengthScale)(p.nuggetRatio)
  } else {
    const table = coarseCorrelationTable(p.kernel, p.lengthScale, p.factor, nx, ny, p.nu, p.anisotropy)
    if (p.method === 'exact') profiled = denseProfile(field, table)(p.nuggetRatio)
    else {
      const data = prepareWhittle(field, p.whittleTaper ?? DEFAULT_WHITTLE_TAPER)
      dataCount = data.weight * (nx * ny - 1)
      profiled = whittleProfile(data, table)(p.nuggetRatio)
    }
  }
  if (p.variance === undefined || !Number.isFinite(profiled.logLikelihood)) return profiled
  const q = profiled.variance / p.variance
  return { ...profiled, logLikelihood: profiled.logLikelihood + 0.5 * dataCount * (Math.log(q) + 1 - q) }
}
