/**
 * What the reader found in an ensemble file, as the upload preview, `tessera inspect` and the run
 * pages show it (server/ingest/types.ts RunSummary builds on it; the pages receive it as JSON).
 */

/** Grid of a run in brief: size, mean spacing and its two components (km), coordinate system. */
export interface RunGridSummary { nx: number; ny: number; spacingKm: number; dxKm: number; dyKm: number; crs: string }

export interface RunContents {
  format: string
  variable: string
  standardName: string | null
  /** Units exactly as in the file. */
  units: string
  canonicalUnits: string
  displayUnits: string
  members: number
  /** Valid times, ISO 8601 UTC. */
  leadTimes: string[]
  forecastPeriodsHours: number[]
  referenceTime: string | null
  grid: RunGridSummary
  /** [west, south, east, north], degrees. */
  extent: [number, number, number, number]
  /** What the reader did that a forecaster may want to know (rows flipped, single member assumed, …). */
  notes: string[]
}
