/**
 * Geometry of the small extent map: a lon/lat frame around a grid outline, an equirectangular
 * projection scaled by cos(latitude) at the frame's centre, graticule lines and land rings.
 */
import { linearTicks, roundPx } from './chartAxes'

export type LonLat = [number, number]

export interface MapFrame {
  west: number
  south: number
  east: number
  north: number
  width: number
  height: number
  /** Projects [lon, lat] to SVG [x, y] (y down). */
  project: (p: LonLat) => [number, number]
  meridians: number[]
  parallels: number[]
}

/**
 * Longitudes moved by whole turns so that none is more than 180° from the first: a grid that
 * crosses the antimeridian then has a continuous outline.
 */
export function unwrapLongitudes(points: LonLat[]): LonLat[] {
  if (points.length === 0) return []
  const reference = points[0]![0]
  return points.map(([lon, lat]) => [lon + 360 * Math.round((reference - lon) / 360), lat])
}

/**
 * A frame around the outline, padded by `padding` of its size (at least `minSpanDeg`), whose
 * SVG size keeps `width` and chooses the height from the projected aspect (clamped).
 */
export function frameAround(outline: LonLat[], width = 320, padding = 0.5, minSpanDeg = 6): MapFrame {
  const pts = unwrapLongitudes(outline)
  const lons = pts.map((p) => p[0])
  const lats = pts.map((p) => p[1])
  let west = Math.min(...lons), east = Math.max(...lons)
  let south = Math.min(...lats), north = Math.max(...lats)
  const kx = Math.max(0.05, Math.cos((((south + north) / 2) * Math.PI) / 180))
  // The minimum span is in degrees of latitude; east–west it is widened by 1/cos φ so a small grid sits in a square-ish frame.
  const padLon = Math.max((east - west) * padding, (minSpanDeg / kx - (east - west)) / 2, 0)
  const padLat = Math.max((north - south) * padding, (minSpanDeg - (north - south)) / 2, 0)
  west -= padLon
  east += padLon
  south = Math.max(-90, south - padLat)
  north = Math.min(90, north + padLat)
  const aspect = (north - south) / ((east - west) * kx)
  const height = Math.round(Math.min(width * 1.1, Math.max(width * 0.45, width * aspect)))
  // Fit the frame inside width × height with the same scale on both axes (no distortion beyond cos φ).
  const scale = Math.min(width / ((east - west) * kx), height / (north - south))
  const cx = (west + east) / 2, cy = (south + north) / 2
  const project = ([lon, lat]: LonLat): [number, number] => [roundPx(width / 2 + (lon - cx) * kx * scale), roundPx(height / 2 - (lat - cy) * scale)]
  // The visible degrees after fitting (the frame may show a little more on one axis).
  const halfLon = width / 2 / (kx * scale), halfLat = height / 2 / scale
  const frame = { west: cx - halfLon, east: cx + halfLon, south: cy - halfLat, north: cy + halfLat }
  return {
    ...frame,
    width,
    height,
    project,
    meridians: insideTicks(frame.west, frame.east),
    parallels: insideTicks(frame.south, frame.north),
  }
}

/** Graticule values strictly inside [lo, hi], away from the edges so their labels fit. */
function insideTicks(lo: number, hi: number): number[] {
  const margin = (hi - lo) * 0.06
  return linearTicks(lo, hi, 4).filter((v) => v > lo + margin && v < hi - margin)
}

/** True when the ring's bounding box meets the frame. */
function ringMeetsFrame(ring: LonLat[], frame: MapFrame): boolean {
  let w = Infinity, e = -Infinity, s = Infinity, n = -Infinity
  for (const [lon, lat] of ring) {
    if (lon < w) w = lon
    if (lon > e) e = lon
    if (lat < s) s = lat
    if (lat > n) n = lat
  }
  return e >= frame.west && w <= frame.east && n >= frame.south && s <= frame.north
}

/**
 * SVG path data for the rings that reach into the frame, each tried at −360°, 0 and +360° so
 * land shows on either side of the antimeridian. Drawing is clipped by the caller.
 */
export function ringsPath(rings: LonLat[][], frame: MapFrame): string {
  const parts: string[] = []
  for (const ring of rings) {
    for (const shift of [-360, 0, 360]) {
      const moved: LonLat[] = shift === 0 ? ring : ring.map(([lon, lat]) => [lon + shift, lat])
      if (!ringMeetsFrame(moved, frame)) continue
      parts.push(
        moved.map((p, k) => {
          const [x, y] = frame.project(p)
          return `${k === 0 ? 'M' : 'L'}${x.toFixed(1)} ${y.toFixed(1)}`
        }).join('') + 'Z',
      )
    }
  }
  return parts.join(' ')
}

/** All rings of a GeoJSON Polygon / MultiPolygon geometry; draw with fill-rule evenodd so holes (lakes, inland seas) stay open. */
export function polygonRings(geometry: { type: string; coordinates: unknown }): LonLat[][] {
  if (geometry.type === 'Polygon') return geometry.coordinates as LonLat[][]
  if (geometry.type === 'MultiPolygon') return (geometry.coordinates as LonLat[][][]).flat()
  return []
}
