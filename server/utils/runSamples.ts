/**
 * The downscaled samples of a run, read from the database into memory for the map workspace.
 * One lead time at a time: every finished task's samples, unpacked to Float32, stacked in member
 * order (members ascending, then that member's samples), so sample index m is the same
 * scenario (member) at every lead time. A small least-recently-used cache keeps the resulting
 * ProductPlans, so a new threshold or radius costs one product computation, not a reload.
 */
import { createError } from 'h3'
import { and, asc, eq, sql } from 'drizzle-orm'
import { ProductPlan } from '../../shared/numerics/ensemble/productPlan'
import { unpackInt16 } from '../../shared/numerics/io/packInt16'
import type { ProbabilityMaps } from '../../shared/numerics/ensemble/productPlan'
import type { Direction } from '../../shared/numerics/ensemble/stack'
import { useDB, tables } from './db'
import { fineGeometry, gridOutline, outlineBounds, type FineGeometry } from './runGeometry'

export type RunRow = typeof tables.runs.$inferSelect

export interface LeadSamples {
  runId: number
  leadIndex: number
  /** Changes whenever the set of finished tasks changes (re-downscaling, late members). */
  fingerprint: string
  plan: ProductPlan
  /** Member indices whose samples are loaded, ascending. */
  memberIndices: number[]
  /** Sample range of loaded member k: [sampleStart[k], sampleStart[k + 1]). */
  sampleStart: number[]
  /** Samples per member when all loaded members have the same number, else null. */
  samplesPerMember: number | null
  /** Every member was downscaled with time-coherent noise (sample k correlated across lead times). */
  timeCoherent: boolean
  /** Coarse fields of this lead time per loaded member (Float32, ny×nx, NaN = missing). */
  coarse: Float32Array[]
  /** Fine cells whose coarse cell is missing in some member (their samples are unconditioned), or null. */
  missing: Uint8Array | null
  /** Smallest and largest value over all samples and coarse fields of this lead time. */
  valueRange: [number, number]
  loadMs: number
  /** Recently computed probability maps, keyed by threshold, direction and radius (cells). */
  maps: Map<string, ProbabilityMaps>
  /**
   * Set when the entry stands for a time window (windowSamples.ts): lead times from..to, each
   * scenario's per-cell extreme over them, and the sentence saying how scenarios link in time.
   */
  window?: { from: number; to: number; extreme: 'max' | 'min'; meaning: string }
}

export interface RunPlacement {
  key: string
  geometry: FineGeometry
  outline: [number, number][]
  bounds: [number, number, number, number]
}

const notFound = (id: number) => createError({ statusCode: 404, statusMessage: 'Not Found', message: `There is no forecast run ${id}.` })
const conflict = (message: string) => createError({ statusCode: 409, statusMessage: 'Conflict', message })

/** How many lead times of samples stay in memory (TESSERA_SAMPLE_CACHE_LEADS, default 8: two 4-lead runs). */
export const SAMPLE_CACHE_LEADS = Math.max(1, Number(process.env.TESSERA_SAMPLE_CACHE_LEADS ?? 8))

const leadCache = new Map<string, LeadSamples>()
const loading = new Map<string, Promise<LeadSamples>>()
const placements = new Map<string, RunPlacement>()

/** A run that has downscaling settings (factor); 404 when there is none, 409 before downscaling. */
export async function runForProducts(runId: number): Promise<RunRow & { settings: NonNullable<RunRow['settings']> }> {
  const [run] = await useDB().select().from(tables.runs).where(eq(tables.runs.id, runId))
  if (!run || run.status === 'staged') throw notFound(runId)
  if (!run.settings) throw conflict(`Run ${runId} (“${run.name}”) has not been downscaled yet.`)
  return run as RunRow & { settings: NonNullable<RunRow['settings']> }
}

/** Checks a lead index against the run (400 with the valid range otherwise). */
export function checkLeadIndex(run: RunRow, leadIndex: number): void {
  if (leadIndex < 0 || leadIndex >= run.leadTimes.length) {
    throw createError({ statusCode: 400, statusMessage: 'Bad Request', message: `Lead index ${leadIndex} is outside this run's ${run.leadTimes.length} lead times (0–${run.leadTimes.length - 1}).` })
  }
}

/** Fine-grid geometry, outline and bounds of a run (cached; geometry depends only on grid and factor). */
export function runPlacement(run: Pick<RunRow, 'id' | 'grid' | 'settings'>): RunPlacement {
  const factor = run.settings!.factor
  const { grid } = run
  const key = `${run.id}:${factor}:${grid.nx}x${grid.ny}:${grid.proj4}:${grid.x[0]},${grid.x[grid.nx - 1]}:${grid.y[0]},${grid.y[grid.ny - 1]}`
  const cached = placements.get(key)
  if (cached) { placements.delete(key); placements.set(key, cached); return cached }
  const geometry = fineGeometry(run.grid, factor)
  const outline = gridOutline(geometry, geometry.kind === 'latlon' ? 1 : 32)
  const placement = { key, geometry, outline, bounds: outlineBounds(outline) }
  placements.set(key, placement)
  while (placements.size > 16) placements.delete(placements.keys().next().value!)
  return placement
}

async function leadFingerprint(runId: number, leadIndex: number): Promise<{ done: number; fingerprint: string }> {
  const t = tables.runTasks
  const [row] = await useDB().select({ done: sql<number>`count(*)::int`, last: sql<string | null>`max(${t.finishedAt})::text` })
    .from(t).where(and(eq(t.runId, runId), eq(t.leadIndex, leadIndex), eq(t.status, 'done')))
  return { done: row?.done ?? 0, fingerprint: `${row?.done ?? 0}@${row?.last ?? ''}` }
}

/** An Int16Array over a copy of the bytes (pg may hand out buffers at odd offsets). */
function int16View(bytes: Buffer): Int16Array {
  return new Int16Array(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength))
}

function float32View(bytes: Buffer): Float32Array {
  return new Float32Array(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength))
}

async function loadLead(run: RunRow, leadIndex: number, fingerprint: string): Promise<LeadSamples> {
  const started = performance.now()
  const db = useDB()
  const t = tables.runTasks
  const tasks = await db.select({
    memberIndex: t.memberIndex, samples: t.samples, sampleOffset: t.sampleOffset, sampleScale: t.sampleScale,
    sampleCount: t.sampleCount, fineNx: t.fineNx, fineNy: t.fineNy,
    timeCoherent: sql<boolean>`(${t.fit} -> 'diagnostics' -> 'timeCoherence') is not null`,
  }).from(t).where(and(eq(t.runId, run.id), eq(t.leadIndex, leadIndex), eq(t.status, 'done'))).orderBy(asc(t.memberIndex))
  const fields = await db.select({ memberIndex: tables.runFields.memberIndex, data: tables.runFields.data }).from(tables.runFields)
    .where(and(eq(tables.runFields.runId, run.id), eq(tables.runFields.leadIndex, leadIndex))).orderBy(asc(tables.runFields.memberIndex))
  const factor = run.settings!.factor
  const fineNx = run.grid.nx * factor, fineNy = run.grid.ny * factor
  const cells = fineNx * fineNy
  const members: Float32Array[] = []
  const memberIndices: number[] = []
  const sampleStart: number[] = [0]
  let lo = Infinity, hi = -Infinity
  for (const task of tasks) {
    if (!task.samples || task.sampleCount == null || task.sampleOffset == null || task.sampleScale == null) continue
    if (task.fineNx !== fineNx || task.fineNy !== fineNy) {
      throw conflict(`Member ${task.memberIndex} of lead time ${leadIndex} has a ${task.fineNx}×${task.fineNy} fine grid, expected ${fineNx}×${fineNy}.`)
    }
    const packed = int16View(task.samples)
    for (let s = 0; s < task.sampleCount; s++) {
      const grid = unpackInt16(packed, task.sampleOffset, task.sampleScale, s, cells)
      for (let k = 0; k < cells; k++) { const v = grid[k]!; if (v < lo) lo = v; if (v > hi) hi = v }
      members.push(grid)
    }
    memberIndices.push(task.memberIndex)
    sampleStart.push(members.length)
  }
  if (members.length === 0) throw conflict(`Run ${run.id} has no finished samples for lead time ${leadIndex + 1} yet.`)
  const coarseByMember = new Map(fields.map((f) => [f.memberIndex, float32View(f.data)]))
  const coarse = memberIndices.map((m) => coarseByMember.get(m) ?? new Float32Array(run.grid.nx * run.grid.ny).fill(NaN))
  // A coarse cell missing in any member: its fine samples were not conditioned on data there.
  let missing: Uint8Array | null = null
  for (const field of coarse) for (let c = 0; c < field.length; c++) {
    const v = field[c]!
    if (!Number.isFinite(v)) {
      missing ??= new Uint8Array(cells)
      const I = c % run.grid.nx, J = Math.floor(c / run.grid.nx)
      for (let dj = 0; dj < factor; dj++) missing.fill(1, (J * factor + dj) * fineNx + I * factor, (J * factor + dj) * fineNx + (I + 1) * factor)
    } else { if (v < lo) lo = v; if (v > hi) hi = v }
  }
  const counts = sampleStart.slice(1).map((s, k) => s - sampleStart[k]!)
  return {
    runId: run.id, leadIndex, fingerprint,
    plan: new ProductPlan({ nx: fineNx, ny: fineNy, members }, { neighbourhoodCacheSize: 2 }),
    memberIndices, sampleStart,
    samplesPerMember: counts.every((c) => c === counts[0]) ? counts[0]! : null,
    timeCoherent: tasks.length > 0 && tasks.every((task) => task.timeCoherent),
    coarse, missing, valueRange: [lo, hi],
    loadMs: Math.round(performance.now() - started),
    maps: new Map(),
  }
}

/**
 * The samples of one lead time of a run, from the cache when the finished tasks are unchanged.
 * Concurrent requests for the same lead time share one load.
 */
export async function leadSamples(run: RunRow, leadIndex: number): Promise<LeadSamples> {
  checkLeadIndex(run, leadIndex)
  const { done, fingerprint } = await leadFingerprint(run.id, leadIndex)
  if (done === 0) throw conflict(`Run ${run.id} has no finished samples for lead time ${leadIndex + 1} yet.`)
  const key = `${run.id}:${leadIndex}:${fingerprint}`
  const cached = leadCache.get(key)
  if (cached) { leadCache.delete(key); leadCache.set(key, cached); return cached }
  const pending = loading.get(key)
  if (pending) return pending
  const promise = loadLead(run, leadIndex, fingerprint).then((entry) => {
    for (const k of leadCache.keys()) if (k.startsWith(`${run.id}:${leadIndex}:`)) leadCache.delete(k)
    leadCache.set(key, entry)
    while (leadCache.size > SAMPLE_CACHE_LEADS) leadCache.delete(leadCache.keys().next().value!)
    return entry
  }).finally(() => loading.delete(key))
  loading.set(key, promise)
  return promise
}

/** Probability maps for a threshold, direction and radius (cells), remembered for the last few requests. */
export function cachedProbabilityMaps(entry: LeadSamples, threshold: number, direction: Direction, radiusCells: number): ProbabilityMaps {
  const key = `${threshold}:${direction}:${radiusCells}`
  const hit = entry.maps.get(key)
  if (hit) { entry.maps.delete(key); entry.maps.set(key, hit); return hit }
  // NMEP straight from the members (~130 ms at 180 × 256², bench/products.ts) rather than preparing the
  // disk-extreme stack (~1.4 s of blocked server per radius): a radius change must stay quick too.
  const maps = entry.plan.probabilityMaps(threshold, direction, radiusCells)
  entry.maps.set(key, maps)
  while (entry.maps.size > 8) entry.maps.delete(entry.maps.keys().next().value!)
  return maps
}

/** Drops every cached lead time of a run (after it is deleted or downscaled again). */
export function forgetRunSamples(runId: number): void {
  for (const k of [...leadCache.keys()]) if (k.startsWith(`${runId}:`)) leadCache.delete(k)
  for (const k of [...placements.keys()]) if (k.startsWith(`${runId}:`)) placements.delete(k)
}

/** What the cache holds, for diagnostics and benchmarks. */
export function sampleCacheState(): { leads: string[]; bytes: number } {
  let bytes = 0
  for (const e of leadCache.values()) bytes += e.plan.stack.members.reduce((s, g) => s + g.byteLength, 0)
  return { leads: [...leadCache.keys()], bytes }
}
