// Forecast runs against the running server, the real PostgreSQL and real worker processes.
import { afterAll, describe, expect, it } from 'vitest'
import { readFileSync, readdirSync, existsSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import pg from 'pg'
import { call, signInAs } from '../support/http'
import { makeEnsembleJson } from '../support/ensembleJson'
import { startWorker, waitFor, type WorkerProcess } from '../support/worker'

const FIXTURES = fileURLToPath(new URL('../fixtures/ingest/', import.meta.url))
const db = new pg.Client({ connectionString: process.env.DATABASE_URL })
await db.connect()
const workers: WorkerProcess[] = []
afterAll(async () => {
  await Promise.all(workers.map((w) => w.kill('SIGKILL')))
  await db.end()
})

const upload = (cookie: string, bytes: Uint8Array, fileName: string) =>
  call('POST', `/api/runs/uploads?fileName=${encodeURIComponent(fileName)}`, { cookie, raw: bytes })

async function rowCounts() {
  const { rows: [r] } = await db.query('select (select count(*) from runs)::int as runs, (select count(*) from run_fields)::int as fields')
  return r as { runs: number; fields: number }
}

function uploadDirIsEmpty(): boolean {
  const dir = process.env.TESSERA_UPLOAD_DIR
  return !dir || !existsSync(dir) || readdirSync(dir).length === 0
}

async function uploadAndConfirm(cookie: string, bytes: Uint8Array, name: string): Promise<number> {
  const staged = await upload(cookie, bytes, `${name}.json`)
  expect(staged.status, JSON.stringify(staged.body)).toBe(201)
  const confirmed = await call('POST', `/api/runs/${staged.body.run.id}/confirm`, { cookie, body: { name } })
  expect(confirmed.status, JSON.stringify(confirmed.body)).toBe(200)
  return staged.body.run.id
}

async function runState(id: number) {
  const { rows } = await db.query('select status, count(*)::int as n from run_tasks where run_id = $1 group by status', [id])
  const { rows: [run] } = await db.query('select status from runs where id = $1', [id])
  return { run: run.status as string, tasks: Object.fromEntries(rows.map((r) => [r.status, r.n])) as Record<string, number> }
}

describe('upload, preview and confirm', () => {
  it('previews a NetCDF classic file, keeps it hidden until confirmed, and refuses the same file twice', async () => {
    const cookie = await signInAs('forecaster')
    const bytes = readFileSync(FIXTURES + 't2m_latlon_classic.nc')
    const staged = await upload(cookie, bytes, 't2m_latlon_classic.nc')
    expect(staged.status, JSON.stringify(staged.body)).toBe(201)
    // Values as read by ncdump of the fixture (the CDL beside it): 3 members, 2 lead times, 6×5 grid, K → °C.
    expect(staged.body.preview).toMatchObject({ members: 3, units: 'K', canonicalUnits: 'degC', grid: { nx: 6, ny: 5 } })
    expect(staged.body.preview.leadTimes).toEqual(['2031-03-04T06:00:00Z', '2031-03-04T12:00:00Z'])
    const list = await call('GET', '/api/runs', { cookie })
    expect(list.body.runs.some((r: { id: number }) => r.id === staged.body.run.id)).toBe(false)
    const ok = await call('POST', `/api/runs/${staged.body.run.id}/confirm`, { cookie, body: { name: 'Test temperatures' } })
    expect(ok.status).toBe(200)
    expect(ok.body.run.status).toBe('ready')
    const again = await call('POST', `/api/runs/${staged.body.run.id}/confirm`, { cookie, body: { name: 'Twice' } })
    expect(again.status).toBe(409)
    const second = await upload(cookie, bytes, 'copy.nc')
    const dup = await call('POST', `/api/runs/${second.body.run.id}/confirm`, { cookie, body: { name: 'Copy' } })
    expect(dup.status).toBe(409)
    expect(dup.body.message).toMatch(/already uploaded as run/)
    expect(uploadDirIsEmpty()).toBe(true)
  })

  const refusals: [string, number, RegExp][] = [
    ['err_units.nc', 422, /units "degrees of warmth" are not recognised/],
    ['err_allmissing.nc', 422, /missing/i],
    ['err_nonfinite.nc', 422, /finite|infinit|NaN/i],
    ['err_nonmonotonic.nc', 422, /order|monoton|increas|decreas/i],
    ['err_novariable.nc', 422, /no ensemble members|no data variable/i],
    ['err_calendar.nc', 422, /calendar/i],
  ]
  for (const [file, status, message] of refusals) {
    it(`refuses ${file} with ${status} and stores nothing`, async () => {
      const cookie = await signInAs('forecaster')
      const before = await rowCounts()
      const res = await upload(cookie, readFileSync(FIXTURES + file), file)
      expect(res.status, JSON.stringify(res.body)).toBe(status)
      expect(res.body.message).toMatch(message)
      expect(await rowCounts()).toEqual(before)
      expect(uploadDirIsEmpty()).toBe(true)
    })
  }

  it('refuses an unknown format, an empty body and an oversized file, storing nothing', async () => {
    const cookie = await signInAs('admin')
    const before = await rowCounts()
    const junk = await upload(cookie, new TextEncoder().encode('hello, this is not a forecast'), 'notes.txt')
    expect(junk.status).toBe(415)
    const empty = await upload(cookie, new Uint8Array(0), 'empty.nc')
    expect(empty.status).toBe(400)
    expect(empty.body.message).toMatch(/empty/)
    // The test server runs with TESSERA_MAX_UPLOAD_MB=2.
    const huge = await upload(cookie, new Uint8Array(3 * 1024 * 1024).fill(7), 'huge.nc')
    expect(huge.status).toBe(413)
    expect(huge.body.message).toMatch(/larger than the 2 MB limit/)
    const truncated = readFileSync(FIXTURES + 't2m_latlon_classic.nc').subarray(0, 300)
    const cut = await upload(cookie, truncated, 'cut.nc')
    expect(cut.status).toBe(422)
    expect(await rowCounts()).toEqual(before)
    expect(uploadDirIsEmpty()).toBe(true)
  })
})

describe('downscaling jobs', () => {
  it('runs to completion with fitted parameters and samples for every member and lead time', async () => {
    const cookie = await signInAs('forecaster')
    const id = await uploadAndConfirm(cookie, makeEnsembleJson({ nx: 8, ny: 6, members: 3, leads: 2, seed: 11 }), 'small queue run')
    const started = await call('POST', `/api/runs/${id}/downscale`, { cookie, body: { factor: 4, samplesPerMember: 3, kernel: 'matern32', seed: 5 } })
    expect(started.status, JSON.stringify(started.body)).toBe(200)
    const twice = await call('POST', `/api/runs/${id}/downscale`, { cookie, body: { factor: 4, samplesPerMember: 3, kernel: 'matern32', seed: 5 } })
    expect(twice.status).toBe(409)
    workers.push(startWorker())
    await waitFor('run completed', async () => (await runState(id)).run === 'completed')
    const detail = await call('GET', `/api/runs/${id}`, { cookie })
    expect(detail.body.progress).toMatchObject({ total: 6, done: 6 })
    for (const t of detail.body.tasks) {
      expect(t.fit.kernel).toBe('matern32')
      expect(t.fit.lengthScaleKm).toBeGreaterThan(0)
      expect(t.fit.blockMeanError).toBeLessThan(1e-6)
    }
    const { rows } = await db.query('select sample_count, fine_nx, fine_ny, octet_length(samples)::int as bytes from run_tasks where run_id = $1', [id])
    for (const r of rows) expect(r).toEqual({ sample_count: 3, fine_nx: 32, fine_ny: 24, bytes: 3 * 32 * 24 * 2 })
    const fit = await call('GET', `/api/runs/${id}/tasks/${detail.body.tasks[0].id}`, { cookie })
    expect(fit.body.task.fit.profile.length).toBeGreaterThan(3)
    await Promise.all(workers.splice(0).map((w) => w.kill()))
  })

  it('recovers from a worker killed mid-run: every member stored exactly once', async () => {
    const cookie = await signInAs('forecaster')
    const id = await uploadAndConfirm(cookie, makeEnsembleJson({ nx: 16, ny: 16, members: 4, leads: 2, seed: 12 }), 'kill test run')
    await call('POST', `/api/runs/${id}/downscale`, { cookie, body: { factor: 8, samplesPerMember: 6, kernel: 'matern32', seed: 9 } })
    const first = startWorker()
    workers.push(first)
    await waitFor('a task running', async () => ((await runState(id)).tasks.running ?? 0) > 0, 60_000, 50)
    await first.kill('SIGKILL')
    const afterKill = await runState(id)
    expect(afterKill.run).toBe('running')
    const second = startWorker()
    workers.push(second)
    await waitFor('run completed after the kill', async () => (await runState(id)).run === 'completed', 120_000)
    const { rows } = await db.query('select lead_index, member_index, status, attempts, samples is not null as stored from run_tasks where run_id = $1', [id])
    expect(rows).toHaveLength(8)
    expect(new Set(rows.map((r) => `${r.lead_index}/${r.member_index}`)).size).toBe(8)
    expect(rows.every((r) => r.status === 'done' && r.stored)).toBe(true)
    expect(rows.some((r) => r.attempts >= 2)).toBe(true)
    await second.kill()
  })

  it('two workers share one run', async () => {
    const cookie = await signInAs('forecaster')
    const id = await uploadAndConfirm(cookie, makeEnsembleJson({ nx: 12, ny: 12, members: 4, leads: 2, seed: 13 }), 'shared run')
    workers.push(startWorker(), startWorker())
    await call('POST', `/api/runs/${id}/downscale`, { cookie, body: { factor: 8, samplesPerMember: 4, kernel: 'matern32', seed: 3 } })
    await waitFor('run completed', async () => (await runState(id)).run === 'completed', 120_000)
    const { rows } = await db.query('select count(distinct worker_id)::int as n from run_tasks where run_id = $1', [id])
    expect(rows[0].n).toBe(2)
    await Promise.all(workers.splice(0).map((w) => w.kill()))
  })

  it('cancel stops the run; nothing pending is processed afterwards', async () => {
    const cookie = await signInAs('forecaster')
    const id = await uploadAndConfirm(cookie, makeEnsembleJson({ nx: 16, ny: 16, members: 6, leads: 2, seed: 14 }), 'cancel run')
    await call('POST', `/api/runs/${id}/downscale`, { cookie, body: { factor: 8, samplesPerMember: 6, kernel: 'matern32', seed: 2 } })
    const w = startWorker()
    workers.push(w)
    await waitFor('a task done', async () => ((await runState(id)).tasks.done ?? 0) > 0, 60_000, 50)
    const res = await call('POST', `/api/runs/${id}/cancel`, { cookie })
    expect(res.status).toBe(200)
    expect(res.body.run.status).toBe('cancelled')
    const atCancel = (await runState(id)).tasks.done ?? 0
    await new Promise((r) => setTimeout(r, 3000))
    const later = await runState(id)
    expect(later.run).toBe('cancelled')
    expect(later.tasks.pending ?? 0).toBe(0)
    // A task already computing when the cancel came is dropped, never stored.
    expect(later.tasks.done ?? 0).toBe(atCancel)
    const again = await call('POST', `/api/runs/${id}/cancel`, { cookie })
    expect(again.status).toBe(409)
    await w.kill()
  })
})
