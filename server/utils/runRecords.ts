import { sql } from 'drizzle-orm'
import { tables, type Database } from './db'
import type { EnsembleRun } from '../ingest'

type Tx = Parameters<Parameters<Database['transaction']>[0]>[0]

/** Outer polygon of the grid in lon-lat (GeoJSON), or null when it crosses the antimeridian. */
function footprintGeoJson(corners: [number, number][]): string | null {
  const lons = corners.map((c) => c[0])
  if (Math.max(...lons) - Math.min(...lons) > 180) return null
  return JSON.stringify({ type: 'Polygon', coordinates: [[...corners, corners[0]]] })
}

export interface RunRecordMeta {
  name: string
  status: 'staged' | 'ready'
  sourceFileName: string
  sourceSha256: string
  sourceBytes: number
  uploadedById: number | null
  isDemo?: boolean
}

/** Inserts a run and all its coarse fields (Float32 bytes) inside the caller's transaction. */
export async function insertParsedRun(tx: Tx | Database, parsed: EnsembleRun, meta: RunRecordMeta) {
  const footprint = footprintGeoJson(parsed.corners)
  const [row] = await tx.insert(tables.runs).values({
    ...meta,
    format: parsed.format, variable: parsed.variable, standardName: parsed.standardName, units: parsed.units,
    canonicalUnits: parsed.canonicalUnits, displayUnits: parsed.displayUnits, members: parsed.members,
    leadTimes: parsed.leadTimes, forecastPeriodsHours: parsed.forecastPeriodsHours,
    referenceTime: parsed.referenceTime ? new Date(parsed.referenceTime) : null, heightM: parsed.heightM ?? null, cellMethods: parsed.cellMethods ?? null,
    grid: { ...parsed.grid, x: Array.from(parsed.grid.x), y: Array.from(parsed.grid.y) },
    extent: parsed.extent, corners: parsed.corners, notes: parsed.notes,
    footprint: footprint ? sql`ST_SetSRID(ST_GeomFromGeoJSON(${footprint}), 4326)` as unknown as string : null,
  }).returning()
  const rows = parsed.fields.map((data, k) => ({
    runId: row!.id, leadIndex: Math.floor(k / parsed.members), memberIndex: k % parsed.members,
    data: Buffer.from(data.buffer, data.byteOffset, data.byteLength),
  }))
  for (let k = 0; k < rows.length; k += 50) await tx.insert(tables.runFields).values(rows.slice(k, k + 50))
  return row!
}

/** One pending task per lead time × member (previous tasks of the run are removed); returns their ids. */
export async function createRunTasks(tx: Tx | Database, runId: number, leadTimes: number, members: number): Promise<number[]> {
  await tx.delete(tables.runTasks).where(sql`${tables.runTasks.runId} = ${runId}`)
  const rows = []
  for (let l = 0; l < leadTimes; l++) for (let m = 0; m < members; m++) rows.push({ runId, leadIndex: l, memberIndex: m })
  const ids: number[] = []
  for (let k = 0; k < rows.length; k += 200) {
    const inserted = await tx.insert(tables.runTasks).values(rows.slice(k, k + 200)).returning({ id: tables.runTasks.id })
    ids.push(...inserted.map((r) => r.id))
  }
  return ids
}
