// Method checks through the API: truths (upload, demo), single checks and batches, progress and
// exports. The numbers themselves are computed by the worker (worker/methodCheckRunner.ts) with the
// pure shared/numerics/pipeline/methodCheck.ts, exactly as `tessera check` does.
import type { H3Event } from 'h3'
import { createError, setResponseHeader } from 'h3'
import { asc, desc, eq, inArray, sql } from 'drizzle-orm'
import type { User } from '#auth-utils'
import { useDB, tables } from './db'
import { recordAudit } from './audit'
import { enqueueMethodChecks } from './methodCheckJobs'
import { insertMethodCheckTruth, methodCheckTruthSummary, TruthRefusedError } from './methodCheckTruths'
import { maxUploadBytes, receiveUpload } from './uploads'
import { IngestError, readEnsembleFromPath, type EnsembleRun } from '../ingest'
import type { MethodCheckTruthSource } from '../db/schema/methodChecks'
import type { CreateMethodCheckBatchInput, CreateMethodCheckInput } from '../../shared/schemas/methodChecks'
import { MIN_COARSE_SIDE } from '../../shared/numerics/pipeline/methodCheck'
import type { MethodCheckHeadline, MethodCheckSettings } from '../../shared/numerics/pipeline/methodCheckReport'
import { summariseBatch } from '../../shared/numerics/pipeline/methodCheckBatch'
import { batchCsv, methodCheckReportCsv } from '../../shared/numerics/io/methodCheckCsv'

const notFound = (what: string) => createError({ statusCode: 404, statusMessage: 'Not Found', message: `There is no ${what}.` })
const refused = (statusCode: number, message: string) => createError({ statusCode, statusMessage: statusCode === 409 ? 'Conflict' : 'Unprocessable Content', message })

type TruthRow = typeof tables.methodCheckTruths.$inferSelect
type Settings = Omit<CreateMethodCheckInput, 'name' | 'truthId' | 'factor'>

/** Receives a fine field file, reads it exactly as a run upload, and keeps the chosen member and lead time as a truth. */
export async function uploadMethodCheckTruth(event: H3Event, user: User, q: { fileName: string; member: number; lead: number; variable?: string; name?: string }) {
  const file = await receiveUpload(event)
  let run: EnsembleRun
  try {
    run = await readEnsembleFromPath(file.path, { maxBytes: maxUploadBytes(), ...(q.variable ? { variable: q.variable } : {}) })
  } catch (err) {
    if (err instanceof IngestError) throw createError({ statusCode: err.httpStatus, statusMessage: 'File refused', message: err.message, data: { code: err.code } })
    throw err
  } finally {
    await file.cleanup()
  }
  let row: TruthRow | undefined
  try {
    const several = run.members > 1 || run.leadTimes.length > 1
    row = await insertMethodCheckTruth(run, q.member, q.lead, {
      name: q.name ?? `${q.fileName.replace(/\.[^.]+$/, '')}${several ? ` (member ${q.member}, ${run.leadTimes[q.lead] ?? `lead ${q.lead}`})` : ''}`,
      sourceFileName: q.fileName, sourceSha256: file.sha256, uploadedById: user.id,
    })
  } catch (err) {
    if (err instanceof TruthRefusedError) throw refused(err.status, err.message)
    throw err
  }
  const truth = methodCheckTruthSummary(row!)
  await recordAudit({ actor: user, action: 'method_check.truth_upload', entityType: 'method_check_truth', entityId: truth.id, after: { name: truth.name, nx: truth.nx, ny: truth.ny, file: q.fileName } }, event)
  return { truth }
}

/** Deletes an uploaded truth; checks made from it keep their own copy. The invented demo fields stay. */
export async function deleteMethodCheckTruth(event: H3Event, user: User, id: number) {
  const db = useDB()
  const [row] = await db.select({ id: tables.methodCheckTruths.id, name: tables.methodCheckTruths.name, isDemo: tables.methodCheckTruths.isDemo })
    .from(tables.methodCheckTruths).where(eq(tables.methodCheckTruths.id, id))
  if (!row) throw notFound(`truth field ${id}`)
  if (row.isDemo) throw refused(409, 'The invented demo truth fields cannot be deleted.')
  await db.delete(tables.methodCheckTruths).where(eq(tables.methodCheckTruths.id, id))
  await recordAudit({ actor: user, action: 'method_check.truth_delete', entityType: 'method_check_truth', entityId: id, before: row }, event)
}

function settingsFor(s: Settings, factor: number): MethodCheckSettings {
  return {
    factor,
    kernel: s.givenKernel ? s.givenKernel.kernel : s.kernel,
    ...(s.givenKernel ? { givenKernel: s.givenKernel } : {}),
    ...(s.givenKernel ? {} : { transform: s.transform, anisotropy: s.anisotropy, regimes: s.regimes }),
    samples: s.samples, seed: s.seed, thresholds: s.thresholds,
    neighbourhoods: [...new Set(s.neighbourhoods)].sort((a, b) => a - b),
  }
}

function assertBlocks(truth: TruthRow, factor: number) {
  const cx = Math.floor(truth.nx / factor), cy = Math.floor(truth.ny / factor)
  if (cx < MIN_COARSE_SIDE || cy < MIN_COARSE_SIDE) {
    throw refused(422, `“${truth.name}” (${truth.nx}×${truth.ny}) gives only ${cx}×${cy} blocks at factor ${factor}; at least ${MIN_COARSE_SIDE}×${MIN_COARSE_SIDE} are needed. Choose a smaller factor.`)
  }
}

function checkValues(truth: TruthRow, settings: MethodCheckSettings, name: string, authorId: number, batchId: number | null) {
  const source: MethodCheckTruthSource = {
    kind: truth.isDemo ? 'demo' : 'upload', name: truth.name, truthId: truth.id, memberIndex: truth.memberIndex, leadIndex: truth.leadIndex,
    ...(truth.standardName ? { standardName: truth.standardName } : {}),
    ...(truth.demoKey ? { demoKey: truth.demoKey } : {}),
    ...(truth.sourceFileName ? { fileName: truth.sourceFileName } : {}),
    ...(truth.sourceSha256 ? { sha256: truth.sourceSha256 } : {}),
  }
  return {
    name, status: 'queued' as const, settings, truthSource: source, truthNx: truth.nx, truthNy: truth.ny,
    truthSpacingKm: truth.spacingKm, truthUnits: truth.displayUnits, truthField: truth.data, authorId, batchId,
  }
}

async function truthsById(ids: number[]): Promise<Map<number, TruthRow>> {
  const rows = await useDB().select().from(tables.methodCheckTruths).where(inArray(tables.methodCheckTruths.id, ids))
  const byId = new Map(rows.map((r) => [r.id, r]))
  const missing = ids.find((id) => !byId.has(id))
  if (missing !== undefined) throw notFound(`truth field ${missing}`)
  return byId
}

/** Queues one check of a stored truth. */
export async function createMethodCheck(event: H3Event, user: User, input: CreateMethodCheckInput) {
  const truth = (await truthsById([input.truthId])).get(input.truthId)!
  assertBlocks(truth, input.factor)
  const settings = settingsFor(input, input.factor)
  const name = input.name || `${truth.name}, b = ${input.factor}`
  const [row] = await useDB().insert(tables.methodChecks).values(checkValues(truth, settings, name, user.id, null)).returning({ id: tables.methodChecks.id })
  await recordAudit({ actor: user, action: 'method_check.create', entityType: 'method_check', entityId: row!.id, after: { name, truthId: truth.id, settings } }, event)
  // Sent after the insert; a check without a job is re-sent by the worker's sweeper.
  await enqueueMethodChecks([row!.id])
  return getMethodCheck(row!.id)
}

/** Queues every truth × factor as one batch. */
export async function createMethodCheckBatch(event: H3Event, user: User, input: CreateMethodCheckBatchInput) {
  const truthIds = [...new Set(input.truthIds)]
  const factors = [...new Set(input.factors)].sort((a, b) => a - b)
  const truths = await truthsById(truthIds)
  for (const id of truthIds) for (const f of factors) assertBlocks(truths.get(id)!, f)
  const { name, truthIds: _t, factors: _f, ...shared } = input
  const { factor: _none, ...common } = settingsFor(shared, 0)
  const db = useDB()
  const { batchId, ids } = await db.transaction(async (tx) => {
    const [batch] = await tx.insert(tables.methodCheckBatches).values({ name, settings: { ...common, factors }, authorId: user.id }).returning({ id: tables.methodCheckBatches.id })
    const rows = truthIds.flatMap((id) => factors.map((f) => {
      const t = truths.get(id)!
      return checkValues(t, settingsFor(shared, f), `${t.name}, b = ${f}`, user.id, batch!.id)
    }))
    const inserted = await tx.insert(tables.methodChecks).values(rows).returning({ id: tables.methodChecks.id })
    await recordAudit({ actor: user, action: 'method_check.batch_create', entityType: 'method_check_batch', entityId: batch!.id, after: { name, truthIds, factors, cases: inserted.length } }, event, tx)
    return { batchId: batch!.id, ids: inserted.map((r) => r.id) }
  })
  await enqueueMethodChecks(ids)
  return getMethodCheckBatch(batchId)
}

const listColumns = {
  id: tables.methodChecks.id, name: tables.methodChecks.name, status: tables.methodChecks.status,
  progress: tables.methodChecks.progress, stage: tables.methodChecks.stage, error: tables.methodChecks.error,
  settings: tables.methodChecks.settings, truthSource: tables.methodChecks.truthSource,
  truthNx: tables.methodChecks.truthNx, truthNy: tables.methodChecks.truthNy, truthSpacingKm: tables.methodChecks.truthSpacingKm, truthUnits: tables.methodChecks.truthUnits,
  batchId: tables.methodChecks.batchId, authorName: tables.users.displayName,
  attempts: tables.methodChecks.attempts, createdAt: tables.methodChecks.createdAt, startedAt: tables.methodChecks.startedAt,
  finishedAt: tables.methodChecks.finishedAt, elapsedMs: tables.methodChecks.elapsedMs,
  headline: sql<MethodCheckHeadline | null>`${tables.methodChecks.report} -> 'headline'`,
}

type ListRow = { status: string; progress: number; startedAt: Date | null; finishedAt: Date | null }

/** Live progress: elapsed time and a rough estimate of the rest from the fraction done. */
function timing(r: ListRow) {
  const elapsedMs = r.startedAt ? (r.finishedAt ?? new Date()).getTime() - r.startedAt.getTime() : 0
  const estimateMs = r.status === 'running' && r.progress > 0.05 && r.progress < 1 ? Math.round(elapsedMs * (1 - r.progress) / r.progress) : null
  return { elapsedSoFarMs: elapsedMs, estimateMs }
}

function selectChecks() {
  return useDB().select(listColumns).from(tables.methodChecks).leftJoin(tables.users, eq(tables.users.id, tables.methodChecks.authorId))
}

/** Every check, newest first, with headline numbers (not the full reports). */
export async function listMethodChecks() {
  const rows = await selectChecks().orderBy(desc(tables.methodChecks.createdAt), desc(tables.methodChecks.id))
  return rows.map((r) => ({ ...r, ...timing(r) }))
}

/** One check with its full report (null until completed). */
export async function getMethodCheck(id: number) {
  const [row] = await selectChecks().where(eq(tables.methodChecks.id, id))
  if (!row) throw notFound(`method check ${id}`)
  const [full] = await useDB().select({ report: tables.methodChecks.report }).from(tables.methodChecks).where(eq(tables.methodChecks.id, id))
  return { check: { ...row, ...timing(row), report: full?.report ?? null } }
}

export async function deleteMethodCheck(event: H3Event, user: User, id: number) {
  const [row] = await useDB().delete(tables.methodChecks).where(eq(tables.methodChecks.id, id)).returning({ id: tables.methodChecks.id, name: tables.methodChecks.name, status: tables.methodChecks.status })
  if (!row) throw notFound(`method check ${id}`)
  await recordAudit({ actor: user, action: 'method_check.delete', entityType: 'method_check', entityId: id, before: row }, event)
}

function attachment(event: H3Event, fileName: string, type: string) {
  setResponseHeader(event, 'content-type', type)
  setResponseHeader(event, 'content-disposition', `attachment; filename="${fileName}"`)
}

function slug(name: string): string {
  return name.normalize('NFKD').replace(/[^\w]+/g, '-').replace(/^-|-$/g, '').toLowerCase().slice(0, 60) || 'method-check'
}

/** The report as JSON (settings, truth source and report) or as the tidy CSV. */
export async function exportMethodCheck(event: H3Event, id: number, format: 'json' | 'csv') {
  const { check } = await getMethodCheck(id)
  if (!check.report) throw refused(409, `Method check ${id} is ${check.status}; there is no report to export yet.`)
  const base = `tessera-method-check-${id}-${slug(check.name)}`
  if (format === 'csv') {
    attachment(event, `${base}.csv`, 'text/csv; charset=utf-8')
    return methodCheckReportCsv(check.report)
  }
  attachment(event, `${base}.json`, 'application/json; charset=utf-8')
  const { headline: _h, report, ...meta } = check
  return JSON.stringify({ check: meta, report })
}

export async function listMethodCheckBatches() {
  const db = useDB()
  const batches = await db.select({ id: tables.methodCheckBatches.id, name: tables.methodCheckBatches.name, settings: tables.methodCheckBatches.settings, createdAt: tables.methodCheckBatches.createdAt, authorName: tables.users.displayName })
    .from(tables.methodCheckBatches).leftJoin(tables.users, eq(tables.users.id, tables.methodCheckBatches.authorId)).orderBy(desc(tables.methodCheckBatches.id))
  const counts = await db.select({ batchId: tables.methodChecks.batchId, status: tables.methodChecks.status, n: sql<number>`count(*)::int` })
    .from(tables.methodChecks).where(sql`${tables.methodChecks.batchId} is not null`).groupBy(tables.methodChecks.batchId, tables.methodChecks.status)
  return batches.map((b) => {
    const mine = counts.filter((c) => c.batchId === b.id)
    return { ...b, cases: mine.reduce((s, c) => s + c.n, 0), completed: mine.find((c) => c.status === 'completed')?.n ?? 0, failed: mine.find((c) => c.status === 'failed')?.n ?? 0 }
  })
}

/** A batch, its cases, and the distribution of their headline scores (overall and per factor). */
export async function getMethodCheckBatch(id: number) {
  const db = useDB()
  const [batch] = await db.select().from(tables.methodCheckBatches).where(eq(tables.methodCheckBatches.id, id))
  if (!batch) throw notFound(`batch ${id}`)
  const cases = (await selectChecks().where(eq(tables.methodChecks.batchId, id)).orderBy(asc(tables.methodChecks.id))).map((r) => ({ ...r, ...timing(r) }))
  const done = cases.filter((c) => c.status === 'completed' && c.headline)
  const factors = [...new Set(cases.map((c) => c.settings.factor))].sort((a, b) => a - b)
  return {
    batch,
    cases,
    summary: summariseBatch(done.map((c) => c.headline!)),
    byFactor: factors.map((factor) => ({ factor, summary: summariseBatch(done.filter((c) => c.settings.factor === factor).map((c) => c.headline!)) })),
  }
}

export async function deleteMethodCheckBatch(event: H3Event, user: User, id: number) {
  const [row] = await useDB().delete(tables.methodCheckBatches).where(eq(tables.methodCheckBatches.id, id)).returning({ id: tables.methodCheckBatches.id, name: tables.methodCheckBatches.name })
  if (!row) throw notFound(`batch ${id}`)
  await recordAudit({ actor: user, action: 'method_check.batch_delete', entityType: 'method_check_batch', entityId: id, before: row }, event)
}

/** One row per case (CSV), or the batch with its summary (JSON). */
export async function exportMethodCheckBatch(event: H3Event, id: number, format: 'json' | 'csv') {
  const data = await getMethodCheckBatch(id)
  const base = `tessera-method-check-batch-${id}-${slug(data.batch.name)}`
  if (format === 'csv') {
    attachment(event, `${base}.csv`, 'text/csv; charset=utf-8')
    return batchCsv(data.cases.map((c) => ({ id: c.id, name: c.name, truth: c.truthSource.name, factor: c.settings.factor, status: c.status, headline: c.headline })))
  }
  attachment(event, `${base}.json`, 'application/json; charset=utf-8')
  return JSON.stringify(data)
}
