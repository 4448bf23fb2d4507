// Runs one method check end to end: claim, compute on a dedicated thread with live progress, store once.
import { Worker } from 'node:worker_threads'
import type { MethodCheckInput } from '../shared/numerics/pipeline/methodCheck'
import type { MethodCheckReport } from '../shared/numerics/pipeline/methodCheckReport'
import type { MethodCheckThreadMessage } from './methodCheckThread'
import { claimMethodCheck, completeMethodCheck, failMethodCheck, recordMethodCheckProgress } from './methodCheckStore'

/** Progress is written to the database at most this often (ms); the last value always is. */
const PROGRESS_EVERY_MS = 700

export interface MethodCheckRunnerContext {
  workerId: string
  /** Check ids being computed here (for heartbeats and clean shutdown). */
  owned: Set<number>
  /** Threads computing (terminated on shutdown). */
  threads: Set<Worker>
  log: (message: string) => void
}

/** Computes a report on a fresh worker thread (the event loop stays free for heartbeats). */
function computeOnThread(input: MethodCheckInput & { truth: Float32Array }, threads: Set<Worker>, onProgress: (fraction: number, stage: string) => void): Promise<MethodCheckReport> {
  return new Promise((resolve, reject) => {
    const thread = new Worker(new URL('./methodCheckThread.mjs', import.meta.url))
    threads.add(thread)
    let settled = false
    const finish = (fn: () => void) => {
      if (settled) return
      settled = true
      threads.delete(thread)
      void thread.terminate()
      fn()
    }
    thread.on('message', (m: MethodCheckThreadMessage) => {
      if (m.kind === 'progress') onProgress(m.fraction, m.stage)
      else if (m.kind === 'done') finish(() => resolve(m.report))
      else finish(() => reject(new Error(m.message)))
    })
    thread.once('error', (err) => finish(() => reject(err)))
    thread.once('exit', (code) => finish(() => reject(new Error(`the computation stopped (thread exit code ${code})`))))
    thread.postMessage(input, [input.truth.buffer as ArrayBuffer])
  })
}

export function createMethodCheckRunner({ workerId, owned, threads, log }: MethodCheckRunnerContext) {
  return async function runCheck(checkId: number): Promise<void> {
    const row = await claimMethodCheck(checkId, workerId)
    if (!row) return // finished, owned by a live worker, or deleted
    owned.add(checkId)
    const started = Date.now()
    let lastWrite = 0
    let writing: Promise<void> = Promise.resolve()
    const progress = (fraction: number, stage: string) => {
      const now = Date.now()
      if (now - lastWrite < PROGRESS_EVERY_MS && fraction < 1) return
      lastWrite = now
      writing = writing.then(() => recordMethodCheckProgress(checkId, workerId, fraction, stage)).catch((e) => log(`progress of check ${checkId} not saved: ${(e as Error).message}`))
    }
    try {
      const bytes = row.truthField
      const truth = new Float32Array(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength))
      const report = await computeOnThread({
        truth, nx: row.truthNx, ny: row.truthNy, spacingKm: row.truthSpacingKm, units: row.truthUnits, settings: row.settings,
        ...(row.truthSource.standardName ? { standardName: row.truthSource.standardName } : {}),
      }, threads, progress)
      await writing
      const stored = await completeMethodCheck(checkId, workerId, report, Date.now() - started)
      log(`method check ${checkId} ${stored ? 'stored' : 'discarded: taken over or deleted'} in ${Date.now() - started} ms`)
    } catch (err) {
      const message = err instanceof Error ? err.message : String(err)
      log(`method check ${checkId} failed: ${message}`)
      await writing
      await failMethodCheck(checkId, workerId, message)
    } finally {
      owned.delete(checkId)
    }
  }
}
