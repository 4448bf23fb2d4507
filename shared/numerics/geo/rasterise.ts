/**
 * Polygon rasterisation onto a grid by cell centres: a cell belongs to the area when its centre
 * is inside, by the even-odd rule over all rings of a polygon (so holes are excluded), and a
 * multipolygon is the union of its polygons. A centre exactly on the boundary follows the
 * half-open crossing rule — inside on a west or south edge, outside on an east or north edge of
 * an axis-aligned rectangle — so two areas that share an edge never both claim a cell.
 * Output: row-major Uint8Array, 1 inside, 0 outside, index j·nx + i.
 */
import { polygonEdges, polygonsOf, scanlineCrossings, type AreaGeometry, type PolygonEdges } from './polygonEdges'

/** First index in ascending a[0..n) with a[index] ≥ x (n when none). */
function lowerBound(a: ArrayLike<number>, x: number): number {
  let lo = 0
  let hi = a.length
  while (lo < hi) { const mid = (lo + hi) >>> 1; if (a[mid]! < x) lo = mid + 1; else hi = mid }
  return lo
}

function monotoneDirection(values: ArrayLike<number>, name: string): 1 | -1 {
  if (values.length < 2) return 1
  const dir = values[1]! > values[0]! ? 1 : -1
  for (let i = 1; i < values.length; i++) {
    const step = values[i]! - values[i - 1]!
    if (!(step * dir > 0)) throw new Error(`${name} must be strictly increasing or strictly decreasing (index ${i})`)
  }
  return dir
}

/**
 * Rasterises onto a regular (or any rectilinear) lon/lat grid given its cell-centre axes:
 * lon[i] for columns i = 0..nx−1 and lat[j] for rows j = 0..ny−1, each strictly monotone
 * (either direction), in degrees. Scanline per row, O(ny · edges · log + cells inside).
 */
export function rasteriseOnAxes(geometry: AreaGeometry, lon: ArrayLike<number>, lat: ArrayLike<number>): Uint8Array {
  const nx = lon.length
  const ny = lat.length
  const lonDir = monotoneDirection(lon, 'longitudes')
  monotoneDirection(lat, 'latitudes')
  // Search on ascending longitudes; map back when the axis runs east → west.
  const ascending = lonDir > 0 ? lon : Float64Array.from({ length: nx }, (_, i) => lon[nx - 1 - i]!)
  const mask = new Uint8Array(nx * ny)
  const crossings: number[] = []
  for (const rings of polygonsOf(geometry)) {
    const edges = polygonEdges(rings)
    for (let j = 0; j < ny; j++) {
      const y = lat[j]!
      if (y < edges.south || y > edges.north) continue
      scanlineCrossings(edges, y, crossings)
      for (let c = 0; c + 1 < crossings.length; c += 2) {
        // Inside: crossings[c] ≤ x < crossings[c + 1].
        const start = lowerBound(ascending, crossings[c]!)
        const end = lowerBound(ascending, crossings[c + 1]!)
        for (let a = start; a < end; a++) mask[j * nx + (lonDir > 0 ? a : nx - 1 - a)] = 1
      }
    }
  }
  return mask
}

/** Edges of a polygon grouped into horizontal bands, so a point only tests the edges near its latitude. */
interface BandedEdges { edges: PolygonEdges; bands: number; bandHeight: number; start: Int32Array; list: Int32Array }

function bandEdges(edges: PolygonEdges): BandedEdges {
  const count = edges.x0.length
  const bands = Math.max(1, Math.min(1024, Math.ceil(count / 4)))
  const bandHeight = (edges.north - edges.south) / bands || 1
  const band = (y: number) => Math.min(bands - 1, Math.max(0, Math.floor((y - edges.south) / bandHeight)))
  const sizes = new Int32Array(bands + 1)
  for (let e = 0; e < count; e++) {
    const b0 = band(Math.min(edges.y0[e]!, edges.y1[e]!))
    const b1 = band(Math.max(edges.y0[e]!, edges.y1[e]!))
    for (let b = b0; b <= b1; b++) sizes[b + 1]!++
  }
  for (let b = 0; b < bands; b++) sizes[b + 1]! += sizes[b]!
  const list = new Int32Array(sizes[bands]!)
  const fill = sizes.slice(0, bands)
  for (let e = 0; e < count; e++) {
    const b0 = band(Math.min(edges.y0[e]!, edges.y1[e]!))
    const b1 = band(Math.max(edges.y0[e]!, edges.y1[e]!))
    for (let b = b0; b <= b1; b++) list[fill[b]!++] = e
  }
  return { edges, bands, bandHeight, start: sizes, list }
}

/** Even-odd test of one point: inside when an odd number of edge crossings lie at or west of x. */
function insideBanded(p: BandedEdges, x: number, y: number): boolean {
  const { edges } = p
  if (y < edges.south || y > edges.north || x < edges.west) return false
  const b = Math.min(p.bands - 1, Math.floor((y - edges.south) / p.bandHeight))
  let inside = false
  for (let t = p.start[b]!; t < p.start[b + 1]!; t++) {
    const e = p.list[t]!
    const ay = edges.y0[e]!, by = edges.y1[e]!
    if ((ay > y) !== (by > y)) {
      const xc = edges.x0[e]! + ((y - ay) * (edges.x1[e]! - edges.x0[e]!)) / (by - ay)
      if (xc <= x) inside = !inside
    }
  }
  return inside
}

/**
 * Rasterises onto a grid given every cell centre's longitude and latitude (projected or curvilinear
 * grids): lon[k], lat[k] for k = j·nx + i. Same inside rule as rasteriseOnAxes. Edges are bucketed
 * into latitude bands, so each centre tests only the few edges near it.
 */
export function rasteriseOnCells(geometry: AreaGeometry, lon: ArrayLike<number>, lat: ArrayLike<number>): Uint8Array {
  if (lon.length !== lat.length) throw new Error(`longitude and latitude arrays differ in length (${lon.length} vs ${lat.length})`)
  const mask = new Uint8Array(lon.length)
  for (const rings of polygonsOf(geometry)) {
    const banded = bandEdges(polygonEdges(rings))
    for (let k = 0; k < lon.length; k++) if (!mask[k] && insideBanded(banded, lon[k]!, lat[k]!)) mask[k] = 1
  }
  return mask
}
