import { afterAll, describe, expect, it } from 'vitest'
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { run } from '../../../cli/products'
import { UsageError } from '../../../cli/args'
import { bruteNeighbourhood, bruteProbability } from './bruteForce'

const dir = mkdtempSync(join(tmpdir(), 'tessera-products-'))
afterAll(() => rmSync(dir, { recursive: true, force: true }))
const file = (name: string, value: unknown) => { const p = join(dir, name); writeFileSync(p, typeof value === 'string' ? value : JSON.stringify(value)); return p }

// 4 members on a 3 × 2 grid (row-major, row 0 first).
const members = [
  [1, 5, 9, 2, 6, 3],
  [4, 4, 8, 7, 1, 2],
  [0, 9, 3, 5, 5, 5],
  [2, 2, 2, 9, 8, 1],
]
const membersPath = file('members.json', { nx: 3, ny: 2, members })
const maskPath = file('mask.json', { nx: 3, ny: 2, values: [0, 1, 1, 0, 0, 1] })

describe('tessera products', () => {
  it('writes probability, NEP, NMEP, moments, percentiles and area products matching independent computations', async () => {
    const out = join(dir, 'products.json')
    await run(['--members', membersPath, '--threshold', '5', '--radius', '1.5', '--area', maskPath, '--out', out])
    const r = JSON.parse(readFileSync(out, 'utf8'))
    const stack = { nx: 3, ny: 2, members: members.map((m) => Float64Array.from(m)) }
    expect(r).toMatchObject({ nx: 3, ny: 2, threshold: 5, direction: 'above', radius: 1.5 })
    expect(r.probability).toEqual(bruteProbability(stack, 5, 'above'))
    const ref = bruteNeighbourhood(stack, 5, 'above', 1.5)
    r.nep.forEach((v: number, k: number) => expect(v).toBeCloseTo(ref.nep[k]!, 12))
    expect(r.nmep).toEqual(ref.nmep)
    // Cell 0 holds 1, 4, 0, 2: mean 7/4, sample variance (divisor 3) = 8.75/3, type-7 median = (1 + 2)/2.
    expect(r.mean[0]).toBeCloseTo(1.75, 12)
    expect(r.spread[0]).toBeCloseTo(Math.sqrt(8.75 / 3), 12)
    expect(r.p50[0]).toBeCloseTo(1.5, 12)
    // p10 of sorted 0, 1, 2, 4: h = 0.3 → 0 + 0.3·(1 − 0) (type 7 by hand).
    expect(r.p10[0]).toBeCloseTo(0.3, 12)
    // Area = cells 1, 2, 5. Member maxima 9, 8, 9, 2 → P(anywhere ≥ 5) = 3/4;
    // member means 17/3, 14/3, 17/3, 5/3 → P(mean ≥ 5) = 2/4; fractions 2/3, 1/3, 2/3, 0 → 5/12.
    expect(r.area.anywhere).toBe(0.75)
    expect(r.area.areaMean).toBe(0.5)
    expect(r.area.fractionExpected).toBeCloseTo(5 / 12, 12)
    expect(r.area.cells).toBe(3)
    // Area maxima sorted 2, 8, 9, 9: type-7 median 8.5.
    expect(r.area.areaMax.p50).toBeCloseTo(8.5, 12)
  })

  it('defaults to radius 0 (NEP = NMEP = probability) and handles --below', async () => {
    const out = join(dir, 'below.json')
    await run(['--members', membersPath, '--threshold', '2', '--below', '--out', out])
    const r = JSON.parse(readFileSync(out, 'utf8'))
    const expected = bruteProbability({ nx: 3, ny: 2, members: members.map((m) => Float64Array.from(m)) }, 2, 'below')
    expect(r.direction).toBe('below')
    expect(r.radius).toBe(0)
    expect(r.probability).toEqual(expected)
    expect(r.nep).toEqual(expected)
    expect(r.nmep).toEqual(expected)
    expect(r.area).toBeUndefined()
  })

  it('accepts a negative threshold written as a separate argument (frost: --threshold -1 --below)', async () => {
    const out = join(dir, 'frost.json')
    await run(['--members', file('cold.json', { nx: 1, ny: 1, members: [[-3], [-1], [0.5], [-1.5]] }), '--threshold', '-1', '--below', '--out', out])
    expect(JSON.parse(readFileSync(out, 'utf8')).probability).toEqual([0.75])
  })

  it('refuses bad input with a one-line usage error', async () => {
    const cases: [string[], string][] = [
      [['--threshold', '5'], '--members is required'],
      [['--members', membersPath], '--threshold is required'],
      [['--members', membersPath, '--threshold', '5', '--radius', '-1'], '--radius must be a number ≥ 0'],
      [['--members', membersPath, '--threshold', '5', '--area', file('m2.json', { nx: 2, ny: 3, values: [0, 1, 1, 0, 0, 1] })], 'mask is 2×3 but the members are 3×2'],
      [['--members', membersPath, '--threshold', '5', '--area', file('m3.json', { nx: 3, ny: 2, values: [0, 1, 0.5, 0, 0, 1] })], 'mask values must be 0 or 1, got 0.5 at column 2, row 0'],
      [['--members', membersPath, '--threshold', '5', '--area', file('m4.json', { nx: 3, ny: 2, values: [0, 0, 0, 0, 0, 0] })], 'no cell set to 1'],
      [['--members', file('nan.json', { nx: 3, ny: 2, members: [[1, 2, null, 4, 5, 6]] }), '--threshold', '5'], 'members[0][2] is null: expected a finite number'],
      [['--members', file('nan2.json', '{"nx":3,"ny":2,"members":[[1,2,NaN,4,5,6]]}'), '--threshold', '5'], 'is not valid JSON'],
      [['--members', membersPath, '--threshold', 'abc'], '--threshold must be a number'],
    ]
    for (const [argv, message] of cases) {
      const err = await run(argv).then(() => null, (e: unknown) => e)
      expect(err, argv.join(' ')).toBeInstanceOf(UsageError)
      expect((err as Error).message).toContain(message)
      expect((err as Error).message).not.toContain('\n')
    }
  })
})
