/**
 * Compact storage of sample fields as scaled 16-bit integers: value ≈ offset + scale · q with
 * q ∈ [−32767, 32767]. The worst-case rounding error is scale / 2, reported as the precision.
 */
export interface PackedInt16 {
  data: Int16Array
  offset: number
  scale: number
  /** Largest absolute rounding error, in the field's units. */
  precision: number
}

/** Packs the concatenation of `fields` (each any length) with one offset/scale chosen from their range. */
export function packInt16(fields: ArrayLike<number>[]): PackedInt16 {
  let lo = Infinity, hi = -Infinity, n = 0
  for (const f of fields) {
    n += f.length
    for (let k = 0; k < f.length; k++) {
      const v = f[k]!
      if (!Number.isFinite(v)) throw new Error('cannot pack non-finite values')
      if (v < lo) lo = v
      if (v > hi) hi = v
    }
  }
  if (n === 0) return { data: new Int16Array(0), offset: 0, scale: 1, precision: 0 }
  const offset = (lo + hi) / 2
  // A constant field still needs a positive scale; the tiny floor keeps q = 0 exact.
  const scale = Math.max((hi - lo) / (2 * 32767), Number.EPSILON * Math.max(1, Math.abs(offset)))
  const data = new Int16Array(n)
  let k = 0
  for (const f of fields) for (let i = 0; i < f.length; i++) data[k++] = Math.round((f[i]! - offset) / scale)
  return { data, offset, scale, precision: scale / 2 }
}

/** Unpacks field `index` of length `size` from packed data into a Float32Array. */
export function unpackInt16(data: Int16Array, offset: number, scale: number, index: number, size: number): Float32Array {
  const out = new Float32Array(size)
  const base = index * size
  for (let i = 0; i < size; i++) out[i] = offset + scale * data[base + i]!
  return out
}
