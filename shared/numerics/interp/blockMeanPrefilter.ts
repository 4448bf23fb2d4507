/**
 * Block-mean-preserving prefilter for separable interpolation.
 *
 * Interpolating block means as if they were point values does not give back the block means
 * (bilinear/bicubic smooth across blocks). Instead, find coarse coefficients c with
 * A·W·c = y (A: b×b block averaging, W: the separable interpolation), then W·c is continuous
 * like W·y and its block means equal y to rounding. Both A and W are tensor products, so
 * A·W = (A_y W_y) ⊗ (A_x W_x) and c needs one banded solve per coarse row and per coarse column.
 * The 1-D matrices A_x W_x are strictly diagonally dominant for bilinear and Keys bicubic at every
 * factor (checked at run time), hence invertible and well conditioned. This is the prefilter
 * idea of spline interpolation (Unser, Aldroubi & Eden 1991, IEEE Trans. PAMI 13:277), with
 * block averages in place of point samples.
 */
import type { AxisWeights } from './axisWeights'
import { factorBanded, type BandedLu } from './bandedSolve'

/** The m×m matrix A_x W_x: entry (I, J) = mean over fine cells of block I of their weight on coarse J. */
function averagedWeightMatrix(w: AxisWeights, factor: number): { dense: Float64Array; lower: number; upper: number } {
  const m = w.coarseCount
  const dense = new Float64Array(m * m)
  let lower = 0, upper = 0
  for (let i = 0; i < w.fineCount; i++) {
    const I = Math.floor(i / factor)
    for (let k = 0; k < w.width; k++) {
      const value = w.weight[i * w.width + k]!
      if (value === 0) continue
      const J = w.index[i * w.width + k]!
      dense[I * m + J]! += value / factor
      lower = Math.max(lower, I - J)
      upper = Math.max(upper, J - I)
    }
  }
  return { dense, lower, upper }
}

/** Factorised A_x W_x for one axis. */
export function axisPrefilter(w: AxisWeights, factor: number): BandedLu {
  const { dense, lower, upper } = averagedWeightMatrix(w, factor)
  return factorBanded(dense, w.coarseCount, lower, upper)
}

/**
 * Coefficients c (row-major mx×my, like y) with block means of W·c equal to y.
 * xAxis/yAxis: the weights used for the interpolation along each axis.
 */
export function blockMeanCoefficients(coarse: Float64Array, xAxis: AxisWeights, yAxis: AxisWeights, factor: number): Float64Array {
  const mx = xAxis.coarseCount
  const my = yAxis.coarseCount
  const c = Float64Array.from(coarse)
  const fx = axisPrefilter(xAxis, factor)
  const fy = axisPrefilter(yAxis, factor)
  for (let J = 0; J < my; J++) fx.solve(c, J * mx, 1)
  for (let I = 0; I < mx; I++) fy.solve(c, I, mx)
  return c
}
