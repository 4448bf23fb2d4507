/**
 * Straightforward reference implementations for the tests: every cell, every member,
 * every neighbour tested by its distance, no prefix sums, no sorting tricks.
 */
import type { Direction, EnsembleStack } from '#shared/numerics/ensemble/stack'

const hit = (x: number, t: number, d: Direction) => (d === 'above' ? x >= t : x <= t)

/** Cells (i2, j2) inside the grid with (i2−i)² + (j2−j)² ≤ R². */
export function neighbours(nx: number, ny: number, i: number, j: number, radius: number): number[] {
  const out: number[] = []
  for (let j2 = 0; j2 < ny; j2++) for (let i2 = 0; i2 < nx; i2++) {
    if ((i2 - i) ** 2 + (j2 - j) ** 2 <= radius * radius) out.push(j2 * nx + i2)
  }
  return out
}

export function bruteProbability(s: EnsembleStack, t: number, d: Direction): number[] {
  const out: number[] = []
  for (let k = 0; k < s.nx * s.ny; k++) out.push(s.members.filter((g) => hit(g[k]!, t, d)).length / s.members.length)
  return out
}

/** NEP and NMEP exactly as defined: per member, neighbourhood mean / max of the binary field, then mean over members. */
export function bruteNeighbourhood(s: EnsembleStack, t: number, d: Direction, radius: number): { nep: number[]; nmep: number[] } {
  const nep: number[] = []
  const nmep: number[] = []
  for (let j = 0; j < s.ny; j++) for (let i = 0; i < s.nx; i++) {
    const nb = neighbours(s.nx, s.ny, i, j, radius)
    let meanSum = 0
    let maxSum = 0
    for (const g of s.members) {
      const events = nb.map((k) => (hit(g[k]!, t, d) ? 1 : 0))
      meanSum += events.reduce((a: number, b) => a + b, 0) / nb.length
      maxSum += Math.max(...events)
    }
    nep.push(meanSum / s.members.length)
    nmep.push(maxSum / s.members.length)
  }
  return { nep, nmep }
}

export function bruteDiskExtreme(field: ArrayLike<number>, nx: number, ny: number, radius: number, extreme: 'max' | 'min'): number[] {
  const out: number[] = []
  for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
    const v = neighbours(nx, ny, i, j, radius).map((k) => field[k]!)
    out.push(extreme === 'max' ? Math.max(...v) : Math.min(...v))
  }
  return out
}
