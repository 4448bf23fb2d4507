// The run_tasks row is the truth about a task; these statements make each step safe when
// several workers (processes or machines) race or die.
import { and, eq, inArray, lt, sql } from 'drizzle-orm'
import { useDB, tables } from '../server/utils/db'

/** A running task whose heartbeat is older than this is considered abandoned (TESSERA_TASK_STALE_SECONDS, default 30). */
export const STALE_AFTER_SECONDS = Number(process.env.TESSERA_TASK_STALE_SECONDS ?? 30)

/**
 * Claims a task for this worker: pending, or running but abandoned. Returns null when another
 * worker owns it, it is finished, or its run was cancelled (the job is then a duplicate).
 */
export async function claimTask(taskId: number, workerId: string) {
  const [row] = await useDB().update(tables.runTasks).set({
    status: 'running', workerId, heartbeatAt: sql`now()`, startedAt: sql`now()`,
    attempts: sql`${tables.runTasks.attempts} + 1`, error: null,
  }).where(and(
    eq(tables.runTasks.id, taskId),
    sql`(${tables.runTasks.status} = 'pending' or (${tables.runTasks.status} = 'running' and ${tables.runTasks.heartbeatAt} < now() - make_interval(secs => ${STALE_AFTER_SECONDS})))`,
    sql`exists (select 1 from runs r where r.id = ${tables.runTasks.runId} and r.status in ('queued', 'running'))`,
  )).returning()
  if (row) {
    await useDB().update(tables.runs).set({ status: 'running', startedAt: sql`coalesce(${tables.runs.startedAt}, now())` })
      .where(and(eq(tables.runs.id, row.runId), eq(tables.runs.status, 'queued')))
  }
  return row ?? null
}

export async function heartbeat(taskIds: number[], workerId: string): Promise<void> {
  if (taskIds.length === 0) return
  await useDB().update(tables.runTasks).set({ heartbeatAt: sql`now()` })
    .where(and(inArray(tables.runTasks.id, taskIds), eq(tables.runTasks.workerId, workerId), eq(tables.runTasks.status, 'running')))
}

/**
 * Stores a finished task, only if this worker still owns it — so a member is stored exactly once
 * even when a presumed-dead worker comes back. Returns false when the result was discarded.
 */
export async function completeTask(taskId: number, workerId: string, result: {
  fit: unknown; samples: Buffer; sampleOffset: number; sampleScale: number; sampleCount: number; fineNx: number; fineNy: number; elapsedMs: number
}): Promise<boolean> {
  return useDB().transaction(async (tx) => {
    const [row] = await tx.update(tables.runTasks).set({ ...result, status: 'done', finishedAt: sql`now()` })
      .where(and(eq(tables.runTasks.id, taskId), eq(tables.runTasks.workerId, workerId), eq(tables.runTasks.status, 'running')))
      .returning({ runId: tables.runTasks.runId })
    if (!row) return false
    await finishRunIfDone(tx, row.runId)
    return true
  })
}

export async function failTask(taskId: number, workerId: string, message: string): Promise<void> {
  await useDB().transaction(async (tx) => {
    const [row] = await tx.update(tables.runTasks).set({ status: 'failed', error: message.slice(0, 2000), finishedAt: sql`now()` })
      .where(and(eq(tables.runTasks.id, taskId), eq(tables.runTasks.workerId, workerId), eq(tables.runTasks.status, 'running')))
      .returning({ runId: tables.runTasks.runId })
    if (row) await finishRunIfDone(tx, row.runId)
  })
}

/** Marks the run completed (or failed) once no task is pending or running. */
async function finishRunIfDone(tx: Parameters<Parameters<ReturnType<typeof useDB>['transaction']>[0]>[0], runId: number) {
  // Serialise the check on the run row: without the lock, two last tasks finishing together
  // each see the other still running and neither closes the run.
  await tx.execute(sql`select 1 from runs where id = ${runId} for update`)
  await tx.execute(sql`
    update runs set
      status = case when exists (select 1 from run_tasks where run_id = ${runId} and status = 'failed') then 'failed'::run_status else 'completed'::run_status end,
      finished_at = now()
    where id = ${runId} and status in ('queued', 'running')
      and not exists (select 1 from run_tasks where run_id = ${runId} and status in ('pending', 'running'))`)
}

/** Tasks whose worker stopped sending heartbeats go back to pending; returns their ids and attempt numbers. */
export async function releaseAbandonedTasks(): Promise<{ id: number; attempts: number }[]> {
  return useDB().update(tables.runTasks).set({ status: 'pending', workerId: null })
    .where(and(eq(tables.runTasks.status, 'running'), lt(tables.runTasks.heartbeatAt, sql`now() - make_interval(secs => ${STALE_AFTER_SECONDS})`)))
    .returning({ id: tables.runTasks.id, attempts: tables.runTasks.attempts })
}

/** The inputs a task needs: its coarse field and the run's grid and settings. */
export async function loadTaskInput(taskId: number) {
  const db = useDB()
  const [task] = await db.select().from(tables.runTasks).where(eq(tables.runTasks.id, taskId))
  if (!task) throw new Error(`task ${taskId} vanished`)
  const [run] = await db.select().from(tables.runs).where(eq(tables.runs.id, task.runId))
  const [field] = await db.select().from(tables.runFields).where(and(
    eq(tables.runFields.runId, task.runId), eq(tables.runFields.leadIndex, task.leadIndex), eq(tables.runFields.memberIndex, task.memberIndex)))
  if (!run?.settings || !field) throw new Error(`run ${task.runId} has no settings or no field for task ${taskId}`)
  const bytes = field.data
  const coarse = new Float32Array(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength))
  return { task, run, coarse }
}

export async function isRunActive(runId: number): Promise<boolean> {
  const [run] = await useDB().select({ status: tables.runs.status }).from(tables.runs).where(eq(tables.runs.id, runId))
  return run?.status === 'queued' || run?.status === 'running'
}

/** On a clean shutdown, hands this worker's running tasks straight back (no need to wait for staleness). */
export async function releaseOwnedTasks(taskIds: number[], workerId: string): Promise<{ id: number; attempts: number }[]> {
  if (taskIds.length === 0) return []
  return useDB().update(tables.runTasks).set({ status: 'pending', workerId: null })
    .where(and(inArray(tables.runTasks.id, taskIds), eq(tables.runTasks.workerId, workerId), eq(tables.runTasks.status, 'running')))
    .returning({ id: tables.runTasks.id, attempts: tables.runTasks.attempts })
}

/**
 * Pending tasks of active runs that nobody claimed for a while (e.g. the web server died between
 * committing the tasks and sending their jobs): their jobs are sent again (de-duplicated by key).
 */
export async function unclaimedPendingTasks(): Promise<{ id: number; attempts: number }[]> {
  const rows = await useDB().execute(sql`
    select t.id, t.attempts from run_tasks t join runs r on r.id = t.run_id
    where t.status = 'pending' and r.status in ('queued', 'running')
      and coalesce(t.heartbeat_at, r.updated_at) < now() - make_interval(secs => ${STALE_AFTER_SECONDS * 4})
    limit 500`)
  return (rows.rows as { id: number; attempts: number }[])
}

/** Closes runs whose tasks are all finished but whose status was left open (self-repair). */
export async function closeFinishedRuns(): Promise<number> {
  const res = await useDB().execute(sql`
    update runs r set
      status = case when exists (select 1 from run_tasks where run_id = r.id and status = 'failed') then 'failed'::run_status else 'completed'::run_status end,
      finished_at = now()
    where r.status in ('queued', 'running')
      and exists (select 1 from run_tasks where run_id = r.id)
      and not exists (select 1 from run_tasks where run_id = r.id and status in ('pending', 'running'))`)
  return res.rowCount ?? 0
}
