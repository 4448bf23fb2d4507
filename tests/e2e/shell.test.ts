// End-to-end in Debian's Chromium against the built app (scripts/test.mjs builds and serves it).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { statSync } from 'node:fs'
import type { Browser } from 'playwright-core'
import { BASE_URL, demoAccount } from '../support/http'
import { launchBrowser, screenshot, signInThroughForm } from '../support/browser'

let browser: Browser
beforeAll(async () => { browser = await launchBrowser() })
afterAll(async () => { await browser?.close() })

describe('app shell', () => {
  it('the demo forecaster signs in and sees the forecaster home', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 860 } })
    const errors: string[] = []
    page.on('pageerror', (e) => errors.push(e.message))
    await signInThroughForm(page, demoAccount('forecaster').email)
    await page.waitForURL(`${BASE_URL}/`)
    await expect(page.getByTestId('home-greeting').textContent()).resolves.toMatch(/Mara/)
    const nav = page.getByTestId('nav')
    await expect(nav.getByRole('link', { name: 'Forecast runs' }).count()).resolves.toBe(1)
    await expect(nav.getByRole('link', { name: 'People' }).count()).resolves.toBe(0)
    const file = await screenshot(page, 'home-forecaster')
    expect(statSync(file).size).toBeGreaterThan(10_000)
    expect(errors).toEqual([])
    await page.close()
  })

  it('a stakeholder opening the People page gets a clear refusal', async () => {
    const page = await browser.newPage()
    await signInThroughForm(page, demoAccount('stakeholder').email)
    await page.waitForURL(`${BASE_URL}/`)
    await page.goto(`${BASE_URL}/admin/people`)
    await expect(page.getByTestId('error-status').textContent()).resolves.toMatch(/403/)
    await expect(page.locator('body').textContent()).resolves.toMatch(/Administrator/)
    await screenshot(page, 'refusal-stakeholder')
    await page.close()
  })

  it('a wrong password shows the message and stays on the sign-in page', async () => {
    const page = await browser.newPage()
    await signInThroughForm(page, demoAccount('duty_lead').email, 'definitely wrong')
    await page.getByText('E-mail or password is wrong.').first().waitFor()
    expect(new URL(page.url()).pathname).toBe('/login')
    await page.close()
  })

  it('signed-out visitors are sent to the sign-in page and come back after', async () => {
    const page = await browser.newPage()
    await page.goto(`${BASE_URL}/profile`)
    await page.waitForURL(/\/login/)
    expect(new URL(page.url()).searchParams.get('next')).toBe('/profile')
    await page.close()
  })
})
