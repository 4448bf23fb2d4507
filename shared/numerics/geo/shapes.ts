/**
 * Area shapes drawn on the map, as GeoJSON polygons in [longitude, latitude] degrees.
 */
import { circle } from '@turf/turf'
import type { Polygon } from 'geojson'

/**
 * Circle of `radiusKm` kilometres around [lon, lat] as a polygon with `steps` vertices
 * (geodesic destination points, via turf.circle). Does not handle circles across ±180°.
 */
export function circlePolygon(centre: [number, number], radiusKm: number, steps = 64): Polygon {
  if (!(radiusKm > 0) || !Number.isFinite(radiusKm)) throw new Error(`circle radius must be a positive number of km, got ${radiusKm}`)
  if (!Number.isInteger(steps) || steps < 3) throw new Error(`a circle needs at least 3 steps, got ${steps}`)
  return circle(centre, radiusKm, { steps, units: 'kilometers' }).geometry
}

/** Longitude–latitude rectangle west ≤ lon ≤ east, south ≤ lat ≤ north, as a counter-clockwise polygon. */
export function rectanglePolygon(west: number, south: number, east: number, north: number): Polygon {
  if (!(west < east) || !(south < north)) throw new Error(`rectangle needs west < east and south < north, got [${west}, ${south}, ${east}, ${north}]`)
  return { type: 'Polygon', coordinates: [[[west, south], [east, south], [east, north], [west, north], [west, south]]] }
}
