/**
 * Reads one CF-convention forecast variable (CF Conventions 1.x) from a NetCDF dataset into an
 * EnsembleRun: picks the data variable, recognises member/time/grid dimensions, resolves times,
 * units, packing (scale_factor, add_offset), missing values (_FillValue, missing_value, valid_*,
 * netCDF default fill values) and the grid mapping, then decodes every (lead time, member) field.
 */
import { assembleRun, checkDecodedSize, fieldLabel, type RunParts } from './assembleRun'
import { axisRole, coordinateOf, gridVariables, isLatitude, isLongitude, unitsOf, type AxisRole } from './cfAxes'
import { leadTimesOf } from './cfLeadTimes'
import { numberAttribute, numbersAttribute, readAll, textAttribute, type Dataset, type NumericArray, type Variable } from './dataModel'
import { IngestError } from './errors'
import { decodeField, type Decoding, type SlabLayout } from './fieldDecode'
import { placeGrid } from './gridGeometry'
import { projectionFromGridMapping, WGS84_LONLAT, type Projection } from './gridMapping'
import { resolveUnits } from './quantities'
import type { EnsembleFormat, EnsembleRun, ReadOptions } from './types'
import { conversion, parseUnits, sameDimensions } from './units'

/** netCDF default fill values (netcdf.h NC_FILL_*), which apply when _FillValue is absent; none for bytes (NUG advice). */
const DEFAULT_FILL: Record<string, number> = {
  short: -32767, int: -2147483647, float: Math.fround(9.9692099683868690e36), double: 9.9692099683868690e36,
  ushort: 65535, uint: 4294967295, int64: -9223372036854775806, uint64: 18446744073709551614,
}
const UNSIGNED_BITS: Record<string, number> = { byte: 8, short: 16, int: 32 }
/** Variables up to this many cells (256 MB of float32) are read in one call. */
const WHOLE_READ_CELLS = 64 * 2 ** 20

function chooseVariable(ds: Dataset, wanted: string | undefined): Variable {
  const candidates = gridVariables(ds)
  if (wanted !== undefined) {
    const v = ds.variables.get(wanted)
    if (!v) {
      throw new IngestError('variable_not_found',
        `The file has no variable "${wanted}"${candidates.length ? `; it has ${candidates.map((c) => `"${c.name}"`).join(', ')}` : ''}.`)
    }
    if (!candidates.includes(v)) throw new IngestError('unsupported_layout', `The variable "${wanted}" is not laid out on a latitude–longitude or projected grid.`)
    return v
  }
  if (candidates.length === 0) {
    const unplaced = [...ds.variables.values()].find((v) => v.dimensions.length >= 2 && coordinateOf(ds, v.name) !== v && v.type !== 'char')
    if (unplaced) {
      throw new IngestError('missing_coordinates',
        `The variable "${unplaced.name}" has no latitude/longitude or projection coordinates for its dimensions (${unplaced.dimensions.join(', ')}), so its grid cannot be placed.`)
    }
    throw new IngestError('no_members', 'The file has no ensemble members (no data variable on a latitude–longitude or projected grid).')
  }
  const score = (v: Variable) => v.dimensions.reduce((s, d) => {
    const role = axisRole(ds, d)
    return s + (role === 'member' ? 2 : role === 'time' ? 1 : 0)
  }, 0)
  const best = Math.max(...candidates.map(score))
  const top = candidates.filter((v) => score(v) === best)
  if (top.length > 1) {
    throw new IngestError('ambiguous_variable',
      `The file holds several forecast variables (${top.map((v) => `"${v.name}"`).join(', ')}); choose one (tessera inspect --variable NAME).`)
  }
  return top[0]!
}

interface Layout { x: number; y: number; member?: number; time?: number; fixed: number[] }

function layoutOf(ds: Dataset, v: Variable): Layout {
  const roles: AxisRole[] = v.dimensions.map((d) => axisRole(ds, d))
  const layout: Layout = { x: -1, y: -1, fixed: [] }
  roles.forEach((role, k) => {
    const dim = v.dimensions[k]!
    const size = v.shape[k]!
    const slot = role === 'other' ? undefined : role
    const taken = slot === 'x' || slot === 'y' ? layout[slot] >= 0 : slot ? layout[slot] !== undefined : false
    if (slot && !taken) {
      layout[slot] = k
    } else if (size === 1) {
      layout.fixed.push(k)
    } else if (slot === 'x' || slot === 'y') {
      throw new IngestError('unsupported_layout', `The variable "${v.name}" has two ${slot} dimensions; Tessera reads 2-D horizontal grids.`)
    } else {
      throw new IngestError('unsupported_layout',
        `The variable "${v.name}" has a dimension "${dim}" of ${size} values besides member, time and the grid; Tessera reads one level at a time — extract one level first.`)
    }
  })
  return layout
}

function projectionOf(ds: Dataset, v: Variable, xVar: Variable, yVar: Variable): Projection {
  const mappingName = (textAttribute(v, 'grid_mapping') ?? '').split(/[\s:]+/).find((t) => t && ds.variables.has(t))
  if (mappingName) {
    const projection = projectionFromGridMapping(mappingName, ds.variables.get(mappingName)!)
    if (projection.kind !== 'latlon' || (isLongitude(xVar) && isLatitude(yVar))) return projection
  }
  if (isLongitude(xVar) && isLatitude(yVar)) return WGS84_LONLAT
  const declared = textAttribute(v, 'grid_mapping')
  throw new IngestError(declared ? 'unsupported_projection' : 'missing_coordinates', declared
    ? `The grid mapping "${declared}" named by "${v.name}" is not in the file.`
    : `The grid of "${v.name}" is in "${xVar.name}"/"${yVar.name}" coordinates but the file has no grid_mapping saying which projection they belong to.`)
}

/** Projection coordinates in metres; rotated and lat–lon coordinates stay in degrees. */
function axisValues(axis: Variable, projection: Projection): Float64Array {
  const values = Float64Array.from(readAll(axis), Number)
  if (projection.kind !== 'projected') return values
  const units = unitsOf(axis) || 'm'
  const unit = parseUnits(units)
  const metre = parseUnits('m')
  if (!sameDimensions(unit.dims, metre.dims)) {
    throw new IngestError('incompatible_units', `The projection coordinate "${axis.name}" has units "${units}", which is not a length.`)
  }
  const { scale } = conversion(unit, metre)
  return values.map((x) => x * scale)
}

function heightOf(ds: Dataset, v: Variable, layout: Layout): number | undefined {
  const listed = (textAttribute(v, 'coordinates') ?? '').split(/\s+/)
  const fixedCoords = layout.fixed.map((k) => v.dimensions[k]!)
  const candidates = [...fixedCoords, ...listed, ...ds.variables.keys()]
  for (const name of candidates) {
    const h = ds.variables.get(name)
    if (!h || h.dimensions.length > 1 || (h.dimensions.length === 1 && !fixedCoords.includes(h.dimensions[0]!))) continue
    if (textAttribute(h, 'standard_name') !== 'height' && name !== 'height') continue
    try {
      const unit = parseUnits(unitsOf(h) || 'm')
      const metre = parseUnits('m')
      if (!sameDimensions(unit.dims, metre.dims)) continue
      return Number(readAll(h)[0]) * conversion(unit, metre).scale
    } catch { continue }
  }
  return undefined
}

function memberLabels(ds: Dataset, v: Variable, layout: Layout): string[] | undefined {
  if (layout.member === undefined) return undefined
  const c = coordinateOf(ds, v.dimensions[layout.member]!)
  if (!c || c.type === 'char' || c.type === 'string') return undefined
  return Array.from(readAll(c), (x) => String(x))
}

function decodingOf(v: Variable, scale: number, offset: number): Decoding {
  const fill = numbersAttribute(v, '_FillValue') ?? (DEFAULT_FILL[v.type] !== undefined ? [DEFAULT_FILL[v.type]!] : [])
  let missing = [...fill, ...(numbersAttribute(v, 'missing_value') ?? [])]
  const range = numbersAttribute(v, 'valid_range')
  let validMin = range?.[0] ?? numberAttribute(v, 'valid_min') ?? -Infinity
  let validMax = range?.[1] ?? numberAttribute(v, 'valid_max') ?? Infinity
  const bits = textAttribute(v, '_Unsigned') === 'true' ? UNSIGNED_BITS[v.type] : undefined
  if (bits) {
    const unsigned = (x: number) => (x < 0 ? x + 2 ** bits : x)
    missing = missing.map(unsigned)
    validMin = Number.isFinite(validMin) ? unsigned(validMin) : validMin
    validMax = Number.isFinite(validMax) ? unsigned(validMax) : validMax
  }
  if (v.type === 'float') missing = missing.map(Math.fround)
  const packScale = numberAttribute(v, 'scale_factor') ?? 1
  const packOffset = numberAttribute(v, 'add_offset') ?? 0
  return {
    missing: missing.filter((x) => !Number.isNaN(x)),
    nanIsMissing: missing.some((x) => Number.isNaN(x)),
    validMin, validMax,
    scale: packScale * scale,
    offset: packOffset * scale + offset,
  }
}

function asUnsigned(raw: NumericArray, type: string): NumericArray {
  if (raw instanceof Int8Array) return new Uint8Array(raw.buffer, raw.byteOffset, raw.length)
  if (raw instanceof Int16Array) return new Uint16Array(raw.buffer, raw.byteOffset, raw.length)
  if (raw instanceof Int32Array) return new Uint32Array(raw.buffer, raw.byteOffset, raw.length)
  const bits = UNSIGNED_BITS[type]!
  return Array.from(raw, (x) => (x < 0 ? x + 2 ** bits : x))
}

/** Interprets a NetCDF dataset as one ensemble run of one variable (`wholeReadCells`: largest variable read in one call). */
export function readCfRun(ds: Dataset, format: EnsembleFormat, options: ReadOptions & { maxDecodedBytes: number; wholeReadCells?: number }): EnsembleRun {
  const v = chooseVariable(ds, options.variable)
  const layout = layoutOf(ds, v)
  const xDim = v.dimensions[layout.x]!, yDim = v.dimensions[layout.y]!
  const xVar = coordinateOf(ds, xDim), yVar = coordinateOf(ds, yDim)
  if (!xVar || !yVar) {
    throw new IngestError('missing_coordinates', `The file has no coordinate values for the grid dimension "${!xVar ? xDim : yDim}", so the grid cannot be placed.`)
  }
  const notes: string[] = []
  const members = layout.member === undefined ? 1 : v.shape[layout.member]!
  if (members === 0) throw new IngestError('no_members', `The file has no ensemble members (the dimension "${v.dimensions[layout.member!]}" is empty).`)
  if (layout.member === undefined) notes.push('The file has no realization (member) dimension; it was read as a single member.')
  const steps = layout.time === undefined ? 1 : v.shape[layout.time]!
  if (steps === 0) throw new IngestError('missing_time', `The file has no lead times (the dimension "${v.dimensions[layout.time!]}" is empty).`)
  checkDecodedSize(members * steps * v.shape[layout.x]! * v.shape[layout.y]!, options.maxDecodedBytes) // before reading anything large

  const projection = projectionOf(ds, v, xVar, yVar)
  const placed = placeGrid({ projection, x: axisValues(xVar, projection), y: axisValues(yVar, projection), xName: xVar.name, yName: yVar.name })
  const { nx, ny } = placed.grid
  const times = leadTimesOf(ds, v, layout.time === undefined ? undefined : v.dimensions[layout.time], steps)

  const standardName = textAttribute(v, 'standard_name') ?? null
  const units = textAttribute(v, 'units')
  if (units === undefined) throw new IngestError('unknown_units', `The variable "${v.name}" has no units attribute.`)
  const resolved = resolveUnits(standardName, units, `The variable "${v.name}"`)
  const decoding = decodingOf(v, resolved.scale, resolved.offset)
  const unsigned = textAttribute(v, '_Unsigned') === 'true' && v.type in UNSIGNED_BITS

  // One read of the whole variable decompresses each chunk once (chunks often span several members);
  // larger variables are read field by field to bound memory.
  const labels = memberLabels(ds, v, layout)
  const unsignedView = (raw: NumericArray) => (unsigned ? asUnsigned(raw, v.type) : raw)
  const whole = members * steps * nx * ny <= (options.wholeReadCells ?? WHOLE_READ_CELLS) ? unsignedView(readAll(v)) : undefined
  const strides = v.shape.map((_, k) => v.shape.slice(k + 1).reduce((p, n) => p * n, 1))
  const xFirst = layout.x < layout.y
  const fields: Float32Array[] = []
  for (let t = 0; t < steps; t++) {
    for (let m = 0; m < members; m++) {
      const where = fieldLabel(labels, m, times.validTimesMs[t]!)
      const slab = { nx, ny, flipX: placed.flipX, flipY: placed.flipY }
      let raw: NumericArray
      let layoutInRaw: SlabLayout
      if (whole) {
        raw = whole
        const origin = (layout.time === undefined ? 0 : t * strides[layout.time]!) + (layout.member === undefined ? 0 : m * strides[layout.member]!)
        layoutInRaw = { ...slab, origin, strideX: strides[layout.x]!, strideY: strides[layout.y]! }
      } else {
        const start = v.shape.map(() => 0)
        const count = v.shape.map((n, k) => (k === layout.x || k === layout.y ? n : 1))
        if (layout.time !== undefined) start[layout.time] = t
        if (layout.member !== undefined) start[layout.member] = m
        raw = unsignedView(v.read(start, count))
        layoutInRaw = { ...slab, strideX: xFirst ? ny : 1, strideY: xFirst ? 1 : nx }
      }
      fields.push(decodeField(raw, layoutInRaw, decoding, where))
    }
  }
  const heightM = heightOf(ds, v, layout)
  const longName = textAttribute(v, 'long_name')
  const cellMethods = textAttribute(v, 'cell_methods')
  const parts: RunParts = {
    format, variable: v.name, standardName, units, resolved, members, validTimesMs: times.validTimesMs, referenceTimeMs: times.referenceTimeMs,
    placed, notes: [...notes, ...times.notes],
    ...(longName ? { longName } : {}), ...(cellMethods ? { cellMethods } : {}), ...(heightM !== undefined ? { heightM } : {}), ...(labels ? { memberLabels: labels } : {}),
  }
  return assembleRun(parts, fields)
}
