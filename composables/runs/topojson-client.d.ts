// The one function of topojson-client the runs pages use (the package ships no types).
declare module 'topojson-client' {
  interface TopoGeometry { type: string; coordinates: unknown }
  interface TopoFeature { type: 'Feature'; geometry: TopoGeometry | null; properties: unknown }
  export function feature(topology: unknown, object: unknown): TopoFeature | { type: 'FeatureCollection'; features: TopoFeature[] }
}
