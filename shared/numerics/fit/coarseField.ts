/**
 * Validation and centring of a coarse field before fitting. Layout: row-major nx×ny, index j·nx + i
 * (j the row); NaN marks a missing cell, which every likelihood simply leaves out.
 */

/** Fewest valid cells a fit accepts: below this the length scale is not identifiable in practice. */
export const MIN_VALID_CELLS = 16
/** Largest block factor accepted (fine cells per coarse cell along each axis). */
export const MAX_FACTOR = 64

export interface CoarseField {
  nx: number
  ny: number
  /** Values minus `offset`; 0 at missing cells. */
  centred: Float64Array
  /** 1 at valid cells, 0 at missing ones. */
  mask: Float64Array
  /** Indices of the valid cells, increasing. */
  valid: Int32Array
  /** Mean of the valid values (subtracted so that quadratic forms do not cancel catastrophically). */
  offset: number
  /** True when no cell is missing. */
  complete: boolean
}

/** Checks the grid, the factor and the data, and centres the valid values. Throws with a one-line reason. */
export function prepareCoarseField(coarse: ArrayLike<number>, nx: number, ny: number, factor: number): CoarseField {
  if (!Number.isInteger(nx) || !Number.isInteger(ny) || nx < 1 || ny < 1) throw new Error(`grid size must be positive integers, got ${nx}×${ny}`)
  if (coarse.length !== nx * ny) throw new Error(`coarse field has ${coarse.length} values, expected nx·ny = ${nx * ny}`)
  if (!Number.isInteger(factor) || factor < 1 || factor > MAX_FACTOR) throw new Error(`factor must be an integer from 1 to ${MAX_FACTOR}, got ${factor}`)
  const n = nx * ny
  const validList: number[] = []
  let sum = 0
  for (let k = 0; k < n; k++) {
    const v = coarse[k]!
    if (Number.isNaN(v)) continue
    if (!Number.isFinite(v)) throw new Error(`coarse cell ${k} is ${v}: expected a finite number or NaN (missing)`)
    validList.push(k)
    sum += v
  }
  if (validList.length < MIN_VALID_CELLS) throw new Error(`too few valid cells to fit: need at least ${MIN_VALID_CELLS}, got ${validList.length}`)
  const offset = sum / validList.length
  const centred = new Float64Array(n)
  const mask = new Float64Array(n)
  let spread = 0
  for (const k of validList) { centred[k] = coarse[k]! - offset; mask[k] = 1; spread = Math.max(spread, Math.abs(centred[k]!)) }
  // "Constant" means no variation beyond the rounding of the values themselves.
  if (spread <= 1e-12 * Math.max(1, Math.abs(offset))) throw new Error('field is constant: nothing to fit')
  return { nx, ny, centred, mask, valid: Int32Array.from(validList), offset, complete: validList.length === n }
}
