// Method check in Chromium: run a check on an invented demo truth field from the page, watch it
// finish (a real worker process), and see the report's plots; then compare two reports side by side.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { statSync } from 'node:fs'
import type { Browser } from 'playwright-core'
import { BASE_URL, call, demoAccount, signInAs } from '../support/http'
import { launchBrowser, screenshot, signInThroughForm } from '../support/browser'
import { startWorker, waitFor, type WorkerProcess } from '../support/worker'

let browser: Browser
let worker: WorkerProcess
beforeAll(async () => {
  browser = await launchBrowser()
  worker = startWorker()
})
afterAll(async () => {
  await browser?.close()
  await worker?.kill()
})

describe('method check', () => {
  it('a forecaster runs a check on a demo truth field and reads the plots', async () => {
    const page = await browser.newPage({ viewport: { width: 1366, height: 900 } })
    const errors: string[] = []
    page.on('pageerror', (e) => errors.push(e.message))
    await signInThroughForm(page, demoAccount('forecaster').email)
    await page.waitForURL(`${BASE_URL}/`)
    await page.goto(`${BASE_URL}/method-check`)
    await expect(page.getByTestId('page-title').textContent()).resolves.toBe('Method check')
    const addDemo = page.getByTestId('mc-add-demo')
    if (await addDemo.count()) {
      await addDemo.click()
      await page.getByTestId('mc-form').waitFor()
    }
    await expect(page.getByTestId('mc-truths').textContent()).resolves.toMatch(/Synthetic Matérn-3\/2 field/)
    const option = page.getByTestId('mc-truth').locator('option', { hasText: 'Synthetic Matérn-3/2' })
    await page.getByTestId('mc-truth').selectOption(await option.getAttribute('value') as string)
    await page.getByTestId('mc-factor').selectOption('8')
    await page.getByTestId('mc-samples').fill('12')
    await screenshot(page, 'method-check-form')
    await page.getByTestId('mc-start').click()
    await page.waitForURL(/\/method-check\/\d+$/)
    // Live progress while the worker computes, then the report.
    await page.getByTestId('mc-summary').waitFor({ timeout: 120_000 })
    await expect(page.getByTestId('mc-summary').textContent()).resolves.toMatch(/On MSE the posterior mean is best|beats the posterior mean on MSE/)
    await expect(page.getByTestId('mc-summary').textContent()).resolves.toMatch(/fair CRPS/)
    for (const id of ['mc-psd', 'mc-psd-ratio', 'mc-fss-0', 'mc-rank', 'mc-reliability-0']) {
      const chart = page.getByTestId(id)
      await chart.scrollIntoViewIfNeeded()
      // Each chart draws real lines or bars, not an empty frame.
      expect(await chart.locator('svg path[d^="M"], svg rect').count(), id).toBeGreaterThan(3)
    }
    // The legend switches a series on and off.
    const toggle = page.getByTestId('mc-psd-legend-bicubic')
    await expect(toggle.getAttribute('aria-pressed')).resolves.toBe('false')
    await toggle.click()
    await expect(toggle.getAttribute('aria-pressed')).resolves.toBe('true')
    await expect(page.getByTestId('score-row-mean').textContent()).resolves.toMatch(/Posterior mean/)
    const file = await screenshot(page, 'method-check-report')
    expect(statSync(file).size).toBeGreaterThan(50_000)
    await page.emulateMedia({ media: 'print' })
    await screenshot(page, 'method-check-report-print')
    await page.emulateMedia({ media: 'screen' })
    expect(errors).toEqual([])
    await page.close()
  })

  it('two reports side by side', async () => {
    const cookie = await signInAs('forecaster')
    const truths = (await call('GET', '/api/method-checks/truths', { cookie })).body.truths
    const gust = truths.find((t: { demoKey: string | null }) => t.demoKey === 'serevan-gust-front')
    const ids: number[] = []
    for (const factor of [4, 8]) {
      const res = await call('POST', '/api/method-checks', { cookie, body: { truthId: gust.id, factor, samples: 8 } })
      expect(res.status, JSON.stringify(res.body)).toBe(201)
      ids.push(res.body.check.id)
    }
    await waitFor('both checks done', async () => {
      const list = (await call('GET', '/api/method-checks', { cookie })).body.checks
      return ids.every((id) => list.find((c: { id: number; status: string }) => c.id === id)?.status === 'completed')
    }, 180_000, 500)
    const page = await browser.newPage({ viewport: { width: 1600, height: 900 } })
    await signInThroughForm(page, demoAccount('forecaster').email)
    await page.waitForURL(`${BASE_URL}/`)
    await page.goto(`${BASE_URL}/method-check`)
    await page.getByTestId(`mc-pick-${ids[0]}`).check()
    await page.getByTestId(`mc-pick-${ids[1]}`).check()
    await page.getByTestId('mc-compare').click()
    await page.waitForURL(/\/method-check\/compare\?a=\d+&b=\d+/)
    await page.getByTestId('mc-compare-table').waitFor()
    expect(await page.getByTestId('mc-compare-table').locator('tbody tr').count()).toBeGreaterThan(8)
    await page.getByTestId('mc0-summary').waitFor()
    await page.getByTestId('mc1-summary').waitFor()
    await screenshot(page, 'method-check-compare')
    await page.close()
  })
})
