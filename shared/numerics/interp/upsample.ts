/**
 * Interpolation baselines: upsample a coarse field by an integer factor b.
 * Coarse field row-major mx×my (index J·mx + I); output row-major (b·mx)×(b·my).
 *
 * Methods (see axisWeights.ts for geometry and edges):
 * - 'nearest': block-constant; its b×b block means equal the coarse values exactly.
 * - 'bilinear': tensor-product linear interpolation between coarse centres; reproduces linear
 *   functions of (x, y) (and x·y) everywhere, including the edge half-cells (linear ghosts).
 * - 'bicubic': tensor-product Keys cubic convolution, a = −½ (Keys 1981); reproduces polynomials
 *   of degree ≤ 2 in each coordinate (e.g. x², x²y²) everywhere; cubics are not reproduced
 *   (third-order accurate).
 *
 * preserveBlockMeans (bilinear, bicubic): interpolate prefiltered coefficients instead of the
 * coarse values (blockMeanPrefilter.ts), so that every b×b block mean of the output equals the
 * coarse value to rounding, the output stays continuous (bilinear) or C¹ (bicubic), and a field
 * whose block means are given is reproduced exactly when it lies in the method's polynomial
 * space (linear / degree ≤ 2 per coordinate). For 'nearest' the option changes nothing.
 * Values are not clipped: bicubic and the preserving variants can leave the coarse value range.
 */
import { axisWeights, type AxisWeights, type InterpolationMethod } from './axisWeights'
import { blockMeanCoefficients } from './blockMeanPrefilter'

export type { InterpolationMethod } from './axisWeights'

export interface UpsampleOptions {
  method: InterpolationMethod
  /** Make the b×b block means of the result equal the coarse values (default false). */
  preserveBlockMeans?: boolean
}

/** Applies 1-D weights along x to every row (rows of length mx → nx). */
function alongRows(src: Float64Array, rows: number, w: AxisWeights): Float64Array {
  const mx = w.coarseCount, nx = w.fineCount
  const out = new Float64Array(rows * nx)
  for (let r = 0; r < rows; r++) {
    for (let i = 0; i < nx; i++) {
      let s = 0
      for (let k = 0; k < w.width; k++) s += w.weight[i * w.width + k]! * src[r * mx + w.index[i * w.width + k]!]!
      out[r * nx + i] = s
    }
  }
  return out
}

/** Applies 1-D weights along y to every column (my rows → ny rows of length nx). */
function alongColumns(src: Float64Array, nx: number, w: AxisWeights): Float64Array {
  const ny = w.fineCount
  const out = new Float64Array(ny * nx)
  for (let j = 0; j < ny; j++) {
    for (let k = 0; k < w.width; k++) {
      const value = w.weight[j * w.width + k]!
      if (value === 0) continue
      const from = w.index[j * w.width + k]! * nx
      for (let i = 0; i < nx; i++) out[j * nx + i]! += value * src[from + i]!
    }
  }
  return out
}

/** Upsamples the coarse mx×my field by `factor` with the chosen baseline method. */
export function upsample(coarse: Float64Array, mx: number, my: number, factor: number, options: UpsampleOptions): Float64Array {
  if (coarse.length !== mx * my) throw new Error(`coarse field has ${coarse.length} values, expected ${mx}×${my}`)
  for (let k = 0; k < coarse.length; k++) if (!Number.isFinite(coarse[k]!)) throw new Error(`coarse value ${k} is not finite`)
  const xAxis = axisWeights(options.method, mx, factor)
  const yAxis = axisWeights(options.method, my, factor)
  const values = options.preserveBlockMeans && options.method !== 'nearest'
    ? blockMeanCoefficients(coarse, xAxis, yAxis, factor)
    : coarse
  return alongColumns(alongRows(values, my, xAxis), xAxis.fineCount, yAxis)
}
