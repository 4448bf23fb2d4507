import { describe, expect, it } from 'vitest'
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { run } from '../../../cli/downscale'
import { UsageError } from '../../../cli/args'

const dir = mkdtempSync(join(tmpdir(), 'tessera-downscale-'))
function gridFile(name: string, content: unknown): string {
  const path = join(dir, name)
  writeFileSync(path, JSON.stringify(content))
  return path
}
const nx = 4, ny = 3
const values = Array.from({ length: nx * ny }, (_, k) => 10 + Math.sin(k) + 0.5 * Math.cos(2 * k))
const input = gridFile('coarse.json', { nx, ny, values: values.map((v, k) => (k === 5 ? null : v)) })
const fixed = ['--kernel', 'matern32', '--length-scale', '4', '--variance', '1.5', '--mean', '10']

async function downscale(args: string[]) {
  const out = join(dir, `out-${Math.random().toString(36).slice(2)}.json`)
  await run([...args, '--out', out])
  return JSON.parse(readFileSync(out, 'utf8')) as { nx: number; ny: number; mean: (number | null)[]; std: number[]; samples: number[][]; params: Record<string, unknown> }
}

describe('tessera downscale', () => {
  it('writes fine mean, std and samples whose block means equal the input (fixed prior)', async () => {
    const b = 3
    const result = await downscale(['--in', input, '--factor', String(b), '--samples', '3', '--seed', '42', ...fixed])
    expect([result.nx, result.ny]).toEqual([nx * b, ny * b])
    expect(result.samples).toHaveLength(3)
    expect(result.params).toMatchObject({ kernel: 'matern32', lengthScale: 4, variance: 1.5, mean: 10, factor: 3, fitted: false })
    for (const field of [result.mean as number[], ...result.samples]) {
      expect(field).toHaveLength(nx * b * ny * b)
      for (let J = 0; J < ny; J++) for (let I = 0; I < nx; I++) {
        if (J * nx + I === 5) continue
        let s = 0
        for (let q = 0; q < b; q++) for (let p = 0; p < b; p++) s += field[(J * b + q) * nx * b + I * b + p]!
        expect(Math.abs(s / (b * b) - values[J * nx + I]!)).toBeLessThan(1e-11)
      }
    }
    expect(result.std.every((v) => v >= 0)).toBe(true)
    // Same seed → same samples.
    const again = await downscale(['--in', input, '--factor', String(b), '--samples', '3', '--seed', '42', ...fixed])
    expect(again.samples).toEqual(result.samples)
  })

  it('fits the prior when it is not given', async () => {
    const big = gridFile('big.json', { nx: 8, ny: 6, values: Array.from({ length: 48 }, (_, k) => 5 + Math.sin(0.5 * (k % 8)) * Math.cos(0.4 * Math.floor(k / 8))) })
    const result = await downscale(['--in', big, '--factor', '2', '--samples', '1', '--seed', '1', '--kernel', 'matern32'])
    expect(result.params.fitted).toBe(true)
    expect(result.params.kernel).toBe('matern32')
    expect(Number(result.params.lengthScale)).toBeGreaterThan(0)
  })

  it('rejects bad input with one-line usage errors', async () => {
    const cases: [string[], RegExp][] = [
      [['--in', input, '--factor', '1', '--samples', '1', '--seed', '1'], /--factor must be an integer from 2 to 16/],
      [['--in', input, '--factor', '2.5', '--samples', '1', '--seed', '1'], /--factor must be an integer/],
      [['--factor', '2', '--samples', '1', '--seed', '1'], /--in is required/],
      [['--in', input, '--factor', '2', '--seed', '1'], /--samples is required/],
      [['--in', input, '--factor', '2', '--samples', '1', '--seed', '1', '--length-scale', '3'], /give all of --kernel --length-scale --variance --mean/],
      [['--in', input, '--factor', '2', '--samples', '1', '--seed', '1', '--kernel', 'cubic'], /--kernel must be one of/],
      [['--in', input, '--factor', '2', '--samples', '1', '--seed', '1'], /cannot fit the prior: too few valid cells/],
      [['--in', gridFile('short.json', { nx: 2, ny: 2, values: [1, 2, 3] }), '--factor', '2', '--samples', '1', '--seed', '1'], /3 values, expected nx·ny = 4/],
      [['--in', gridFile('empty.json', { nx: 1, ny: 2, values: [null, null] }), '--factor', '2', '--samples', '1', '--seed', '1', ...fixed], /no observed cells/],
    ]
    for (const [args, message] of cases) {
      const err = await run(args).then(() => undefined, (e: unknown) => e)
      expect(err).toBeInstanceOf(UsageError)
      expect((err as Error).message).toMatch(message)
      expect((err as Error).message).not.toContain('\n')
    }
  })
})
