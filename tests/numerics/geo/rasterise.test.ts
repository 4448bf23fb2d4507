import { describe, expect, it } from 'vitest'
import { booleanPointInPolygon } from '@turf/turf'
import type { MultiPolygon, Polygon, Position } from 'geojson'
import { rasteriseOnAxes, rasteriseOnCells } from '#shared/numerics/geo/rasterise'
import { circlePolygon, rectanglePolygon } from '#shared/numerics/geo/shapes'
import { uniformGenerator } from '../ensemble/seededRandom'

/** A star-shaped ring (simple by construction): sorted angles, radii in [r0, r1], closed. */
function starRing(u: () => number, cx: number, cy: number, r0: number, r1: number, vertices: number, clockwise = false): Position[] {
  const angles = Array.from({ length: vertices }, () => u() * 2 * Math.PI).sort((a, b) => a - b)
  if (clockwise) angles.reverse()
  const ring = angles.map((t) => { const r = r0 + (r1 - r0) * u(); return [cx + r * Math.cos(t), cy + r * Math.sin(t)] })
  return [...ring, ring[0]!]
}

/** Star polygon with up to two star holes inside its inner radius. */
function randomPolygon(u: () => number, cx: number, cy: number, size: number): Position[][] {
  const rings = [starRing(u, cx, cy, 0.6 * size, size, 5 + Math.floor(u() * 20))]
  const holes = Math.floor(u() * 3)
  if (holes === 1) rings.push(starRing(u, cx, cy, 0.1 * size, 0.5 * size, 4 + Math.floor(u() * 8), true))
  if (holes === 2) {
    rings.push(starRing(u, cx - 0.3 * size, cy, 0.05 * size, 0.25 * size, 5, true))
    rings.push(starRing(u, cx + 0.3 * size, cy, 0.05 * size, 0.25 * size, 6, true))
  }
  return rings
}

// Grid: centres 10.05..13.95 °E (40 columns), 58.975..56.025 °N north to south (60 rows).
const lon = Float64Array.from({ length: 40 }, (_, i) => 10.05 + 0.1 * i)
const lat = Float64Array.from({ length: 60 }, (_, j) => 58.975 - 0.05 * j)
const cellLon = Float64Array.from({ length: 2400 }, (_, k) => lon[k % 40]!)
const cellLat = Float64Array.from({ length: 2400 }, (_, k) => lat[Math.floor(k / 40)]!)

function turfMask(g: Polygon | MultiPolygon, lons: ArrayLike<number>, lats: ArrayLike<number>): number[] {
  return Array.from({ length: lons.length }, (_, k) => (booleanPointInPolygon([lons[k]!, lats[k]!], g) ? 1 : 0))
}

describe('polygon rasterisation by cell centres', () => {
  it('agrees with turf.booleanPointInPolygon on random polygons with holes, on lon/lat axes and per-cell coordinates', () => {
    const u = uniformGenerator(314)
    let inside = 0
    for (let trial = 0; trial < 40; trial++) {
      const g: Polygon = { type: 'Polygon', coordinates: randomPolygon(u, 10 + 4 * u(), 56 + 3 * u(), 0.3 + 1.5 * u()) }
      const expected = turfMask(g, cellLon, cellLat)
      expect(Array.from(rasteriseOnAxes(g, lon, lat))).toEqual(expected)
      expect(Array.from(rasteriseOnCells(g, cellLon, cellLat))).toEqual(expected)
      inside += expected.reduce((a, b) => a + b, 0)
    }
    expect(inside).toBeGreaterThan(1000) // the fixtures do cover cells
  })

  it('multipolygons (separate and nested-in-hole parts) are the union of their polygons', () => {
    const u = uniformGenerator(2718)
    for (let trial = 0; trial < 20; trial++) {
      const a = randomPolygon(u, 11, 57, 0.8)
      const b = randomPolygon(u, 13, 58, 0.6)
      // An island inside a's hole region: small star around a's centre.
      const island = [starRing(u, 11, 57, 0.02, 0.05, 5)]
      const g: MultiPolygon = { type: 'MultiPolygon', coordinates: [a, b, island] }
      const expected = turfMask(g, cellLon, cellLat)
      expect(Array.from(rasteriseOnAxes(g, lon, lat))).toEqual(expected)
      expect(Array.from(rasteriseOnCells(g, cellLon, cellLat))).toEqual(expected)
    }
  })

  it('projected grids: rotated scattered centres agree with turf', () => {
    const u = uniformGenerator(99)
    const n = 3000
    const lons = Float64Array.from({ length: n }, () => 9.5 + 5 * u())
    const lats = Float64Array.from({ length: n }, () => 55.5 + 4 * u())
    for (let trial = 0; trial < 10; trial++) {
      const g: Polygon = { type: 'Polygon', coordinates: randomPolygon(u, 12, 57.5, 1.5) }
      expect(Array.from(rasteriseOnCells(g, lons, lats))).toEqual(turfMask(g, lons, lats))
    }
  })

  it('east-to-west longitude axes give the same cells as west-to-east', () => {
    const u = uniformGenerator(5)
    const g: Polygon = { type: 'Polygon', coordinates: randomPolygon(u, 12, 57, 1) }
    const reversed = Float64Array.from(lon).reverse()
    const a = rasteriseOnAxes(g, lon, lat)
    const b = rasteriseOnAxes(g, reversed, lat)
    for (let j = 0; j < 60; j++) for (let i = 0; i < 40; i++) expect(b[j * 40 + (39 - i)]).toBe(a[j * 40 + i])
  })

  it('boundary rule on a rectangle with centres exactly on its edges: west/south edges in, east/north edges out (half-open)', () => {
    const axLon = Float64Array.from({ length: 11 }, (_, i) => i) // 0..10 °E
    const axLat = Float64Array.from({ length: 11 }, (_, j) => 10 - j) // 10..0 °N
    const mask = rasteriseOnAxes(rectanglePolygon(2, 3, 6, 8), axLon, axLat)
    for (let j = 0; j < 11; j++) for (let i = 0; i < 11; i++) {
      const x = axLon[i]!
      const y = axLat[j]!
      expect(mask[j * 11 + i], `(${x}, ${y})`).toBe(x >= 2 && x < 6 && y >= 3 && y < 8 ? 1 : 0)
    }
    const cells = rasteriseOnCells(rectanglePolygon(2, 3, 6, 8), Float64Array.from({ length: 121 }, (_, k) => k % 11), Float64Array.from({ length: 121 }, (_, k) => 10 - Math.floor(k / 11)))
    expect(Array.from(cells)).toEqual(Array.from(mask))
    // Two rectangles sharing the edge lon = 6 never claim the same cell.
    const right = rasteriseOnAxes(rectanglePolygon(6, 3, 9, 8), axLon, axLat)
    for (let k = 0; k < 121; k++) expect(mask[k]! & right[k]!).toBe(0)
  })

  it('circle helper: a geodesic circle of 50 km covers the cells whose centres are within ~50 km (turf.circle, 128 steps)', () => {
    const c = circlePolygon([12, 57.5], 50, 128)
    expect(c.coordinates[0]).toHaveLength(129)
    const mask = rasteriseOnAxes(c, lon, lat)
    const R = 6371.0088 // mean Earth radius used by turf, km
    for (let j = 0; j < 60; j++) for (let i = 0; i < 40; i++) {
      const p1 = (57.5 * Math.PI) / 180, p2 = (lat[j]! * Math.PI) / 180
      const dl = ((lon[i]! - 12) * Math.PI) / 180
      const d = 2 * R * Math.asin(Math.sqrt(Math.sin((p2 - p1) / 2) ** 2 + Math.cos(p1) * Math.cos(p2) * Math.sin(dl / 2) ** 2)) // haversine
      if (d < 49.5) expect(mask[j * 40 + i]).toBe(1)
      if (d > 50.5) expect(mask[j * 40 + i]).toBe(0)
    }
    expect(() => circlePolygon([0, 0], -1)).toThrow('positive')
    expect(() => rectanglePolygon(3, 0, 1, 1)).toThrow('west < east')
  })

  it('rejects non-monotone axes and mismatched coordinate arrays', () => {
    const g = rectanglePolygon(0, 0, 1, 1)
    expect(() => rasteriseOnAxes(g, [0, 1, 1], [0, 1])).toThrow('longitudes must be strictly')
    expect(() => rasteriseOnCells(g, [0, 1], [0])).toThrow('differ in length')
  })
})
