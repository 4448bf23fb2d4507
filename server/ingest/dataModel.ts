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
