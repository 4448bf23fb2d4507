/**
 * Validation of uploaded areas of interest as GeoJSON (RFC 7946). Accepts a Polygon or
 * MultiPolygon geometry, a Feature holding one, or a FeatureCollection of such Features.
 * Every problem is reported with its place in the document (e.g.
 * `features[2].geometry.coordinates[0][5]`) and what was found there.
 * Checks: types, nesting of coordinate arrays, positions of ≥ 2 finite numbers,
 * longitude in [−180, 180] and latitude in [−90, 90] (RFC 7946 §3.1.1, WGS 84 degrees),
 * rings of ≥ 4 positions with first = last (§3.1.6), rings that enclose an area, no
 * self-intersection within a ring or crossing between rings of a polygon (turf.kinks),
 * holes inside their outer ring. Ring orientation is not enforced (§3.1.6 says parsers
 * should not reject rings for winding order).
 */
import { booleanPointInPolygon, kinks } from '@turf/turf'
import type { GeoJsonProperties, MultiPolygon, Polygon, Position } from 'geojson'
import type { AreaGeometry } from './polygonEdges'

export interface GeoJsonProblem {
  /** Where in the document, e.g. "features[1].geometry.coordinates[0][3]"; "" for the top level. */
  path: string
  message: string
}

/** A valid area: its geometry, the feature's properties (null for a bare geometry) and where it was (the feature's path). */
export interface ValidArea { geometry: AreaGeometry; properties: GeoJsonProperties; path: string }

export type AreaValidation =
  | { ok: true; areas: ValidArea[] }
  | { ok: false; problems: GeoJsonProblem[] }

/** At most this many positions per geometry: the crossing checks are quadratic in the vertex count. */
export const MAX_POSITIONS = 20_000

/** One line per problem: "path: message" (or the message alone at the top level). */
export function formatProblem(p: GeoJsonProblem): string {
  return p.path ? `${p.path}: ${p.message}` : p.message
}

const isObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v)
const at = (path: string, key: string | number) => (typeof key === 'number' ? `${path}[${key}]` : path ? `${path}.${key}` : key)
const show = (v: unknown) => { const s = JSON.stringify(v); return s === undefined ? String(v) : s.length > 40 ? s.slice(0, 37) + '...' : s }
const pointText = (p: Position) => `[${p[0]}, ${p[1]}]`

/** Validates an uploaded area document; on success returns its polygonal geometries with their properties. */
export function validateAreaGeoJson(input: unknown): AreaValidation {
  const problems: GeoJsonProblem[] = []
  const areas: ValidArea[] = []
  const fail = (path: string, message: string) => { problems.push({ path, message }) }

  const geometry = (g: unknown, path: string, properties: GeoJsonProperties, areaPath = path) => {
    if (!isObject(g)) return fail(path, g === null ? 'the feature has no geometry' : `a geometry must be an object, got ${show(g)}`)
    if (g.type !== 'Polygon' && g.type !== 'MultiPolygon') {
      return fail(at(path, 'type'), typeof g.type === 'string' ? `only Polygon and MultiPolygon areas are accepted, got ${g.type}` : 'missing "type"')
    }
    const before = problems.length
    const coords = g.coordinates
    const cpath = at(path, 'coordinates')
    if (!Array.isArray(coords)) return fail(cpath, `"coordinates" must be an array, got ${show(coords)}`)
    const polygons: { rings: Position[][]; path: string }[] = []
    if (g.type === 'Polygon') polygons.push({ rings: coords as Position[][], path: cpath })
    else {
      if (coords.length === 0) return fail(cpath, 'a MultiPolygon needs at least one polygon')
      coords.forEach((p, k) => {
        if (!Array.isArray(p)) fail(at(cpath, k), `a polygon must be an array of rings, got ${show(p)}`)
        else polygons.push({ rings: p as Position[][], path: at(cpath, k) })
      })
    }
    let positions = 0
    for (const poly of polygons) positions += polygonStructure(poly.rings, poly.path, fail)
    if (problems.length > before) return
    if (positions > MAX_POSITIONS) return fail(cpath, `the area has ${positions} positions, more than ${MAX_POSITIONS}: simplify it before uploading`)
    for (const poly of polygons) polygonTopology(poly.rings, poly.path, fail)
    if (problems.length === before) areas.push({ geometry: { type: g.type, coordinates: coords } as Polygon | MultiPolygon, properties, path: areaPath })
  }

  const feature = (f: unknown, path: string) => {
    if (!isObject(f)) return fail(path, `a feature must be an object, got ${show(f)}`)
    if (f.type !== 'Feature') return fail(at(path, 'type'), `expected "Feature", got ${show(f.type)}`)
    if (!('geometry' in f)) return fail(path, 'a feature needs a "geometry" member')
    const props = f.properties
    if (props !== undefined && props !== null && !isObject(props)) fail(at(path, 'properties'), '"properties" must be an object or null')
    geometry(f.geometry, at(path, 'geometry'), isObject(props) ? props : null, path)
  }

  if (!isObject(input)) fail('', `expected a GeoJSON object, got ${show(input)}`)
  else if (input.type === 'FeatureCollection') {
    if (!Array.isArray(input.features)) fail('features', '"features" must be an array')
    else if (input.features.length === 0) fail('features', 'the collection has no features')
    else input.features.forEach((f, k) => feature(f, at('features', k)))
  } else if (input.type === 'Feature') feature(input, '')
  else if (typeof input.type === 'string') geometry(input, '', null)
  else fail('type', 'missing "type" (expected FeatureCollection, Feature, Polygon or MultiPolygon)')

  return problems.length ? { ok: false, problems } : { ok: true, areas }
}

/** Shape checks of one polygon's rings; returns the number of positions seen. */
function polygonStructure(rings: unknown[], path: string, fail: (path: string, message: string) => void): number {
  if (rings.length === 0) { fail(path, 'a polygon needs at least one ring (its outer boundary)'); return 0 }
  let positions = 0
  rings.forEach((ring, r) => {
    const rpath = at(path, r)
    if (!Array.isArray(ring)) return fail(rpath, `a linear ring must be an array of positions, got ${show(ring)}`)
    positions += ring.length
    let good = true
    ring.forEach((p, k) => {
      const ppath = at(rpath, k)
      if (!Array.isArray(p) || p.length < 2 || !p.every((v) => typeof v === 'number' && Number.isFinite(v))) {
        good = false
        return fail(ppath, `a position must be [longitude, latitude] with finite numbers, got ${show(p)}`)
      }
      const [lon, lat] = p as number[]
      if (lon! < -180 || lon! > 180) { good = false; fail(ppath, `longitude ${lon} is outside [-180, 180]`) }
      if (lat! < -90 || lat! > 90) { good = false; fail(ppath, `latitude ${lat} is outside [-90, 90]`) }
    })
    if (ring.length < 4) return fail(rpath, `a linear ring needs at least 4 positions (the last repeating the first), got ${ring.length}`)
    if (!good) return
    const first = ring[0] as number[]
    const last = ring[ring.length - 1] as number[]
    if (first[0] !== last[0] || first[1] !== last[1]) fail(rpath, `the ring is not closed: first position ${pointText(first)} differs from last ${pointText(last)}`)
  })
  return positions
}

/** True when every position of the ring lies on one straight line (or on one point). */
function isFlat(ring: Position[]): boolean {
  const [x0, y0] = ring[0]! as [number, number]
  const other = ring.find((p) => p[0] !== x0 || p[1] !== y0)
  if (!other) return true
  const dx = other[0]! - x0
  const dy = other[1]! - y0
  return ring.every((p) => dx * (p[1]! - y0) - dy * (p[0]! - x0) === 0)
}

/** Topology checks of a structurally valid polygon: area, self-intersection, crossing rings, holes inside. */
function polygonTopology(rings: Position[][], path: string, fail: (path: string, message: string) => void): void {
  let clean = true
  rings.forEach((ring, r) => {
    if (isFlat(ring)) { clean = false; return fail(at(path, r), 'the ring encloses no area (all its positions are on one line)') }
    const crossings = kinks({ type: 'LineString', coordinates: ring }).features
    if (crossings.length > 0) {
      clean = false
      fail(at(path, r), `the ring intersects itself at ${pointText(crossings[0]!.geometry.coordinates)}${crossings.length > 1 ? ` (and ${crossings.length - 1} more places)` : ''}`)
    }
  })
  if (!clean || rings.length < 2) return
  for (let a = 0; a < rings.length; a++) for (let b = a + 1; b < rings.length; b++) {
    const crossings = kinks({ type: 'Polygon', coordinates: [rings[a]!, rings[b]!] }).features
    if (crossings.length > 0) { clean = false; fail(path, `rings ${a} and ${b} cross at ${pointText(crossings[0]!.geometry.coordinates)}`) }
  }
  if (!clean) return
  const outer: Polygon = { type: 'Polygon', coordinates: [rings[0]!] }
  for (let h = 1; h < rings.length; h++) {
    if (!booleanPointInPolygon(rings[h]![0]!, outer)) fail(at(path, h), 'this hole lies outside the polygon\'s outer ring (ring 0)')
  }
}
