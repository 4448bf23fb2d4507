/**
 * Where the fine (downscaled) cells of a run lie on the Earth. The fine grid subdivides every
 * coarse cell into factor × factor equal cells in the grid's native coordinates (degrees for
 * latitude–longitude and rotated-pole grids, metres for projected ones), so fine row j = 0 is the
 * southernmost and column i = 0 the westernmost, as on the coarse grid (server/ingest/types.ts).
 * Coarse cell edges lie halfway between neighbouring centres; the outer edges half a step out.
 */
import proj4 from 'proj4'
import type { RunGrid } from '../db/schema/runs'
import { geographicFor } from '../ingest/gridMapping'

export type GridKind = 'latlon' | 'rotated' | 'projected'

export interface FineGeometry {
  kind: GridKind
  factor: number
  coarseNx: number
  coarseNy: number
  /** Fine grid size: coarse size × factor. */
  nx: number
  ny: number
  /** Native coordinates of the fine cell edges, ascending: nx + 1 and ny + 1 values. */
  xEdges: Float64Array
  yEdges: Float64Array
  /** Native coordinates of the fine cell centres, ascending: nx and ny values. */
  xCentres: Float64Array
  yCentres: Float64Array
  /** Fine spacing in km (the coarse mean spacing divided by the factor). */
  spacingKm: number
  /** Native (x, y) → [longitude, latitude] in degrees. */
  toLonLat(x: number, y: number): [number, number]
  /** [longitude, latitude] → native (x, y); NaN when the projection cannot map the point. */
  fromLonLat(lon: number, lat: number): [number, number]
}

/** The kind of a stored grid, from its axis units (see EnsembleGrid.xUnits). */
export function gridKind(grid: Pick<RunGrid, 'xUnits' | 'crs'>): GridKind {
  if (grid.xUnits === 'degrees_east' || grid.crs === 'EPSG:4326' || grid.crs === 'latitude_longitude') return 'latlon'
  return grid.xUnits === 'degrees' ? 'rotated' : 'projected'
}

/** Cell edges of a strictly increasing axis of centres: midpoints, and half a step beyond each end. */
export function axisEdges(centres: ArrayLike<number>): Float64Array {
  const n = centres.length
  if (n < 2) throw new Error(`an axis needs at least 2 cell centres, got ${n}`)
  const edges = new Float64Array(n + 1)
  edges[0] = centres[0]! - (centres[1]! - centres[0]!) / 2
  for (let k = 1; k < n; k++) edges[k] = (centres[k - 1]! + centres[k]!) / 2
  edges[n] = centres[n - 1]! + (centres[n - 1]! - centres[n - 2]!) / 2
  return edges
}

/** Splits every interval of `edges` into `factor` equal parts: (n·factor + 1) fine edges. */
export function subdivideEdges(edges: Float64Array, factor: number): Float64Array {
  if (!Number.isInteger(factor) || factor < 1) throw new Error(`block factor must be a positive integer, got ${factor}`)
  const n = edges.length - 1
  const fine = new Float64Array(n * factor + 1)
  for (let k = 0; k < n; k++) {
    const a = edges[k]!, b = edges[k + 1]!
    for (let s = 0; s < factor; s++) fine[k * factor + s] = a + ((b - a) * s) / factor
  }
  fine[n * factor] = edges[n]!
  return fine
}

function centresOf(edges: Float64Array): Float64Array {
  const c = new Float64Array(edges.length - 1)
  for (let k = 0; k < c.length; k++) c[k] = (edges[k]! + edges[k + 1]!) / 2
  return c
}

/** Fine-grid geometry of a run's grid subdivided by `factor`. */
export function fineGeometry(grid: RunGrid, factor: number): FineGeometry {
  const kind = gridKind(grid)
  const xEdges = subdivideEdges(axisEdges(grid.x), factor)
  const yEdges = subdivideEdges(axisEdges(grid.y), factor)
  let toLonLat: FineGeometry['toLonLat']
  let fromLonLat: FineGeometry['fromLonLat']
  if (kind === 'latlon') {
    toLonLat = (x, y) => [x, y]
    fromLonLat = (lon, lat) => [lon, lat]
  } else {
    const converter = proj4(grid.proj4, geographicFor(grid.proj4))
    toLonLat = (x, y) => converter.forward([x, y]) as [number, number]
    fromLonLat = (lon, lat) => {
      try {
        const p = converter.inverse([lon, lat]) as [number, number]
        return Number.isFinite(p[0]) && Number.isFinite(p[1]) ? p : [NaN, NaN]
      } catch { return [NaN, NaN] }
    }
  }
  return {
    kind, factor, coarseNx: grid.nx, coarseNy: grid.ny, nx: grid.nx * factor, ny: grid.ny * factor,
    xEdges, yEdges, xCentres: centresOf(xEdges), yCentres: centresOf(yEdges),
    spacingKm: grid.spacingKm / factor, toLonLat, fromLonLat,
  }
}

/** Index k of the last edge with edges[k] ≤ v, or −1 when v is outside [edges[0], edges[n]). */
export function intervalOf(edges: Float64Array, v: number): number {
  const n = edges.length - 1
  if (!(v >= edges[0]!) || !(v < edges[n]!)) return v === edges[n] ? n - 1 : -1
  let lo = 0, hi = n
  while (hi - lo > 1) { const mid = (lo + hi) >>> 1; if (edges[mid]! <= v) lo = mid; else hi = mid }
  return lo
}

/**
 * The fine cell (row-major index j·nx + i) holding the point [lon, lat], or −1 outside the grid.
 * On latitude–longitude grids the longitude is also tried ±360° (grids stored as 0…360 or unwrapped).
 */
export function locateFineCell(geometry: FineGeometry, lon: number, lat: number): number {
  const tryAt = (x: number, y: number) => {
    const i = intervalOf(geometry.xEdges, x)
    const j = intervalOf(geometry.yEdges, y)
    return i < 0 || j < 0 ? -1 : j * geometry.nx + i
  }
  if (geometry.kind === 'latlon') {
    for (const shift of [0, 360, -360]) { const k = tryAt(lon + shift, lat); if (k >= 0) return k }
    return -1
  }
  const [x, y] = geometry.fromLonLat(lon, lat)
  return Number.isFinite(x) && Number.isFinite(y) ? tryAt(x, y) : -1
}

/** Coarse cell index J·coarseNx + I of fine cell k (its parent block). */
export function parentCoarseCell(geometry: FineGeometry, k: number): number {
  const i = k % geometry.nx, j = Math.floor(k / geometry.nx)
  return Math.floor(j / geometry.factor) * geometry.coarseNx + Math.floor(i / geometry.factor)
}

/** Longitude and latitude of every fine cell centre, row-major (for rasterising areas on projected grids). */
export function fineCellCentresLonLat(geometry: FineGeometry): { lon: Float64Array; lat: Float64Array } {
  const { nx, ny } = geometry
  const lon = new Float64Array(nx * ny), lat = new Float64Array(nx * ny)
  for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
    const [lo, la] = geometry.toLonLat(geometry.xCentres[i]!, geometry.yCentres[j]!)
    lon[j * nx + i] = lo
    lat[j * nx + i] = la
  }
  return { lon, lat }
}

/**
 * The outer boundary of the grid as a closed [lon, lat] ring (counter-clockwise in native
 * coordinates), `steps` points per side so projected edges keep their curvature. Longitudes
 * are continuous along the ring (they may pass 180° rather than jump).
 */
export function gridOutline(geometry: FineGeometry, steps = 32): [number, number][] {
  const { xEdges: xe, yEdges: ye } = geometry
  const w = xe[0]!, e = xe[xe.length - 1]!, s = ye[0]!, n = ye[ye.length - 1]!
  const ring: [number, number][] = []
  const side = (x0: number, y0: number, x1: number, y1: number) => {
    for (let k = 0; k < steps; k++) ring.push(geometry.toLonLat(x0 + ((x1 - x0) * k) / steps, y0 + ((y1 - y0) * k) / steps))
  }
  side(w, s, e, s); side(e, s, e, n); side(e, n, w, n); side(w, n, w, s)
  for (let k = 1; k < ring.length; k++) {
    let d = ring[k]![0] - ring[k - 1]![0]
    d -= 360 * Math.round(d / 360)
    ring[k] = [ring[k - 1]![0] + d, ring[k]![1]]
  }
  ring.push([ring[0]![0], ring[0]![1]])
  return ring
}

/** [west, south, east, north] of the grid outline in degrees; east may exceed 180 when the grid crosses the 180° line. */
export function outlineBounds(ring: [number, number][]): [number, number, number, number] {
  let w = Infinity, s = Infinity, e = -Infinity, n = -Infinity
  for (const [lon, lat] of ring) { w = Math.min(w, lon); e = Math.max(e, lon); s = Math.min(s, lat); n = Math.max(n, lat) }
  const shift = w < -180 ? 360 : w >= 180 ? -360 : 0
  return [w + shift, s, e + shift, n]
}
