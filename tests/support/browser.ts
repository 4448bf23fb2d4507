// Debian's Chromium driven by playwright-core (no browser download), for the e2e tests.
import { chromium, type Browser, type Page } from 'playwright-core'
import { mkdirSync } from 'node:fs'
import { join } from 'node:path'
import { BASE_URL } from './http'
import { DEMO_PASSWORD } from '../../scripts/lib/demoAccounts'

export const ARTEFACTS = process.env.TESSERA_TEST_RESULTS ?? join(process.cwd(), 'test-results')

export function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  })
}

export async function signInThroughForm(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto(`${BASE_URL}/login`)
  await page.getByTestId('login-email').fill(email)
  await page.getByTestId('login-password').fill(password)
  await page.getByTestId('login-submit').click()
}

export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(ARTEFACTS, { recursive: true })
  const path = join(ARTEFACTS, `${name}.png`)
  await page.screenshot({ path, fullPage: true })
  return path
}
