// End-to-end in Chromium: a forecaster builds a briefing from the demo run and submits it; a duty
// lead returns it with a comment; the forecaster fixes and resubmits; the lead approves the PDF
// (by its fingerprint) and downloads it.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { readFileSync } from 'node:fs'
import pg from 'pg'
import type { Browser, Page } from 'playwright-core'
import { BASE_URL, demoAccount } from '../support/http'
import { launchBrowser, screenshot, signInThroughForm } from '../support/browser'

let browser: Browser
const db = new pg.Client({ connectionString: process.env.DATABASE_URL })
let runId: number
let areaId: number
let thresholdId: number

beforeAll(async () => {
  browser = await launchBrowser()
  await db.connect()
  const { rows: [run] } = await db.query(`select id from runs where is_demo and standard_name = 'wind_speed_of_gust' and status = 'completed' order by id limit 1`)
  runId = run.id
  const { rows: [t] } = await db.query(`select id from hazard_thresholds where hazard = 'gust' and value = 20 and direction = 'above'`)
  thresholdId = t.id
  const { rows: [a] } = await db.query(`insert into areas (name, tags, kind, geometry) values ($1, '{e2e}', 'rectangle',
    ST_Multi(ST_SetSRID(ST_GeomFromGeoJSON($2), 4326))) returning id`, [`E2E pass area ${Date.now()}`,
    JSON.stringify({ type: 'Polygon', coordinates: [[[-24.1, -45.0], [-23.3, -45.0], [-23.3, -44.4], [-24.1, -44.4], [-24.1, -45.0]]] })])
  areaId = a.id
})
afterAll(async () => {
  await browser?.close()
  await db.end()
})

async function signedIn(role: 'forecaster' | 'duty_lead'): Promise<Page> {
  const context = await browser.newContext({ viewport: { width: 1280, height: 900 }, acceptDownloads: true })
  const page = await context.newPage()
  await signInThroughForm(page, demoAccount(role).email)
  await page.waitForURL(`${BASE_URL}/`)
  return page
}

const saved = (page: Page) => page.locator('[data-testid="briefing-save-state"][data-state="saved"]').waitFor({ timeout: 30_000 })
const status = (page: Page, s: string) => page.getByTestId(`briefing-status-${s}`).first().waitFor({ timeout: 30_000 })
const confirm = (page: Page) => page.locator('dialog[open] [data-testid="confirm-ok"]').click()

describe('briefing from the demo run to approval', () => {
  it('is built, returned, fixed, resubmitted, approved and downloaded', async () => {
    const errors: string[] = []
    const forecaster = await signedIn('forecaster')
    forecaster.on('pageerror', (e) => errors.push(e.message))

    // Build from the demo gust run.
    await forecaster.goto(`${BASE_URL}/briefings`)
    await forecaster.getByTestId('briefing-new').click()
    await forecaster.getByTestId(`briefing-run-${runId}`).check()
    await forecaster.getByTestId('briefing-create').click()
    await forecaster.waitForURL(/\/briefings\/\d+$/)
    const url = forecaster.url()
    await forecaster.getByTestId(`briefing-area-${areaId}`).check()
    await forecaster.getByTestId(`briefing-threshold-${thresholdId}`).check()
    await forecaster.locator('[data-testid="briefing-statements"] li').first().waitFor({ timeout: 30_000 })
    await expect(forecaster.locator('[data-testid="briefing-statements"]').textContent()).resolves.toMatch(/\d+ of \d+ scenarios/)
    await forecaster.getByTestId('briefing-headline').fill('Strong gusts on the pass this morning')
    await forecaster.getByTestId('briefing-next-update').fill('2031-11-14T18:00')
    await forecaster.getByTestId('briefing-recipient-duty-team').check()
    await saved(forecaster)
    await forecaster.getByTestId('briefing-pdf-hash').waitFor({ timeout: 30_000 })
    await screenshot(forecaster, 'briefing-builder')
    await forecaster.getByTestId('briefing-submit').click()
    await status(forecaster, 'awaiting_approval')

    // The duty lead reviews and returns it.
    const lead = await signedIn('duty_lead')
    lead.on('pageerror', (e) => errors.push(e.message))
    await lead.goto(`${BASE_URL}/briefings`)
    await lead.getByTestId('briefing-queue').locator(`a[href="${new URL(url).pathname}"]`).waitFor()
    await lead.goto(url)
    await expect(lead.getByTestId('briefing-pdf-hash').textContent({ timeout: 30_000 })).resolves.toMatch(/^[0-9a-f]{64}$/)
    await lead.getByTestId('briefing-return').click()
    await lead.getByTestId('briefing-return-comment').fill('Name the road sections in the headline.')
    await confirm(lead)
    await status(lead, 'draft')
    await screenshot(lead, 'briefing-returned-by-lead')

    // The forecaster sees the comment, fixes the headline and resubmits.
    await forecaster.reload()
    await expect(forecaster.getByTestId('briefing-returned').textContent()).resolves.toContain('Name the road sections in the headline.')
    await forecaster.getByTestId('briefing-headline').fill('Strong gusts on the pass road between the two hairpins this morning')
    await saved(forecaster)
    await forecaster.getByTestId('briefing-submit').click()
    await status(forecaster, 'awaiting_approval')

    // The lead approves exactly the PDF shown, then downloads it.
    await lead.reload()
    const hash = (await lead.getByTestId('briefing-pdf-hash').textContent({ timeout: 30_000 }))!.trim()
    expect(hash).toMatch(/^[0-9a-f]{64}$/)
    await lead.getByTestId('briefing-approve').click()
    await confirm(lead)
    await status(lead, 'approved')
    await expect(lead.getByTestId('briefing-facts').textContent()).resolves.toContain(`PDF ${hash.slice(0, 8)}`)
    await expect(lead.getByTestId('history-returned').textContent()).resolves.toContain('Name the road sections')
    await screenshot(lead, 'briefing-approved')
    const [download] = await Promise.all([lead.waitForEvent('download'), lead.getByTestId('briefing-pdf-download').click()])
    const bytes = readFileSync((await download.path())!)
    expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-')
    expect(errors).toEqual([])
  })
})
