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
  for (let t = 0; t < len; t++) {
    const v = pad[t]!
    prefix[t] = t % w === 0 ? v : Math.max(prefix[t - 1]!, v)
  }
  for (let t = len - 1; t >= 0; t--) {
    const v = pad[t]!
    suffix[t] = t === len - 1 || t % w === w - 1 ? v : Math.max(suffix[t + 1]!, v)
  }
  for (let i = 0; i < n; i++) {
    const a = suffix[i]!
    const b = prefix[i + w - 1]!
    out[outOffset + i] = a > b ? a : b
  }
}

/**
 * Disk-neighbourhood extreme of a row-major nx × ny field: 'max' or 'min' over every cell whose
 * centre lies within R cells of the cell's centre (inside the grid). Returns a new Float64Array.
 */
export function diskExtreme(field: ArrayLike<number>, nx: number, ny: number, radius: number | DiskChords, extreme: 'max' | 'min'): Float64Array {
  const { reach, halfWidth } = typeof radius === 'number' ? diskChords(radius) : radius
  const sign = extreme === 'max' ? 1 : -1
  const cells = nx * ny
  const maxH = halfWidth[0]!
  const pad = new Float64Array(nx + 2 * maxH)
  const prefix = new Float64Array(nx + 2 * maxH)
  const suffix = new Float64Array(nx + 2 * maxH)
  // rowMax[d]: running max along rows with half-width h(d); chords of equal width share one grid.
  const rowMax: Float64Array[] = []
  for (let d = 0; d <= reach; d++) {
    const h = halfWidth[d]!
    if (d > 0 && h === halfWidth[d - 1]) { rowMax.push(rowMax[d - 1]!); continue }
    const g = new Float64Array(cells)
    for (let j = 0; j < ny; j++) runningMax(field, j * nx, nx, h, sign, g, j * nx, pad, prefix, suffix)
    rowMax.push(g)
  }
  const out = Float64Array.from(rowMax[0]!)
  for (let d = 1; d <= reach; d++) {
    const g = rowMax[d]!
    for (let j = 0; j < ny; j++) {
      const o = j * nx
      if (j - d >= 0) { const a = (j - d) * nx; for (let i = 0; i < nx; i++) if (g[a + i]! > out[o + i]!) out[o + i] = g[a + i]! }
      if (j + d < ny) { const b = (j + d) * nx; for (let i = 0; i < nx; i++) if (g[b + i]! > out[o + i]!) out[o + i] = g[b + i]! }
    }
  }
  if (sign < 0) for (let k = 0; k < cells; k++) out[k] = -out[k]!
  return out
}
