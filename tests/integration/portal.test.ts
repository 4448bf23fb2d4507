// The stakeholder portal against the running server: a stakeholder sees exactly the briefing
// versions sent to their lists (with the PDF and the versions of the series), nothing else.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createHash } from 'node:crypto'
import { eq } from 'drizzle-orm'
import { useDB, closeDB, tables } from '../../server/utils/db'
import { call, signInAs, demoAccount, BASE_URL } from '../support/http'
import { makeBriefing, makeOrganisationWithList, statementFor } from './distribution/records'

const db = useDB()
let cookie = ''
let staffCookie = ''
const b: Record<string, Awaited<ReturnType<typeof makeBriefing>>> = {}

beforeAll(async () => {
  cookie = await signInAs('stakeholder')
  staffCookie = await signInAs('forecaster')
  // The demo stakeholder is a contact on the Serevan Regional Roads list (seeded).
  const [user] = await db.select().from(tables.users).where(eq(tables.users.email, demoAccount('stakeholder').email))
  const [roads] = await db.select().from(tables.distributionLists).where(eq(tables.distributionLists.key, 'demo-serevan-regional-roads'))
  const mine = [{ key: roads!.key, name: roads!.name }]
  const other = (await makeOrganisationWithList({ contacts: [{ name: 'Someone Else', email: 'someone@elsewhere.example' }] })).list
  b.v1 = await makeBriefing({ title: 'Portal test: pass gusts', listKeys: mine, issuedAt: new Date('2031-11-14T09:30:00Z'), statements: [statementFor(1, 'Kaldor Pass', 0.7, 'about 70 % that gusts reach 20 m/s')] })
  await db.update(tables.briefings).set({ status: 'superseded' }).where(eq(tables.briefings.id, b.v1.id))
  b.v2 = await makeBriefing({ title: 'Portal test: pass gusts (amended)', seriesId: b.v1.seriesId, version: 2, supersedesId: b.v1.id, listKeys: mine, issuedAt: new Date('2031-11-14T11:00:00Z') })
  b.otherList = await makeBriefing({ title: 'Portal test: not for the roads', listKeys: [{ key: other.key, name: other.name }] })
  b.notIssued = await makeBriefing({ title: 'Portal test: approved only', status: 'approved', listKeys: mine })
  expect(user).toBeTruthy()
}, 60_000)

afterAll(async () => { await closeDB() })

describe('stakeholder portal', () => {
  it('lists only what was sent to the stakeholder\'s lists, one entry per series, newest version', async () => {
    const res = await call('GET', '/api/portal/briefings', { cookie })
    expect(res.status).toBe(200)
    const ids = res.body.briefings.map((x: { id: number }) => x.id)
    expect(ids).toContain(b.v2!.id)
    expect(ids).not.toContain(b.v1!.id)
    expect(ids).not.toContain(b.otherList!.id)
    expect(ids).not.toContain(b.notIssued!.id)
    expect(res.body.briefings.find((x: { id: number }) => x.id === b.v2!.id).versions).toBe(2)
    expect(res.body.subscriptions).toContainEqual({ list: 'Serevan Regional Roads', organisation: 'Serevan Regional Roads' })
    const times = res.body.briefings.map((x: { issuedAt: string }) => Date.parse(x.issuedAt))
    expect([...times].sort((p: number, q: number) => q - p)).toEqual(times)
  })

  it('shows a version with its statements and the amendment history', async () => {
    const res = await call('GET', `/api/portal/briefings/${b.v1!.id}`, { cookie })
    expect(res.status).toBe(200)
    expect(res.body.briefing.status).toBe('superseded')
    expect(res.body.briefing.statements[0].text).toBe('about 70 % that gusts reach 20 m/s')
    expect(res.body.briefing.versions.map((v: { version: number }) => v.version)).toEqual([2, 1])
    expect(res.body.briefing.newerVersion.id).toBe(b.v2!.id)
    expect(JSON.stringify(res.body)).not.toMatch(/editorIds|authorId|approvedById/)
  })

  it('serves the issued PDF byte for byte', async () => {
    const res = await fetch(`${BASE_URL}/api/portal/briefings/${b.v2!.id}/pdf`, { headers: { cookie } })
    expect(res.status).toBe(200)
    const bytes = Buffer.from(await res.arrayBuffer())
    expect(createHash('sha256').update(bytes).digest('hex')).toBe(b.v2!.pdfSha256)
  })

  it('answers 404 for anything not sent to them', async () => {
    for (const id of [b.otherList!.id, b.notIssued!.id]) {
      expect((await call('GET', `/api/portal/briefings/${id}`, { cookie })).status).toBe(404)
      expect((await call('GET', `/api/portal/briefings/${id}/pdf`, { cookie })).status).toBe(404)
    }
  })

  it('keeps the rest of the system closed to stakeholders', async () => {
    for (const path of ['/api/archive/search?q=gusts', `/api/briefings/${b.v2!.id}/export/cap`, '/api/distribution-lists', '/api/mail/received', '/api/runs', '/api/areas']) {
      expect((await call('GET', path, { cookie })).status, path).toBe(403)
    }
    // …and the portal's routes to staff.
    expect((await call('GET', '/api/portal/briefings', { cookie: staffCookie })).status).toBe(403)
  })

  it('exports issued versions as CAP, GeoJSON and CSV for staff, and refuses unissued ones', async () => {
    const capRes = await fetch(`${BASE_URL}/api/briefings/${b.v2!.id}/export/cap`, { headers: { cookie: staffCookie } })
    expect(capRes.status).toBe(200)
    expect(await capRes.text()).toContain('<alert xmlns="urn:oasis:names:tc:emergency:cap:1.2">')
    const geo = await fetch(`${BASE_URL}/api/briefings/${b.v2!.id}/export/geojson`, { headers: { cookie: staffCookie } })
    expect(geo.headers.get('content-type')).toMatch(/application\/geo\+json/)
    expect((await geo.json()).type).toBe('FeatureCollection')
    const csv = await fetch(`${BASE_URL}/api/briefings/${b.v1!.id}/export/csv`, { headers: { cookie: staffCookie } })
    expect((await csv.text()).split('\r\n')[1]).toContain('about 70 % that gusts reach 20 m/s')
    expect((await call('GET', `/api/briefings/${b.notIssued!.id}/export/cap`, { cookie: staffCookie })).status).toBe(409)
  })
})
