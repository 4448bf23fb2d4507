import { describe, expect, it } from 'vitest'
import { execFile } from 'node:child_process'
import { fileURLToPath } from 'node:url'
import { promisify } from 'node:util'
import { fixturePath } from './fixtures'

const ROOT = fileURLToPath(new URL('../../../', import.meta.url))
const run = promisify(execFile)

async function inspect(...args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    const { stdout, stderr } = await run(ROOT + 'node_modules/.bin/tsx', [ROOT + 'bin/tessera.ts', 'inspect', ...args], { cwd: ROOT })
    return { code: 0, stdout, stderr }
  } catch (err) {
    const e = err as { code: number; stdout: string; stderr: string }
    return { code: e.code, stdout: e.stdout, stderr: e.stderr }
  }
}

describe('tessera inspect', () => {
  it('prints the preview as JSON', async () => {
    const out = await inspect(fixturePath('precip_lcc_64bit.nc'))
    expect(out.code).toBe(0)
    const summary = JSON.parse(out.stdout)
    expect(summary).toMatchObject({
      variable: 'precipitation_amount', standardName: 'precipitation_amount', units: 'kg m-2', canonicalUnits: 'mm', members: 3,
      leadTimes: ['2031-03-04T06:00:00Z', '2031-03-04T12:00:00Z'], referenceTime: '2031-03-04T00:00:00Z',
      grid: { nx: 6, ny: 5, spacingKm: 2.5, crs: 'lambert_conformal_conic' },
    })
    expect(summary.extent).toHaveLength(4)
    expect(summary.stats.min).toBeCloseTo(0.2, 5) // member 1, lead time 1: 0.2 + 0.01 j + 0.001 i, smallest at j = i = 0
  }, 30_000)

  it('exits non-zero with the upload message for a refused file, and 2 for bad usage', async () => {
    const bad = await inspect(fixturePath('err_calendar.nc'))
    expect(bad.code).toBe(1)
    expect(bad.stdout).toBe('')
    expect(bad.stderr.trim()).toBe('tessera inspect: The time coordinate "time" uses the "360_day" calendar; Tessera reads only the standard (Gregorian) calendar. Convert the times first.')
    const usage = await inspect()
    expect(usage.code).toBe(2)
  }, 30_000)
})
