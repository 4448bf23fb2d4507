/**
 * The part of the netCDF data model the CF reader needs, shared by the NetCDF classic and
 * NetCDF-4/HDF5 back ends: named dimensions, variables with attributes, and hyperslab reads.
 */
export type AttributeValue = string | number | number[]

export type NumericArray =
  | Float32Array | Float64Array | Int8Array | Uint8Array | Int16Array | Uint16Array | Int32Array | Uint32Array | number[]

/** netCDF external types (classic uses the signed ones; NetCDF-4 adds unsigned and 64-bit types). */
export type ValueType = 'byte' | 'ubyte' | 'char' | 'short' | 'ushort' | 'int' | 'uint' | 'int64' | 'uint64' | 'float' | 'double' | 'string' | 'other'

export interface Variable {
  name: string
  dimensions: string[]
  shape: number[]
  type: ValueType
  attributes: Record<string, AttributeValue>
  /**
   * Reads the box start[k] … start[k] + count[k] − 1 along each dimension, row-major over the box.
   * Scalars take empty arrays. Values are raw (still packed, fill values in place).
   */
  read(start: number[], count: number[]): NumericArray
}

export interface Dataset {
  dimensions: Map<string, number>
  variables: Map<string, Variable>
  attributes: Record<string, AttributeValue>
}

/** Reads a whole variable. */
export function readAll(variable: Variable): NumericArray {
  return variable.read(variable.shape.map(() => 0), variable.shape)
}

/** A numeric attribute as one number (first element of a vector), or undefined. */
export function numberAttribute(variable: { attributes: Record<string, AttributeValue> }, name: string): number | undefined {
  const v = variable.attributes[name]
  if (typeof v === 'number') return v
  if (Array.isArray(v) && typeof v[0] === 'number') return v[0]
  return undefined
}

/** A numeric attribute as a list of numbers, or undefined. */
export function numbersAttribute(variable: { attributes: Record<string, AttributeValue> }, name: string): number[] | undefined {
  const v = variable.attributes[name]
  if (typeof v === 'number') return [v]
  if (Array.isArray(v)) return v
  return undefined
}

/** A text attribute, or undefined. */
export function textAttribute(variable: { attributes: Record<string, AttributeValue> }, name: string): string | undefined {
  const v = variable.attributes[name]
  return typeof v === 'string' ? v : undefined
}

/**
 * Copies the box [start, start + count) of a row-major array of `shape` into `out` (row-major over the box),
 * given a reader of flat element indices. Throws RangeError for a box outside the array.
 */
export function copyHyperslab(shape: number[], start: number[], count: number[], out: NumericArray, at: (flat: number) => number): NumericArray {
  const rank = shape.length
  if (rank === 0) { out[0] = at(0); return out }
  for (let k = 0; k < rank; k++) {
    if (start[k]! < 0 || count[k]! < 0 || start[k]! + count[k]! > shape[k]!) throw new RangeError('hyperslab outside the variable')
  }
  if (out.length === 0) return out
  const strides = new Array<number>(rank)
  strides[rank - 1] = 1
  for (let k = rank - 2; k >= 0; k--) strides[k] = strides[k + 1]! * shape[k + 1]!
  const index = new Array<number>(rank).fill(0)
  const run = count[rank - 1]!
  let o = 0
  for (;;) {
    let base = 0
    for (let k = 0; k < rank; k++) base += (start[k]! + index[k]!) * strides[k]!
    for (let i = 0; i < run; i++) out[o++] = at(base + i)
    let k = rank - 2
    while (k >= 0 && ++index[k]! >= count[k]!) { index[k] = 0; k-- }
    if (k < 0) return out
  }
}
