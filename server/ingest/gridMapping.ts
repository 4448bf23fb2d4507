/**
 * CF grid mappings (CF Conventions Appendix F) as proj4 strings, so proj4 can place a projected
 * grid on the map. The figure of the Earth comes from earth_radius, semi_major_axis with
 * semi_minor_axis or inverse_flattening, or defaults to WGS 84.
 */
import proj4 from 'proj4'
import { numberAttribute, numbersAttribute, textAttribute, type AttributeValue } from './dataModel'
import { IngestError } from './errors'

/** How native (x, y) relate to longitude/latitude. */
export type ProjectionKind = 'latlon' | 'rotated' | 'projected'

export interface Projection {
  kind: ProjectionKind
  /** CF grid_mapping_name, or 'EPSG:…' */
  crs: string
  /** Native coordinates → geographic, via proj4(proj4String, geographic). */
  proj4: string
  /** Geographic longitude/latitude on the same figure of the Earth (no datum shift, as usual for model grids). */
  geographic: string
  earthRadiusKm: number
}

/** IUGG mean Earth radius R1 (Moritz 1980, Geodetic Reference System 1980), km. */
export const MEAN_EARTH_RADIUS_KM = 6371.0088

export const WGS84_LONLAT: Projection = {
  kind: 'latlon', crs: 'EPSG:4326', proj4: '+proj=longlat +datum=WGS84 +no_defs', geographic: '+proj=longlat +datum=WGS84 +no_defs', earthRadiusKm: MEAN_EARTH_RADIUS_KM,
}

interface Attributes { attributes: Record<string, AttributeValue> }

function figureOfEarth(gm: Attributes): { proj: string; radiusKm: number } {
  const radius = numberAttribute(gm, 'earth_radius')
  const a = numberAttribute(gm, 'semi_major_axis')
  const b = numberAttribute(gm, 'semi_minor_axis')
  const rf = numberAttribute(gm, 'inverse_flattening')
  if (radius && radius > 0) return { proj: `+R=${radius}`, radiusKm: radius / 1000 }
  if (a && a > 0 && b && b > 0) return { proj: `+a=${a} +b=${b}`, radiusKm: (2 * a + b) / 3000 }
  if (a && a > 0 && rf && rf > 0) return { proj: `+a=${a} +rf=${rf}`, radiusKm: (3 - 1 / rf) * a / 3000 }
  if (a && a > 0) return { proj: `+R=${a}`, radiusKm: a / 1000 }
  return { proj: '+ellps=WGS84', radiusKm: MEAN_EARTH_RADIUS_KM }
}

function normaliseLongitude(lon: number): number {
  return ((((lon + 180) % 360) + 360) % 360) - 180
}

/** Builds the proj4 converter once to make sure proj4 understands the string. */
export function checkedProjection(p: Projection, what: string): Projection {
  try {
    proj4(p.proj4, p.geographic).forward([0, 0])
  } catch (err) {
    throw new IngestError('unsupported_projection', `${what}: the projection "${p.proj4}" cannot be used (${(err as Error).message}).`)
  }
  return p
}

/**
 * Translates a CF grid-mapping variable. Supported: latitude_longitude, rotated_latitude_longitude,
 * lambert_conformal_conic, transverse_mercator, polar_stereographic, lambert_azimuthal_equal_area,
 * mercator; otherwise a crs_wkt attribute proj4 can read.
 */
export function projectionFromGridMapping(name: string, gm: Attributes): Projection {
  const mapping = textAttribute(gm, 'grid_mapping_name') ?? ''
  const earth = figureOfEarth(gm)
  const what = `The grid mapping "${name}" (${mapping || 'no grid_mapping_name'})`
  const need = (attr: string): number => {
    const v = numberAttribute(gm, attr)
    if (v === undefined || !Number.isFinite(v)) throw new IngestError('unsupported_projection', `${what} lacks the attribute ${attr}.`)
    return v
  }
  const opt = (attr: string, fallback: number) => numberAttribute(gm, attr) ?? fallback
  const offsets = () => `+x_0=${opt('false_easting', 0)} +y_0=${opt('false_northing', 0)}`
  const geographic = `+proj=longlat ${earth.proj} +no_defs`
  const make = (kind: ProjectionKind, proj: string): Projection =>
    checkedProjection({ kind, crs: mapping, proj4: `${proj} ${earth.proj} +no_defs`.replace(/\s+/g, ' '), geographic, earthRadiusKm: earth.radiusKm }, what)
  switch (mapping) {
    case 'latitude_longitude':
      return make('latlon', '+proj=longlat')
    case 'rotated_latitude_longitude': {
      const poleLat = need('grid_north_pole_latitude')
      const poleLon = need('grid_north_pole_longitude')
      return make('rotated', `+proj=ob_tran +o_proj=longlat +o_lon_p=${opt('north_pole_grid_longitude', 0)} +o_lat_p=${poleLat} +lon_0=${normaliseLongitude(poleLon + 180)}`)
    }
    case 'lambert_conformal_conic': {
      const parallels = numbersAttribute(gm, 'standard_parallel')
      if (!parallels || parallels.length === 0) need('standard_parallel')
      const [lat1, lat2 = lat1] = parallels!
      return make('projected', `+proj=lcc +lat_1=${lat1} +lat_2=${lat2} +lat_0=${need('latitude_of_projection_origin')} +lon_0=${need('longitude_of_central_meridian')} ${offsets()} +units=m`)
    }
    case 'transverse_mercator':
      return make('projected', `+proj=tmerc +lat_0=${need('latitude_of_projection_origin')} +lon_0=${need('longitude_of_central_meridian')} +k_0=${need('scale_factor_at_central_meridian')} ${offsets()} +units=m`)
    case 'polar_stereographic': {
      const lat0 = need('latitude_of_projection_origin')
      const lon0 = numberAttribute(gm, 'straight_vertical_longitude_from_pole') ?? need('longitude_of_projection_origin')
      const ts = numberAttribute(gm, 'standard_parallel')
      const scale = ts === undefined ? `+k_0=${need('scale_factor_at_projection_origin')}` : `+lat_ts=${ts}`
      return make('projected', `+proj=stere +lat_0=${lat0} +lon_0=${lon0} ${scale} ${offsets()} +units=m`)
    }
    case 'lambert_azimuthal_equal_area':
      return make('projected', `+proj=laea +lat_0=${need('latitude_of_projection_origin')} +lon_0=${need('longitude_of_projection_origin')} ${offsets()} +units=m`)
    case 'mercator': {
      const ts = numberAttribute(gm, 'standard_parallel')
      const scale = ts === undefined ? `+k_0=${opt('scale_factor_at_projection_origin', 1)}` : `+lat_ts=${ts}`
      return make('projected', `+proj=merc +lon_0=${need('longitude_of_projection_origin')} ${scale} ${offsets()} +units=m`)
    }
    default: {
      const wkt = textAttribute(gm, 'crs_wkt') ?? textAttribute(gm, 'spatial_ref')
      if (wkt) {
        try {
          const converter = proj4(wkt, '+proj=longlat +datum=WGS84 +no_defs')
          converter.forward([0, 0])
          return { kind: 'projected', crs: mapping || 'crs_wkt', proj4: wkt, geographic: '+proj=longlat +datum=WGS84 +no_defs', earthRadiusKm: earth.radiusKm }
        } catch { /* fall through to the refusal */ }
      }
      throw new IngestError('unsupported_projection',
        `${what} is not supported; Tessera reads regular latitude–longitude, rotated pole, Lambert conformal, transverse Mercator, polar stereographic, Lambert azimuthal and Mercator grids.`)
    }
  }
}

/** '+proj=longlat' on the figure of the Earth named in a proj4 string (+R, +a/+b/+rf, +ellps, +datum), WGS 84 if none. */
export function geographicFor(projString: string): string {
  const figure = projString.split(/\s+/).filter((t) => /^\+(R|a|b|rf|f|ellps|datum|towgs84)=/.test(t))
  return `+proj=longlat ${figure.length ? figure.join(' ') : '+datum=WGS84'} +no_defs`
}

/** Sphere radius for spacings on a lat–lon grid described by a proj4 string: +R, else the mean radius. */
export function radiusKmFor(projString: string): number {
  const r = /\+R=([0-9.eE+-]+)/.exec(projString)
  return r ? Number(r[1]) / 1000 : MEAN_EARTH_RADIUS_KM
}
