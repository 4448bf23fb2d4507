/**
 * Tessera's own ensemble grid format, "ensemble-grid/1" (UTF-8 JSON; documented in docs/formats.md):
 *
 *   {
 *     "tessera": "ensemble-grid/1",
 *     "variable": "gust",                          // required: a short name
 *     "standardName": "wind_speed_of_gust",        // optional CF standard name (canonical units follow from it)
 *     "longName": "Gust at 10 m",                  // optional
 *     "units": "m s-1",                            // required, UDUNITS spelling
 *     "referenceTime": "2031-03-04T00:00:00Z",     // optional (null when unknown)
 *     "leadTimes": ["2031-03-04T06:00:00Z", …],    // required: valid times, ISO 8601, increasing
 *     "heightM": 10, "cellMethods": "time: maximum", // optional
 *     "grid": { "lon": [...nx], "lat": [...ny] }   // regular latitude–longitude (WGS 84), cell centres, or
 *           | { "proj4": "+proj=lcc …", "x": [...nx], "y": [...ny] }, // projected, metres (degrees for +proj=ob_tran)
 *     "memberLabels": ["1", "2", …],               // optional, one per member
 *     "members": [ [ [ny·nx values], … one per lead time ], … one per member ]
 *   }
 *
 * Each field is row-major in the order of the coordinates as given (value of column i, row k at
 * k·nx + i, row k at lat[k] or y[k]); null marks a missing cell. Rows or columns given in
 * decreasing order are flipped on reading, as for every other format.
 */
import { assembleRun, checkDecodedSize, fieldLabel } from './assembleRun'
import { parseIsoTime } from './cfTime'
import { IngestError } from './errors'
import { decodeField } from './fieldDecode'
import { placeGrid } from './gridGeometry'
import { checkedProjection, geographicFor, radiusKmFor, WGS84_LONLAT, type Projection } from './gridMapping'
import { resolveUnits } from './quantities'
import type { EnsembleRun, ReadOptions } from './types'

export const TESSERA_JSON_VERSION = 'ensemble-grid/1'

type Json = Record<string, unknown>

function incomplete(detail: string): never {
  throw new IngestError('corrupt_file', `The Tessera JSON file is incomplete or malformed: ${detail}.`)
}

function text(obj: Json, key: string, required: true): string
function text(obj: Json, key: string, required: false): string | undefined
function text(obj: Json, key: string, required: boolean): string | undefined {
  const v = obj[key]
  if (v === undefined || v === null) return required ? incomplete(`"${key}" is missing`) : undefined
  if (typeof v !== 'string' || v.trim() === '') incomplete(`"${key}" must be a non-empty string`)
  return v
}

function numbers(raw: unknown, what: string): Float64Array {
  if (!Array.isArray(raw) || raw.some((v) => typeof v !== 'number')) incomplete(`${what} must be an array of numbers`)
  return Float64Array.from(raw as number[])
}

/** null → NaN (missing); non-numbers are refused. Infinity can arrive from literals such as 1e999. */
function cellValues(raw: unknown, cells: number, what: string): Float64Array {
  if (!Array.isArray(raw)) throw new IngestError('shape_mismatch', `${what} is not an array of ${cells} values.`)
  if (raw.length !== cells) throw new IngestError('shape_mismatch', `${what} has ${raw.length} values; the grid has ${cells} cells.`)
  const out = new Float64Array(cells)
  for (let k = 0; k < cells; k++) {
    const v = raw[k]
    if (v === null) out[k] = NaN
    else if (typeof v === 'number') out[k] = v
    else incomplete(`${what}[${k}] is ${JSON.stringify(v)}, not a number or null`)
  }
  return out
}

function projectionOf(grid: Json): { projection: Projection; x: Float64Array; y: Float64Array; xName: string; yName: string } {
  if (grid.lon !== undefined || grid.lat !== undefined) {
    return { projection: WGS84_LONLAT, x: numbers(grid.lon, 'grid.lon'), y: numbers(grid.lat, 'grid.lat'), xName: 'grid.lon', yName: 'grid.lat' }
  }
  const proj = text(grid, 'proj4', false)
  if (!proj) incomplete('"grid" needs "lon" and "lat", or "proj4" with "x" and "y"')
  const rotated = /\+proj=ob_tran\b/.test(proj)
  const longlat = /\+proj=(longlat|latlong|lonlat|latlon)\b/.test(proj)
  const projection = checkedProjection({
    kind: rotated ? 'rotated' : longlat ? 'latlon' : 'projected',
    crs: rotated ? 'rotated_latitude_longitude' : longlat ? 'latitude_longitude' : (/\+proj=(\w+)/.exec(proj)?.[1] ?? 'proj4'),
    proj4: proj, geographic: geographicFor(proj), earthRadiusKm: radiusKmFor(proj),
  }, 'The Tessera JSON grid')
  return { projection, x: numbers(grid.x, 'grid.x'), y: numbers(grid.y, 'grid.y'), xName: 'grid.x', yName: 'grid.y' }
}

/** Reads Tessera JSON text. */
export function readTesseraJson(source: string, options: ReadOptions & { maxDecodedBytes: number }): EnsembleRun {
  let doc: unknown
  try {
    doc = JSON.parse(source)
  } catch (err) {
    throw new IngestError('corrupt_file', `The JSON file cannot be parsed (${(err as Error).message}); it may be truncated.`)
  }
  if (typeof doc !== 'object' || doc === null || Array.isArray(doc)) incomplete('expected an object')
  const obj = doc as Json
  if (obj.tessera !== TESSERA_JSON_VERSION) {
    throw new IngestError('unknown_format', typeof obj.tessera === 'string'
      ? `This Tessera JSON is version "${obj.tessera}"; this Tessera reads "${TESSERA_JSON_VERSION}".`
      : `The JSON file is not a Tessera ensemble grid (it has no "tessera": "${TESSERA_JSON_VERSION}" marker).`)
  }
  const variable = text(obj, 'variable', true)
  const standardName = text(obj, 'standardName', false) ?? null
  const units = text(obj, 'units', true)
  const resolved = resolveUnits(standardName, units, `The variable "${variable}"`)
  if (typeof obj.grid !== 'object' || obj.grid === null) incomplete('"grid" is missing')
  const { projection, x, y, xName, yName } = projectionOf(obj.grid as Json)
  const placed = placeGrid({ projection, x, y, xName, yName })
  const { nx, ny } = placed.grid
  if (!Array.isArray(obj.leadTimes)) incomplete('"leadTimes" must be an array of ISO 8601 valid times')
  const validTimesMs = (obj.leadTimes as unknown[]).map((t, k) => parseIsoTime(t, `leadTimes[${k}]`))
  const referenceTimeMs = obj.referenceTime === undefined || obj.referenceTime === null ? null : parseIsoTime(obj.referenceTime, 'referenceTime')
  if (!Array.isArray(obj.members) || obj.members.length === 0) {
    throw new IngestError('no_members', 'The file has no ensemble members ("members" is empty or missing).')
  }
  const memberList = obj.members as unknown[]
  const members = memberList.length
  checkDecodedSize(members * validTimesMs.length * nx * ny, options.maxDecodedBytes)
  let labels: string[] | undefined
  if (obj.memberLabels !== undefined) {
    if (!Array.isArray(obj.memberLabels) || obj.memberLabels.length !== members) {
      throw new IngestError('shape_mismatch', `"memberLabels" must list one label for each of the ${members} members.`)
    }
    labels = (obj.memberLabels as unknown[]).map(String)
  }
  const fields: Float32Array[] = []
  for (let t = 0; t < validTimesMs.length; t++) {
    for (let m = 0; m < members; m++) {
      const perLead = memberList[m]
      if (!Array.isArray(perLead) || perLead.length !== validTimesMs.length) {
        throw new IngestError('shape_mismatch', `members[${m}] must hold one field for each of the ${validTimesMs.length} lead times.`)
      }
      const where = fieldLabel(labels, m, validTimesMs[t]!)
      const raw = cellValues(perLead[t], nx * ny, `members[${m}][${t}]`)
      fields.push(decodeField(raw, { nx, ny, strideX: 1, strideY: nx, flipX: placed.flipX, flipY: placed.flipY },
        { missing: [], nanIsMissing: true, validMin: -Infinity, validMax: Infinity, scale: resolved.scale, offset: resolved.offset }, where))
    }
  }
  const heightM = typeof obj.heightM === 'number' ? obj.heightM : undefined
  const longName = text(obj, 'longName', false)
  const cellMethods = text(obj, 'cellMethods', false)
  return assembleRun({
    format: 'tessera-json', variable, standardName, units, resolved, members, validTimesMs, referenceTimeMs, placed, notes: [],
    ...(longName ? { longName } : {}), ...(cellMethods ? { cellMethods } : {}), ...(heightM !== undefined ? { heightM } : {}), ...(labels ? { memberLabels: labels } : {}),
  }, fields)
}
