// Fine "truth" fields for method checks: taken from an uploaded ensemble file (one member, one lead
// time) or synthesised for the invented demo. No h3 here, so seeding scripts can use it too.
import { createHash } from 'node:crypto'
import { asc, desc, inArray } from 'drizzle-orm'
import { useDB, tables } from './db'
import { readEnsembleFile, type EnsembleRun } from '../ingest'
import { MAX_TRUTH_CELLS } from '../../shared/schemas/methodChecks'
import { DEMO_TRUTH_KEYS, synthesiseDemoTruths, type DemoTruth } from '../../shared/demo/truthFields'

/** A truth the check cannot use; `status` is the HTTP status to answer with. */
export class TruthRefusedError extends Error {
  constructor(message: string, readonly status = 422) { super(message) }
}

type TruthRow = typeof tables.methodCheckTruths.$inferSelect

/** The chosen field of a run, checked: member and lead exist, no missing cells, not too large. */
export function truthFieldOf(run: EnsembleRun, member: number, lead: number): Float32Array {
  if (member >= run.members) throw new TruthRefusedError(`The file has ${run.members} member(s); member ${member} does not exist (members count from 0).`)
  if (lead >= run.leadTimes.length) throw new TruthRefusedError(`The file has ${run.leadTimes.length} lead time(s); lead ${lead} does not exist (lead times count from 0).`)
  const { nx, ny } = run.grid
  if (nx * ny > MAX_TRUTH_CELLS) throw new TruthRefusedError(`The grid has ${nx}×${ny} cells; a method check takes at most ${MAX_TRUTH_CELLS.toLocaleString('en')} (1024×1024). Crop the field first.`)
  if (nx < 8 || ny < 8) throw new TruthRefusedError(`The grid has only ${nx}×${ny} cells; a truth needs at least 8×8 (4×4 blocks of 2×2).`)
  const field = run.fields[lead * run.members + member]!
  let missing = 0
  for (const v of field) if (!Number.isFinite(v)) missing++
  if (missing > 0) throw new TruthRefusedError(`The field has ${missing} missing cell(s); a truth must be complete, since every cell is scored.`)
  return field
}

function statsOf(f: Float32Array) {
  let sum = 0, min = Infinity, max = -Infinity
  for (const v of f) { sum += v; if (v < min) min = v; if (v > max) max = v }
  const mean = sum / f.length
  let ss = 0
  for (const v of f) ss += (v - mean) * (v - mean)
  return { min, max, mean, std: Math.sqrt(ss / f.length) }
}

export interface TruthMeta {
  name: string
  description?: string | null
  isDemo?: boolean
  demoKey?: string | null
  sourceFileName?: string | null
  sourceSha256?: string | null
  uploadedById?: number | null
}

/** Stores one field of a run as a truth (Float32 little-endian, the run's row order); returns the row. */
export async function insertMethodCheckTruth(run: EnsembleRun, member: number, lead: number, meta: TruthMeta): Promise<TruthRow | undefined> {
  const field = truthFieldOf(run, member, lead)
  const [row] = await useDB().insert(tables.methodCheckTruths).values({
    name: meta.name, description: meta.description ?? null, isDemo: meta.isDemo ?? false, demoKey: meta.demoKey ?? null,
    variable: run.variable, standardName: run.standardName, canonicalUnits: run.canonicalUnits, displayUnits: run.displayUnits,
    nx: run.grid.nx, ny: run.grid.ny, spacingKm: run.grid.spacingKm, validTime: run.leadTimes[lead] ?? null,
    memberIndex: member, leadIndex: lead, sourceFileName: meta.sourceFileName ?? null, sourceSha256: meta.sourceSha256 ?? null,
    stats: statsOf(field), data: Buffer.from(field.buffer, field.byteOffset, field.byteLength), uploadedById: meta.uploadedById ?? null,
  }).onConflictDoNothing().returning()
  return row
}

/** A demo truth as Tessera JSON (one member, one lead time), so it goes through the real reader. */
function demoTruthJson(t: DemoTruth): Uint8Array {
  return new TextEncoder().encode(JSON.stringify({
    tessera: 'ensemble-grid/1', variable: t.variable, standardName: t.standardName, units: t.units, longName: t.name,
    leadTimes: [t.validTime], grid: { lon: Array.from(t.lon), lat: Array.from(t.lat) },
    members: [[Array.from(t.values, (v) => Math.round(v * 10000) / 10000)]],
  }))
}

/** Creates the invented demo truth fields that are not there yet; returns how many were added. */
export async function ensureDemoTruths(): Promise<number> {
  const db = useDB()
  const present = new Set((await db.select({ key: tables.methodCheckTruths.demoKey }).from(tables.methodCheckTruths)
    .where(inArray(tables.methodCheckTruths.demoKey, [...DEMO_TRUTH_KEYS]))).map((r) => r.key))
  if (DEMO_TRUTH_KEYS.every((k) => present.has(k))) return 0
  let added = 0
  for (const t of synthesiseDemoTruths()) {
    if (present.has(t.key)) continue
    const bytes = demoTruthJson(t)
    const run = await readEnsembleFile(bytes, `${t.key}.json`)
    const row = await insertMethodCheckTruth(run, 0, 0, {
      name: t.name, description: t.description, isDemo: true, demoKey: t.key,
      sourceFileName: `${t.key}.json`, sourceSha256: createHash('sha256').update(bytes).digest('hex'),
    })
    if (row) added++
  }
  return added
}

/** What lists show of a truth (no field data). */
export function methodCheckTruthSummary(t: TruthRow) {
  const { data: _data, ...rest } = t
  return rest
}

export async function listMethodCheckTruths() {
  const rows = await useDB().select().from(tables.methodCheckTruths).orderBy(desc(tables.methodCheckTruths.isDemo), asc(tables.methodCheckTruths.id))
  return rows.map(methodCheckTruthSummary)
}
