// End-to-end in Chromium: an approved briefing from the demo run (prepared through the API: a
// forecaster writes it for the Serevan Regional Roads list, a duty lead approves its PDF) is
// issued by the duty lead in the browser; a real worker e-mails it to the SMTP stand-in; the
// demo stakeholder signs in and finds it in the portal; the admin's mail log shows the message
// with its PDF, byte for byte the stored one.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createHash } from 'node:crypto'
import pg from 'pg'
import type { Browser, Page } from 'playwright-core'
import { BASE_URL, call, demoAccount, signInAs } from '../support/http'
import { launchBrowser, screenshot, signInThroughForm } from '../support/browser'
import { startWorker, waitFor, type WorkerProcess } from '../support/worker'

let browser: Browser
let worker: WorkerProcess
const db = new pg.Client({ connectionString: process.env.DATABASE_URL })
let briefingId = 0
let title = ''

/** A briefing from the demo gust run, written by the forecaster and approved by the duty lead. */
async function approvedDemoBriefing(): Promise<number> {
  const { rows: [run] } = await db.query(`select id, lead_times from runs where is_demo and standard_name = 'wind_speed_of_gust' and status = 'completed' order by id limit 1`)
  const { rows: [area] } = await db.query(`insert into areas (name, tags, kind, geometry) values ($1, '{e2e}', 'rectangle',
    ST_Multi(ST_SetSRID(ST_GeomFromGeoJSON($2), 4326))) returning id`, [`Kaldor Pass road ${Date.now()}`,
    JSON.stringify({ type: 'Polygon', coordinates: [[[-24.1, -45.0], [-23.3, -45.0], [-23.3, -44.4], [-24.1, -44.4], [-24.1, -45.0]]] })])
  const forecaster = await signInAs('forecaster')
  title = `Gusts on the Kaldor Pass road ${Date.now().toString(36)}`
  const created = await call('POST', '/api/briefings', { cookie: forecaster, body: {
    runId: run.id, title,
    selection: { leadFrom: 0, leadTo: run.lead_times.length - 1, areaIds: [area.id], thresholds: [{ hazard: 'gust', label: 'Strong gusts', value: 20, direction: 'above' }], kinds: ['anywhere'] },
  } })
  expect(created.status, JSON.stringify(created.body)).toBe(201)
  const id = created.body.briefing.id as number
  const edited = await call('PATCH', `/api/briefings/${id}`, { cookie: forecaster, body: {
    lockVersion: created.body.briefing.lockVersion,
    narrative: { headline: 'Strong gusts likely on the pass road', summary: 'Plan for gusts on the exposed sections.', details: '' },
    nextUpdateAt: '2031-11-14T18:00:00Z', recipientKeys: ['demo-serevan-regional-roads'],
  } })
  expect(edited.status, JSON.stringify(edited.body)).toBe(200)
  const submitted = await call('POST', `/api/briefings/${id}/submit`, { cookie: forecaster, body: { lockVersion: edited.body.briefing.lockVersion } })
  expect(submitted.status, JSON.stringify(submitted.body)).toBe(200)
  const lead = await signInAs('duty_lead')
  const pdf = await fetch(`${BASE_URL}/api/briefings/${id}/pdf`, { headers: { cookie: lead } })
  const approved = await call('POST', `/api/briefings/${id}/approve`, { cookie: lead, body: { lockVersion: submitted.body.briefing.lockVersion, pdfSha256: pdf.headers.get('x-tessera-pdf-sha256') } })
  expect(approved.status, JSON.stringify(approved.body)).toBe(200)
  return id
}

async function signedIn(role: 'duty_lead' | 'stakeholder' | 'admin'): Promise<Page> {
  const context = await browser.newContext({ viewport: { width: 1280, height: 900 }, acceptDownloads: true })
  const page = await context.newPage()
  await signInThroughForm(page, demoAccount(role).email)
  await page.waitForURL(`${BASE_URL}/`)
  return page
}

beforeAll(async () => {
  browser = await launchBrowser()
  await db.connect()
  briefingId = await approvedDemoBriefing()
  worker = startWorker({ TESSERA_MAIL_SWEEP_SECONDS: '1' })
}, 300_000)
afterAll(async () => {
  await worker?.kill('SIGTERM')
  await browser?.close()
  await db.end()
})

describe('an issued briefing reaches the stakeholder', () => {
  it('is issued by the duty lead, e-mailed, found in the portal and shown in the mail log', async () => {
    const errors: string[] = []
    const lead = await signedIn('duty_lead')
    lead.on('pageerror', (e) => errors.push(e.message))
    await lead.goto(`${BASE_URL}/briefings/${briefingId}`)
    await lead.getByTestId('briefing-issue').click()
    await lead.locator('dialog[open] [data-testid="confirm-ok"]').click()
    await lead.getByTestId('briefing-status-issued').first().waitFor({ timeout: 60_000 })
    // Delivery per recipient on the briefing page, until the worker has sent it.
    await lead.getByTestId('deliveries').waitFor()
    await waitFor('delivered', async () => {
      await lead.reload()
      return (await lead.getByTestId('delivery-sent').count()) >= 1
    }, 90_000, 2000)
    await screenshot(lead, 'distribution-issued')

    const { rows: [stored] } = await db.query('select pdf_sha256 from briefings where id = $1', [briefingId])

    // The stakeholder (Serevan Regional Roads) finds it in the portal.
    const stakeholder = await signedIn('stakeholder')
    stakeholder.on('pageerror', (e) => errors.push(e.message))
    await stakeholder.getByRole('link', { name: 'My briefings' }).first().click()
    await stakeholder.getByTestId(`portal-item-${briefingId}`).waitFor()
    await stakeholder.getByTestId(`portal-open-${briefingId}`).click()
    await stakeholder.getByTestId('portal-briefing').waitFor()
    await expect(stakeholder.getByTestId('page-title').textContent()).resolves.toBe(title)
    await expect(stakeholder.getByTestId('portal-statements').first().textContent()).resolves.toMatch(/\d+ of \d+ scenarios/)
    const portalPdf = await stakeholder.request.get(`${BASE_URL}/api/portal/briefings/${briefingId}/pdf`)
    expect(createHash('sha256').update(await portalPdf.body()).digest('hex')).toBe(stored.pdf_sha256)
    await screenshot(stakeholder, 'distribution-portal')

    // The admin's mail log: the message to the stakeholder, with the PDF attached.
    const admin = await signedIn('admin')
    admin.on('pageerror', (e) => errors.push(e.message))
    await admin.goto(`${BASE_URL}/admin/mail`)
    const row = admin.getByTestId('mail-received').locator('tr', { hasText: 'stakeholder@tessera.example' }).filter({ hasText: 'Serevan Regional Roads:' }).first()
    await row.waitFor({ timeout: 30_000 })
    const link = row.locator('a[href*="/attachments/0"]')
    await expect(link.textContent()).resolves.toMatch(/\.pdf$/)
    const [download] = await Promise.all([admin.waitForEvent('download'), link.click()])
    const bytes = await import('node:fs/promises').then((fs) => download.path().then((p) => fs.readFile(p!)))
    expect(createHash('sha256').update(bytes).digest('hex')).toBe(stored.pdf_sha256)
    await row.getByRole('button', { name: 'Read' }).click()
    await expect(admin.getByTestId('mail-text').textContent()).resolves.toContain('Read it in your portal')
    await screenshot(admin, 'distribution-mail-log')
    expect(errors).toEqual([])
  })

  it('lets staff find it in the archive and export it as CAP', async () => {
    const lead = await signedIn('duty_lead')
    await lead.goto(`${BASE_URL}/archive`)
    await lead.getByTestId('archive-q').fill('Kaldor Pass road gusts')
    await lead.getByTestId('archive-search').click()
    await lead.waitForURL(/[?&]q=/)
    // The words are marked in the snippet once the search (not the first, unfiltered list) has answered.
    await lead.getByTestId(`archive-hit-${briefingId}`).locator('mark').first().waitFor({ timeout: 30_000 })
    await expect(lead.getByTestId(`archive-hit-${briefingId}`).locator('mark').allTextContents()).resolves.toEqual(expect.arrayContaining([expect.stringMatching(/kaldor|pass|road|gust/i)]))
    const cap = await lead.request.get(`${BASE_URL}/api/briefings/${briefingId}/export/cap`)
    expect(await cap.text()).toContain('<scope>Restricted</scope>')
    await screenshot(lead, 'distribution-archive')
  })
})
