/**
 * The neighbourhood of a cell: every cell whose centre lies within R cells (Euclidean,
 * inclusive: dx² + dy² ≤ R²) of its centre. As a union of row chords it is, for each row
 * offset dy ∈ [−⌊R⌋, ⌊R⌋], the columns dx ∈ [−h(dy), h(dy)] with h(dy) = ⌊√(R² − dy²)⌋.
 * R = 1.5 gives exactly the 3 × 3 square; R = 1 the five-cell cross; R = 0 the cell alone.
 */

export interface DiskChords {
  radius: number
  /** ⌊R⌋: the largest row offset. */
  reach: number
  /** halfWidth[d] = h(d) for d = 0..reach (symmetric in ±d). */
  halfWidth: Int32Array
}

/** Row chords of the disk of radius R cells (R finite, ≥ 0). Integer-exact: no cell is lost to sqrt rounding. */
export function diskChords(radius: number): DiskChords {
  if (!Number.isFinite(radius) || radius < 0) throw new Error(`neighbourhood radius must be a finite number ≥ 0 cells, got ${radius}`)
  const r2 = radius * radius
  let reach = Math.floor(radius)
  while ((reach + 1) * (reach + 1) <= r2) reach++
  while (reach * reach > r2) reach--
  const halfWidth = new Int32Array(reach + 1)
  for (let d = 0; d <= reach; d++) {
    let h = Math.floor(Math.sqrt(Math.max(0, r2 - d * d)))
    while ((h + 1) * (h + 1) + d * d <= r2) h++
    while (h > 0 && h * h + d * d > r2) h--
    halfWidth[d] = h
  }
  return { radius, reach, halfWidth }
}

/** Number of cells in the full (untruncated) disk. */
export function diskSize(chords: DiskChords): number {
  let s = 2 * chords.halfWidth[0]! + 1
  for (let d = 1; d <= chords.reach; d++) s += 2 * (2 * chords.halfWidth[d]! + 1)
  return s
}
