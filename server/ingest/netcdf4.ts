/**
 * NetCDF-4 files (HDF5 underneath) through h5wasm. The netCDF-4 mapping onto HDF5 (netCDF-C
 * "NetCDF-4 format" notes): dimensions are HDF5 dimension scales; a variable's dimension names
 * come from its attached scales (DIMENSION_LIST), falling back to _Netcdf4Coordinates dimension ids;
 * scales named "This is a netCDF dimension but not a netCDF variable" are dimensions only.
 *
 * Bytes are opened from h5wasm's in-memory file system (nothing touches the disk); a path is opened
 * in place by the Node build, whose file system is the host's, so large files are read chunk by chunk.
 */
import type { AttributeValue, Dataset, NumericArray, ValueType, Variable } from './dataModel'
import { IngestError } from './errors'

type H5Module = typeof import('h5wasm')
type H5File = InstanceType<H5Module['File']>
type H5Dataset = InstanceType<H5Module['Dataset']>

const INTERNAL_ATTRIBUTES = new Set(['CLASS', 'NAME', 'REFERENCE_LIST', 'DIMENSION_LIST', '_Netcdf4Dimid', '_Netcdf4Coordinates', '_nc3_strict', '_NCProperties', '_SuperblockVersion', '_IsNetcdf4'])
const DIMENSION_ONLY = 'This is a netCDF dimension but not a netCDF variable'

let memoryModule: Promise<{ h5: H5Module; fs: { writeFile(p: string, d: Uint8Array): void; unlink(p: string): void } }> | undefined
let nodeModule: Promise<H5Module> | undefined
let fileCounter = 0

async function loadMemoryModule() {
  memoryModule ??= (async () => {
    const h5 = await import('h5wasm')
    const module = await h5.ready
    module.activate_throwing_error_handler() // HDF5 errors become exceptions instead of stderr noise
    return { h5, fs: module.FS as unknown as { writeFile(p: string, d: Uint8Array): void; unlink(p: string): void } }
  })()
  return memoryModule
}

async function loadNodeModule(): Promise<H5Module> {
  nodeModule ??= (async () => {
    const h5 = await import('h5wasm/node') as unknown as H5Module
    const module = await h5.ready
    module.activate_throwing_error_handler()
    return h5
  })()
  return nodeModule
}

function lastLines(err: unknown): string {
  const text = err instanceof Error ? err.message : String(err)
  const minor = /minor:\s*([^\n]+)/g
  let m: RegExpExecArray | null
  let last = ''
  while ((m = minor.exec(text))) last = m[1]!.trim()
  return last || text.split('\n')[0]!.slice(0, 200)
}

function corruption(err: unknown): IngestError {
  if (err instanceof IngestError) return err
  return new IngestError('corrupt_file', `The NetCDF-4 file is damaged or truncated (${lastLines(err)}).`)
}

/**
 * Opens NetCDF-4 bytes or a path, runs `use` on the dataset and always closes the file.
 * HDF5 failures while opening or reading become IngestError('corrupt_file').
 */
export async function withNetcdf4<T>(source: { bytes: Uint8Array } | { path: string }, use: (dataset: Dataset) => T): Promise<T> {
  let h5: H5Module
  let fileName: string
  let cleanup = () => {}
  if ('bytes' in source) {
    const mem = await loadMemoryModule()
    h5 = mem.h5
    fileName = `/tessera-ingest-${process.pid}-${++fileCounter}.nc`
    mem.fs.writeFile(fileName, source.bytes)
    cleanup = () => { try { mem.fs.unlink(fileName) } catch { /* already gone */ } }
  } else {
    h5 = await loadNodeModule()
    fileName = source.path
  }
  let file: H5File | undefined
  try {
    file = new h5.File(fileName, 'r')
    if (file.file_id < 0n) throw new Error('cannot open the file')
    return use(describe(file, h5))
  } catch (err) {
    throw corruption(err)
  } finally {
    try { file?.close() } catch { /* closing a broken file */ }
    cleanup()
  }
}

function toAttributeValue(value: unknown): AttributeValue | undefined {
  if (typeof value === 'string') return value
  if (typeof value === 'number') return value
  if (typeof value === 'bigint') return Number(value)
  if (ArrayBuffer.isView(value) || Array.isArray(value)) {
    const list = Array.from(value as ArrayLike<unknown>)
    if (list.every((v) => typeof v === 'string')) return list.join('')
    const numbers = list.map((v) => (typeof v === 'bigint' ? Number(v) : v))
    if (!numbers.every((v) => typeof v === 'number')) return undefined
    return numbers.length === 1 ? numbers[0] as number : numbers as number[]
  }
  return undefined
}

function readAttributes(entity: { attrs: Record<string, { value: unknown }> }): Record<string, AttributeValue> {
  const out: Record<string, AttributeValue> = {}
  for (const [name, attribute] of Object.entries(entity.attrs)) {
    if (INTERNAL_ATTRIBUTES.has(name)) continue
    try {
      const v = toAttributeValue(attribute.value)
      if (v !== undefined) out[name] = v
    } catch { /* attribute of a type Tessera does not use (references, compounds) */ }
  }
  return out
}

function valueType(metadata: { type: number; size: number; signed: boolean }): ValueType {
  if (metadata.type === 0) {
    const names: Record<number, [ValueType, ValueType]> = { 1: ['byte', 'ubyte'], 2: ['short', 'ushort'], 4: ['int', 'uint'], 8: ['int64', 'uint64'] }
    const pair = names[metadata.size]
    return pair ? (metadata.signed ? pair[0] : pair[1]) : 'other'
  }
  if (metadata.type === 1) return metadata.size === 4 ? 'float' : metadata.size === 8 ? 'double' : 'other'
  if (metadata.type === 3) return 'string'
  return 'other'
}

function toNumeric(value: unknown): NumericArray {
  if (value instanceof BigInt64Array || value instanceof BigUint64Array) return Float64Array.from(value, Number)
  if (ArrayBuffer.isView(value)) return value as unknown as NumericArray
  if (typeof value === 'number') return [value]
  if (typeof value === 'bigint') return [Number(value)]
  if (typeof value === 'boolean') return [value ? 1 : 0]
  throw new IngestError('unsupported_layout', 'The file holds a variable of a type Tessera cannot read as numbers.')
}

function describe(file: H5File, h5: H5Module): Dataset {
  const datasets = new Map<string, H5Dataset>()
  for (const name of file.keys()) {
    const entity = file.get(name)
    if (entity instanceof h5.Dataset) datasets.set(name, entity)
  }
  const dimensions = new Map<string, number>()
  const dimensionById = new Map<number, string>()
  for (const [name, d] of datasets) {
    const attrs = d.attrs
    if (!('CLASS' in attrs) || attrs.CLASS!.value !== 'DIMENSION_SCALE') continue
    const size = d.shape?.[0] ?? 0
    dimensions.set(name, size)
    if ('_Netcdf4Dimid' in attrs) dimensionById.set(Number(attrs._Netcdf4Dimid!.value), name)
  }
  const variables = new Map<string, Variable>()
  for (const [name, d] of datasets) {
    const attrs = d.attrs
    const scaleName = 'NAME' in attrs ? String(attrs.NAME!.value) : ''
    if (scaleName.startsWith(DIMENSION_ONLY)) continue
    const shape = d.shape ?? []
    const dimensionIds = '_Netcdf4Coordinates' in attrs ? Array.from(attrs._Netcdf4Coordinates!.value as ArrayLike<number>, Number) : []
    const dimensionNames = shape.map((size, k) => {
      if (dimensions.has(name) && shape.length === 1) return name
      let scales: string[] = []
      try { scales = d.get_attached_scales(k) } catch { /* no scales attached */ }
      const fromScale = scales[0]?.split('/').pop()
      return fromScale || dimensionById.get(dimensionIds[k] ?? -1) || `dim${k}_${size}`
    })
    dimensionNames.forEach((n, k) => { if (!dimensions.has(n)) dimensions.set(n, shape[k]!) })
    variables.set(name, {
      name,
      dimensions: dimensionNames,
      shape,
      type: valueType(d.metadata as { type: number; size: number; signed: boolean }),
      attributes: readAttributes(d),
      read(start, count) {
        if (shape.length === 0) return toNumeric(d.value)
        const whole = start.every((s, k) => s === 0 && count[k] === shape[k])
        return toNumeric(whole ? d.value : d.slice(start.map((s, k) => [s, s + count[k]!]) as [number, number][]))
      },
    })
  }
  return { dimensions, variables, attributes: readAttributes(file) }
}
