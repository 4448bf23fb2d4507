// topojson-client ships no types; the workspace basemap uses feature and mesh (typed at the call site).
declare module 'topojson-client' {
  export function mesh(topology: unknown, object: unknown, filter?: (a: unknown, b: unknown) => boolean): unknown
}
