// The demo scenario end to end without the database: synthesise the three coarse ensembles,
// read them back through the real reader, downscale every member and lead time on a worker-thread
// pool (as the worker does), and count the bytes that would be stored.
import { availableParallelism } from 'node:os'
import { readEnsembleFile } from '../server/ingest'
import { synthesiseDemoEnsembles } from '../shared/demo/synthesise'
import { taskSeed } from '../shared/numerics/pipeline/downscaleMember'
import { ThreadPool } from '../worker/threadPool'
import { DEMO_SIZES } from '../scripts/lib/demoRuns'

export async function bench() {
  const size = DEMO_SIZES[process.env.TESSERA_DEMO_SIZE === 'small' ? 'small' : 'full']
  const threads = Math.max(1, availableParallelism())
  const t0 = performance.now()
  const ensembles = synthesiseDemoEnsembles({ members: size.members, leadTimes: size.leadTimes })
  const tSynth = performance.now() - t0
  const pool = new ThreadPool(threads)
  let sampleBytes = 0, coarseBytes = 0, tasks = 0, capped = 0, worstBlockMean = 0
  const t1 = performance.now()
  for (const e of ensembles) {
    const json = new TextEncoder().encode(JSON.stringify({
      tessera: 'ensemble-grid/1', variable: e.variable, standardName: e.standardName, units: e.units, referenceTime: e.referenceTime, leadTimes: e.leadTimes,
      grid: { lon: Array.from(e.lon), lat: Array.from(e.lat) },
      members: Array.from({ length: e.members }, (_, m) => e.leadTimes.map((_, t) => Array.from(e.fields[t * e.members + m]!))),
    }))
    const run = await readEnsembleFile(json, `${e.variable}.json`)
    const jobs = run.fields.map((coarse, k) => pool.run({
      coarse, nx: run.grid.nx, ny: run.grid.ny, factor: size.factor, kernel: 'auto', samples: size.samplesPerMember,
      seed: taskSeed(1, Math.floor(k / run.members), k % run.members), spacingKm: run.grid.spacingKm,
    }))
    for (const out of await Promise.all(jobs)) {
      tasks++
      sampleBytes += out.packed.data.byteLength
      if (out.fit.atBound === 'upper') capped++
      worstBlockMean = Math.max(worstBlockMean, out.blockMeanError)
    }
    coarseBytes += run.fields.reduce((s, f) => s + f.byteLength, 0)
  }
  const wall = (performance.now() - t1) / 1000
  await pool.close()
  const figures = {
    demoSize: process.env.TESSERA_DEMO_SIZE === 'small' ? 'small' : 'full',
    threads, tasks, samplesPerMember: size.samplesPerMember, fineGrid: `${32 * size.factor}x${32 * size.factor}`,
    synthesiseSeconds: +(tSynth / 1000).toFixed(2), downscaleSeconds: +wall.toFixed(1), secondsPerTaskPerThread: +(wall * threads / tasks).toFixed(2),
    sampleMegabytes: +(sampleBytes / 1e6).toFixed(1), coarseMegabytes: +(coarseBytes / 1e6).toFixed(2),
    membersAtLengthScaleCap: capped, worstBlockMeanError: worstBlockMean,
  }
  console.table(figures)
  return figures
}
