import { afterAll, describe, expect, it } from 'vitest'
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { run } from '../../../cli/score'
import { UsageError } from '../../../cli/args'

const dir = mkdtempSync(join(tmpdir(), 'tessera-score-'))
afterAll(() => rmSync(dir, { recursive: true, force: true }))
const file = (name: string, value: unknown) => { const p = join(dir, name); writeFileSync(p, JSON.stringify(value)); return p }

// 3×2 grid; member A equals the truth, member B is 1 everywhere.
const truthPath = file('truth.json', { nx: 3, ny: 2, values: [0, 1, 2, 3, 4, 5], spacing: 1.5 })
const membersPath = file('members.json', { nx: 3, ny: 2, members: [[0, 1, 2, 3, 4, 5], [1, 1, 1, 1, 1, 1]] })

async function score(...args: string[]) {
  const out = join(dir, `out-${Math.random().toString(36).slice(2)}.json`)
  await run([...args, '--out', out])
  return JSON.parse(readFileSync(out, 'utf8'))
}

describe('tessera score', () => {
  it('prints every score, matching values worked out by hand', async () => {
    const r = await score('--truth', truthPath, '--forecast', membersPath, '--threshold', '3', '--neighbourhoods', '1,3')
    // Mean = 0.5, 1, 1.5, 2, 2.5, 3 → errors² 0.25, 0, 0.25, 1, 2.25, 4 → MSE 7.75/6.
    expect(r.mse).toBeCloseTo(7.75 / 6, 14)
    expect(r.rmse).toBeCloseTo(Math.sqrt(7.75 / 6), 14)
    // Events (≥ 3): truth 0 0 0 1 1 1; probabilities 0 0 0 ½ ½ ½. n = 1: 1 − 0.75/(3 + 0.75) = 0.8.
    expect(r.fss['1']).toBeCloseTo(0.8, 14)
    // M = O/2 everywhere (B never has an event), so FSS = 1 − ¼/(1 + ¼) = 0.8 at every size.
    expect(r.fss['3']).toBeCloseTo(0.8, 14)
    expect(r.baseRate).toBe(0.5)
    expect(r.fssUseful).toBe(0.75)
    // Brier: 3·¼/6 = 0.125; bins p = 0 (freq 0) and p = ½ (freq 1): REL 0.125, RES 0.25, UNC 0.25.
    expect(r.brier).toMatchObject({ score: 0.125, reliability: 0.125, resolution: 0.25, uncertainty: 0.25 })
    // Two members with one equal to y: fair CRPS = |d|/2 − |d|/2 = 0; plain = |d|/4, d = 1 0 1 2 3 4.
    expect(r.crps).toBeCloseTo(0, 15)
    expect(r.crpsEnsemble).toBeCloseTo(11 / 24, 14)
    // Cells 2–5: B below, tie with A → rank 1 or 2; cell 0: rank 0 or 1; cell 1: tie with both, 0–2.
    expect(r.rankHistogram).toHaveLength(3)
    expect(r.rankHistogram.reduce((a: number, b: number) => a + b, 0)).toBe(6)
    expect(r.rankHistogram[0]).toBeLessThanOrEqual(2)
    expect(r.psd.wavenumber).toEqual([0.5])
    expect(r.psd.wavenumberPerKm[0]).toBeCloseTo(0.5 / 1.5, 15)
    expect(r.psd).toMatchObject({ window: 'hann', removeMean: true })
    expect(r.psd.truth).toHaveLength(1)
    expect(r.psd.forecastMean).toHaveLength(1)
    expect(r.psd.members).toBeUndefined()
  })

  it('takes the threshold as a percentile of the truth, and can add member spectra', async () => {
    const r = await score('--truth', truthPath, '--forecast', membersPath, '--percentile', '50', '--member-spectra', '--window', 'none')
    expect(r.threshold).toBeCloseTo(2.5, 15) // type-7 median of 0…5
    expect(r.percentile).toBe(50)
    expect(Object.keys(r.fss)).toEqual(['1', '3', '5', '9'])
    expect(r.psd.members).toHaveLength(2)
    expect(r.psd.window).toBe('none')
  })

  it('reports FSS as null when neither field has an event, and crps as null for one member', async () => {
    const one = file('one.json', { nx: 3, ny: 2, members: [[0, 0, 0, 0, 0, 0]] })
    const r = await score('--truth', truthPath, '--forecast', one, '--threshold', '100')
    expect(r.fss['1']).toBeNull()
    expect(r.crps).toBeNull()
    expect(r.crpsEnsemble).toBeCloseTo(15 / 6, 14)
  })

  const bad: Array<[string, string[], RegExp]> = [
    ['even neighbourhood', ['--threshold', '3', '--neighbourhoods', '1,4'], /odd positive integers/],
    ['zero neighbourhood', ['--threshold', '3', '--neighbourhoods', '0'], /odd positive integers/],
    ['no threshold', [], /exactly one of --threshold/],
    ['both thresholds', ['--threshold', '3', '--percentile', '50'], /exactly one of --threshold/],
    ['percentile > 100', ['--percentile', '101'], /within \[0, 100\]/],
    ['bad window', ['--threshold', '3', '--window', 'cosine'], /--window/],
  ]
  for (const [name, args, message] of bad) {
    it(`rejects ${name} with a one-line usage error`, async () => {
      const p = run(['--truth', truthPath, '--forecast', membersPath, ...args])
      await expect(p).rejects.toThrow(UsageError)
      await expect(p).rejects.toThrow(message)
    })
  }

  it('rejects a shape mismatch and a truth with missing values', async () => {
    const small = file('small.json', { nx: 2, ny: 3, members: [[0, 1, 2, 3, 4, 5]] })
    await expect(run(['--truth', truthPath, '--forecast', small, '--threshold', '1'])).rejects.toThrow(/shape mismatch: truth is 3×2, forecast is 2×3/)
    const holey = file('holey.json', { nx: 3, ny: 2, values: [0, 1, null, 3, 4, 5] })
    await expect(run(['--truth', holey, '--forecast', membersPath, '--threshold', '1'])).rejects.toThrow(/missing value at column 2, row 0/)
  })

  it('accepts a negative threshold written as a separate argument', async () => {
    const r = await score('--truth', truthPath, '--forecast', membersPath, '--threshold', '-2')
    expect(r.threshold).toBe(-2)
    expect(r.baseRate).toBe(1)
  })
})
