/**
 * Pixel-major sorted copy of a stack: the N values of pixel k, ascending, at
 * values[k·N .. k·N + N − 1]. Sorting once makes every later threshold a binary
 * search per pixel and every percentile a lookup.
 */
import type { Direction, EnsembleStack } from './stack'

export interface SortedStack {
  /** Members per pixel. */
  n: number
  /** Number of pixels nx·ny. */
  cells: number
  /** Ascending values per pixel, pixel-major. Float32 when every input grid was Float32 (exact copy). */
  values: Float32Array | Float64Array
}

/** Sorts each pixel's N member values (transpose to pixel-major, then an in-place numeric sort per pixel). */
export function sortByPixel(stack: EnsembleStack): SortedStack {
  const single = stack.members.every((g) => g instanceof Float32Array)
  return sortGridsByPixel(stack.members.length, stack.nx * stack.ny, single, (m) => stack.members[m]!)
}

/**
 * Same as sortByPixel for grids produced one at a time by gridOf(m), m = 0..n−1, so that a
 * derived stack (e.g. disk maxima) never has to exist member-major in memory.
 * `single` stores Float32 values: only exact when every grid holds Float32-representable values.
 */
export function sortGridsByPixel(n: number, cells: number, single: boolean, gridOf: (m: number) => ArrayLike<number>): SortedStack {
  const values = single ? new Float32Array(n * cells) : new Float64Array(n * cells)
  for (let m = 0; m < n; m++) {
    const grid = gridOf(m)
    for (let k = 0, o = m; k < cells; k++, o += n) values[o] = grid[k]!
  }
  if (n > 1) for (let k = 0, o = 0; k < cells; k++, o += n) values.subarray(o, o + n).sort()
  return { n, cells, values }
}

/**
 * Number of the pixel's values that cross T: for 'above' those ≥ T (N − first index with
 * value ≥ T), for 'below' those ≤ T (first index with value > T). Binary search, O(log N).
 */
export function crossingCount(sorted: SortedStack, pixel: number, threshold: number, direction: Direction): number {
  const { values, n } = sorted
  let lo = pixel * n
  let hi = lo + n
  const base = lo
  if (direction === 'above') {
    while (lo < hi) { const mid = (lo + hi) >>> 1; if (values[mid]! < threshold) lo = mid + 1; else hi = mid }
    return n - (lo - base)
  }
  while (lo < hi) { const mid = (lo + hi) >>> 1; if (values[mid]! <= threshold) lo = mid + 1; else hi = mid }
  return lo - base
}

/** Per-pixel share of values crossing T (row-major nx·ny Float64Array), from a sorted stack. */
export function sortedExceedance(sorted: SortedStack, threshold: number, direction: Direction, out = new Float64Array(sorted.cells)): Float64Array {
  // count / N exactly (not count · (1/N)), so every path gives bit-identical k/N.
  for (let k = 0; k < sorted.cells; k++) out[k] = crossingCount(sorted, k, threshold, direction) / sorted.n
  return out
}

/**
 * Quantile of n ascending values starting at values[offset], by linear interpolation between
 * order statistics: Hyndman & Fan (1996) type 7, h = (n − 1)·q, x = x₍⌊h⌋₎ + (h − ⌊h⌋)(x₍⌊h⌋+1₎ − x₍⌊h⌋₎).
 * This is numpy's and R's default. q ∈ [0, 1].
 */
export function quantileType7(values: ArrayLike<number>, offset: number, n: number, q: number): number {
  const h = (n - 1) * q
  const lo = Math.floor(h)
  const hi = Math.min(lo + 1, n - 1)
  const a = values[offset + lo]!
  return a + (h - lo) * (values[offset + hi]! - a)
}
