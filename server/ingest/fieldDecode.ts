/**
 * Turns one raw 2-D slab of a file into a Tessera field: masks missing values, unpacks and converts
 * units in one affine step (canonical = raw·scale + offset), and reorders the cells so the field is
 * row-major with row 0 the southernmost and column 0 the westernmost.
 */
import { IngestError } from './errors'

export interface Decoding {
  /** Raw values that mean "missing" (fill value, missing_value, GeoTIFF nodata), in the raw type's precision. */
  missing: number[]
  /** Raw values outside [validMin, validMax] are missing (CF valid_range / valid_min / valid_max). */
  validMin: number
  validMax: number
  /** Whether a raw NaN is a declared missing value (a fill value of NaN, or JSON null). */
  nanIsMissing: boolean
  scale: number
  offset: number
}

export interface SlabLayout {
  /** Index in `raw` of the first cell in file order (default 0). */
  origin?: number
  nx: number
  ny: number
  /** Distance in the raw slab between neighbouring columns / rows in file order. */
  strideX: number
  strideY: number
  flipX: boolean
  flipY: boolean
}

/** Decodes a slab into a new Float32Array (NaN = missing). Throws IngestError('non_finite') for undeclared NaN/±∞. */
export function decodeField(raw: ArrayLike<number>, layout: SlabLayout, decoding: Decoding, where: string): Float32Array {
  const { nx, ny, strideX, strideY, flipX, flipY } = layout
  const origin = layout.origin ?? 0
  const out = new Float32Array(nx * ny)
  const missing = new Set(decoding.missing)
  const checkMissing = missing.size > 0
  const { validMin, validMax, nanIsMissing, scale, offset } = decoding
  let nonFinite = 0
  for (let j = 0; j < ny; j++) {
    const rowBase = origin + (flipY ? ny - 1 - j : j) * strideY
    for (let i = 0; i < nx; i++) {
      const v = raw[rowBase + (flipX ? nx - 1 - i : i) * strideX]!
      if (Number.isNaN(v)) {
        if (!nanIsMissing) nonFinite++
        out[j * nx + i] = NaN
      } else if ((checkMissing && missing.has(v)) || v < validMin || v > validMax) {
        out[j * nx + i] = NaN
      } else if (!Number.isFinite(v)) {
        nonFinite++
        out[j * nx + i] = NaN
      } else {
        out[j * nx + i] = v * scale + offset
      }
    }
  }
  if (nonFinite > 0) {
    throw new IngestError('non_finite',
      `${where} has ${nonFinite} cell${nonFinite > 1 ? 's' : ''} holding NaN or infinite values that the file does not declare as missing (no fill value matches).`)
  }
  return out
}

/** Refuses a field with no valid cell. */
export function requireSomeValues(field: Float32Array, where: string): void {
  for (let k = 0; k < field.length; k++) if (!Number.isNaN(field[k]!)) return
  throw new IngestError('all_missing', `${where} has no valid values: every cell is missing.`)
}
