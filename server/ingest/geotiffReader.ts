/**
 * GeoTIFF ensembles: one image, one band per member, one lead time. Georeferencing from the GeoTIFF
 * keys (EPSG geographic or projected code) and the affine tags (ModelTiepoint + ModelPixelScale or
 * ModelTransformation, GeoTIFF 1.1 §7.3); nodata, band scale/offset, unit type and description
 * from GDAL's tags. The forecast metadata Tessera needs are GDAL metadata items named after the CF
 * attributes (gdal_translate -mo KEY=VALUE; keys are case-insensitive):
 *   STANDARD_NAME, LONG_NAME, VARIABLE, UNITS (else the band unit type), CELL_METHODS, HEIGHT (m),
 *   FORECAST_REFERENCE_TIME and VALID_TIME (ISO 8601), FORECAST_PERIOD (hours) — any two of the last three.
 */
import type { GeoTIFF, GeoTIFFImage } from 'geotiff'
import { assembleRun, checkDecodedSize } from './assembleRun'
import { formatIsoUtc, parseIsoTime } from './cfTime'
import { IngestError } from './errors'
import { decodeField } from './fieldDecode'
import { placeGrid } from './gridGeometry'
import { checkedProjection, geographicFor, MEAN_EARTH_RADIUS_KM, WGS84_LONLAT, type Projection } from './gridMapping'
import { resolveUnits } from './quantities'
import type { EnsembleRun, ReadOptions } from './types'

const USER_DEFINED = 32767

function corrupt(err: unknown): never {
  if (err instanceof IngestError) throw err
  throw new IngestError('corrupt_file', `The GeoTIFF is damaged or truncated (${err instanceof Error ? err.message : String(err)}).`)
}

/** proj4 strings of the EPSG codes Tessera recognises in GeoTIFF keys (EPSG registry definitions). */
function projectionForEpsg(code: number, geographic: boolean): Projection | undefined {
  const make = (proj: string, kind: Projection['kind'] = 'projected'): Projection =>
    checkedProjection({ kind, crs: `EPSG:${code}`, proj4: proj, geographic: geographicFor(proj), earthRadiusKm: MEAN_EARTH_RADIUS_KM }, `EPSG:${code}`)
  if (geographic) {
    if (code === 4326) return WGS84_LONLAT
    if (code === 4258 || code === 4269 || code === 4167) return make('+proj=longlat +ellps=GRS80 +no_defs', 'latlon')
    return undefined
  }
  if (code >= 32601 && code <= 32660) return make(`+proj=utm +zone=${code - 32600} +datum=WGS84 +units=m +no_defs`)
  if (code >= 32701 && code <= 32760) return make(`+proj=utm +zone=${code - 32700} +south +datum=WGS84 +units=m +no_defs`)
  if (code >= 25828 && code <= 25838) return make(`+proj=utm +zone=${code - 25800} +ellps=GRS80 +units=m +no_defs`)
  if (code === 3857) return make('+proj=merc +a=6378137 +b=6378137 +lat_ts=0 +lon_0=0 +x_0=0 +y_0=0 +k=1 +units=m +no_defs')
  if (code === 3035) return make('+proj=laea +lat_0=52 +lon_0=10 +x_0=4321000 +y_0=3210000 +ellps=GRS80 +units=m +no_defs')
  return undefined
}

function projectionOf(image: GeoTIFFImage): Projection {
  let keys: Record<string, number> | null
  try {
    keys = image.getGeoKeys() as Record<string, number> | null
  } catch (err) {
    corrupt(err)
  }
  if (!keys) throw new IngestError('missing_coordinates', 'The GeoTIFF has no georeferencing (no GeoTIFF keys), so the grid cannot be placed.')
  const geographic = keys.GTModelTypeGeoKey === 2
  const code = geographic ? keys.GeographicTypeGeoKey : keys.ProjectedCSTypeGeoKey
  if (!geographic && keys.ProjLinearUnitsGeoKey !== undefined && keys.ProjLinearUnitsGeoKey !== 9001) {
    throw new IngestError('unsupported_projection', 'The GeoTIFF coordinates are not in metres; reproject it (gdalwarp -t_srs EPSG:4326).')
  }
  const projection = code !== undefined && code !== USER_DEFINED ? projectionForEpsg(code, geographic) : undefined
  if (!projection) {
    throw new IngestError('unsupported_projection',
      `The GeoTIFF uses ${code === undefined || code === USER_DEFINED ? 'a user-defined coordinate system' : `EPSG:${code}`}, which Tessera does not know; reproject it to EPSG:4326 (gdalwarp -t_srs EPSG:4326).`)
  }
  return projection
}

/** Cell-centre coordinates of columns and rows from the affine tags; refuses rotated or sheared images. */
function axes(image: GeoTIFFImage): { x: Float64Array; y: Float64Array } {
  const dir = image.getFileDirectory()
  const nx = image.getWidth(), ny = image.getHeight()
  const transform = dir.getValue('ModelTransformation') as number[] | undefined
  const tie = dir.getValue('ModelTiepoint') as number[] | undefined
  const scale = dir.getValue('ModelPixelScale') as number[] | undefined
  let x0: number, dx: number, y0: number, dy: number // coordinate of pixel corner (0, 0) and steps per pixel
  if (tie && tie.length >= 6 && scale) {
    dx = scale[0]!; dy = -scale[1]!
    x0 = tie[3]! - tie[0]! * dx; y0 = tie[4]! - tie[1]! * dy
  } else if (transform && transform.length >= 8) {
    if (transform[1] !== 0 || transform[4] !== 0) throw new IngestError('unsupported_layout', 'The GeoTIFF grid is rotated; warp it to a north-up grid first (gdalwarp).')
    dx = transform[0]!; dy = transform[5]!; x0 = transform[3]!; y0 = transform[7]!
  } else {
    throw new IngestError('missing_coordinates', 'The GeoTIFF has no pixel-to-map transformation, so the grid cannot be placed.')
  }
  const centre = image.pixelIsArea() ? 0.5 : 0 // PixelIsPoint tie points refer to pixel centres
  return {
    x: Float64Array.from({ length: nx }, (_, i) => x0 + (i + centre) * dx),
    y: Float64Array.from({ length: ny }, (_, j) => y0 + (j + centre) * dy),
  }
}

function lowerKeys(record: Record<string, unknown> | null): Record<string, string> {
  const out: Record<string, string> = {}
  for (const [k, v] of Object.entries(record ?? {})) out[k.toLowerCase()] = String(v)
  return out
}

function timesOf(meta: Record<string, string>): { valid: number; reference: number | null } {
  const valid = meta.valid_time ?? meta.time
  const reference = meta.forecast_reference_time
  const periodText = meta.forecast_period
  const period = periodText === undefined ? undefined : Number(periodText)
  if (period !== undefined && !Number.isFinite(period)) {
    throw new IngestError('bad_time_units', `FORECAST_PERIOD must be a number of hours, got "${periodText}".`)
  }
  const ref = reference === undefined ? null : parseIsoTime(reference, 'FORECAST_REFERENCE_TIME')
  let validMs = valid === undefined ? undefined : parseIsoTime(valid, 'VALID_TIME')
  if (validMs === undefined) {
    if (ref === null || period === undefined) {
      throw new IngestError('missing_time', 'The GeoTIFF has no valid time: add the metadata item VALID_TIME, or FORECAST_REFERENCE_TIME and FORECAST_PERIOD (hours).')
    }
    validMs = ref + period * 3_600_000
  } else if (ref !== null && period !== undefined && Math.abs(validMs - ref - period * 3_600_000) > 1000) {
    throw new IngestError('inconsistent_times', `VALID_TIME ${formatIsoUtc(validMs)} is not FORECAST_REFERENCE_TIME + ${period} h.`)
  }
  return { valid: validMs, reference: ref ?? (period !== undefined ? validMs - period * 3_600_000 : null) }
}

/** Refuses a file whose image data (strips or tiles) reach past its end: a truncated download. */
async function requireCompleteData(image: GeoTIFFImage, fileSize: number): Promise<void> {
  const dir = image.getFileDirectory()
  const tiled = dir.hasTag('TileOffsets')
  const offsets = await dir.loadValue(tiled ? 'TileOffsets' : 'StripOffsets') as ArrayLike<number> | undefined
  const counts = await dir.loadValue(tiled ? 'TileByteCounts' : 'StripByteCounts') as ArrayLike<number> | undefined
  if (!offsets || !counts || offsets.length !== counts.length) corrupt('no image data')
  for (let k = 0; k < offsets.length; k++) {
    if (offsets[k]! + counts[k]! > fileSize) corrupt(`image data end at byte ${offsets[k]! + counts[k]!}, the file has ${fileSize}`)
  }
}

/** Reads an opened GeoTIFF of `fileSize` bytes as one lead time of an ensemble (bands = members). */
export async function readGeotiffRun(tiff: GeoTIFF, fileName: string, fileSize: number, options: ReadOptions & { maxDecodedBytes: number }): Promise<EnsembleRun> {
  let image: GeoTIFFImage
  let meta: Record<string, string>
  let bands: Record<string, string>[]
  try {
    image = await tiff.getImage(0)
    await requireCompleteData(image, fileSize)
    meta = lowerKeys(await image.getGDALMetadata())
    bands = await Promise.all(Array.from({ length: image.getSamplesPerPixel() }, async (_, b) => lowerKeys(await image.getGDALMetadata(b))))
  } catch (err) {
    corrupt(err)
  }
  const members = bands.length
  checkDecodedSize(members * image.getWidth() * image.getHeight(), options.maxDecodedBytes)
  const projection = projectionOf(image)
  let grid: { x: Float64Array; y: Float64Array }
  try {
    grid = axes(image)
  } catch (err) {
    corrupt(err)
  }
  const { x, y } = grid
  const placed = placeGrid({ projection, x, y, xName: 'columns', yName: 'rows' })
  const times = timesOf(meta)

  const units = meta.units ?? bands[0]?.unittype
  if (!units) throw new IngestError('unknown_units', 'The GeoTIFF does not state its units: set the band unit type or the metadata item UNITS.')
  if (!meta.units && bands.some((b) => (b.unittype ?? '') !== units)) {
    throw new IngestError('incompatible_units', 'The bands of the GeoTIFF have different unit types; all members must share one unit.')
  }
  const standardName = meta.standard_name ?? null
  const variable = meta.variable ?? standardName ?? fileName.replace(/^.*[\\/]/, '').replace(/\.[^.]*$/, '')
  const resolved = resolveUnits(standardName, units, `The GeoTIFF variable "${variable}"`)
  const noData = image.getGDALNoData()
  const float32 = image.getSampleFormat(0) === 3 && image.getBitsPerSample(0) === 32
  const labels = bands.every((b) => b.description) ? bands.map((b) => b.description!) : undefined

  let rasters: ArrayLike<number>[]
  try {
    rasters = await image.readRasters({ interleave: false }) as unknown as ArrayLike<number>[]
  } catch (err) {
    corrupt(err)
  }
  const fields = rasters.map((raster, b) => {
    const scale = Number(bands[b]!.scale ?? 1), offset = Number(bands[b]!.offset ?? 0)
    return decodeField(raster, { nx: x.length, ny: y.length, strideX: 1, strideY: x.length, flipX: placed.flipX, flipY: placed.flipY }, {
      missing: noData === null || Number.isNaN(noData) ? [] : [float32 ? Math.fround(noData) : noData],
      nanIsMissing: noData !== null && Number.isNaN(noData),
      validMin: -Infinity, validMax: Infinity,
      scale: scale * resolved.scale,
      offset: offset * resolved.scale + resolved.offset,
    }, `Band ${b + 1}${labels ? ` ("${labels[b]}")` : ''} at ${formatIsoUtc(times.valid)}`)
  })
  const height = meta.height === undefined ? undefined : Number(meta.height)
  return assembleRun({
    format: 'geotiff', variable, standardName, units, resolved, members,
    validTimesMs: [times.valid], referenceTimeMs: times.reference, placed, notes: [],
    ...(meta.long_name ? { longName: meta.long_name } : {}),
    ...(meta.cell_methods ? { cellMethods: meta.cell_methods } : {}),
    ...(height !== undefined && Number.isFinite(height) ? { heightM: height } : {}),
    ...(labels ? { memberLabels: labels } : {}),
  }, fields)
}
