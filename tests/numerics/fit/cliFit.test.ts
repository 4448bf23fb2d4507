import { afterAll, describe, expect, it, vi } from 'vitest'
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { run } from '../../../cli/fit'
import { UsageError } from '../../../cli/args'
import { coarseSampler } from './synthetic'

const dir = mkdtempSync(join(tmpdir(), 'tessera-fit-'))
afterAll(() => rmSync(dir, { recursive: true, force: true }))

function gridFile(name: string, nx: number, ny: number, values: (number | null)[]): string {
  const path = join(dir, name)
  writeFileSync(path, JSON.stringify({ nx, ny, values, spacing: 2.5 }))
  return path
}

async function runFit(argv: string[]): Promise<Record<string, unknown>> {
  let out = ''
  const spy = vi.spyOn(process.stdout, 'write').mockImplementation((chunk: string | Uint8Array) => { out += String(chunk); return true })
  try { await run(argv) } finally { spy.mockRestore() }
  return JSON.parse(out) as Record<string, unknown>
}

describe('tessera fit (CLI)', () => {
  const y = Array.from(coarseSampler({ kernel: 'matern32', lengthScale: 8, variance: 2, mean: 5, factor: 4, nx: 12, ny: 12 })(9))
  const withGap: (number | null)[] = [...y]
  withGap[7] = null
  const path = gridFile('coarse.json', 12, 12, withGap)

  it('prints the documented fields (ℓ in fine cells and in km from the coarse spacing)', async () => {
    const r = await runFit(['--in', path, '--factor', '4', '--kernel', 'matern32'])
    for (const key of ['kernel', 'lengthScale', 'variance', 'mean', 'logLikelihood', 'lengthScaleInterval']) expect(r).toHaveProperty(key)
    expect(r.kernel).toBe('matern32')
    expect(r.validCells).toBe(143)
    expect(r.lengthScaleKm).toBeCloseTo((r.lengthScale as number) * 2.5 / 4, 12) // spacing is per coarse cell
    const [lo, hi] = r.lengthScaleInterval as [number, number]
    expect(lo).toBeLessThan(r.lengthScale as number)
    expect(hi).toBeGreaterThan(r.lengthScale as number)
  })

  it('bad input is a one-line usage error', async () => {
    await expect(run(['--in', path, '--factor', '3.5'])).rejects.toThrow(UsageError)
    await expect(run(['--in', path, '--factor', '4', '--kernel', 'gauss'])).rejects.toThrow(/--kernel must be one of/)
    await expect(run(['--in', path, '--factor', '4', '--nugget', 'lots'])).rejects.toThrow(/--nugget/)
    await expect(run(['--in', gridFile('flat.json', 5, 5, new Array(25).fill(1.5)), '--factor', '2'])).rejects.toThrow('field is constant: nothing to fit')
    await expect(run(['--in', gridFile('tiny.json', 3, 3, new Array(9).fill(0).map((_, k) => k)), '--factor', '2'])).rejects.toThrow(/too few valid cells/)
    await expect(run(['--factor', '2'])).rejects.toThrow(/--in is required/)
  })
})
