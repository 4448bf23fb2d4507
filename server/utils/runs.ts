import type { H3Event } from 'h3'
import { createError } from 'h3'
import { and, asc, desc, eq, inArray, lt, sql } from 'drizzle-orm'
import type { User } from '#auth-utils'
import { useDB, tables } from './db'
import { recordAudit } from './audit'
import { enqueueTasks } from './jobs'
import { createRunTasks, insertParsedRun } from './runRecords'
import { forgetRunSamples } from './runSamples'
import { forgetRunWindows } from './windowSamples'
import { maxUploadBytes, receiveUpload } from './uploads'
import { IngestError, readEnsembleFromPath, summariseRun, type EnsembleRun } from '../ingest'
import { estimateSampleBytes, type DownscaleSettingsInput } from '../../shared/schemas/runs'
import { fitTimeScale } from '../../shared/numerics/coherence/fitTimeScale'
import type { DownscaleSettings } from '../db/schema/runs'
import { leadHoursOf } from '../../shared/utils/leadHours'

const notFound = (id: number) => createError({ statusCode: 404, statusMessage: 'Not Found', message: `There is no forecast run ${id}.` })
const conflict = (message: string) => createError({ statusCode: 409, statusMessage: 'Conflict', message })

type RunRow = typeof tables.runs.$inferSelect

/**
 * Receives an upload, reads and validates it completely, then stores it as a staged run
 * (hidden until confirmed) in one transaction: a refused file leaves no rows and no files.
 */
export async function stageUpload(event: H3Event, user: User, fileName: string) {
  const file = await receiveUpload(event)
  let parsed: EnsembleRun
  try {
    parsed = await readEnsembleFromPath(file.path, { maxBytes: maxUploadBytes() })
  } catch (err) {
    if (err instanceof IngestError) throw createError({ statusCode: err.httpStatus, statusMessage: 'File refused', message: err.message, data: { code: err.code } })
    throw err
  } finally {
    await file.cleanup()
  }
  const db = useDB()
  // Staged copies nobody confirmed within a day are dropped, so abandoned previews don't pile up.
  await db.delete(tables.runs).where(and(eq(tables.runs.status, 'staged'), lt(tables.runs.createdAt, sql`now() - interval '1 day'`)))
  const run = await db.transaction((tx) => insertParsedRun(tx, parsed, {
    name: fileName.replace(/\.[^.]+$/, ''), status: 'staged', sourceFileName: fileName, sourceSha256: file.sha256, sourceBytes: file.bytes, uploadedById: user.id,
  }))
  return { run: runSummary(run), preview: summariseRun(parsed) }
}

/** Confirms a staged upload. The same file cannot be confirmed twice (double submission → 409). */
export async function confirmRun(event: H3Event, user: User, id: number, name: string) {
  const db = useDB()
  const [run] = await db.select().from(tables.runs).where(eq(tables.runs.id, id))
  if (!run) throw notFound(id)
  if (run.status !== 'staged') throw conflict('This upload has already been confirmed.')
  const [twin] = await db.select({ id: tables.runs.id, name: tables.runs.name }).from(tables.runs)
    .where(and(eq(tables.runs.sourceSha256, run.sourceSha256), sql`${tables.runs.status} <> 'staged'`))
  if (twin) throw conflict(`This file was already uploaded as run ${twin.id} (“${twin.name}”).`)
  try {
    const [after] = await db.update(tables.runs).set({ status: 'ready', name })
      .where(and(eq(tables.runs.id, id), eq(tables.runs.status, 'staged'))).returning()
    if (!after) throw conflict('This upload has already been confirmed.')
    await recordAudit({ actor: user, action: 'run.upload', entityType: 'run', entityId: id, after: runSummary(after) }, event)
    return { run: runSummary(after) }
  } catch (err) {
    if ((err as { code?: string }).code === '23505') throw conflict('This file was already uploaded as another run.')
    throw err
  }
}

/**
 * Queues one task per member and lead time. Allowed from ready, cancelled or failed; a run that
 * is already queued or running answers 409, so a double click starts nothing twice.
 */
export async function startDownscaling(event: H3Event, user: User, id: number, input: DownscaleSettingsInput) {
  const db = useDB()
  const settings: DownscaleSettings = { ...input }
  if (settings.timeCoherence) settings.timeScaleHours = await fitRunTimeScale(id)
  const taskIds = await db.transaction(async (tx) => {
    const [run] = await tx.update(tables.runs).set({ status: 'queued', settings, startedAt: null, finishedAt: null })
      .where(and(eq(tables.runs.id, id), inArray(tables.runs.status, ['ready', 'cancelled', 'failed']))).returning()
    if (!run) {
      const [existing] = await tx.select({ status: tables.runs.status }).from(tables.runs).where(eq(tables.runs.id, id))
      if (!existing) throw notFound(id)
      throw conflict(existing.status === 'staged' ? 'Confirm the upload before downscaling.' : `This run is ${existing.status}; it cannot be started again now.`)
    }
    const ids = await createRunTasks(tx, id, run.leadTimes.length, run.members)
    await recordAudit({ actor: user, action: 'run.downscale', entityType: 'run', entityId: id, after: settings }, event, tx)
    return ids
  })
  // Jobs are sent after the commit; a task without a job is re-queued by the worker's sweeper.
  await enqueueTasks(taskIds)
  forgetRunSamples(id)
  forgetRunWindows(id)
  return getRun(id)
}

export async function cancelRun(event: H3Event, user: User, id: number) {
  const db = useDB()
  await db.transaction(async (tx) => {
    const [run] = await tx.update(tables.runs).set({ status: 'cancelled', finishedAt: new Date() })
      .where(and(eq(tables.runs.id, id), inArray(tables.runs.status, ['queued', 'running']))).returning({ id: tables.runs.id })
    if (!run) {
      const [existing] = await tx.select({ status: tables.runs.status }).from(tables.runs).where(eq(tables.runs.id, id))
      if (!existing) throw notFound(id)
      throw conflict(`This run is ${existing.status}; only a queued or running run can be cancelled.`)
    }
    await tx.update(tables.runTasks).set({ status: 'cancelled' })
      .where(and(eq(tables.runTasks.runId, id), inArray(tables.runTasks.status, ['pending', 'running'])))
    await recordAudit({ actor: user, action: 'run.cancel', entityType: 'run', entityId: id }, event, tx)
  })
  return getRun(id)
}

/** Removes a run that is not being processed (staged, ready, cancelled, failed, completed). */
export async function deleteRun(event: H3Event, user: User, id: number) {
  const [row] = await useDB().delete(tables.runs)
    .where(and(eq(tables.runs.id, id), sql`${tables.runs.status} not in ('queued', 'running')`)).returning()
  if (!row) {
    const [existing] = await useDB().select({ status: tables.runs.status }).from(tables.runs).where(eq(tables.runs.id, id))
    if (!existing) throw notFound(id)
    throw conflict('Cancel the downscaling before deleting the run.')
  }
  forgetRunSamples(id)
  forgetRunWindows(id)
  await recordAudit({ actor: user, action: 'run.delete', entityType: 'run', entityId: id, before: runSummary(row) }, event)
}

/** What lists and pages show of a run (no large arrays). */
export function runSummary(run: RunRow) {
  const { grid, footprint: _f, uploadedById: _u, ...rest } = run
  return { ...rest, grid: { nx: grid.nx, ny: grid.ny, spacingKm: grid.spacingKm, dxKm: grid.dxKm, dyKm: grid.dyKm, crs: grid.crs } }
}

export async function listRuns() {
  const db = useDB()
  const rows = await db.select().from(tables.runs).where(sql`${tables.runs.status} <> 'staged'`).orderBy(desc(tables.runs.createdAt))
  const counts = await db.select({ runId: tables.runTasks.runId, status: tables.runTasks.status, n: sql<number>`count(*)::int` })
    .from(tables.runTasks).groupBy(tables.runTasks.runId, tables.runTasks.status)
  return rows.map((r) => ({ ...runSummary(r), progress: progressOf(counts.filter((c) => c.runId === r.id)) }))
}

function progressOf(counts: { status: string; n: number }[]) {
  const by = Object.fromEntries(counts.map((c) => [c.status, c.n])) as Record<string, number>
  const total = counts.reduce((s, c) => s + c.n, 0)
  return { total, done: by.done ?? 0, running: by.running ?? 0, pending: by.pending ?? 0, failed: by.failed ?? 0, cancelled: by.cancelled ?? 0 }
}

/** A run with live progress, an estimate of the time left, and every task's fitted parameters. */
export async function getRun(id: number) {
  const db = useDB()
  const [run] = await db.select().from(tables.runs).where(eq(tables.runs.id, id))
  if (!run) throw notFound(id)
  const tasks = await db.select({
    id: tables.runTasks.id, leadIndex: tables.runTasks.leadIndex, memberIndex: tables.runTasks.memberIndex, status: tables.runTasks.status,
    attempts: tables.runTasks.attempts, elapsedMs: tables.runTasks.elapsedMs, error: tables.runTasks.error,
    startedAt: tables.runTasks.startedAt, finishedAt: tables.runTasks.finishedAt,
    fit: sql<Record<string, unknown> | null>`${tables.runTasks.fit} - 'profile' - 'diagnostics'`,
  }).from(tables.runTasks).where(eq(tables.runTasks.runId, id)).orderBy(asc(tables.runTasks.leadIndex), asc(tables.runTasks.memberIndex))
  const progress = progressOf(Object.entries(tasks.reduce<Record<string, number>>((acc, t) => { acc[t.status] = (acc[t.status] ?? 0) + 1; return acc }, {})).map(([status, n]) => ({ status, n })))
  const doneTimes = tasks.filter((t) => t.status === 'done' && t.elapsedMs).map((t) => t.elapsedMs!)
  const elapsedMs = run.startedAt ? (run.finishedAt ?? new Date()).getTime() - run.startedAt.getTime() : 0
  const remaining = progress.pending + progress.running
  // Observed throughput so far (tasks per wall-clock ms) predicts the rest.
  const estimateMs = progress.done > 0 && remaining > 0 && elapsedMs > 0 ? Math.round(remaining * elapsedMs / progress.done) : null
  const s = run.settings
  return {
    run: {
      ...runSummary(run),
      sampleBytesEstimate: s ? estimateSampleBytes(run.members, run.leadTimes.length, s.samplesPerMember, run.grid.nx, run.grid.ny, s.factor) : null,
      fineSpacingKm: s ? run.grid.spacingKm / s.factor : null,
    },
    progress: { ...progress, elapsedMs, estimateMs, meanTaskMs: doneTimes.length ? Math.round(doneTimes.reduce((a, b) => a + b, 0) / doneTimes.length) : null },
    tasks,
  }
}

/** One task's full fit, including the profile likelihood curve for the plot. */
export async function getTaskFit(runId: number, taskId: number) {
  const [task] = await useDB().select({ id: tables.runTasks.id, leadIndex: tables.runTasks.leadIndex, memberIndex: tables.runTasks.memberIndex, status: tables.runTasks.status, fit: tables.runTasks.fit })
    .from(tables.runTasks).where(and(eq(tables.runTasks.id, taskId), eq(tables.runTasks.runId, runId)))
  if (!task) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `Run ${runId} has no task ${taskId}.` })
  return { task }
}

/**
 * Decorrelation time τ of the run's perturbations from its coarse members (fitTimeScale), used so
 * that sample k of a member hangs together across lead times. Undefined for a single lead time.
 */
async function fitRunTimeScale(runId: number): Promise<number | undefined> {
  const db = useDB()
  const [run] = await db.select({ leadTimes: tables.runs.leadTimes, forecastPeriodsHours: tables.runs.forecastPeriodsHours, members: tables.runs.members })
    .from(tables.runs).where(eq(tables.runs.id, runId))
  if (!run || run.leadTimes.length < 2) return undefined
  const rows = await db.select().from(tables.runFields).where(eq(tables.runFields.runId, runId))
  const fields: Float32Array[][] = run.leadTimes.map(() => [])
  for (const r of rows) fields[r.leadIndex]![r.memberIndex] = new Float32Array(r.data.buffer.slice(r.data.byteOffset, r.data.byteOffset + r.data.byteLength))
  return fitTimeScale(fields, leadHoursOf(run)).timeScaleHours
}
