// Briefings against the running server and the real PostgreSQL: the state machine with four eyes,
// the PDF hash tie, edits returning to draft, optimistic locking and races, roles, and the PDF itself
// (text by pdftotext, fonts by pdffonts, the map page rendered by pdftoppm).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createHash } from 'node:crypto'
import { execFileSync } from 'node:child_process'
import { mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import pg from 'pg'
import { PNG } from 'pngjs'
import { BASE_URL, call, signIn, signInAs, uniqueEmail } from '../support/http'
import { formatPercent } from '../../shared/utils/likelihood'

const db = new pg.Client({ connectionString: process.env.DATABASE_URL })
await db.connect()
afterAll(() => db.end())

const cookies: Record<'forecaster' | 'lead' | 'lead2' | 'admin' | 'stakeholder', string> = {} as never
let run: { id: number; members: number; samples: number; leads: number }
let areaId: number
const threshold = { hazard: 'gust', label: 'Strong gusts', value: 20, direction: 'above' }

/** A second duty lead, so that two leads who did not write a briefing can race to approve it. */
async function secondLead(admin: string): Promise<string> {
  const email = uniqueEmail('lead2')
  const res = await call('POST', '/api/users', { cookie: admin, body: { email, displayName: 'Second Duty Lead', role: 'duty_lead' } })
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  const token = new URL(res.body.inviteUrl).searchParams.get('token')!
  expect((await call('POST', '/api/auth/set-password', { body: { token, password: 'second lead long password' } })).status).toBe(200)
  return signIn(email, 'second lead long password')
}

beforeAll(async () => {
  cookies.forecaster = await signInAs('forecaster')
  cookies.lead = await signInAs('duty_lead')
  cookies.admin = await signInAs('admin')
  cookies.stakeholder = await signInAs('stakeholder')
  cookies.lead2 = await secondLead(cookies.admin)
  const { rows: [r] } = await db.query(`select id, members, (settings->>'samplesPerMember')::int as samples, jsonb_array_length(lead_times) as leads
    from runs where is_demo and standard_name = 'wind_speed_of_gust' and status = 'completed' order by id limit 1`)
  expect(r, 'the demo gust run is seeded and downscaled').toBeTruthy()
  run = r
  // An area of our own around the invented Kaldor Pass (the demo region is ocean in world-atlas).
  const { rows: [a] } = await db.query(`insert into areas (name, tags, kind, geometry) values ($1, '{test}', 'rectangle',
    ST_Multi(ST_SetSRID(ST_GeomFromGeoJSON($2), 4326))) returning id`, [`Briefing test pass ${Date.now()}`,
    JSON.stringify({ type: 'Polygon', coordinates: [[[-24.1, -45.0], [-23.3, -45.0], [-23.3, -44.4], [-24.1, -44.4], [-24.1, -45.0]]] })])
  areaId = a.id
})

const selection = () => ({ leadFrom: 0, leadTo: run.leads - 1, areaIds: [areaId], thresholds: [threshold], kinds: ['anywhere', 'areaMean', 'fraction'] })
const get = async (cookie: string, id: number) => { const r = await call('GET', `/api/briefings/${id}`, { cookie }); expect(r.status, JSON.stringify(r.body)).toBe(200); return r.body }
const patch = (cookie: string, id: number, body: Record<string, unknown>) => call('PATCH', `/api/briefings/${id}`, { cookie, body })
const act = (cookie: string, id: number, action: string, body: Record<string, unknown>) => call('POST', `/api/briefings/${id}/${action}`, { cookie, body })

async function create(cookie: string): Promise<number> {
  const res = await call('POST', '/api/briefings', { cookie, body: { runId: run.id, title: `Test briefing ${Date.now()}`, selection: selection() } })
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  return res.body.briefing.id
}

/** Fills everything submission needs; returns the view. */
async function fill(cookie: string, id: number) {
  const v = await get(cookie, id)
  const res = await patch(cookie, id, {
    lockVersion: v.briefing.lockVersion,
    narrative: { headline: 'Damaging gusts likely on Kaldor Pass this morning', summary: 'Strong gusts over the pass.', details: 'Details for the test.' },
    confidenceNote: 'Members agree well on the pass.',
    nextUpdateAt: '2031-11-14T18:00:00Z',
    recipientKeys: ['duty-team'],
    contact: 'Test Forecaster, +00 000 000',
  })
  expect(res.status, JSON.stringify(res.body)).toBe(200)
  return res.body
}

async function submitted(author: string): Promise<{ id: number; view: any }> {
  const id = await create(author)
  const v = await fill(author, id)
  const res = await act(author, id, 'submit', { lockVersion: v.briefing.lockVersion })
  expect(res.status, JSON.stringify(res.body)).toBe(200)
  return { id, view: res.body }
}

async function pdfOf(cookie: string, id: number): Promise<{ bytes: Buffer; header: string | null; status: number }> {
  const res = await fetch(`${BASE_URL}/api/briefings/${id}/pdf`, { headers: { cookie } })
  return { bytes: Buffer.from(await res.arrayBuffer()), header: res.headers.get('x-tessera-pdf-sha256'), status: res.status }
}
const sha = (b: Buffer) => createHash('sha256').update(b).digest('hex')

describe('building a briefing', () => {
  it('fills in key statements from the run: probability = k/N with N = members × samples', async () => {
    const id = await create(cookies.forecaster)
    const { briefing } = await get(cookies.forecaster, id)
    expect(briefing.status).toBe('draft')
    expect(briefing.statements.map((s: any) => s.kind)).toEqual(['anywhere', 'areaMean', 'fraction'])
    for (const s of briefing.statements) {
      expect(s.scenarios).toBe(run.members * run.samples)
      expect(s.members).toBe(run.members)
      if (s.kind === 'fraction') { expect(s.count).toBeNull(); expect(s.value).toBeGreaterThanOrEqual(0); expect(s.value).toBeLessThanOrEqual(1) } else {
        expect(s.value).toBeCloseTo(s.count / s.scenarios, 12)
        expect(s.membersShowing).toBeLessThanOrEqual(run.members)
        // A member that shows the event contributes at least one scenario, at most all of its samples.
        expect(s.count).toBeGreaterThanOrEqual(s.membersShowing)
        expect(s.count).toBeLessThanOrEqual(s.membersShowing * run.samples)
      }
      expect(s.text).toContain(briefing.statements[0].areaName)
      expect(s.text).toMatch(/UTC 14 Nov 2031/)
    }
    // Anywhere in the area is at least as likely as the area average crossing the threshold.
    expect(briefing.statements[0].value).toBeGreaterThanOrEqual(briefing.statements[1].value)
    expect(briefing.windowStart).toBeTruthy()
    expect(briefing.caveats.snapshot.some((c: any) => c.standing)).toBe(true)
  })

  it('refuses submission until it is ready, listing what is missing', async () => {
    const id = await create(cookies.forecaster)
    const { briefing } = await get(cookies.forecaster, id)
    const res = await act(cookies.forecaster, id, 'submit', { lockVersion: briefing.lockVersion })
    expect(res.status).toBe(422)
    const fields = res.body.data.problems.map((p: any) => p.field)
    expect(fields).toEqual(expect.arrayContaining(['recipients', 'narrative', 'nextUpdate']))
    expect(res.body.message).toMatch(/Choose who receives the briefing/)
  })

  it('keeps the number when wording is edited, marks the edit, and refuses a changed number', async () => {
    const id = await create(cookies.forecaster)
    const { briefing } = await get(cookies.forecaster, id)
    const s = briefing.statements[0]
    const wrong = Math.round(s.value * 100) === 42 ? 43 : 42
    const refused = await patch(cookies.forecaster, id, { lockVersion: briefing.lockVersion, statementEdits: [{ key: s.key, text: `About ${wrong} % chance of strong gusts on the pass.` }] })
    expect(refused.status).toBe(422)
    expect(refused.body.message).toMatch(new RegExp(`says ${wrong} %`))
    const ok = await patch(cookies.forecaster, id, { lockVersion: briefing.lockVersion, statementEdits: [{ key: s.key, text: 'Strong gusts over the pass are the main concern.' }] })
    expect(ok.status, JSON.stringify(ok.body)).toBe(200)
    const edited = ok.body.briefing.statements[0]
    expect(edited.text).toBe('Strong gusts over the pass are the main concern.')
    expect(edited.edited.byName).toBe('Mara Lindqvist')
    expect(edited.value).toBe(s.value)
    expect(edited.count).toBe(s.count)
  })

  it('answers a stale lockVersion with 409 and the reload message', async () => {
    const id = await create(cookies.forecaster)
    const { briefing } = await get(cookies.forecaster, id)
    expect((await patch(cookies.forecaster, id, { lockVersion: briefing.lockVersion, title: 'First change' })).status).toBe(200)
    const stale = await patch(cookies.forecaster, id, { lockVersion: briefing.lockVersion, title: 'Second change from an old copy' })
    expect(stale.status).toBe(409)
    expect(stale.body.message).toBe('Someone else changed this briefing a moment ago; reload to see their change.')
    expect((await get(cookies.forecaster, id)).briefing.title).toBe('First change')
  })
})

describe('review and approval', () => {
  it('returns with a comment, and the history shows it', async () => {
    const { id, view } = await submitted(cookies.forecaster)
    expect(view.briefing.status).toBe('awaiting_approval')
    expect(view.briefing.pdfSha256).toMatch(/^[0-9a-f]{64}$/)
    expect((await act(cookies.lead, id, 'return', { lockVersion: view.briefing.lockVersion })).status).toBe(400)
    const back = await act(cookies.lead, id, 'return', { lockVersion: view.briefing.lockVersion, comment: 'Say which road sections are affected.' })
    expect(back.status, JSON.stringify(back.body)).toBe(200)
    expect(back.body.briefing.status).toBe('draft')
    const returned = back.body.events.find((e: any) => e.action === 'returned')
    expect(returned).toMatchObject({ comment: 'Say which road sections are affected.', fromStatus: 'awaiting_approval', toStatus: 'draft', actorName: 'Tomas Okonkwo-Reyes' })
  })

  it('enforces four eyes: the author and anyone who edited this version cannot approve', async () => {
    const { id, view } = await submitted(cookies.lead)
    const hash = view.briefing.pdfSha256
    const own = await act(cookies.lead, id, 'approve', { lockVersion: view.briefing.lockVersion, pdfSha256: hash })
    expect(own.status).toBe(403)
    expect(own.body.message).toMatch(/four-eyes/)
    // Forecasters may not approve at all.
    expect((await act(cookies.forecaster, id, 'approve', { lockVersion: view.briefing.lockVersion, pdfSha256: hash })).status).toBe(403)
    // lead2 edits (taking it back to draft) and resubmits: now lead2 is an editor and may not approve either.
    const edited = await patch(cookies.lead2, id, { lockVersion: view.briefing.lockVersion, confidenceNote: 'Edited by the second lead.' })
    expect(edited.status).toBe(200)
    expect(edited.body.briefing.status).toBe('draft')
    const again = await act(cookies.lead2, id, 'submit', { lockVersion: edited.body.briefing.lockVersion })
    expect(again.status).toBe(200)
    const byEditor = await act(cookies.lead2, id, 'approve', { lockVersion: again.body.briefing.lockVersion, pdfSha256: again.body.briefing.pdfSha256 })
    expect(byEditor.status).toBe(403)
    expect(byEditor.body.message).toMatch(/edited this version/)
  })

  it('ties approval to the reviewed PDF hash and clears it when the briefing is edited afterwards', async () => {
    const { id, view } = await submitted(cookies.forecaster)
    const pdf = await pdfOf(cookies.lead, id)
    expect(pdf.status).toBe(200)
    expect(sha(pdf.bytes)).toBe(view.briefing.pdfSha256)
    expect(pdf.header).toBe(view.briefing.pdfSha256)
    const wrongHash = await act(cookies.lead, id, 'approve', { lockVersion: view.briefing.lockVersion, pdfSha256: 'f'.repeat(64) })
    expect(wrongHash.status).toBe(409)
    const ok = await act(cookies.lead, id, 'approve', { lockVersion: view.briefing.lockVersion, pdfSha256: sha(pdf.bytes) })
    expect(ok.status, JSON.stringify(ok.body)).toBe(200)
    expect(ok.body.briefing).toMatchObject({ status: 'approved', approvedPdfSha256: sha(pdf.bytes), approvedByName: 'Tomas Okonkwo-Reyes' })
    const edit = await patch(cookies.forecaster, id, { lockVersion: ok.body.briefing.lockVersion, title: 'Changed after approval' })
    expect(edit.status).toBe(200)
    expect(edit.body.briefing).toMatchObject({ status: 'draft', approvedAt: null, approvedPdfSha256: null })
    expect(edit.body.events.at(-1)).toMatchObject({ action: 'edited', fromStatus: 'approved', toStatus: 'draft' })
  })

  it('lets exactly one of two concurrent approvals win', async () => {
    const { id, view } = await submitted(cookies.forecaster)
    const body = { lockVersion: view.briefing.lockVersion, pdfSha256: view.briefing.pdfSha256 }
    const results = await Promise.all([act(cookies.lead, id, 'approve', body), act(cookies.lead2, id, 'approve', body)])
    expect(results.map((r) => r.status).sort()).toEqual([200, 409])
    expect(results.find((r) => r.status === 409)!.body.message).toMatch(/Someone else changed this briefing/)
    const { rows } = await db.query(`select count(*)::int as n from briefing_events where briefing_id = $1 and action = 'approved'`, [id])
    expect(rows[0].n).toBe(1)
  })

  it('an edit racing an approval leaves one consistent outcome', async () => {
    const { id, view } = await submitted(cookies.forecaster)
    const v = view.briefing.lockVersion
    const [edit, approve] = await Promise.all([
      patch(cookies.forecaster, id, { lockVersion: v, title: 'Racing edit' }),
      act(cookies.lead, id, 'approve', { lockVersion: v, pdfSha256: view.briefing.pdfSha256 }),
    ])
    expect([edit.status, approve.status].sort()).toEqual([200, 409])
    const { briefing } = await get(cookies.lead, id)
    if (approve.status === 200) expect(briefing).toMatchObject({ status: 'approved', approvedPdfSha256: view.briefing.pdfSha256 })
    else expect(briefing).toMatchObject({ status: 'draft', title: 'Racing edit', approvedAt: null })
  })
})

describe('issue, amend, withdraw', () => {
  it('issues, stays immutable, amends into a superseding version and withdraws with a reason', async () => {
    const { id, view } = await submitted(cookies.forecaster)
    const approved = await act(cookies.lead, id, 'approve', { lockVersion: view.briefing.lockVersion, pdfSha256: view.briefing.pdfSha256 })
    expect((await act(cookies.forecaster, id, 'issue', { lockVersion: approved.body.briefing.lockVersion })).status).toBe(403)
    const issued = await act(cookies.lead, id, 'issue', { lockVersion: approved.body.briefing.lockVersion })
    expect(issued.status, JSON.stringify(issued.body)).toBe(200)
    expect(issued.body.briefing.status).toBe('issued')
    const v1 = issued.body.briefing
    const edit = await patch(cookies.forecaster, id, { lockVersion: v1.lockVersion, title: 'Too late' })
    expect(edit.status).toBe(409)
    expect(edit.body.message).toMatch(/Amend it/)
    // The database refuses too, whatever the application does.
    await expect(db.query('update briefings set title = $1 where id = $2', ['Sneaky', id])).rejects.toThrow(/cannot be changed/)
    await expect(db.query('delete from briefings where id = $1', [id])).rejects.toThrow(/cannot be deleted/)

    const amended = await act(cookies.forecaster, id, 'amend', { lockVersion: v1.lockVersion })
    expect(amended.status, JSON.stringify(amended.body)).toBe(201)
    expect(amended.body.briefing.version).toBe(2)
    const twice = await act(cookies.forecaster, id, 'amend', { lockVersion: v1.lockVersion })
    expect(twice.status).toBe(409)
    const id2 = amended.body.briefing.id
    const draft2 = await get(cookies.forecaster, id2)
    expect(draft2.briefing).toMatchObject({ seriesId: v1.seriesId, version: 2, supersedesId: id, status: 'draft', approvedAt: null, issuedAt: null })
    const fixed = await patch(cookies.forecaster, id2, { lockVersion: draft2.briefing.lockVersion, narrative: { ...draft2.briefing.narrative, headline: 'Corrected: gusts easing by noon' } })
    const sub2 = await act(cookies.forecaster, id2, 'submit', { lockVersion: fixed.body.briefing.lockVersion })
    expect(sub2.status, JSON.stringify(sub2.body)).toBe(200)
    const app2 = await act(cookies.lead2, id2, 'approve', { lockVersion: sub2.body.briefing.lockVersion, pdfSha256: sub2.body.briefing.pdfSha256 })
    expect(app2.status).toBe(200)
    // Still issued until the amendment is issued.
    expect((await get(cookies.lead, id)).briefing.status).toBe('issued')
    const iss2 = await act(cookies.lead, id2, 'issue', { lockVersion: app2.body.briefing.lockVersion })
    expect(iss2.status).toBe(200)
    expect(iss2.body.versions.map((v: any) => [v.version, v.status])).toEqual([[1, 'superseded'], [2, 'issued']])
    const old = await get(cookies.lead, id)
    expect(old.briefing.status).toBe('superseded')
    expect(old.events.at(-1)).toMatchObject({ action: 'superseded' })

    expect((await act(cookies.lead, id2, 'withdraw', { lockVersion: iss2.body.briefing.lockVersion })).status).toBe(400)
    const gone = await act(cookies.lead, id2, 'withdraw', { lockVersion: iss2.body.briefing.lockVersion, reason: 'Issued for the wrong day.' })
    expect(gone.status).toBe(200)
    expect(gone.body.briefing).toMatchObject({ status: 'withdrawn', withdrawnReason: 'Issued for the wrong day.' })

    const { rows } = await db.query(`select action from audit_log where entity_type = 'briefing' and entity_id = $1 order by id`, [String(id)])
    expect(rows.map((r) => r.action)).toEqual(['briefing.create', 'briefing.edit', 'briefing.submit', 'briefing.approve', 'briefing.issue', 'briefing.supersede'])
    const { rows: rows2 } = await db.query(`select action from audit_log where entity_type = 'briefing' and entity_id = $1 order by id`, [String(id2)])
    expect(rows2.map((r) => r.action)).toEqual(['briefing.amend', 'briefing.edit', 'briefing.submit', 'briefing.approve', 'briefing.issue', 'briefing.withdraw'])
  })
})

describe('access', () => {
  it('keeps stakeholders out, lets admins read but not write', async () => {
    const id = await create(cookies.forecaster)
    const { briefing } = await get(cookies.forecaster, id)
    expect((await call('GET', `/api/briefings/${id}`, { cookie: cookies.stakeholder })).status).toBe(403)
    expect((await pdfOf(cookies.stakeholder, id)).status).toBe(403)
    expect((await call('GET', '/api/briefings', { cookie: cookies.stakeholder })).status).toBe(403)
    expect((await call('GET', `/api/briefings/${id}`, { cookie: cookies.admin })).status).toBe(200)
    expect((await patch(cookies.admin, id, { lockVersion: briefing.lockVersion, title: 'Admin edit' })).status).toBe(403)
    expect((await act(cookies.admin, id, 'submit', { lockVersion: briefing.lockVersion })).status).toBe(403)
  })

  it('keeps at least one standing caveat active in the library', async () => {
    const list = await call('GET', '/api/caveats', { cookie: cookies.lead })
    const standing = list.body.caveats.filter((c: any) => c.standing && c.active)
    expect(standing.length).toBe(1)
    const off = await call('PATCH', `/api/caveats/${standing[0].id}`, { cookie: cookies.lead, body: { active: false } })
    expect(off.status).toBe(409)
    expect((await call('DELETE', `/api/caveats/${standing[0].id}`, { cookie: cookies.admin })).status).toBe(409)
    expect((await call('POST', '/api/caveats', { cookie: cookies.forecaster, body: { title: 'x', text: 'y' } })).status).toBe(403)
    const made = await call('POST', '/api/caveats', { cookie: cookies.lead, body: { title: 'Test caveat', text: 'Only for a test.' } })
    expect(made.status).toBe(201)
    expect((await call('DELETE', `/api/caveats/${made.body.caveat.id}`, { cookie: cookies.lead })).status).toBe(204)
  })
})

describe('the PDF', () => {
  let dir: string
  let file: string
  let view: any
  beforeAll(async () => {
    const s = await submitted(cookies.forecaster)
    const approved = await act(cookies.lead, s.id, 'approve', { lockVersion: s.view.briefing.lockVersion, pdfSha256: s.view.briefing.pdfSha256 })
    const issued = await act(cookies.lead, s.id, 'issue', { lockVersion: approved.body.briefing.lockVersion })
    expect(issued.status).toBe(200)
    view = issued.body
    const pdf = await pdfOf(cookies.lead, s.id)
    expect(pdf.bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-')
    expect(sha(pdf.bytes)).toBe(view.briefing.pdfSha256)
    dir = mkdtempSync(join(tmpdir(), 'tessera-briefing-pdf-'))
    file = join(dir, 'briefing.pdf')
    writeFileSync(file, pdf.bytes)
    if (process.env.TESSERA_TEST_RESULTS) writeFileSync(join(process.env.TESSERA_TEST_RESULTS, 'briefing-issued.pdf'), pdf.bytes)
  })

  // Whitespace collapsed; pdftotext sometimes drops the narrow space before % ("0 %" → "0%").
  const text = () => execFileSync('pdftotext', [file, '-']).toString('utf8').replace(/\s+/g, ' ').replace(/ %/g, '%')

  it('carries the statements with their numbers, the times in UTC and local time, the caveats and the caution', () => {
    const t = text()
    const b = view.briefing
    expect(t).toContain(b.title)
    expect(t).toContain('Damaging gusts likely on Kaldor Pass this morning')
    for (const s of b.statements) {
      expect(t).toContain(formatPercent(s.value).replace(' %', '%'))
      if (s.count !== null) expect(t).toContain(s.count === 0 ? `none of ${s.scenarios} scenarios` : `${s.count} of ${s.scenarios} scenarios`)
    }
    expect(t).toContain(b.statements[0].areaName)
    // Validity in UTC and in the demo's invented local time (UTC−02:00).
    const start = new Date(b.windowStart)
    const hh = String(start.getUTCHours()).padStart(2, '0')
    expect(t).toContain(`${start.getUTCDate()} Nov 2031 ${hh}:00 UTC`)
    expect(t).toMatch(/Serevan Coast time, UTC−02:00/)
    expect(t).toContain('Standing caution')
    expect(t).toContain('they are not a physical forecast')
    expect(t).toContain('Near 0% is not impossible')
    expect(t).toContain('Likelihood scale used in this briefing')
    expect(t).toContain(`${run.members * run.samples} scenarios in all`)
    expect(t).toContain(`Tessera briefing ${b.seriesId} · version 1`)
    expect(t).toMatch(/Page 1 of \d/)
    expect(t).not.toMatch(/NOT ISSUED/)
  })

  it('embeds Atkinson Hyperlegible', () => {
    const fonts = execFileSync('pdffonts', [file]).toString('utf8').split('\n').slice(2).filter(Boolean)
    expect(fonts.length).toBeGreaterThanOrEqual(2)
    for (const line of fonts) {
      expect(line).toMatch(/AtkinsonHyperlegible/)
      // Columns: name type encoding emb sub uni object ID — "emb" must be yes.
      expect(line).toMatch(/\byes\s+yes\s+yes\b/)
    }
  })

  it('draws a map that is not blank', () => {
    const pages = Number(/Pages:\s+(\d+)/.exec(execFileSync('pdfinfo', [file]).toString('utf8'))![1])
    let mapPage = 0
    for (let p = 1; p <= pages && !mapPage; p++) {
      if (execFileSync('pdftotext', ['-f', String(p), '-l', String(p), file, '-']).toString('utf8').includes('Figure 1.')) mapPage = p
    }
    expect(mapPage).toBeGreaterThan(0)
    execFileSync('pdftoppm', ['-png', '-r', '60', '-f', String(mapPage), '-l', String(mapPage), file, join(dir, 'page')])
    const png = PNG.sync.read(readFileSync(join(dir, readdirSync(dir).find((f) => f.startsWith('page') && f.endsWith('.png'))!)))
    // Saturated pixels (the probability colours) — text and rules are ink and grey, so these come from the map.
    let coloured = 0
    for (let k = 0; k < png.width * png.height; k++) {
      const [r, g, b] = [png.data[4 * k]!, png.data[4 * k + 1]!, png.data[4 * k + 2]!]
      const max = Math.max(r, g, b), min = Math.min(r, g, b)
      if (max > 0 && (max - min) / max > 0.25) coloured++
    }
    expect(coloured / (png.width * png.height)).toBeGreaterThan(0.01)
  })
})
