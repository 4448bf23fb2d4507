import { describe, expect, it } from 'vitest'
import { formatProblem, MAX_POSITIONS, validateAreaGeoJson } from '#shared/numerics/geo/validateGeoJson'

const square = [[20, 60], [21, 60], [21, 61], [20, 61], [20, 60]]
const hole = [[20.2, 60.2], [20.2, 60.4], [20.4, 60.4], [20.4, 60.2], [20.2, 60.2]]

/** The formatted problems of an invalid document (fails the test when it validates). */
function problems(input: unknown): string[] {
  const r = validateAreaGeoJson(input)
  if (r.ok) throw new Error('expected the document to be rejected')
  return r.problems.map(formatProblem)
}

// Rules from RFC 7946: §3 object types, §3.1.1 positions (lon, lat in WGS 84 degrees),
// §3.1.6 linear rings (≥ 4 positions, closed), §3.3 FeatureCollection; self-intersection via turf.kinks.
describe('GeoJSON area validation', () => {
  it('accepts a Polygon with a hole, a MultiPolygon, a Feature and a FeatureCollection, keeping properties', () => {
    const poly = { type: 'Polygon', coordinates: [square, hole] }
    const multi = { type: 'MultiPolygon', coordinates: [[square], [[[22, 60], [23, 60], [23, 61], [22, 60]]]] }
    expect(validateAreaGeoJson(poly).ok).toBe(true)
    expect(validateAreaGeoJson(multi).ok).toBe(true)
    const r = validateAreaGeoJson({ type: 'FeatureCollection', features: [
      { type: 'Feature', properties: { name: 'Harbour' }, geometry: poly },
      { type: 'Feature', properties: null, geometry: multi },
    ] })
    expect(r.ok && r.areas.map((a) => [a.path, a.properties?.name ?? null, a.geometry.type])).toEqual([
      ['features[0]', 'Harbour', 'Polygon'], ['features[1]', null, 'MultiPolygon'],
    ])
    // Clockwise outer rings are accepted: RFC 7946 §3.1.6 tells parsers not to reject on winding.
    expect(validateAreaGeoJson({ type: 'Polygon', coordinates: [[...square].reverse()] }).ok).toBe(true)
  })

  it('reports wrong types', () => {
    expect(problems(42)).toEqual(['expected a GeoJSON object, got 42'])
    expect(problems({ coordinates: [] })).toEqual(['type: missing "type" (expected FeatureCollection, Feature, Polygon or MultiPolygon)'])
    expect(problems({ type: 'Point', coordinates: [1, 2] })).toEqual(['type: only Polygon and MultiPolygon areas are accepted, got Point'])
    expect(problems({ type: 'Feature', properties: {}, geometry: null })).toEqual(['geometry: the feature has no geometry'])
    expect(problems({ type: 'FeatureCollection', features: [] })).toEqual(['features: the collection has no features'])
    expect(problems({ type: 'FeatureCollection', features: [{ type: 'Feature', geometry: { type: 'LineString', coordinates: [] } }] }))
      .toEqual(['features[0].geometry.type: only Polygon and MultiPolygon areas are accepted, got LineString'])
  })

  it('reports malformed coordinate arrays and positions with their location', () => {
    expect(problems({ type: 'Polygon', coordinates: 'abc' })).toEqual(['coordinates: "coordinates" must be an array, got "abc"'])
    expect(problems({ type: 'Polygon', coordinates: [] })).toEqual(['coordinates: a polygon needs at least one ring (its outer boundary)'])
    expect(problems({ type: 'Polygon', coordinates: [[[20, 60], [21, 'x'], [21, 61], [20, 60]]] }))
      .toEqual(['coordinates[0][1]: a position must be [longitude, latitude] with finite numbers, got [21,"x"]'])
    expect(problems({ type: 'MultiPolygon', coordinates: [[square], 7] })).toEqual(['coordinates[1]: a polygon must be an array of rings, got 7'])
  })

  it('reports longitudes and latitudes out of range', () => {
    expect(problems({ type: 'Polygon', coordinates: [[[179, 60], [190, 60], [179, 61], [179, 60]]] })).toEqual(['coordinates[0][1]: longitude 190 is outside [-180, 180]'])
    expect(problems({ type: 'Polygon', coordinates: [[[20, 89], [21, 95], [21, 89.5], [20, 89]]] })).toEqual(['coordinates[0][1]: latitude 95 is outside [-90, 90]'])
  })

  it('reports rings that are too short or not closed', () => {
    expect(problems({ type: 'Polygon', coordinates: [[[20, 60], [21, 60], [20, 60]]] }))
      .toEqual(['coordinates[0]: a linear ring needs at least 4 positions (the last repeating the first), got 3'])
    expect(problems({ type: 'Polygon', coordinates: [[[20, 60], [21, 60], [21, 61], [20, 61]]] }))
      .toEqual(['coordinates[0]: the ring is not closed: first position [20, 60] differs from last [20, 61]'])
  })

  it('reports self-intersections, crossing rings, flat rings and holes outside', () => {
    const bowtie = [[20, 60], [21, 61], [21, 60], [20, 61], [20, 60]]
    expect(problems({ type: 'Feature', properties: {}, geometry: { type: 'Polygon', coordinates: [bowtie] } }))
      .toEqual(['geometry.coordinates[0]: the ring intersects itself at [20.5, 60.5]'])
    const crossingHole = [[20.5, 60.5], [21.5, 60.5], [21.5, 60.7], [20.5, 60.7], [20.5, 60.5]]
    expect(problems({ type: 'Polygon', coordinates: [square, crossingHole] })).toEqual([
      expect.stringMatching(/^coordinates: rings 0 and 1 cross at \[21, 60\.[57]\]$/),
    ])
    expect(problems({ type: 'Polygon', coordinates: [[[20, 60], [21, 61], [22, 62], [20, 60]]] }))
      .toEqual(['coordinates[0]: the ring encloses no area (all its positions are on one line)'])
    const farHole = [[25, 60.2], [25, 60.4], [25.2, 60.4], [25, 60.2]]
    expect(problems({ type: 'Polygon', coordinates: [square, farHole] })).toEqual(['coordinates[1]: this hole lies outside the polygon\'s outer ring (ring 0)'])
  })

  it('refuses over-detailed areas before the quadratic crossing checks', () => {
    const n = MAX_POSITIONS + 1
    const ring = Array.from({ length: n }, (_, k) => [20 + Math.cos((2 * Math.PI * k) / (n - 1)), 60 + Math.sin((2 * Math.PI * k) / (n - 1))])
    ring[n - 1] = ring[0]!
    expect(problems({ type: 'Polygon', coordinates: [ring] })).toEqual([`coordinates: the area has ${n} positions, more than ${MAX_POSITIONS}: simplify it before uploading`])
  })
})
