/**
 * A stack of ensemble grids: N members (or downscaled samples) of one nx × ny grid.
 * Every grid is row-major: the value of column i, row j sits at index j·nx + i.
 * Sample index m is the same scenario across lead times, which is what makes
 * joint (area, time-window) probabilities possible.
 */

/** One grid of values, row-major nx × ny. */
export type Grid = Float32Array | Float64Array

/** N grids of one shape; members[m][j·nx + i]. */
export interface EnsembleStack {
  nx: number
  ny: number
  members: readonly Grid[]
}

/**
 * Which side of the threshold T counts as an event.
 * 'above': x ≥ T (gusts, rain, heat). 'below': x ≤ T (frost, cold). Both are inclusive.
 */
export type Direction = 'above' | 'below'

/** True when x is an event for threshold T in the given direction (inclusive on both sides). */
export function crosses(x: number, threshold: number, direction: Direction): boolean {
  return direction === 'above' ? x >= threshold : x <= threshold
}

/**
 * Checks that a stack is usable: positive integer sizes, at least one member,
 * every member of length nx·ny and free of NaN/±Infinity. Throws an Error naming
 * the first problem (member and cell) otherwise.
 */
export function checkStack(stack: EnsembleStack): void {
  const { nx, ny, members } = stack
  if (!Number.isInteger(nx) || nx < 1 || !Number.isInteger(ny) || ny < 1) throw new Error(`grid size must be positive integers, got nx=${nx}, ny=${ny}`)
  if (members.length === 0) throw new Error('the stack has no members')
  const cells = nx * ny
  members.forEach((grid, m) => {
    if (grid.length !== cells) throw new Error(`member ${m} has ${grid.length} values, expected nx·ny = ${cells}`)
    for (let k = 0; k < cells; k++) {
      if (!Number.isFinite(grid[k])) throw new Error(`member ${m} has a non-finite value (${grid[k]}) at column ${k % nx}, row ${Math.floor(k / nx)}`)
    }
  })
}

/** Number of cells nx·ny of a stack. */
export function cellCount(stack: EnsembleStack): number {
  return stack.nx * stack.ny
}

/**
 * Element-wise extreme over lead times of several sample-aligned stacks:
 * out.members[m][k] = max (or min) over t of stacks[t].members[m][k].
 * The per-pixel exceedance of the 'max' stack is P(x ≥ T at some time in the window);
 * use 'min' with direction 'below'. The result is Float32 when every input grid is (the extreme of
 * Float32 values is one of them, so nothing is rounded), else Float64.
 */
export function timeExtremeStack(stacks: readonly EnsembleStack[], extreme: 'max' | 'min'): EnsembleStack {
  if (stacks.length === 0) throw new Error('a time window needs at least one lead time')
  const { nx, ny } = stacks[0]!
  const n = stacks[0]!.members.length
  stacks.forEach((s, t) => {
    if (s.nx !== nx || s.ny !== ny) throw new Error(`lead time ${t} has grid ${s.nx}×${s.ny}, expected ${nx}×${ny}`)
    if (s.members.length !== n) throw new Error(`lead time ${t} has ${s.members.length} samples, expected ${n} (samples must be aligned)`)
  })
  const single = stacks.every((s) => s.members.every((g) => g instanceof Float32Array))
  const members: Grid[] = []
  for (let m = 0; m < n; m++) {
    const out = single ? Float32Array.from(stacks[0]!.members[m]!) : Float64Array.from(stacks[0]!.members[m]!)
    for (let t = 1; t < stacks.length; t++) {
      const g = stacks[t]!.members[m]!
      if (extreme === 'max') { for (let k = 0; k < out.length; k++) if (g[k]! > out[k]!) out[k] = g[k]! }
      else { for (let k = 0; k < out.length; k++) if (g[k]! < out[k]!) out[k] = g[k]! }
    }
    members.push(out)
  }
  return { nx, ny, members }
}
