import type PgBoss from 'pg-boss'
import { useBoss } from './jobs'

/** pg-boss queue carrying one job per method check (the method_checks row is the truth about progress). */
export const METHOD_CHECK_QUEUE = 'method-check'

export interface MethodCheckJob { checkId: number }

let ready: Promise<PgBoss> | undefined

/** The process-wide pg-boss client with the method-check queue created (creating it again is a no-op). */
export function useMethodCheckBoss(): Promise<PgBoss> {
  ready ??= useBoss().then(async (b) => {
    // Long expiry: a dead worker is noticed by the check's heartbeat (worker/methodCheckStore.ts), not by pg-boss.
    await b.createQueue(METHOD_CHECK_QUEUE, { name: METHOD_CHECK_QUEUE, retryLimit: 3, retryDelay: 5, retryBackoff: true, expireInSeconds: 3600 })
    return b
  }).catch((err) => { ready = undefined; throw err })
  return ready
}

/** Sends one job per check id (de-duplicated per attempt); returns how many were accepted. */
export async function enqueueMethodChecks(checkIds: number[], attempt = 0): Promise<number> {
  const b = await useMethodCheckBoss()
  let sent = 0
  for (const checkId of checkIds) {
    if (await b.send(METHOD_CHECK_QUEUE, { checkId } satisfies MethodCheckJob, { singletonKey: `check-${checkId}-${attempt}` })) sent++
  }
  return sent
}

/** Forgets the memoised client (after stopBoss, e.g. in the worker's shutdown). */
export function forgetMethodCheckBoss(): void {
  ready = undefined
}
