// Method checks in the worker process: one pg-boss work loop (one check at a time per process, on
// its own thread beside the downscaling pool), heartbeats, and a sweeper that re-queues checks whose
// worker died. Started from worker/index.ts.
import type { Worker } from 'node:worker_threads'
import { enqueueMethodChecks, forgetMethodCheckBoss, METHOD_CHECK_QUEUE, useMethodCheckBoss, type MethodCheckJob } from '../server/utils/methodCheckJobs'
import { createMethodCheckRunner } from './methodCheckRunner'
import { heartbeatMethodChecks, releaseOwnedMethodChecks, releaseStaleMethodChecks, unclaimedMethodChecks } from './methodCheckStore'
import { STALE_AFTER_SECONDS } from './taskStore'

export interface MethodCheckWorker { stop: () => Promise<void> }

export async function startMethodCheckWorker({ workerId, log }: { workerId: string; log: (m: string) => void }): Promise<MethodCheckWorker> {
  const owned = new Set<number>()
  const threads = new Set<Worker>()
  const runCheck = createMethodCheckRunner({ workerId, owned, threads, log })
  const boss = await useMethodCheckBoss()
  await boss.work<MethodCheckJob>(METHOD_CHECK_QUEUE, { batchSize: 1, pollingIntervalSeconds: 0.5 }, async ([job]) => {
    if (job) await runCheck(job.data.checkId)
  })
  const beat = setInterval(() => {
    heartbeatMethodChecks([...owned], workerId).catch((e) => log(`method-check heartbeat failed: ${e.message}`))
  }, Math.min(5, STALE_AFTER_SECONDS / 3) * 1000)
  const sweep = setInterval(async () => {
    try {
      const released = await releaseStaleMethodChecks()
      for (const c of released) await enqueueMethodChecks([c.id], c.attempts)
      if (released.length) log(`re-queued ${released.length} abandoned method check(s)`)
      for (const c of await unclaimedMethodChecks()) await enqueueMethodChecks([c.id], c.attempts)
    } catch (e) { log(`method-check sweep failed: ${(e as Error).message}`) }
  }, Math.min(10, STALE_AFTER_SECONDS / 2) * 1000)
  return {
    async stop() {
      clearInterval(beat)
      clearInterval(sweep)
      // Hand the checks back first, so the computation ending below cannot mark them failed.
      const released = await releaseOwnedMethodChecks([...owned], workerId)
      for (const c of released) await enqueueMethodChecks([c.id], c.attempts)
      await Promise.all([...threads].map((t) => t.terminate()))
      forgetMethodCheckBoss()
    },
  }
}
