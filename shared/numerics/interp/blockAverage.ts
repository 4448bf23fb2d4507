/**
 * Coarse-graining by block averages: the operator A of the downscaling model.
 * Fine field row-major nx×ny (index j·nx + i); coarse field row-major (nx/b)×(ny/b).
 */

/** Mean of each b×b block of a fine field whose sides are multiples of b (no missing values). */
export function blockAverage(fine: Float64Array, nx: number, ny: number, factor: number): Float64Array {
  if (!Number.isInteger(factor) || factor < 1) throw new Error(`block factor must be a positive integer, got ${factor}`)
  if (nx % factor !== 0 || ny % factor !== 0) throw new Error(`grid ${nx}×${ny} is not a multiple of the block factor ${factor}`)
  if (fine.length !== nx * ny) throw new Error(`field has ${fine.length} values, expected ${nx}×${ny}`)
  const mx = nx / factor
  const my = ny / factor
  const coarse = new Float64Array(mx * my)
  for (let j = 0; j < ny; j++) {
    const row = Math.floor(j / factor) * mx
    for (let i = 0; i < nx; i++) coarse[row + Math.floor(i / factor)]! += fine[j * nx + i]!
  }
  const scale = 1 / (factor * factor)
  for (let k = 0; k < coarse.length; k++) coarse[k]! *= scale
  return coarse
}
