/**
 * Polygon and multipolygon geometry (GeoJSON coordinate order: [longitude, latitude], degrees)
 * flattened into edge arrays for the rasterisers. Every ring of a polygon contributes its
 * edges; the even-odd rule over all rings then makes holes come out by themselves.
 * No antimeridian handling: geometry and grid longitudes must use the same range and the
 * polygon must not cross ±180° (RFC 7946 §3.1.9 asks for such polygons to be split).
 */
import type { MultiPolygon, Polygon, Position } from 'geojson'

export type AreaGeometry = Polygon | MultiPolygon

/** Edges of one polygon (outer ring and holes): edge e runs (x0[e], y0[e]) → (x1[e], y1[e]). */
export interface PolygonEdges {
  x0: Float64Array
  y0: Float64Array
  x1: Float64Array
  y1: Float64Array
  /** Bounding box of the polygon. */
  west: number
  south: number
  east: number
  north: number
}

/** The polygons of a geometry as lists of rings (a Polygon is one polygon). */
export function polygonsOf(geometry: AreaGeometry): Position[][][] {
  if (geometry.type === 'Polygon') return [geometry.coordinates]
  if (geometry.type === 'MultiPolygon') return geometry.coordinates
  throw new Error(`expected a Polygon or MultiPolygon, got ${(geometry as { type: string }).type}`)
}

/**
 * Edge arrays of one polygon's rings. A ring is closed implicitly (last → first) when its
 * last position differs from its first; horizontal edges are dropped (they never cross a scanline).
 */
export function polygonEdges(rings: readonly Position[][]): PolygonEdges {
  const x0: number[] = []
  const y0: number[] = []
  const x1: number[] = []
  const y1: number[] = []
  let west = Infinity
  let south = Infinity
  let east = -Infinity
  let north = -Infinity
  for (const ring of rings) {
    const n = ring.length
    for (let p = 0; p < n; p++) {
      const a = ring[p]!
      const b = ring[(p + 1) % n]!
      const ax = a[0]!, ay = a[1]!, bx = b[0]!, by = b[1]!
      if (ax < west) west = ax
      if (ax > east) east = ax
      if (ay < south) south = ay
      if (ay > north) north = ay
      if (ay === by) continue
      x0.push(ax); y0.push(ay); x1.push(bx); y1.push(by)
    }
  }
  return { x0: Float64Array.from(x0), y0: Float64Array.from(y0), x1: Float64Array.from(x1), y1: Float64Array.from(y1), west, south, east, north }
}

/**
 * Longitudes where the polygon's edges cross the horizontal line at latitude y, ascending.
 * An edge crosses when exactly one end lies above y (half-open rule: (y0 > y) ≠ (y1 > y)),
 * so a vertex on the line is counted once and horizontal edges never.
 */
export function scanlineCrossings(edges: PolygonEdges, y: number, out: number[] = []): number[] {
  out.length = 0
  const { x0, y0, x1, y1 } = edges
  for (let e = 0; e < x0.length; e++) {
    const ay = y0[e]!, by = y1[e]!
    if ((ay > y) !== (by > y)) out.push(x0[e]! + ((y - ay) * (x1[e]! - x0[e]!)) / (by - ay))
  }
  return out.sort((p, q) => p - q)
}
