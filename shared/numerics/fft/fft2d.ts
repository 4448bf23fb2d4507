/**
 * Two-dimensional discrete Fourier transforms on row-major grids (index j·nx + i, j the row),
 * computed as 1-D transforms along rows then columns (row–column algorithm).
 * Lengths: any positive integers (fastest for powers of two, see fftPlan.ts).
 */
import FFT from 'fft.js'
import { complexFftPlan } from './fftPlan'

/** Columns gathered together in the column pass, so each row read touches whole cache lines. */
const COLUMN_BLOCK = 16

/**
 * In-place 2-D complex DFT of the field re + i·im (both Float64Array of length nx·ny, row-major).
 * Forward: F(kx, ky) = Σ f(x, y) e^{−2πi (kx x/nx + ky y/ny)}; `inverse` uses e^{+…} and includes 1/(nx·ny).
 */
export function fft2d(re: Float64Array, im: Float64Array, nx: number, ny: number, inverse = false): void {
  checkShape(re, nx, ny, 're'); checkShape(im, nx, ny, 'im')
  if (nx > 1) transformRows(re, im, nx, ny, inverse)
  if (ny > 1) transformColumns(re, im, nx, ny, nx, inverse)
}

/**
 * Forward 2-D DFT of a real row-major nx×ny field: returns the non-redundant half spectrum,
 * columns kx = 0…⌊nx/2⌋, as re/im planes of width hx = ⌊nx/2⌋ + 1 (index ky·hx + kx).
 * The other half follows from F(nx − kx, ny − ky) = conj F(kx, ky).
 */
export function realFft2d(data: Float64Array, nx: number, ny: number): { re: Float64Array; im: Float64Array; width: number } {
  checkShape(data, nx, ny, 'data')
  const hx = Math.floor(nx / 2) + 1
  const re = new Float64Array(hx * ny), im = new Float64Array(hx * ny)
  const row = new Float64Array(2 * nx)
  if (nx >= 2 && (nx & (nx - 1)) === 0) {
    const f = new FFT(nx)
    for (let j = 0; j < ny; j++) {
      f.realTransform(row, data.subarray(j * nx, (j + 1) * nx))
      for (let k = 0; k < hx; k++) { re[j * hx + k] = row[2 * k]!; im[j * hx + k] = row[2 * k + 1]! }
    }
  } else {
    const plan = complexFftPlan(nx), buf = new Float64Array(2 * nx)
    for (let j = 0; j < ny; j++) {
      for (let i = 0; i < nx; i++) { buf[2 * i] = data[j * nx + i]!; buf[2 * i + 1] = 0 }
      plan.forward(row, buf)
      for (let k = 0; k < hx; k++) { re[j * hx + k] = row[2 * k]!; im[j * hx + k] = row[2 * k + 1]! }
    }
  }
  if (ny > 1) transformColumns(re, im, hx, ny, hx, false)
  return { re, im, width: hx }
}

function checkShape(a: Float64Array, nx: number, ny: number, name: string): void {
  if (!Number.isInteger(nx) || !Number.isInteger(ny) || nx < 1 || ny < 1) throw new Error(`FFT grid must be positive integers, got ${nx}×${ny}`)
  if (a.length !== nx * ny) throw new Error(`${name} has length ${a.length}, expected nx·ny = ${nx * ny}`)
}

/**
 * Pruned 2-D DFT for fields that are zero outside rows 0…rows−1 (forward), or whose result is only
 * needed on rows 0…rows−1 (inverse): the row pass skips the other rows. Same conventions as fft2d.
 * Used for circulant products of a window embedded in a larger torus.
 */
export function fft2dRowPruned(re: Float64Array, im: Float64Array, nx: number, ny: number, rows: number, inverse = false): void {
  checkShape(re, nx, ny, 're'); checkShape(im, nx, ny, 'im')
  if (!inverse) {
    if (nx > 1) transformRows(re, im, nx, rows, inverse)
    if (ny > 1) transformColumns(re, im, nx, ny, nx, inverse)
  } else {
    if (ny > 1) transformColumns(re, im, nx, ny, nx, inverse)
    if (nx > 1) transformRows(re, im, nx, rows, inverse)
  }
}

interface ColumnBuffers { gathered: Float64Array; transformed: Float64Array; inViews: Float64Array[]; outViews: Float64Array[] }
const columnBufferCache = new Map<number, ColumnBuffers>()

/** Reused gather buffers for columns of length ny: COLUMN_BLOCK columns at offsets c·2ny, with per-column views for fft.js. */
function columnBuffers(ny: number): ColumnBuffers {
  let cached = columnBufferCache.get(ny)
  if (!cached) {
    const len = 2 * ny
    const gathered = new Float64Array(len * COLUMN_BLOCK), transformed = new Float64Array(len * COLUMN_BLOCK)
    cached = {
      gathered, transformed,
      inViews: Array.from({ length: COLUMN_BLOCK }, (_, c) => gathered.subarray(c * len, (c + 1) * len)),
      outViews: Array.from({ length: COLUMN_BLOCK }, (_, c) => transformed.subarray(c * len, (c + 1) * len)),
    }
    columnBufferCache.set(ny, cached)
  }
  return cached
}

function transformRows(re: Float64Array, im: Float64Array, nx: number, ny: number, inverse: boolean): void {
  const plan = complexFftPlan(nx)
  // Exact-length views: fft.js's inverse rescales every entry of its output array.
  const { inViews, outViews } = columnBuffers(nx)
  const buf = inViews[0]!, out = outViews[0]!
  for (let j = 0; j < ny; j++) {
    const o = j * nx
    for (let i = 0; i < nx; i++) { buf[2 * i] = re[o + i]!; buf[2 * i + 1] = im[o + i]! }
    if (inverse) plan.inverse(out, buf); else plan.forward(out, buf)
    for (let i = 0; i < nx; i++) { re[o + i] = out[2 * i]!; im[o + i] = out[2 * i + 1]! }
  }
}

/** Transforms columns 0…width−1 of planes with row stride `stride`. */
function transformColumns(re: Float64Array, im: Float64Array, width: number, ny: number, stride: number, inverse: boolean): void {
  const plan = complexFftPlan(ny)
  const block = Math.min(COLUMN_BLOCK, width)
  const len = 2 * ny
  const { gathered, transformed, inViews, outViews } = columnBuffers(ny)
  for (let c0 = 0; c0 < width; c0 += block) {
    const cw = Math.min(block, width - c0)
    for (let j = 0; j < ny; j++) {
      const o = j * stride + c0
      for (let c = 0, g = 2 * j; c < cw; c++, g += len) { gathered[g] = re[o + c]!; gathered[g + 1] = im[o + c]! }
    }
    for (let c = 0; c < cw; c++) {
      if (inverse) plan.inverse(outViews[c]!, inViews[c]!); else plan.forward(outViews[c]!, inViews[c]!)
    }
    for (let j = 0; j < ny; j++) {
      const o = j * stride + c0
      for (let c = 0, g = 2 * j; c < cw; c++, g += len) { re[o + c] = transformed[g]!; im[o + c] = transformed[g + 1]! }
    }
  }
}
