// `tessera check` (cli/check.ts): the same report as the job's pure computation, from grid JSON or an
// ensemble file, and one-line usage errors.
import { afterAll, describe, expect, it } from 'vitest'
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { run } from '../../../cli/check'
import { UsageError } from '../../../cli/args'
import { runMethodCheck } from '../../../shared/numerics/pipeline/methodCheck'

const dir = mkdtempSync(join(tmpdir(), 'tessera-check-'))
afterAll(() => rmSync(dir, { recursive: true, force: true }))
const file = (name: string, value: unknown) => { const p = join(dir, name); writeFileSync(p, JSON.stringify(value)); return p }

const nx = 36, ny = 32
const values = Array.from({ length: nx * ny }, (_, k) => 12 + 3 * Math.sin((k % nx) / 4) * Math.cos(Math.floor(k / nx) / 5) + 0.3 * Math.sin(k * 1.7))
const truthPath = file('fine.json', { nx, ny, values, spacing: 1.5 })

async function check(...args: string[]) {
  const out = join(dir, `out-${Math.random().toString(36).slice(2)}.json`)
  await run([...args, '--out', out])
  return JSON.parse(readFileSync(out, 'utf8'))
}

describe('tessera check', () => {
  it('writes the report the job computes, for the same truth and settings', async () => {
    const csv = join(dir, 'report.csv')
    const r = await check('--truth', truthPath, '--factor', '4', '--samples', '5', '--seed', '3', '--threshold', '12,-1', '--neighbourhoods', '1,5', '--csv', csv)
    const direct = runMethodCheck({ truth: Float64Array.from(values), nx, ny, spacingKm: 1.5, settings: {
      factor: 4, kernel: 'auto', samples: 5, seed: 3, thresholds: { kind: 'value', values: [12, -1] }, neighbourhoods: [1, 5],
    } })
    expect(r).toEqual(JSON.parse(JSON.stringify(direct)))
    expect(r.grid).toMatchObject({ nx: 36, ny: 32, coarseNx: 9, coarseNy: 8, spacingKm: 1.5, croppedFrom: null })
    expect(r.forecasts.map((f: { id: string }) => f.id)).toEqual(['mean', 'ensemble', 'nearest', 'bilinear', 'bilinear-bm', 'bicubic', 'bicubic-bm'])
    expect(r.samples).toHaveLength(5)
    expect(r.summary.length).toBeGreaterThan(5)
    expect(readFileSync(csv, 'utf8').split('\r\n')[0]).toMatch(/^section,forecast,threshold/)
  })

  it('reads one member and lead time of an ensemble file, as an upload would, with its spacing and units', async () => {
    const lon = Array.from({ length: nx }, (_, i) => -30 + 0.02 * i), lat = Array.from({ length: ny }, (_, j) => -45 + 0.02 * j)
    const shifted = values.map((v) => v + 5)
    const path = file('ens.json', {
      tessera: 'ensemble-grid/1', variable: 'gust', standardName: 'wind_speed_of_gust', units: 'm s-1',
      leadTimes: ['2031-11-14T06:00:00Z', '2031-11-14T12:00:00Z'], grid: { lon, lat }, members: [[values, values], [values, shifted]],
    })
    const r = await check('--truth', path, '--factor', '4', '--member', '1', '--lead', '1', '--samples', '3', '--percentile', '50', '--neighbourhoods', '1')
    expect(r.grid.units).toBe('m/s')
    // The file's standard name picks the transform, as for a run of gusts.
    expect(r.fit.transform).toBe('boxcox')
    expect(r.forecasts[0].label).toBe('Mean of the samples')
    // 0.02° of latitude is 2.2 km; of longitude at 45° S about 1.6 km: the reader's mean spacing lies between.
    expect(r.grid.spacingKm).toBeGreaterThan(1.5)
    expect(r.grid.spacingKm).toBeLessThan(2.3)
    expect(r.truth.mean).toBeCloseTo(values.reduce((a, b) => a + b) / values.length + 5, 4)
    await expect(check('--truth', path, '--factor', '4', '--member', '2')).rejects.toThrow(/has 2 member/)
  })

  it('refuses bad input with a usage error', async () => {
    const bad: [string[], RegExp][] = [
      [['--factor', '4'], /--truth is required/],
      [['--truth', truthPath], /--factor is required/],
      [['--truth', truthPath, '--factor', '17'], /from 2 to 16/],
      [['--truth', truthPath, '--factor', '4', '--kernel', 'cubic'], /--kernel must be one of/],
      [['--truth', truthPath, '--factor', '4', '--length-scale', '3'], /to fix the prior/],
      [['--truth', truthPath, '--factor', '4', '--threshold', '1', '--percentile', '50'], /not both/],
      [['--truth', truthPath, '--factor', '4', '--neighbourhoods', '1,4'], /odd/],
      [['--truth', truthPath, '--factor', '4', '--samples', '1'], /samples must be/],
      [['--truth', truthPath, '--factor', '16'], /only 2×2 blocks/],
      [['--truth', join(dir, 'nope.json'), '--factor', '4'], /cannot read/],
    ]
    for (const [args, message] of bad) {
      const err = await check(...args).catch((e) => e)
      expect(err, args.join(' ')).toBeInstanceOf(UsageError)
      expect(err.message).toMatch(message)
    }
  })
})
