// Runs one downscaling task end to end: claim, compute on the thread pool, store exactly once.
import { memberNoiseSeed, taskSeed } from '../shared/numerics/pipeline/downscaleMember'
import { DEFAULT_TIME_SCALE_HOURS } from '../shared/numerics/coherence/fitTimeScale'
import { leadHoursOf } from '../shared/utils/leadHours'
import type { ThreadPool } from './threadPool'
import { claimTask, completeTask, failTask, isRunActive, loadTaskInput } from './taskStore'

export interface TaskRunnerContext {
  pool: ThreadPool
  workerId: string
  /** Task ids this worker is computing (for heartbeats and clean shutdown). */
  owned: Set<number>
  log: (message: string) => void
}

export function createTaskRunner({ pool, workerId, owned, log }: TaskRunnerContext) {
  return async function runTask(taskId: number): Promise<void> {
    const task = await claimTask(taskId, workerId)
    if (!task) return // finished, owned by a live worker, or its run was cancelled
    owned.add(taskId)
    const started = Date.now()
    try {
      const { run, coarse } = await loadTaskInput(taskId)
      const s = run.settings!
      const leadHours = leadHoursOf(run)
      const output = await pool.run({
        coarse, nx: run.grid.nx, ny: run.grid.ny, factor: s.factor, kernel: s.kernel,
        samples: s.samplesPerMember, seed: taskSeed(s.seed, task.leadIndex, task.memberIndex), spacingKm: run.grid.spacingKm,
        // Runs started before the extensions existed keep the basic model (no transform, no coherence).
        standardName: run.standardName ?? undefined,
        transform: s.transform ?? 'none',
        anisotropy: s.anisotropy ?? 'off',
        regimes: s.regimes ?? 'off',
        timeCoherence: s.timeCoherence && leadHours.length > 1
          ? { leadIndex: task.leadIndex, leadHours, timeScaleHours: s.timeScaleHours ?? DEFAULT_TIME_SCALE_HOURS, noiseSeed: memberNoiseSeed(s.seed, task.memberIndex) }
          : undefined,
      })
      if (!(await isRunActive(run.id))) return // cancelled meanwhile: the result is dropped
      const p = output.packed
      const stored = await completeTask(taskId, workerId, {
        fit: { ...output.fit, precision: p.precision, blockMeanError: output.blockMeanError, diagnostics: output.diagnostics },
        samples: Buffer.from(p.data.buffer, p.data.byteOffset, p.data.byteLength),
        sampleOffset: p.offset, sampleScale: p.scale, sampleCount: s.samplesPerMember,
        fineNx: output.fineNx, fineNy: output.fineNy, elapsedMs: Date.now() - started,
      })
      log(`task ${taskId} (run ${run.id}, lead ${task.leadIndex}, member ${task.memberIndex}) ${stored ? 'stored' : 'discarded: taken over'} in ${Date.now() - started} ms`)
    } catch (err) {
      const message = err instanceof Error ? err.message : String(err)
      log(`task ${taskId} failed: ${message}`)
      await failTask(taskId, workerId, message)
    } finally {
      owned.delete(taskId)
    }
  }
}
