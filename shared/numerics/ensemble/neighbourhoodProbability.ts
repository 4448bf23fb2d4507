/**
 * Neighbourhood ensemble probabilities (Schwartz & Sobash 2017, Mon. Wea. Rev. 145:3397),
 * with the disk neighbourhood of disk.ts (radius R in cells, truncated at the grid edge):
 *  - NEP  = mean over members of the neighbourhood MEAN of the event field
 *           ("what share of the area around here is affected, on average");
 *  - NMEP = mean over members of the neighbourhood MAXIMUM of the event field
 *           ("the chance of an event somewhere within R of here").
 * With R = 0 both equal the per-pixel exceedance probability.
 */
import { dilateRow } from './bitRows'
import { diskChords, type DiskChords } from './disk'
import { exceedanceProbability } from './exceedance'
import { neighbourhoodMean } from './neighbourhoodMean'
import type { Direction, EnsembleStack } from './stack'

/**
 * NEP per pixel (row-major nx·ny). The member average and the neighbourhood average are
 * both linear, so NEP is the neighbourhood mean of the per-pixel probability map: pass that
 * map as `probability` when it is already at hand.
 */
export function neighbourhoodEnsembleProbability(stack: EnsembleStack, threshold: number, direction: Direction,
  radius: number | DiskChords, probability = exceedanceProbability(stack, threshold, direction)): Float64Array {
  return neighbourhoodMean(probability, stack.nx, stack.ny, radius)
}

/**
 * NMEP per pixel (row-major nx·ny) straight from the members. Each member's event field is
 * packed into 32-cell words per row; each distinct chord half-width h gives a row dilation
 * (windowed OR over [i − h, i + h]); a cell has an event in its disk when any row j + d,
 * dilated by h(|d|), has its bit set. Cost O(N·nx·ny·(1 + ⌊R⌋·log R / 32)) word operations
 * plus one comparison per member and cell.
 */
export function neighbourhoodMaximumProbability(stack: EnsembleStack, threshold: number, direction: Direction,
  radius: number | DiskChords): Float64Array {
  const { nx, ny, members } = stack
  const { reach, halfWidth } = typeof radius === 'number' ? diskChords(radius) : radius
  const words = (nx + 31) >>> 5
  const events = new Int32Array(words * ny)
  // dilated[d] holds every row dilated by h(d); equal widths share one buffer.
  const dilated: Int32Array[] = []
  const owner: boolean[] = []
  for (let d = 0; d <= reach; d++) {
    const shared = d > 0 && halfWidth[d] === halfWidth[d - 1]
    dilated.push(shared ? dilated[d - 1]! : new Int32Array(words * ny))
    owner.push(!shared)
  }
  const a = new Int32Array(words)
  const b = new Int32Array(words)
  const c = new Int32Array(words)
  const hitRow = new Int32Array(words)
  const counts = new Int32Array(nx * ny)
  const above = direction === 'above'
  for (const grid of members) {
    for (let j = 0; j < ny; j++) {
      const o = j * nx
      for (let w = 0; w < words; w++) {
        const i0 = w << 5
        const i1 = Math.min(nx, i0 + 32)
        let bits = 0
        if (above) for (let i = i0; i < i1; i++) bits |= +(grid[o + i]! >= threshold) << (i - i0)
        else for (let i = i0; i < i1; i++) bits |= +(grid[o + i]! <= threshold) << (i - i0)
        events[j * words + w] = bits
      }
    }
    for (let d = 0; d <= reach; d++) {
      if (!owner[d]) continue
      for (let j = 0; j < ny; j++) dilateRow(events, j * words, dilated[d]!, j * words, words, halfWidth[d]!, a, b, c)
    }
    for (let j = 0; j < ny; j++) {
      hitRow.set(dilated[0]!.subarray(j * words, j * words + words))
      for (let d = 1; d <= reach; d++) {
        const g = dilated[d]!
        if (j - d >= 0) for (let w = 0, s = (j - d) * words; w < words; w++) hitRow[w]! |= g[s + w]!
        if (j + d < ny) for (let w = 0, s = (j + d) * words; w < words; w++) hitRow[w]! |= g[s + w]!
      }
      const o = j * nx
      for (let w = 0; w < words; w++) {
        let bits = hitRow[w]!
        while (bits !== 0) {
          const low = bits & -bits
          const i = (w << 5) + 31 - Math.clz32(low)
          if (i < nx) counts[o + i]!++
          bits ^= low
        }
      }
    }
  }
  const n = members.length
  const out = new Float64Array(nx * ny)
  for (let k = 0; k < out.length; k++) out[k] = counts[k]! / n
  return out
}
