// The method_checks row is the truth about a check; these statements keep it right when several
// workers race or die (the same pattern as taskStore.ts for downscaling tasks).
import { and, eq, inArray, lt, sql } from 'drizzle-orm'
import { useDB, tables } from '../server/utils/db'
import type { MethodCheckReport } from '../shared/numerics/pipeline/methodCheckReport'
import { STALE_AFTER_SECONDS } from './taskStore'

/** A check that stopped this many times (its worker died each time) is marked failed instead of retried. */
export const MAX_METHOD_CHECK_ATTEMPTS = 3

const t = tables.methodChecks
const stale = sql`${t.heartbeatAt} < now() - make_interval(secs => ${STALE_AFTER_SECONDS})`

/** Claims a queued check, or a running one whose worker went silent; null when it is not for us. */
export async function claimMethodCheck(checkId: number, workerId: string) {
  const [row] = await useDB().update(t).set({
    status: 'running', workerId, heartbeatAt: sql`now()`, startedAt: sql`now()`, finishedAt: null,
    attempts: sql`${t.attempts} + 1`, error: null, progress: 0, stage: 'starting',
  }).where(and(eq(t.id, checkId), sql`(${t.status} = 'queued' or (${t.status} = 'running' and ${stale}))`)).returning()
  return row ?? null
}

export async function recordMethodCheckProgress(checkId: number, workerId: string, progress: number, stage: string): Promise<void> {
  await useDB().update(t).set({ progress, stage, heartbeatAt: sql`now()` })
    .where(and(eq(t.id, checkId), eq(t.workerId, workerId), eq(t.status, 'running')))
}

export async function heartbeatMethodChecks(checkIds: number[], workerId: string): Promise<void> {
  if (checkIds.length === 0) return
  await useDB().update(t).set({ heartbeatAt: sql`now()` })
    .where(and(inArray(t.id, checkIds), eq(t.workerId, workerId), eq(t.status, 'running')))
}

/** Stores the report only if this worker still owns the check; false when it was taken over or deleted. */
export async function completeMethodCheck(checkId: number, workerId: string, report: MethodCheckReport, elapsedMs: number): Promise<boolean> {
  const rows = await useDB().update(t).set({ status: 'completed', report, progress: 1, stage: 'done', finishedAt: sql`now()`, elapsedMs })
    .where(and(eq(t.id, checkId), eq(t.workerId, workerId), eq(t.status, 'running'))).returning({ id: t.id })
  return rows.length > 0
}

export async function failMethodCheck(checkId: number, workerId: string, message: string): Promise<void> {
  await useDB().update(t).set({ status: 'failed', error: message.slice(0, 2000), finishedAt: sql`now()` })
    .where(and(eq(t.id, checkId), eq(t.workerId, workerId), eq(t.status, 'running')))
}

/**
 * Running checks whose worker stopped sending heartbeats go back to the queue (returned, to be sent
 * again), or fail once they have stopped MAX_METHOD_CHECK_ATTEMPTS times.
 */
export async function releaseStaleMethodChecks(): Promise<{ id: number; attempts: number }[]> {
  const db = useDB()
  await db.update(t).set({ status: 'failed', finishedAt: sql`now()`, error: `The check stopped ${MAX_METHOD_CHECK_ATTEMPTS} times before finishing (its worker ended each time); it is not retried again.` })
    .where(and(eq(t.status, 'running'), stale, sql`${t.attempts} >= ${MAX_METHOD_CHECK_ATTEMPTS}`))
  return db.update(t).set({ status: 'queued', workerId: null, stage: 'waiting for a worker again' })
    .where(and(eq(t.status, 'running'), stale)).returning({ id: t.id, attempts: t.attempts })
}

/** Queued checks nobody claimed for a while (e.g. the web server died before sending the job). */
export async function unclaimedMethodChecks(): Promise<{ id: number; attempts: number }[]> {
  return useDB().select({ id: t.id, attempts: t.attempts }).from(t)
    .where(and(eq(t.status, 'queued'), lt(sql`coalesce(${t.heartbeatAt}, ${t.updatedAt})`, sql`now() - make_interval(secs => ${STALE_AFTER_SECONDS * 4})`)))
    .limit(100)
}

/** On a clean shutdown, hands this worker's running checks straight back. */
export async function releaseOwnedMethodChecks(checkIds: number[], workerId: string): Promise<{ id: number; attempts: number }[]> {
  if (checkIds.length === 0) return []
  return useDB().update(t).set({ status: 'queued', workerId: null, stage: 'waiting for a worker again', attempts: sql`greatest(${t.attempts} - 1, 0)` })
    .where(and(inArray(t.id, checkIds), eq(t.workerId, workerId), eq(t.status, 'running'))).returning({ id: t.id, attempts: t.attempts })
}
