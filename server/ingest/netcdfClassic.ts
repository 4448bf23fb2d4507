/**
 * NetCDF classic (CDF-1) and 64-bit offset (CDF-2) files. netcdfjs parses the header; the data are
 * read here straight from the bytes (big-endian, by hyperslab) so a large variable never becomes a
 * JavaScript array of boxed numbers, signed bytes stay signed and a truncated file is detected
 * before any value is used. Layout per the NetCDF classic format specification (Unidata).
 */
import { NetCDFReader } from 'netcdfjs'
import { copyHyperslab, type AttributeValue, type Dataset, type NumericArray, type ValueType, type Variable } from './dataModel'
import { IngestError } from './errors'

const TYPE_SIZE: Record<string, number> = { byte: 1, char: 1, short: 2, int: 4, float: 4, double: 8 }
const STREAMING = 0xffffffff

interface HeaderVariable { name: string; dimensions: number[]; attributes: { name: string; type: string; value: unknown }[]; type: string; offset: number; record: boolean }

function corrupt(detail: string): never {
  throw new IngestError('corrupt_file', `The NetCDF file is damaged or truncated (${detail}).`)
}

function attributeValue(type: string, value: unknown): AttributeValue {
  if (typeof value === 'string') return value
  const list = (Array.isArray(value) ? value : [value]).map(Number)
  const signed = type === 'byte' ? list.map((v) => (v > 127 ? v - 256 : v)) : list // netcdfjs reads bytes unsigned
  return signed.length === 1 ? signed[0]! : signed
}

function attributes(list: { name: string; type: string; value: unknown }[]): Record<string, AttributeValue> {
  const out: Record<string, AttributeValue> = {}
  for (const a of list) out[a.name] = attributeValue(a.type, a.value)
  return out
}

function newArray(type: string, n: number): NumericArray {
  switch (type) {
    case 'byte': return new Int8Array(n)
    case 'char': return new Uint8Array(n)
    case 'short': return new Int16Array(n)
    case 'int': return new Int32Array(n)
    case 'float': return new Float32Array(n)
    default: return new Float64Array(n)
  }
}

function elementReader(view: DataView, type: string): (byteOffset: number) => number {
  switch (type) {
    case 'byte': return (o) => view.getInt8(o)
    case 'char': return (o) => view.getUint8(o)
    case 'short': return (o) => view.getInt16(o, false)
    case 'int': return (o) => view.getInt32(o, false)
    case 'float': return (o) => view.getFloat32(o, false)
    default: return (o) => view.getFloat64(o, false)
  }
}

/** Opens classic or 64-bit offset NetCDF bytes. Throws IngestError('corrupt_file') for damaged headers or data. */
export function openNetcdfClassic(bytes: Uint8Array): Dataset {
  if (bytes[3] !== 1 && bytes[3] !== 2) {
    throw new IngestError('unknown_format', `This NetCDF variant (CDF-${bytes[3]}) is not supported; convert it with "nccopy -k nc4" or "nccopy -k classic".`)
  }
  let reader: NetCDFReader
  try {
    reader = new NetCDFReader(bytes)
  } catch (err) {
    corrupt((err as Error).message)
  }
  const header = reader.header
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength)
  const dimList = header.dimensions ?? []
  const headerVars = (header.variables ?? []) as unknown as HeaderVariable[]
  const recordId = header.recordDimension.id

  const padded = (n: number) => Math.ceil(n / 4) * 4
  const recordBytes = (v: HeaderVariable) =>
    v.dimensions.slice(1).reduce((p, d) => p * dimList[d]!.size, 1) * (TYPE_SIZE[v.type] ?? corrupt(`variable ${v.name} has an unknown type`))
  const recordVars = headerVars.filter((v) => v.record)
  // A single record variable is stored without padding (format specification, "Note on padding").
  const recordStep = recordVars.length === 1 ? recordBytes(recordVars[0]!) : recordVars.reduce((s, v) => s + padded(recordBytes(v)), 0)
  let numRecords = header.recordDimension.length
  if (numRecords === STREAMING && recordVars.length > 0) {
    const first = Math.min(...recordVars.map((v) => v.offset))
    numRecords = recordStep > 0 ? Math.floor((bytes.length - first) / recordStep) : 0
  }
  const dimSize = (id: number) => (id === recordId ? numRecords : dimList[id]!.size)

  const dimensions = new Map<string, number>()
  dimList.forEach((d, id) => dimensions.set(d.name, dimSize(id)))
  const variables = new Map<string, Variable>()
  for (const hv of headerVars) {
    if (hv.dimensions.some((id) => id >= dimList.length)) corrupt(`variable ${hv.name} refers to a missing dimension`)
    const shape = hv.dimensions.map(dimSize)
    const size = TYPE_SIZE[hv.type] ?? corrupt(`variable ${hv.name} has an unknown type`)
    const perRecord = recordBytes(hv) / size
    const total = shape.reduce((p, n) => p * n, 1)
    const end = hv.record
      ? (numRecords === 0 ? hv.offset : hv.offset + (numRecords - 1) * recordStep + perRecord * size)
      : hv.offset + total * size
    if (end > bytes.length) corrupt(`variable ${hv.name} needs ${end} bytes, the file has ${bytes.length}`)
    const get = elementReader(view, hv.type)
    // Byte offset of the element with flat row-major index k (records interleave with other record variables).
    const byteOffset = hv.record
      ? (k: number) => hv.offset + Math.floor(k / perRecord) * recordStep + (k % perRecord) * size
      : (k: number) => hv.offset + k * size
    variables.set(hv.name, {
      name: hv.name,
      dimensions: hv.dimensions.map((id) => dimList[id]!.name),
      shape,
      type: hv.type as ValueType,
      attributes: attributes(hv.attributes),
      read(start, count) {
        return copyHyperslab(shape, start, count, newArray(hv.type, count.reduce((p, n) => p * n, 1)), (k) => get(byteOffset(k)))
      },
    })
  }
  return { dimensions, variables, attributes: attributes(header.globalAttributes as HeaderVariable['attributes']) }
}
