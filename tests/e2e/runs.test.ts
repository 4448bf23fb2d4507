// Forecast runs end to end in Chromium: upload, preview, confirm, downscale with a real worker
// process, live progress to 100 %, the parameter table and a profile-likelihood plot.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Browser, Page } from 'playwright-core'
import { BASE_URL, demoAccount } from '../support/http'
import { launchBrowser, screenshot, signInThroughForm } from '../support/browser'
import { makeEnsembleJson } from '../support/ensembleJson'
import { startWorker, type WorkerProcess } from '../support/worker'
import { estimateSampleBytes } from '../../shared/schemas/runs'

let browser: Browser
let worker: WorkerProcess
let dir: string
beforeAll(async () => {
  browser = await launchBrowser()
  worker = startWorker()
  dir = mkdtempSync(join(tmpdir(), 'tessera-e2e-runs-'))
})
afterAll(async () => {
  await worker?.kill()
  await browser?.close()
  if (dir) rmSync(dir, { recursive: true, force: true })
})

/** A seed no other test uses, so the file's checksum is new and confirming it is not refused as a duplicate. */
const uniqueSeed = () => 1_000_000 + ((Date.now() * 7 + process.pid) % 1_000_000_000)

async function openRunsAs(page: Page, role: 'forecaster' | 'duty_lead') {
  await signInThroughForm(page, demoAccount(role).email)
  await page.waitForURL(`${BASE_URL}/`)
  await page.goto(`${BASE_URL}/runs`)
  await page.getByTestId('page-title').waitFor()
}

describe('forecast runs', () => {
  it('a forecaster uploads a run, confirms the preview, downscales it and reads the fitted parameters', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } })
    const errors: string[] = []
    page.on('pageerror', (e) => errors.push(e.message))
    await openRunsAs(page, 'forecaster')

    const seed = uniqueSeed()
    const file = join(dir, `gusts-${seed}.json`)
    writeFileSync(file, makeEnsembleJson({ nx: 8, ny: 6, members: 3, leads: 2, seed }))
    // The input is enabled once the page is interactive (nothing chosen earlier is lost).
    await page.waitForSelector('[data-testid="runs-upload-input"]:not([disabled])')
    await page.getByTestId('runs-upload-input').setInputFiles(file)

    const preview = page.getByTestId('runs-preview')
    await preview.waitFor()
    const text = (await preview.textContent()) ?? ''
    // What makeEnsembleJson writes: gusts in m s-1, 3 members, 6 and 12 UTC on 14 Nov 2031, 8×6 cells.
    expect(text).toContain('wind_speed_of_gust')
    expect(text).toContain('m s-1, shown as m/s')
    expect(text).toMatch(/Members\s*3/)
    expect(text).toContain('2031-11-14T06:00:00Z')
    expect(text).toContain('2031-11-14T12:00:00Z')
    expect(text).toContain('T+6 h')
    expect(text).toContain('8 × 6 cells')
    expect(await preview.getByTestId('runs-extent-map').locator('svg path').count()).toBeGreaterThan(0)

    const name = `E2E gusts ${seed}`
    await page.getByTestId('runs-confirm-name').fill(name)
    await page.getByTestId('runs-confirm').click()
    await page.waitForURL(/\/runs\/\d+$/)
    // The URL changes before the run page has rendered; its heading is the run's name.
    await page.getByRole('heading', { level: 1, name }).waitFor()
    await expect(page.getByTestId('run-status').getAttribute('data-status')).resolves.toBe('ready')

    await page.waitForSelector('[data-testid="downscale-factor"]:not([disabled])')
    await page.getByTestId('downscale-factor').fill('4')
    await page.getByTestId('downscale-samples').fill('3')
    await page.getByTestId('downscale-kernel').selectOption('matern32')
    await page.getByTestId('downscale-seed').fill('7')
    await expect(page.getByTestId('downscale-fine-spacing').textContent()).resolves.toContain('32 × 24 cells')
    // 3 members × 2 lead times × 3 samples × 32 × 24 fine cells × 2 bytes = 27 648 bytes.
    expect(estimateSampleBytes(3, 2, 3, 8, 6, 4)).toBe(27_648)
    await expect(page.getByTestId('downscale-storage').textContent()).resolves.toContain('27.6 kB')
    await page.getByTestId('downscale-start').click()

    const progress = page.getByTestId('run-progress')
    await progress.waitFor()
    await page.waitForFunction(
      () => document.querySelector('[data-testid="run-progress"]')?.getAttribute('aria-valuenow') === '100',
      null, { timeout: 100_000, polling: 500 },
    )
    await page.waitForFunction(
      () => document.querySelector('[data-testid="run-status"]')?.getAttribute('data-status') === 'completed',
      null, { timeout: 20_000 },
    )
    await expect(progress.getAttribute('aria-valuenow')).resolves.toBe('100')

    const rows = page.getByTestId('fit-table').getByTestId('fit-row')
    await expect(rows.count()).resolves.toBe(6)
    const pairs = new Set<string>()
    for (let k = 0; k < 6; k++) {
      const row = rows.nth(k)
      pairs.add(`${await row.getAttribute('data-lead')}/${await row.getAttribute('data-member')}`)
      await expect(row.textContent()).resolves.toContain('Matérn 3/2')
      await expect(row.textContent()).resolves.toMatch(/\d km/)
    }
    expect(pairs.size).toBe(6)

    await page.getByTestId('fit-sort-lengthScale').click()
    await expect(page.locator('th[aria-sort="ascending"]').textContent()).resolves.toContain('ℓ')
    await page.getByTestId('fit-lead-filter').selectOption('1')
    await expect(rows.count()).resolves.toBe(3)
    await page.getByTestId('fit-lead-filter').selectOption('all')

    await rows.nth(0).getByTestId('fit-show-profile').click()
    const plot = page.getByTestId('profile-plot')
    await plot.waitFor()
    expect(((await plot.locator('svg path').first().getAttribute('d')) ?? '').length).toBeGreaterThan(10)
    await expect(page.getByTestId('profile-caption').textContent()).resolves.toMatch(/~95 % interval/)
    await page.getByTestId('profile-table-toggle').click()
    expect(await page.getByTestId('profile-table').locator('tbody tr').count()).toBeGreaterThan(3)

    const shot = await screenshot(page, 'runs-downscaled')
    expect(statSync(shot).size).toBeGreaterThan(20_000)
    expect(errors).toEqual([])
    await page.close()
  })

  it('a file that is not an ensemble is refused with the reason, and nothing is listed', async () => {
    const page = await browser.newPage()
    await openRunsAs(page, 'forecaster')
    const file = join(dir, 'shift-notes.txt')
    writeFileSync(file, 'Shift notes: nothing to report.\n')
    await page.waitForSelector('[data-testid="runs-upload-input"]:not([disabled])')
    await page.getByTestId('runs-upload-input').setInputFiles(file)
    const alert = page.getByTestId('runs-upload-error')
    await alert.waitFor()
    await expect(alert.getByRole('alert').count()).resolves.toBe(1)
    expect(((await alert.textContent()) ?? '').length).toBeGreaterThan(20)
    expect(await page.getByTestId('runs-preview').count()).toBe(0)
    await page.close()
  })

  it('a duty lead sees the runs but is not offered an upload', async () => {
    const page = await browser.newPage()
    await openRunsAs(page, 'duty_lead')
    expect(await page.getByTestId('runs-table').count()).toBe(1)
    expect(await page.getByTestId('runs-upload-input').count()).toBe(0)
    await page.close()
  })
})
