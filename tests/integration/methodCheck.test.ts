// Method check against the running server, the real PostgreSQL and real worker processes: truth
// uploads (and refusals), checks through the queue to a stored report equal to the pure computation
// (the same as `tessera check`), exports, batches, access by role, and recovery from a killed worker.
import { afterAll, describe, expect, it } from 'vitest'
import { existsSync, readFileSync, readdirSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import pg from 'pg'
import { call, signInAs } from '../support/http'
import { startWorker, waitFor, type WorkerProcess } from '../support/worker'
import { runMethodCheck } from '../../shared/numerics/pipeline/methodCheck'
import { Xoshiro128 } from '../../shared/numerics/random/xoshiro128'

const FIXTURES = fileURLToPath(new URL('../fixtures/ingest/', import.meta.url))
const db = new pg.Client({ connectionString: process.env.DATABASE_URL })
await db.connect()
const workers: WorkerProcess[] = []
afterAll(async () => {
  await Promise.all(workers.map((w) => w.kill('SIGKILL')))
  await db.end()
})

/** A fine field as Tessera JSON: smooth structure plus seeded noise, `members` members, one lead time. */
function fineJson(nx: number, ny: number, members: number, seed: number, hole = false): { bytes: Uint8Array; fields: number[][] } {
  const rng = new Xoshiro128(seed)
  const fields = Array.from({ length: members }, () => Array.from({ length: nx * ny }, (_, k) => {
    const i = k % nx, j = Math.floor(k / nx)
    return Math.round((12 + 4 * Math.sin(i / 5) * Math.cos(j / 6) + 0.8 * Math.sin(i / 2 + j / 3) + 0.3 * (rng.nextDouble() - 0.5)) * 1000) / 1000
  }))
  const doc = {
    tessera: 'ensemble-grid/1', variable: 'gust', standardName: 'wind_speed_of_gust', units: 'm s-1',
    leadTimes: ['2031-11-14T06:00:00Z'], grid: { lon: Array.from({ length: nx }, (_, i) => -30 + 0.03 * i), lat: Array.from({ length: ny }, (_, j) => -46 + 0.03 * j) },
    members: fields.map((f) => [hole ? f.map((v, k) => (k === 17 ? null : v)) : f]),
  }
  return { bytes: new TextEncoder().encode(JSON.stringify(doc)), fields }
}

const uploadTruth = (cookie: string, bytes: Uint8Array, fileName: string, extra = '') =>
  call('POST', `/api/method-checks/truths?fileName=${encodeURIComponent(fileName)}${extra}`, { cookie, raw: bytes })

async function truthCount(): Promise<number> {
  const { rows: [r] } = await db.query('select count(*)::int as n from method_check_truths')
  return r.n
}

function uploadDirIsEmpty(): boolean {
  const dir = process.env.TESSERA_UPLOAD_DIR
  return !dir || !existsSync(dir) || readdirSync(dir).length === 0
}

async function checkRow(id: number) {
  const { rows: [r] } = await db.query('select status, progress, attempts, error from method_checks where id = $1', [id])
  return r as { status: string; progress: number; attempts: number; error: string | null } | undefined
}

const SMALL = { factor: 4, samples: 4, seed: 7, thresholds: { kind: 'value' as const, values: [12, 15] }, neighbourhoods: [1, 3, 9] }

describe('method-check truth fields', () => {
  it('adds the invented demo truths once, whoever asks', async () => {
    const cookie = await signInAs('duty_lead')
    const first = await call('POST', '/api/method-checks/truths/demo', { cookie, body: {} })
    expect(first.status, JSON.stringify(first.body)).toBe(200)
    const again = await call('POST', '/api/method-checks/truths/demo', { cookie, body: {} })
    expect(again.body.added).toBe(0)
    const demo = again.body.truths.filter((t: { isDemo: boolean }) => t.isDemo)
    expect(demo).toHaveLength(3)
    // 32×32 demo coarse cells refined 8×; read through the real reader (km spacing of the demo grid, ~2.6 km).
    for (const t of demo) {
      expect([t.nx, t.ny]).toEqual([256, 256])
      expect(t.spacingKm).toBeGreaterThan(2.3)
      expect(t.spacingKm).toBeLessThan(2.9)
      expect(t.name).toMatch(/invented demo/)
      expect(t.data).toBeUndefined()
    }
    const del = await call('DELETE', `/api/method-checks/truths/${demo[0].id}`, { cookie })
    expect(del.status).toBe(409)
  })

  it('keeps the chosen member of an upload as a truth', async () => {
    const cookie = await signInAs('forecaster')
    const { bytes } = fineJson(32, 28, 2, 1)
    const res = await uploadTruth(cookie, bytes, 'fine-pair.json', '&member=1')
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.truth).toMatchObject({ nx: 32, ny: 28, memberIndex: 1, leadIndex: 0, isDemo: false, displayUnits: 'm/s', sourceFileName: 'fine-pair.json' })
    expect(res.body.truth.name).toMatch(/fine-pair \(member 1/)
    expect(uploadDirIsEmpty()).toBe(true)
  })

  const refusals: [string, () => Uint8Array, string, number, RegExp][] = [
    ['a field with a missing cell', () => fineJson(32, 28, 1, 2, true).bytes, '', 422, /1 missing cell\(s\); a truth must be complete/],
    ['a member that does not exist', () => fineJson(32, 28, 2, 3).bytes, '&member=5', 422, /has 2 member\(s\); member 5 does not exist/],
    ['a lead time that does not exist', () => fineJson(32, 28, 1, 3).bytes, '&lead=1', 422, /has 1 lead time\(s\)/],
    ['a grid too small to be blocked', () => readFileSync(FIXTURES + 't2m_latlon_classic.nc'), '', 422, /only 6×5 cells/],
    ['an unknown format', () => new TextEncoder().encode('not a field at all'), '', 415, /./],
    ['an empty body', () => new Uint8Array(0), '', 400, /empty/],
  ]
  for (const [what, bytes, extra, status, message] of refusals) {
    it(`refuses ${what} with ${status}, storing nothing`, async () => {
      const cookie = await signInAs('admin')
      const before = await truthCount()
      const res = await uploadTruth(cookie, bytes(), 'truth.json', extra)
      expect(res.status, JSON.stringify(res.body)).toBe(status)
      expect(res.body.message).toMatch(message)
      expect(await truthCount()).toBe(before)
      expect(uploadDirIsEmpty()).toBe(true)
    })
  }
})

describe('method-check jobs', () => {
  it('runs a check through the queue to the report the pure computation gives, with exports', async () => {
    const cookie = await signInAs('forecaster')
    const { bytes, fields } = fineJson(36, 32, 1, 4)
    const up = await uploadTruth(cookie, bytes, 'one-field.json')
    expect(up.status).toBe(201)
    const truth = up.body.truth

    const tooCoarse = await call('POST', '/api/method-checks', { cookie, body: { truthId: truth.id, factor: 9 } })
    expect(tooCoarse.status).toBe(422)
    expect(tooCoarse.body.message).toMatch(/only 4×3 blocks at factor 9/)
    expect((await call('POST', '/api/method-checks', { cookie, body: { truthId: 999999, factor: 4 } })).status).toBe(404)
    expect((await call('POST', '/api/method-checks', { cookie, body: { truthId: truth.id, factor: 4, neighbourhoods: [2] } })).status).toBe(400)
    expect((await call('POST', '/api/method-checks', { cookie, body: { truthId: truth.id, factor: 4, samples: 1 } })).status).toBe(400)

    const created = await call('POST', '/api/method-checks', { cookie, body: { truthId: truth.id, ...SMALL } })
    expect(created.status, JSON.stringify(created.body)).toBe(201)
    const id = created.body.check.id
    expect(created.body.check).toMatchObject({ status: 'queued', name: 'one-field, b = 4', report: null, truthSource: { kind: 'upload', truthId: truth.id } })
    const early = await call('GET', `/api/method-checks/${id}/export?format=csv`, { cookie })
    expect(early.status).toBe(409)

    workers.push(startWorker())
    await waitFor('check completed', async () => (await checkRow(id))?.status === 'completed', 120_000)
    const detail = await call('GET', `/api/method-checks/${id}`, { cookie })
    expect(detail.status).toBe(200)
    const check = detail.body.check
    expect(check).toMatchObject({ status: 'completed', progress: 1, stage: 'done', attempts: 1 })
    expect(check.elapsedMs).toBeGreaterThan(0)
    // The stored report is exactly what the pure computation (and so `tessera check`) gives for the stored
    // Float32 truth, spacing and units: nothing is lost or rounded on the way through jsonb.
    const expected = runMethodCheck({
      truth: Float32Array.from(fields[0]!), nx: 36, ny: 32, spacingKm: truth.spacingKm, units: 'm/s', standardName: 'wind_speed_of_gust',
      settings: { ...SMALL, kernel: 'auto' },
    })
    expect(check.report).toEqual(JSON.parse(JSON.stringify(expected)))
    // Gusts are downscaled in Box–Cox values, as a run of gusts is (transform 'auto').
    expect(check.report.fit.transform).toBe('boxcox')
    expect(check.report.settings).toMatchObject({ transform: 'auto', anisotropy: 'off', regimes: 'off' })
    expect(check.headline).toEqual(check.report.headline)

    const list = await call('GET', '/api/method-checks', { cookie })
    const item = list.body.checks.find((c: { id: number }) => c.id === id)
    expect(item.headline.rmseMean).toBe(expected.headline.rmseMean)
    expect(item.report).toBeUndefined()

    const csv = await call('GET', `/api/method-checks/${id}/export?format=csv`, { cookie })
    expect(csv.status).toBe(200)
    expect(csv.headers.get('content-type')).toMatch(/text\/csv/)
    expect(csv.headers.get('content-disposition')).toMatch(/attachment; filename="tessera-method-check-\d+-one-field-b-4\.csv"/)
    expect(String(csv.body).split('\r\n')[0]).toBe('section,forecast,threshold,neighbourhood_cells,wavenumber_per_cell,wavelength_km,quantity,value')
    const json = await call('GET', `/api/method-checks/${id}/export`, { cookie })
    expect(json.headers.get('content-disposition')).toMatch(/\.json"$/)
    expect(json.body.report.headline).toEqual(expected.headline)
    expect(json.body.check.truthSource.fileName).toBe('one-field.json')

    // Checks keep their own copy of the truth: deleting the truth leaves the report usable.
    expect((await call('DELETE', `/api/method-checks/truths/${truth.id}`, { cookie })).status).toBe(204)
    expect((await call('GET', `/api/method-checks/${id}`, { cookie })).body.check.report.headline).toEqual(expected.headline)
    expect((await call('DELETE', `/api/method-checks/${id}`, { cookie })).status).toBe(204)
    expect((await call('GET', `/api/method-checks/${id}`, { cookie })).status).toBe(404)
    const { rows } = await db.query("select action from audit_log where entity_type = 'method_check' and entity_id = $1 order by id", [String(id)])
    expect(rows.map((r) => r.action)).toEqual(['method_check.create', 'method_check.delete'])
  })

  it('runs a batch of truths × factors and summarises the distribution of its scores', async () => {
    const cookie = await signInAs('duty_lead')
    const a = await uploadTruth(cookie, fineJson(32, 32, 1, 5).bytes, 'batch-a.json')
    const b = await uploadTruth(cookie, fineJson(32, 32, 1, 6).bytes, 'batch-b.json')
    const tooMany = await call('POST', '/api/method-checks/batches', { cookie, body: { name: 'x', truthIds: [a.body.truth.id], factors: [2, 3, 4, 6, 8, 12, 16] } })
    expect(tooMany.status).toBe(400)
    const { factor: _one, ...shared } = SMALL
    const res = await call('POST', '/api/method-checks/batches', { cookie, body: { name: 'Two fields × two factors', truthIds: [a.body.truth.id, b.body.truth.id], factors: [4, 2], ...shared } })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const batchId = res.body.batch.id
    expect(res.body.cases.map((c: { settings: { factor: number } }) => c.settings.factor)).toEqual([2, 4, 2, 4])
    if (workers.length === 0) workers.push(startWorker())
    await waitFor('batch completed', async () => {
      const { rows } = await db.query("select count(*)::int as n from method_checks where batch_id = $1 and status = 'completed'", [batchId])
      return rows[0].n === 4
    }, 120_000)
    const detail = await call('GET', `/api/method-checks/batches/${batchId}`, { cookie })
    expect(detail.body.summary.cases).toBe(4)
    const rmse = detail.body.summary.metrics.find((m: { key: string }) => m.key === 'rmseMean')
    const values = detail.body.cases.map((c: { headline: { rmseMean: number } }) => c.headline.rmseMean).sort((x: number, y: number) => x - y)
    expect(rmse).toMatchObject({ count: 4, min: values[0], max: values[3] })
    expect(rmse.median).toBeCloseTo((values[1] + values[2]) / 2, 12)
    expect(detail.body.byFactor.map((f: { factor: number; summary: { cases: number } }) => [f.factor, f.summary.cases])).toEqual([[2, 2], [4, 2]])
    const csv = await call('GET', `/api/method-checks/batches/${batchId}/export?format=csv`, { cookie })
    expect(String(csv.body).trimEnd().split('\r\n')).toHaveLength(5)
    expect((await call('GET', '/api/method-checks/batches', { cookie })).body.batches.find((x: { id: number }) => x.id === batchId)).toMatchObject({ cases: 4, completed: 4 })
    expect((await call('DELETE', `/api/method-checks/batches/${batchId}`, { cookie })).status).toBe(204)
    const { rows } = await db.query('select count(*)::int as n from method_checks where batch_id = $1', [batchId])
    expect(rows[0].n).toBe(0)
  })

  it('a stakeholder can neither see nor start checks', async () => {
    const cookie = await signInAs('stakeholder')
    expect((await call('GET', '/api/method-checks', { cookie })).status).toBe(403)
    expect((await call('POST', '/api/method-checks', { cookie, body: { truthId: 1, factor: 4 } })).status).toBe(403)
  })

  it('recovers a check whose worker was killed mid-way: it is re-queued and completed once', async () => {
    await Promise.all(workers.splice(0).map((w) => w.kill()))
    const cookie = await signInAs('forecaster')
    const demo = (await call('POST', '/api/method-checks/truths/demo', { cookie, body: {} })).body.truths.find((t: { demoKey: string }) => t.demoKey === 'synthetic-matern32')
    // Enough work on a 256×256 truth that the kill lands while it computes.
    const res = await call('POST', '/api/method-checks', { cookie, body: { truthId: demo.id, factor: 4, samples: 40, thresholds: { kind: 'percentile', values: [90] }, neighbourhoods: [1, 5, 25] } })
    const id = res.body.check.id
    const first = startWorker()
    workers.push(first)
    await waitFor('check running', async () => (await checkRow(id))?.status === 'running', 60_000, 50)
    await first.kill('SIGKILL')
    expect((await checkRow(id))?.status).toBe('running')
    const second = startWorker()
    workers.push(second)
    await waitFor('check completed after the kill', async () => (await checkRow(id))?.status === 'completed', 180_000)
    const row = await checkRow(id)
    expect(row!.attempts).toBe(2)
    const detail = await call('GET', `/api/method-checks/${id}`, { cookie })
    expect(detail.body.check.report.samples).toHaveLength(40)
    await second.kill()
  })
})
