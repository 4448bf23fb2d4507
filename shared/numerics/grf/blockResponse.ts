/**
 * Translation-invariant pieces of the torus model used by the posterior variance.
 */
import { fft2d } from '../fft/fft2d'
import type { ConditioningModel } from './conditioningModel'

/** k(0) of the torus model: Σλ / M. */
export function torusPointVariance(model: ConditioningModel): number {
  let s = 0
  for (const v of model.lambda) s += v
  return s / model.lambda.length
}

/**
 * u0 = K Aᵀ e₀ on the fine torus (row-major Nx×Ny): the covariance of every fine cell with the mean of
 * block (0, 0). By stationarity cov(x_i, y_B) = u0(i − b·B) (indices modulo the torus).
 */
export function blockResponse(model: ConditioningModel): Float64Array {
  const { embedding: e, blocks, lambda } = model
  const re = new Float64Array(lambda.length), im = new Float64Array(lambda.length)
  const ones = new Float64Array(blocks.coarseNx * blocks.coarseNy).fill(1)
  blocks.addLiftedCoarse(re, im, lambda, ones, new Float64Array(ones.length))
  fft2d(re, im, e.nx, e.ny, true)
  return re
}
