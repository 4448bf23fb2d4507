/**
 * Maximum (or minimum) of a field over each cell's disk neighbourhood, truncated at the edge.
 * Each distinct chord width is a 1-D running extreme along rows by the van Herk (1992) /
 * Gil & Werman (1993) algorithm (three comparisons per cell, independent of the width);
 * the disk is then the extreme over its row chords: O(nx·ny·(3⌊R⌋ + 4)) in all.
 *
 * Used for NMEP: the neighbourhood maximum of the event field 1[x ≥ T] equals 1[diskMax(x) ≥ T]
 * for every T, so a disk-extreme stack turns NMEP into an exceedance of that stack.
 */
import { diskChords, type DiskChords } from './disk'

/**
 * 1-D running maximum of sign·src[offset + i] over the window [i − h, i + h] ∩ [0, n − 1],
 * written to out[outOffset + i]; pad, prefix and suffix are scratch of length ≥ n + 2h.
 */
function runningMax(src: ArrayLike<number>, offset: number, n: number, h: number, sign: number,
  out: Float64Array, outOffset: number, pad: Float64Array, prefix: Float64Array, suffix: Float64Array): void {
  const w = 2 * h + 1
  const len = n + 2 * h
  for (let t = 0; t < h; t++) { pad[t] = -Infinity; pad[len - 1 - t] = -Infinity }
  for (let i = 0; i < n; i++) pad[h + i] = sign * src[offset + i]!
  // Blocks of w: running max from each block's start (prefix) and from its end (suffix).
  for (let b = 0; b < len; b += w) {
    const e = b + w < len ? b + w : len
    let m = -Infinity
    for (let t = b; t < e; t++) { const v = pad[t]!; if (v > m) m = v; prefix[t] = m }
    m = -Infinity
    for (let t = e - 1; t >= b; t--) { const v = pad[t]!; if (v > m) m = v; suffix[t] = m }
  }
  // The window [i, i + w − 1] of pad spans at most two blocks: suffix of one, prefix of the next.
  for (let i = 0; i < n; i++) {
    const a = suffix[i]!
    const c = prefix[i + w - 1]!
    out[outOffset + i] = a > c ? a : c
  }
}

/** A reusable disk-extreme operator for one grid shape and radius (scratch buffers allocated once). */
export type DiskExtremeOperator = (field: ArrayLike<number>, extreme: 'max' | 'min', out?: Float64Array) => Float64Array

/**
 * Builds the disk-neighbourhood extreme for an nx × ny grid and radius R cells: 'max' or 'min'
 * over every cell whose centre lies within R cells of the cell's centre (inside the grid).
 * Call it once per member; the returned grid is row-major nx·ny (a new one unless `out` is given).
 */
export function diskExtremeOperator(nx: number, ny: number, radius: number | DiskChords): DiskExtremeOperator {
  const { reach, halfWidth } = typeof radius === 'number' ? diskChords(radius) : radius
  const cells = nx * ny
  const maxH = halfWidth[0]!
  const pad = new Float64Array(nx + 2 * maxH)
  const prefix = new Float64Array(nx + 2 * maxH)
  const suffix = new Float64Array(nx + 2 * maxH)
  // rowMax[d]: running max along rows with half-width h(d); chords of equal width share one grid.
  const rowMax: Float64Array[] = []
  const widthOwner: boolean[] = []
  for (let d = 0; d <= reach; d++) {
    const shared = d > 0 && halfWidth[d] === halfWidth[d - 1]
    rowMax.push(shared ? rowMax[d - 1]! : new Float64Array(cells))
    widthOwner.push(!shared)
  }
  return (field, extreme, out = new Float64Array(cells)) => {
    const sign = extreme === 'max' ? 1 : -1
    for (let d = 0; d <= reach; d++) {
      if (!widthOwner[d]) continue
      const g = rowMax[d]!
      for (let j = 0; j < ny; j++) runningMax(field, j * nx, nx, halfWidth[d]!, sign, g, j * nx, pad, prefix, suffix)
    }
    out.set(rowMax[0]!)
    for (let d = 1; d <= reach; d++) {
      const g = rowMax[d]!
      for (let j = 0; j < ny; j++) {
        const o = j * nx
        if (j - d >= 0) { const a = (j - d) * nx; for (let i = 0; i < nx; i++) { const v = g[a + i]!; if (v > out[o + i]!) out[o + i] = v } }
        if (j + d < ny) { const b = (j + d) * nx; for (let i = 0; i < nx; i++) { const v = g[b + i]!; if (v > out[o + i]!) out[o + i] = v } }
      }
    }
    if (sign < 0) for (let k = 0; k < cells; k++) out[k] = -out[k]!
    return out
  }
}

/** Disk-neighbourhood extreme of one row-major nx × ny field (see diskExtremeOperator). */
export function diskExtreme(field: ArrayLike<number>, nx: number, ny: number, radius: number | DiskChords, extreme: 'max' | 'min'): Float64Array {
  return diskExtremeOperator(nx, ny, radius)(field, extreme)
}
