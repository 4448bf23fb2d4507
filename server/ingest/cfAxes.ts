/**
 * Recognising what each dimension of a CF variable means (CF Conventions §4: coordinate types
 * identified by standard_name, axis, units, and, as a last resort, common dimension names).
 */
import { textAttribute, type Dataset, type Variable } from './dataModel'

export type AxisRole = 'x' | 'y' | 'member' | 'time' | 'other'

const MEMBER_NAMES = new Set(['realization', 'realisation', 'ensemble_member', 'member', 'number', 'ens', 'ensemble', 'mem'])
const TIME_NAMES = new Set(['time', 'leadtime', 'lead_time', 'step', 'forecast_period', 'valid_time', 't'])
const X_STANDARD_NAMES = new Set(['longitude', 'grid_longitude', 'projection_x_coordinate'])
const Y_STANDARD_NAMES = new Set(['latitude', 'grid_latitude', 'projection_y_coordinate'])
const TIME_STANDARD_NAMES = new Set(['time', 'forecast_period', 'forecast_reference_time'])
const LON_UNITS = new Set(['degrees_east', 'degree_east', 'degree_e', 'degrees_e', 'degreee', 'degreese'])
const LAT_UNITS = new Set(['degrees_north', 'degree_north', 'degree_n', 'degrees_n', 'degreen', 'degreesn'])
const X_NAMES = new Set(['x', 'lon', 'longitude', 'rlon', 'grid_longitude'])
const Y_NAMES = new Set(['y', 'lat', 'latitude', 'rlat', 'grid_latitude'])
export const NUMERIC_TYPES = new Set(['byte', 'ubyte', 'short', 'ushort', 'int', 'uint', 'int64', 'uint64', 'float', 'double'])

/** The coordinate variable of a dimension: a 1-D variable with the dimension's name. */
export function coordinateOf(ds: Dataset, dim: string): Variable | undefined {
  const v = ds.variables.get(dim)
  return v && v.dimensions.length === 1 && v.dimensions[0] === dim ? v : undefined
}

export function unitsOf(v: Variable | undefined): string {
  return (v ? textAttribute(v, 'units') ?? '' : '').trim()
}

/** True for longitude-like coordinates (degrees_east, or standard_name longitude). */
export function isLongitude(v: Variable | undefined): boolean {
  return !!v && (textAttribute(v, 'standard_name') === 'longitude' || LON_UNITS.has(unitsOf(v).toLowerCase()))
}

/** True for latitude-like coordinates (degrees_north, or standard_name latitude). */
export function isLatitude(v: Variable | undefined): boolean {
  return !!v && (textAttribute(v, 'standard_name') === 'latitude' || LAT_UNITS.has(unitsOf(v).toLowerCase()))
}

/** Role of one dimension of a data variable. */
export function axisRole(ds: Dataset, dim: string): AxisRole {
  const c = coordinateOf(ds, dim)
  const name = dim.toLowerCase()
  const sn = c ? textAttribute(c, 'standard_name') ?? '' : ''
  const axis = c ? (textAttribute(c, 'axis') ?? '').toUpperCase() : ''
  const units = unitsOf(c).toLowerCase()
  if (sn === 'realization' || (!sn && MEMBER_NAMES.has(name))) return 'member'
  if (X_STANDARD_NAMES.has(sn) || axis === 'X' || LON_UNITS.has(units)) return 'x'
  if (Y_STANDARD_NAMES.has(sn) || axis === 'Y' || LAT_UNITS.has(units)) return 'y'
  if (TIME_STANDARD_NAMES.has(sn) || axis === 'T' || / since /.test(units)) return 'time'
  if (!sn && !axis) {
    if (X_NAMES.has(name)) return 'x'
    if (Y_NAMES.has(name)) return 'y'
    if (TIME_NAMES.has(name)) return 'time'
  }
  return 'other'
}

/** Names other variables point to (coordinates, bounds, grid mappings, …): these are not data. */
export function referencedNames(ds: Dataset): Set<string> {
  const out = new Set<string>()
  for (const v of ds.variables.values()) {
    for (const attr of ['coordinates', 'bounds', 'grid_mapping', 'ancillary_variables', 'cell_measures', 'climatology', 'formula_terms']) {
      const text = textAttribute(v, attr)
      if (!text) continue
      for (const token of text.split(/\s+/)) if (token && !token.endsWith(':')) out.add(token)
    }
  }
  return out
}

/** Variables on a horizontal grid that may hold the ensemble. */
export function gridVariables(ds: Dataset): Variable[] {
  const referenced = referencedNames(ds)
  return [...ds.variables.values()].filter((v) => {
    if (referenced.has(v.name) || coordinateOf(ds, v.name) === v || !NUMERIC_TYPES.has(v.type) || v.dimensions.length < 2) return false
    const roles = v.dimensions.map((d) => axisRole(ds, d))
    return roles.includes('x') && roles.includes('y')
  })
}
