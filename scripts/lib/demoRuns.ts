// Seeds the invented demo scenario's forecast runs: three synthetic coarse ensembles written as
// Tessera JSON, read back through the real reader, stored, and downscaled in-process with the
// same task runner the worker uses, so the demo is usable as soon as the app is up.
import { availableParallelism } from 'node:os'
import { createHash } from 'node:crypto'
import { eq, sql } from 'drizzle-orm'
import { useDB, tables } from '../../server/utils/db'
import { readEnsembleFile } from '../../server/ingest'
import { createRunTasks, insertParsedRun } from '../../server/utils/runRecords'
import { synthesiseDemoEnsembles, type DemoEnsemble } from '../../shared/demo/synthesise'
import { ThreadPool } from '../../worker/threadPool'
import { createTaskRunner } from '../../worker/runTask'
import { closeFinishedRuns } from '../../worker/taskStore'
import type { DownscaleSettings } from '../../server/db/schema/runs'
import { downscaleSettingsSchema } from '../../shared/schemas/runs'
import { fitTimeScale } from '../../shared/numerics/coherence/fitTimeScale'
import { leadHoursOf } from '../../shared/utils/leadHours'

const TITLES: Record<DemoEnsemble['variable'], string> = {
  gust: 'Serevan Coast — gusts (invented demo)',
  temperature: 'Serevan Coast — 2 m temperature (invented demo)',
  precipitation: 'Serevan Coast — 6-hour precipitation (invented demo)',
}

function toTesseraJson(e: DemoEnsemble): Uint8Array {
  const members = Array.from({ length: e.members }, (_, m) =>
    e.leadTimes.map((_, t) => Array.from(e.fields[t * e.members + m]!, (v) => Math.round(v * 1000) / 1000)))
  return new TextEncoder().encode(JSON.stringify({
    tessera: 'ensemble-grid/1', variable: e.variable, standardName: e.standardName, units: e.units,
    longName: `${TITLES[e.variable]}`, referenceTime: e.referenceTime, leadTimes: e.leadTimes,
    ...(e.variable === 'precipitation' ? { cellMethods: 'time: sum' } : e.variable === 'temperature' ? { heightM: 2 } : { heightM: 10, cellMethods: 'time: maximum' }),
    grid: { lon: Array.from(e.lon), lat: Array.from(e.lat) }, members,
  }))
}

export interface DemoRunOptions { members: number; leadTimes: number; samplesPerMember: number; factor: number }

export const DEMO_SIZES: Record<'full' | 'small', DemoRunOptions> = {
  full: { members: 18, leadTimes: 4, samplesPerMember: 10, factor: 8 },
  small: { members: 4, leadTimes: 2, samplesPerMember: 3, factor: 8 },
}

/** Creates and downscales the demo runs unless they exist. Returns the seconds it took (0 when skipped). */
export async function seedDemoRuns(opts: DemoRunOptions, log: (m: string) => void): Promise<number> {
  const db = useDB()
  const [existing] = await db.select({ n: sql<number>`count(*)::int` }).from(tables.runs).where(eq(tables.runs.isDemo, true))
  if ((existing?.n ?? 0) > 0) { log('demo runs already there'); return 0 }
  const started = Date.now()
  const ensembles = synthesiseDemoEnsembles({ members: opts.members, leadTimes: opts.leadTimes })
  const taskIds: number[] = []
  for (const e of ensembles) {
    const bytes = toTesseraJson(e)
    const parsed = await readEnsembleFile(bytes, `${e.variable}.json`)
    // The defaults a forecaster gets (transform by variable, time-coherent samples), τ from the members.
    const settings: DownscaleSettings = downscaleSettingsSchema.parse({ factor: opts.factor, samplesPerMember: opts.samplesPerMember, kernel: 'auto', seed: 1 })
    const byLead = parsed.leadTimes.map((_, t) => parsed.fields.slice(t * parsed.members, (t + 1) * parsed.members))
    if (settings.timeCoherence && byLead.length > 1) settings.timeScaleHours = fitTimeScale(byLead, leadHoursOf(parsed)).timeScaleHours
    await db.transaction(async (tx) => {
      const run = await insertParsedRun(tx, parsed, {
        name: TITLES[e.variable], status: 'ready', sourceFileName: `serevan-demo-${e.variable}.json`,
        sourceSha256: createHash('sha256').update(bytes).digest('hex'), sourceBytes: bytes.length, uploadedById: null, isDemo: true,
      })
      await tx.update(tables.runs).set({ status: 'queued', settings }).where(eq(tables.runs.id, run.id))
      taskIds.push(...await createRunTasks(tx, run.id, parsed.leadTimes.length, parsed.members))
    })
  }
  const pool = new ThreadPool(Math.max(1, availableParallelism()))
  const runTask = createTaskRunner({ pool, workerId: 'demo-seed', owned: new Set(), log: () => {} })
  let done = 0
  const next = async (): Promise<void> => {
    const id = taskIds.shift()
    if (id === undefined) return
    await runTask(id)
    done++
    if (done % 10 === 0 || taskIds.length === 0) log(`demo downscaling: ${done} member fields done`)
    return next()
  }
  await Promise.all(Array.from({ length: Math.max(1, availableParallelism()) }, next))
  await pool.close()
  await closeFinishedRuns()
  const seconds = (Date.now() - started) / 1000
  log(`demo runs seeded and downscaled in ${seconds.toFixed(1)} s`)
  return seconds
}
