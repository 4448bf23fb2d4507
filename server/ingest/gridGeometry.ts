/**
 * Orients a grid (both axes increasing, so row j = 0 is the southernmost), measures its spacing in
 * km and places it on the map (extent and corners of the outer cell edges in longitude/latitude).
 *
 * Spacing: on latitude–longitude and rotated-pole grids, the mean great-circle (haversine) distance
 * between adjacent cell centres on a sphere of the grid's radius; a rotation of the sphere keeps
 * distances, so rotated coordinates are measured directly. On projected grids, the nominal spacing
 * of the projection coordinates (what the model grid is defined by; the map scale factor is ignored).
 */
import proj4 from 'proj4'
import type { EnsembleGrid } from './types'
import { IngestError } from './errors'
import type { Projection } from './gridMapping'

const DEG = Math.PI / 180

export interface GridSpec {
  projection: Projection
  /** Cell-centre coordinates in file order: degrees for latlon/rotated, metres for projected. */
  x: ArrayLike<number>
  y: ArrayLike<number>
  xName: string
  yName: string
}

export interface PlacedGrid {
  grid: EnsembleGrid
  extent: [number, number, number, number]
  corners: [number, number][]
  /** Whether the file stores x (columns) or y (rows) in decreasing order. */
  flipX: boolean
  flipY: boolean
  notes: string[]
}

/** Great-circle distance (haversine formula) between two points given in degrees, on a sphere of radius r. */
export function haversineKm(lon1: number, lat1: number, lon2: number, lat2: number, radiusKm: number): number {
  const s = Math.sin(((lat2 - lat1) * DEG) / 2) ** 2 + Math.cos(lat1 * DEG) * Math.cos(lat2 * DEG) * Math.sin(((lon2 - lon1) * DEG) / 2) ** 2
  return 2 * radiusKm * Math.asin(Math.min(1, Math.sqrt(s)))
}

/** Unwraps longitudes that jump by more than 180° (e.g. 350, 355, 0, 5 → 350 … 365); values must lie within ±720°. */
function unwrapLongitudes(values: Float64Array, name: string): boolean {
  if (values.some((v) => Math.abs(v) > 720)) {
    throw new IngestError('missing_coordinates', `The longitudes of "${name}" are not valid longitudes (values beyond ±720°).`)
  }
  let changed = false
  for (let k = 1; k < values.length; k++) {
    const turns = Math.round((values[k]! - values[k - 1]!) / 360)
    if (turns !== 0) { values[k] = values[k]! - 360 * turns; changed = true }
  }
  return changed
}

function orientAxis(raw: ArrayLike<number>, name: string, longitude: boolean, notes: string[]): { values: Float64Array; reversed: boolean } {
  const values = Float64Array.from(raw)
  if (values.some((v) => !Number.isFinite(v))) throw new IngestError('non_monotonic', `The coordinate "${name}" has missing or non-finite values.`)
  if (longitude && unwrapLongitudes(values, name)) notes.push(`Longitudes of "${name}" cross the 0°/360° or 180° line; they were unwrapped.`)
  if (values.length < 2) {
    throw new IngestError('grid_too_small', `The grid has ${values.length} cell along "${name}"; Tessera needs at least 2 in each direction.`)
  }
  const increasing = values[1]! > values[0]!
  for (let k = 1; k < values.length; k++) {
    const step = values[k]! - values[k - 1]!
    if (increasing ? !(step > 0) : !(step < 0)) {
      throw new IngestError('non_monotonic',
        `The coordinate "${name}" is not in strictly increasing or decreasing order (${values[k - 1]} then ${values[k]} at positions ${k - 1} and ${k}).`)
    }
  }
  return { values: increasing ? values : values.reverse(), reversed: !increasing }
}

function edges(v: Float64Array): [number, number] {
  const n = v.length
  return [v[0]! - (v[1]! - v[0]!) / 2, v[n - 1]! + (v[n - 1]! - v[n - 2]!) / 2]
}

function mean(sum: number, count: number): number { return count > 0 ? sum / count : NaN }

function spacingKm(kind: Projection['kind'], x: Float64Array, y: Float64Array, radiusKm: number): [number, number] {
  if (kind === 'projected') {
    return [(x[x.length - 1]! - x[0]!) / (x.length - 1) / 1000, (y[y.length - 1]! - y[0]!) / (y.length - 1) / 1000]
  }
  let dx = 0
  for (let j = 0; j < y.length; j++) {
    for (let i = 0; i + 1 < x.length; i++) dx += haversineKm(x[i]!, y[j]!, x[i + 1]!, y[j]!, radiusKm)
  }
  let dy = 0
  for (let j = 0; j + 1 < y.length; j++) dy += haversineKm(x[0]!, y[j]!, x[0]!, y[j + 1]!, radiusKm)
  return [mean(dx, y.length * (x.length - 1)), mean(dy, y.length - 1)]
}

function wrap180(lon: number): number {
  const w = ((((lon + 180) % 360) + 360) % 360) - 180
  return w === -180 && lon > 0 ? 180 : w
}

/** Bounding box of a closed lon–lat ring; handles the 180° line and rings around a pole. */
function ringExtent(ring: [number, number][]): [number, number, number, number] {
  let south = Infinity, north = -Infinity
  let lon = ring[0]![0]
  let west = lon, east = lon
  for (let k = 0; k < ring.length; k++) {
    const [lo, la] = ring[k]!
    if (k > 0) {
      let step = lo - ring[k - 1]![0]
      step -= 360 * Math.round(step / 360)
      lon += step
    }
    west = Math.min(west, lon); east = Math.max(east, lon)
    south = Math.min(south, la); north = Math.max(north, la)
  }
  const [first] = ring[0]!
  let closing = first - ring[ring.length - 1]![0]
  closing -= 360 * Math.round(closing / 360)
  if (Math.abs(lon + closing - first) > 180) { // the ring winds around a pole
    return south > -north ? [-180, south, 180, 90] : [-180, -90, 180, north]
  }
  if (east - west >= 360) return [-180, south, 180, north]
  return [wrap180(west), south, wrap180(east), north]
}

/** Orients the axes, measures spacing and computes extent and corners of a grid. */
export function placeGrid(spec: GridSpec): PlacedGrid {
  const notes: string[] = []
  const { projection } = spec
  const ox = orientAxis(spec.x, spec.xName, projection.kind === 'latlon', notes)
  const oy = orientAxis(spec.y, spec.yName, false, notes)
  if (oy.reversed) notes.push(`Rows are stored from north to south ("${spec.yName}" decreasing); they were flipped so the first row is the southernmost.`)
  if (ox.reversed) notes.push(`Columns are stored from east to west ("${spec.xName}" decreasing); they were flipped so the first column is the westernmost.`)
  const x = ox.values, y = oy.values
  if (projection.kind === 'latlon' && (y[0]! < -90 - 1e-9 || y[y.length - 1]! > 90 + 1e-9)) {
    throw new IngestError('missing_coordinates', `The latitudes of "${spec.yName}" go beyond ±90°.`)
  }
  const [dxKm, dyKm] = spacingKm(projection.kind, x, y, projection.earthRadiusKm)

  const toLonLat: (p: [number, number]) => [number, number] = projection.kind === 'latlon'
    ? (p) => [p[0], Math.max(-90, Math.min(90, p[1]))]
    : (() => { const c = proj4(projection.proj4, projection.geographic); return (p: [number, number]) => c.forward(p) as [number, number] })()
  const [west, east] = edges(x)
  const [south, north] = edges(y)
  const corners = ([[west, north], [east, north], [east, south], [west, south]] as [number, number][])
    .map((p) => { const [lo, la] = toLonLat(p); return [wrap180(lo), la] as [number, number] })
  const steps = Math.max(16, x.length, y.length)
  const ring: [number, number][] = []
  const side = (from: [number, number], to: [number, number]) => {
    for (let k = 0; k < steps; k++) ring.push(toLonLat([from[0] + ((to[0] - from[0]) * k) / steps, from[1] + ((to[1] - from[1]) * k) / steps]))
  }
  side([west, north], [east, north]); side([east, north], [east, south]); side([east, south], [west, south]); side([west, south], [west, north])
  if (ring.some(([lo, la]) => !Number.isFinite(lo) || !Number.isFinite(la))) {
    throw new IngestError('missing_coordinates', 'The grid reaches outside the area its projection can map to longitude and latitude.')
  }
  return {
    grid: {
      nx: x.length, ny: y.length, spacingKm: (dxKm + dyKm) / 2, dxKm, dyKm, crs: projection.crs, proj4: projection.proj4, x, y,
      xUnits: projection.kind === 'latlon' ? 'degrees_east' : projection.kind === 'rotated' ? 'degrees' : 'm',
      yUnits: projection.kind === 'latlon' ? 'degrees_north' : projection.kind === 'rotated' ? 'degrees' : 'm',
      earthRadiusKm: projection.earthRadiusKm,
    },
    extent: ringExtent(ring),
    corners,
    flipX: ox.reversed,
    flipY: oy.reversed,
    notes,
  }
}
