// Tessera's job worker: claims downscaling tasks from the pg-boss queue and runs the numerics
// on worker threads. Run as many of these as you like, on one machine or several sharing the
// database; the run_tasks rows keep each member stored exactly once.
//   DATABASE_URL=… npx tsx worker/index.ts      (npm start starts one beside the web server)
import { hostname, availableParallelism } from 'node:os'
import { randomBytes } from 'node:crypto'
import { useBoss, stopBoss, DOWNSCALE_QUEUE, enqueueTasks, type DownscaleJob } from '../server/utils/jobs'
import { closeDB } from '../server/utils/db'
import { ThreadPool } from './threadPool'
import { heartbeat, releaseAbandonedTasks, releaseOwnedTasks, STALE_AFTER_SECONDS, unclaimedPendingTasks, closeFinishedRuns } from './taskStore'
import { createTaskRunner } from './runTask'
import { startMailSender } from './mail'
// Method checks: their own queue, one check at a time per process, on a dedicated thread.
import { startMethodCheckWorker } from './methodCheckWorker'

const workerId = `${hostname()}:${process.pid}:${randomBytes(3).toString('hex')}`
const threads = Number(process.env.TESSERA_WORKER_THREADS ?? Math.max(1, availableParallelism()))
const pool = new ThreadPool(threads)
const owned = new Set<number>()
const log = (msg: string) => console.log(`[worker ${workerId}] ${msg}`)

const runTask = createTaskRunner({ pool, workerId, owned, log })

const boss = await useBoss()
for (let k = 0; k < threads; k++) {
  await boss.work<DownscaleJob>(DOWNSCALE_QUEUE, { batchSize: 1, pollingIntervalSeconds: 0.5 }, async ([job]) => {
    if (job) await runTask(job.data.taskId)
  })
}
const beat = setInterval(() => { heartbeat([...owned], workerId).catch((e) => log(`heartbeat failed: ${e.message}`)) }, Math.min(5, STALE_AFTER_SECONDS / 3) * 1000)
const sweep = setInterval(async () => {
  try {
    const released = await releaseAbandonedTasks()
    for (const t of released) await enqueueTasks([t.id], t.attempts)
    if (released.length) log(`re-queued ${released.length} abandoned task(s)`)
    for (const t of await unclaimedPendingTasks()) await enqueueTasks([t.id], t.attempts)
    await closeFinishedRuns()
  } catch (e) { log(`sweep failed: ${(e as Error).message}`) }
}, Math.min(10, STALE_AFTER_SECONDS / 2) * 1000)
const methodChecks = await startMethodCheckWorker({ workerId, log })
// The mail outbox (briefings, notices, invitations) is sent by the same process.
const mail = await startMailSender({ workerId, log })
log(`ready with ${threads} thread(s)`)

async function shutdown() {
  clearInterval(beat)
  clearInterval(sweep)
  await methodChecks.stop()
  await mail.stop()
  const released = await releaseOwnedTasks([...owned], workerId)
  for (const t of released) await enqueueTasks([t.id], t.attempts)
  await stopBoss()
  await pool.close()
  await closeDB()
  process.exit(0)
}
process.on('SIGTERM', shutdown)
process.on('SIGINT', shutdown)
