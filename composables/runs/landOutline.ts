/**
 * Land polygons of the world at 1:110 million (world-atlas land-110m through topojson-client),
 * loaded once on demand in the browser: the extent map needs no tiles and no network.
 */
import { polygonRings, type LonLat } from './extentMap'

let landRings: Promise<LonLat[][]> | null = null

export function loadLandRings(): Promise<LonLat[][]> {
  landRings ??= Promise.all([import('topojson-client'), import('world-atlas/land-110m.json')]).then(([topojson, atlas]) => {
    const topology = (atlas as { default?: unknown }).default ?? atlas
    const land = topojson.feature(topology, (topology as { objects: { land: unknown } }).objects.land)
    const features = land.type === 'FeatureCollection' ? land.features : [land]
    return features.flatMap((f) => (f.geometry ? polygonRings(f.geometry) : []))
  }).catch((error: unknown) => {
    landRings = null
    throw error
  })
  return landRings
}
