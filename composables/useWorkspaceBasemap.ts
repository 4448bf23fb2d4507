/**
 * The workspace map's own basemap, shipped with the app (nothing is fetched from outside):
 * land and country borders from world-atlas (Natural Earth 1:50 million, TopoJSON) turned into
 * GeoJSON with topojson-client, and the invented demo region drawn from shared/demo/region.ts.
 */
import type { Feature, FeatureCollection, Geometry, LineString, MultiLineString, Polygon } from 'geojson'
import { DEMO_PLACES, KALDOR_RIDGE, SEREVAN_COAST, type DemoPlace } from '#shared/demo/region'

interface TopojsonApi {
  feature(topology: unknown, object: unknown): Feature | FeatureCollection
  mesh(topology: unknown, object: unknown, filter?: (a: unknown, b: unknown) => boolean): MultiLineString
}

export interface Basemap { land: FeatureCollection; borders: Feature<MultiLineString> }

let basemap: Promise<Basemap> | null = null

/** Land polygons and borders between countries, loaded once (about 1.3 MB from the app's own assets). */
export function loadBasemap(): Promise<Basemap> {
  basemap ??= (async (): Promise<Basemap> => {
    const [topojson, landUrl, countriesUrl] = await Promise.all([
      import('topojson-client') as unknown as Promise<TopojsonApi>,
      import('world-atlas/land-50m.json?url').then((m) => m.default as string),
      import('world-atlas/countries-50m.json?url').then((m) => m.default as string),
    ])
    const [landTopo, countriesTopo] = await Promise.all([landUrl, countriesUrl].map(async (url) => {
      const res = await fetch(url)
      if (!res.ok) throw new Error(`basemap ${url}: ${res.status}`)
      return res.json() as Promise<{ objects: Record<string, unknown> }>
    }))
    const land = topojson.feature(landTopo, landTopo!.objects.land)
    const borders = topojson.mesh(countriesTopo, countriesTopo!.objects.countries, (a, b) => a !== b)
    return {
      land: land.type === 'FeatureCollection' ? land : { type: 'FeatureCollection' as const, features: [land] },
      borders: { type: 'Feature', properties: {}, geometry: borders },
    }
  })().catch((error: unknown) => { basemap = null; throw error })
  return basemap!
}

/** The invented demo region as GeoJSON: coastline polygon, ridge crest line and places. */
export function demoRegion(): { coast: Feature<Polygon>; ridge: Feature<LineString>; places: DemoPlace[] } {
  return {
    coast: { type: 'Feature', properties: { name: 'Serevan Coast (invented)' }, geometry: { type: 'Polygon', coordinates: [SEREVAN_COAST] } },
    ridge: { type: 'Feature', properties: { name: 'Kaldor Range (invented)' }, geometry: { type: 'LineString', coordinates: KALDOR_RIDGE } },
    places: DEMO_PLACES,
  }
}

/** A closed lon-lat ring as a GeoJSON polygon feature. */
export function ringFeature(ring: [number, number][], properties: Record<string, unknown> = {}): Feature<Polygon> {
  return { type: 'Feature', properties, geometry: { type: 'Polygon', coordinates: [ring] } }
}

export function featureCollection<G extends Geometry>(features: Feature<G>[]): FeatureCollection<G> {
  return { type: 'FeatureCollection', features }
}
