/**
 * What Tessera reads from one ensemble file, whatever its format.
 *
 * Layout of `fields`: one Float32Array per (lead time t, member m) at index t·members + m; each is
 * row-major ny×nx (cell (i, j) at j·nx + i), j = 0 the southernmost row (smallest y), i = 0 the
 * westernmost column (smallest x); values in canonical units, NaN = missing.
 */
import type { RunContents } from '../../shared/types/runContents'

export type EnsembleFormat = 'netcdf-classic' | 'netcdf-4' | 'geotiff' | 'tessera-json'

/** Horizontal grid: 1-D coordinates of cell centres, both strictly increasing. */
export interface EnsembleGrid {
  nx: number
  ny: number
  /** Mean of dxKm and dyKm. */
  spacingKm: number
  /** Mean distance between horizontally / vertically adjacent cell centres, km. */
  dxKm: number
  dyKm: number
  /** 'EPSG:4326' for regular latitude–longitude; the CF grid_mapping_name (e.g. 'rotated_latitude_longitude',
   * 'lambert_conformal_conic') for NetCDF projections; 'EPSG:<code>' for GeoTIFF projections. */
  crs: string
  /** Native coordinates (x, y) → longitude/latitude through proj4 from this string to '+proj=longlat' on the same figure of the Earth. */
  proj4: string
  x: Float64Array
  y: Float64Array
  /** 'degrees_east'/'degrees_north' (lat–lon), 'degrees' (rotated pole), 'm' (projected, always converted to metres). */
  xUnits: string
  yUnits: string
  /** Sphere radius used for great-circle spacings (km). */
  earthRadiusKm: number
}

export interface EnsembleRun {
  format: EnsembleFormat
  /** Variable name in the file. */
  variable: string
  /** CF standard_name, or null when the file gives none. */
  standardName: string | null
  longName?: string
  /** Units exactly as written in the file. */
  units: string
  /** Units of `fields` (UDUNITS spelling, e.g. 'degC', 'm s-1', 'mm'). */
  canonicalUnits: string
  /** The same units as a forecaster writes them (e.g. '°C', 'm/s', 'mm'). */
  displayUnits: string
  members: number
  /** One label per member (from the realization coordinate, band description or JSON). */
  memberLabels?: string[]
  /** Valid times, ISO 8601 UTC ('2031-03-04T06:00:00Z'), strictly increasing. */
  leadTimes: string[]
  /** Hours from referenceTime to each valid time; empty when referenceTime is null. */
  forecastPeriodsHours: number[]
  referenceTime: string | null
  heightM?: number
  cellMethods?: string
  grid: EnsembleGrid
  /** [west, south, east, north] in degrees, of the outer cell edges; west > east when the grid crosses 180°. */
  extent: [number, number, number, number]
  /** Outer cell-edge corners as [lon, lat]: north-west, north-east, south-east, south-west (in grid terms: top-left first, clockwise). */
  corners: [number, number][]
  fields: Float32Array[]
  /** What the reader did that a forecaster may want to know (rows flipped, single member assumed, …). */
  notes: string[]
}

export interface ReadOptions {
  /** Largest file accepted, bytes (default 512 MB); checked before anything is parsed. */
  maxBytes?: number
  /** Largest decoded size of all fields as float32, bytes (default 4 × maxBytes); guards against highly compressed files. */
  maxDecodedBytes?: number
  /** Name of the data variable when the file holds several. */
  variable?: string
}

/** The preview shown before a forecaster confirms an upload (and printed by `tessera inspect`). */
export interface RunSummary extends RunContents {
  format: EnsembleFormat
  heightM?: number
  cellMethods?: string
  /** First member, first lead time, canonical units; missing cells ignored. */
  stats: { min: number; max: number; mean: number; missingCells: number }
}
