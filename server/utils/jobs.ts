import PgBoss from 'pg-boss'
import { databaseUrl } from './db'

/** The durable queue (pg-boss on the same PostgreSQL) that carries one job per downscaling task. */
export const DOWNSCALE_QUEUE = 'downscale-task'

export interface DownscaleJob { taskId: number }

/** Wake-up calls for the mail sender: the outbox table holds the messages, a job only says "look now". */
export const MAIL_QUEUE = 'mail-outbox'

let boss: Promise<PgBoss> | undefined

/** Process-wide pg-boss client, started and with its queues created (send to a missing queue is a silent no-op). */
export function useBoss(): Promise<PgBoss> {
  boss ??= (async () => {
    const b = new PgBoss({ connectionString: databaseUrl(), schema: 'pgboss', max: 4 })
    b.on('error', (err) => console.error('[jobs]', err.message))
    await b.start()
    // Long expiry: a dead worker is detected by the task heartbeat (worker/recovery.ts), not by pg-boss.
    await b.createQueue(DOWNSCALE_QUEUE, { name: DOWNSCALE_QUEUE, retryLimit: 5, retryDelay: 5, retryBackoff: true, expireInSeconds: 3600 })
    await b.createQueue(MAIL_QUEUE, { name: MAIL_QUEUE, retryLimit: 0, expireInSeconds: 900 })
    return b
  })()
  return boss
}

/** Sends one job per task id; returns how many were accepted. */
export async function enqueueTasks(taskIds: number[], attempt = 0): Promise<number> {
  const b = await useBoss()
  let sent = 0
  for (const taskId of taskIds) {
    const id = await b.send(DOWNSCALE_QUEUE, { taskId } satisfies DownscaleJob, { singletonKey: `task-${taskId}-${attempt}` })
    if (id) sent++
  }
  return sent
}

export async function stopBoss(): Promise<void> {
  if (!boss) return
  const b = await boss
  boss = undefined
  await b.stop({ graceful: false, wait: true })
}
