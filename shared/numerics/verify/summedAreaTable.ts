/**
 * Summed-area table (Crow 1984, SIGGRAPH '84): S[(j)(nx+1) + i] = Σ of values in rows < j and
 * columns < i, so any rectangle's sum costs four look-ups. Input row-major nx×ny; the table is
 * (nx+1)×(ny+1) with a zero first row and column.
 */

/** Builds the (nx+1)×(ny+1) summed-area table of a row-major nx×ny field. */
export function summedAreaTable(values: ArrayLike<number>, nx: number, ny: number): Float64Array {
  if (values.length !== nx * ny) throw new Error(`field has ${values.length} values, expected ${nx}×${ny}`)
  const w = nx + 1
  const table = new Float64Array(w * (ny + 1))
  for (let j = 0; j < ny; j++) {
    let rowSum = 0
    for (let i = 0; i < nx; i++) {
      rowSum += values[j * nx + i]!
      table[(j + 1) * w + i + 1] = table[j * w + i + 1]! + rowSum
    }
  }
  return table
}

/** Sum over columns i0 … i1 and rows j0 … j1 (inclusive, already clipped to the grid). */
export function rectangleSum(table: Float64Array, nx: number, i0: number, i1: number, j0: number, j1: number): number {
  const w = nx + 1
  return table[(j1 + 1) * w + i1 + 1]! - table[j0 * w + i1 + 1]! - table[(j1 + 1) * w + i0]! + table[j0 * w + i0]!
}
