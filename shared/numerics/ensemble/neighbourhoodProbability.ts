/**
 * Neighbourhood ensemble probabilities (Schwartz & Sobash 2017, Mon. Wea. Rev. 145:3397),
 * with the disk neighbourhood of disk.ts (radius R in cells, truncated at the grid edge):
 *  - NEP  = mean over members of the neighbourhood MEAN of the event field
 *           ("what share of the area around here is affected, on average");
 *  - NMEP = mean over members of the neighbourhood MAXIMUM of the event field
 *           ("the chance of an event somewhere within R of here").
 * With R = 0 both equal the per-pixel exceedance probability.
 */
import { diskChords, type DiskChords } from './disk'
import { eventField, exceedanceProbability } from './exceedance'
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
 * NMEP per pixel (row-major nx·ny) straight from the members: for each member, the event
 * field's row prefix counts tell in O(1) per chord whether any cell of the disk has an event.
 * Cost O(N·nx·ny·(2⌊R⌋ + 1)) at worst; rows with no event nearby are skipped.
 */
export function neighbourhoodMaximumProbability(stack: EnsembleStack, threshold: number, direction: Direction,
  radius: number | DiskChords): Float64Array {
  const { nx, ny, members } = stack
  const { reach, halfWidth } = typeof radius === 'number' ? diskChords(radius) : radius
  const cells = nx * ny
  const stride = nx + 1
  const events = new Uint8Array(cells)
  const prefix = new Int32Array(stride * ny)
  const rowTotal = new Int32Array(ny)
  const counts = new Float64Array(cells)
  for (const grid of members) {
    eventField(grid, threshold, direction, events)
    for (let j = 0; j < ny; j++) {
      let s = 0
      for (let i = 0; i < nx; i++) { s += events[j * nx + i]!; prefix[j * stride + i + 1] = s }
      rowTotal[j] = s
    }
    for (let j = 0; j < ny; j++) {
      const d0 = Math.max(-reach, -j)
      const d1 = Math.min(reach, ny - 1 - j)
      let any = 0
      for (let d = d0; d <= d1; d++) any += rowTotal[j + d]!
      if (any === 0) continue
      for (let i = 0; i < nx; i++) {
        for (let d = d0; d <= d1; d++) {
          const h = halfWidth[d < 0 ? -d : d]!
          const lo = i - h < 0 ? 0 : i - h
          const hi = i + h >= nx ? nx - 1 : i + h
          const p = (j + d) * stride
          if (prefix[p + hi + 1]! > prefix[p + lo]!) { counts[j * nx + i]!++; break }
        }
      }
    }
  }
  const n = members.length
  for (let k = 0; k < cells; k++) counts[k] = counts[k]! / n
  return counts
}
