// The map workspace in Chromium: a forecaster opens a run, sets a threshold, draws an area on the
// map with the mouse, saves it and reads its probabilities in the table; the map is saved as an
// artefact and checked not to be blank.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { readFileSync } from 'node:fs'
import { PNG } from 'pngjs'
import { inArray } from 'drizzle-orm'
import type { Browser } from 'playwright-core'
import { BASE_URL, demoAccount } from '../support/http'
import { launchBrowser, screenshot, signInThroughForm } from '../support/browser'
import { closeDB, tables, useDB } from '../../server/utils/db'
import { deleteTestRun, insertTestRun, type TestRun } from '../integration/workspaceRun'

let browser: Browser
let run: TestRun
const areaName = `Drawn area ${Date.now().toString(36)}`

beforeAll(async () => {
  run = await insertTestRun({ name: 'Workspace browser test run' })
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
  await useDB().delete(tables.areas).where(inArray(tables.areas.name, [areaName]))
  if (run) await deleteTestRun(run.id)
  await closeDB()
})

/** Share of pixels that differ clearly from the most common colour (the background). */
function nonBackgroundShare(file: string): number {
  const png = PNG.sync.read(readFileSync(file))
  const counts = new Map<number, number>()
  const key = (p: number) => (png.data[p]! >> 3 << 10) | (png.data[p + 1]! >> 3 << 5) | (png.data[p + 2]! >> 3)
  for (let p = 0; p < png.data.length; p += 4) counts.set(key(p), (counts.get(key(p)) ?? 0) + 1)
  const background = [...counts.entries()].sort((a, b) => b[1] - a[1])[0]![1]
  return 1 - background / (png.width * png.height)
}

describe('map workspace', () => {
  it('a forecaster sets a threshold, draws a rectangle, saves it and sees its probabilities', async () => {
    const page = await browser.newPage({ viewport: { width: 1400, height: 1000 } })
    const errors: string[] = []
    page.on('pageerror', (e) => errors.push(e.message))
    await signInThroughForm(page, demoAccount('forecaster').email)
    await page.waitForURL(`${BASE_URL}/`)

    await page.goto(`${BASE_URL}/workspace`)
    await page.getByTestId(`workspace-run-${run.id}`).click()
    await page.waitForURL(`${BASE_URL}/workspace/${run.id}`)
    const legend = page.getByTestId('legend-title')
    await expect(legend.textContent({ timeout: 60_000 })).resolves.toMatch(/Probability that gusts reach 20 m\/s or more somewhere within 10 km \(NMEP\)/)

    // A threshold of our own: the legend follows.
    await page.getByTestId('threshold-value').fill('13.55')
    await page.getByText('Probability that gusts reach 13.55 m/s or more', { exact: false }).first().waitFor({ timeout: 30_000 })
    await page.getByTestId('product-probability').check()
    await page.getByText('Probability that gusts reach 13.55 m/s or more, per 5.5 km cell', { exact: false }).first().waitFor({ timeout: 30_000 })
    await page.waitForFunction("document.querySelector('[data-testid=map-image-ready]')?.textContent?.includes('threshold=13.55')", undefined, { timeout: 30_000 })

    // Draw a rectangle with the mouse: click a corner, move, click the opposite corner.
    await page.getByTestId('draw-rectangle').click()
    await page.getByTestId('workspace-map').scrollIntoViewIfNeeded()
    const box = (await page.getByTestId('workspace-map').boundingBox())!
    const cx = box.x + box.width / 2, cy = box.y + box.height / 2
    await page.mouse.move(cx - 90, cy - 60)
    await page.mouse.click(cx - 90, cy - 60)
    for (let k = 1; k <= 10; k++) await page.mouse.move(cx - 90 + 18 * k, cy - 60 + 12 * k)
    await page.mouse.click(cx + 90, cy + 60)
    const form = page.getByTestId('area-save-form')
    await form.waitFor({ timeout: 15_000 })
    await page.getByTestId('area-name').fill(areaName)
    await page.getByTestId('area-save').click()

    // Its table appears, with numbers that say what they count.
    const article = page.locator('article', { has: page.getByRole('heading', { name: areaName }) })
    const anywhere = article.getByTestId('cell-anywhere').first()
    await anywhere.waitFor({ timeout: 60_000 })
    await expect(anywhere.textContent()).resolves.toMatch(/\d+ %.*\d+ of 12 scenarios; \d+ of 3 members/)
    await expect(article.locator('tbody tr').count()).resolves.toBe(2)
    await expect(article.getByTestId('cell-window-anywhere').textContent()).resolves.toMatch(/\d+ %/)
    await expect(article.textContent()).resolves.toMatch(/gusts reach 13\.55 m\/s or more/)

    // The readout by typed position, without the map.
    await page.getByTestId('readout-lat').fill(String(run.lat[2]))
    await page.getByTestId('readout-lon').fill(String(run.lon[3]))
    await page.getByTestId('readout-go').click()
    await expect(page.getByTestId('readout-probability').textContent({ timeout: 30_000 })).resolves.toMatch(/of 12 scenarios; \d+ of 3 members/)

    // A time window: the map, legend and the area's window row follow it.
    await page.getByTestId('window-to').selectOption('1')
    await page.getByText('per 5.5 km cell, at any of the 2 valid times from 06 UTC 14 Nov 2031 to 12 UTC 14 Nov 2031', { exact: false }).first().waitFor({ timeout: 30_000 })
    await expect(page.getByTestId('legend-window').textContent()).resolves.toMatch(/counted per scenario/)
    await page.waitForFunction("document.querySelector('[data-testid=map-image-ready]')?.textContent?.includes('windowTo=1')", undefined, { timeout: 30_000 })
    await expect(article.getByTestId('cell-window-anywhere').textContent({ timeout: 30_000 })).resolves.toMatch(/\d+ %/)

    const file = await screenshot(page, 'workspace-page')
    const mapFile = file.replace('workspace-page', 'workspace-map')
    await page.getByTestId('workspace-map-frame').screenshot({ path: mapFile })
    expect(nonBackgroundShare(mapFile)).toBeGreaterThan(0.2)
    expect(errors).toEqual([])
    await page.close()
  })
})
