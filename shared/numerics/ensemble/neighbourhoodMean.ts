/**
 * Mean of a field over each cell's disk neighbourhood (see disk.ts), truncated at the grid
 * edge: the average is over the neighbourhood cells that lie inside the grid.
 * Row prefix sums make each chord O(1), so the cost is O(nx·ny·(2⌊R⌋ + 1)).
 */
import { diskChords, type DiskChords } from './disk'

/** Disk-neighbourhood mean of a row-major nx × ny field; returns a new Float64Array. */
export function neighbourhoodMean(field: ArrayLike<number>, nx: number, ny: number, radius: number | DiskChords): Float64Array {
  const { reach, halfWidth } = typeof radius === 'number' ? diskChords(radius) : radius
  const stride = nx + 1
  // prefix[j·(nx+1) + i] = Σ of row j's first i values.
  const prefix = new Float64Array(stride * ny)
  for (let j = 0; j < ny; j++) {
    let s = 0
    const row = j * nx
    const p = j * stride
    for (let i = 0; i < nx; i++) { s += field[row + i]!; prefix[p + i + 1] = s }
  }
  const out = new Float64Array(nx * ny)
  for (let j = 0; j < ny; j++) {
    const d0 = Math.max(-reach, -j)
    const d1 = Math.min(reach, ny - 1 - j)
    for (let i = 0; i < nx; i++) {
      let sum = 0
      let count = 0
      for (let d = d0; d <= d1; d++) {
        const h = halfWidth[d < 0 ? -d : d]!
        const lo = i - h < 0 ? 0 : i - h
        const hi = i + h >= nx ? nx - 1 : i + h
        const p = (j + d) * stride
        sum += prefix[p + hi + 1]! - prefix[p + lo]!
        count += hi - lo + 1
      }
      out[j * nx + i] = sum / count
    }
  }
  return out
}
