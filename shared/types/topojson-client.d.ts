// The one function of topojson-client Tessera uses (the package ships no types); same shape as composables/runs/topojson-client.d.ts.
declare module 'topojson-client' {
  interface TopoGeometry { type: string; coordinates: unknown }
  interface TopoFeature { type: 'Feature'; geometry: TopoGeometry | null; properties: unknown }
  export function feature(topology: unknown, object: unknown): TopoFeature | { type: 'FeatureCollection'; features: TopoFeature[] }
}
