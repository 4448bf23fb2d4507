import { describe, expect, it } from 'vitest'
import { fractionsSkill, fssOfFractions, fssUsefulLevel } from '../../../shared/numerics/verify/fractionsSkillScore'
import { neighbourhoodFractions } from '../../../shared/numerics/verify/neighbourhoodFractions'
import { uniformSource } from './testRandom'

/** Brute-force fractions: explicit n×n loop, outside cells are non-events, denominator n². */
function bruteFractions(events: ArrayLike<number>, nx: number, ny: number, n: number): Float64Array {
  const h = (n - 1) / 2
  const out = new Float64Array(nx * ny)
  for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
    let s = 0
    for (let dj = -h; dj <= h; dj++) for (let di = -h; di <= h; di++) {
      const x = i + di, y = j + dj
      if (x >= 0 && x < nx && y >= 0 && y < ny) s += events[y * nx + x]!
    }
    out[j * nx + i] = s / (n * n)
  }
  return out
}

function singlePoint(nx: number, ny: number, i: number, j: number): Float64Array {
  const f = new Float64Array(nx * ny)
  f[j * nx + i] = 1
  return f
}

const stack = (nx: number, ny: number, ...members: Float64Array[]) => ({ nx, ny, members })

describe('neighbourhood fractions', () => {
  it('summed-area fractions equal the brute-force n×n count / n² (edges included)', () => {
    const u = uniformSource(3)
    const nx = 17, ny = 11
    const events = Float64Array.from({ length: nx * ny }, () => (u() < 0.3 ? 1 : 0))
    const probs = Float64Array.from({ length: nx * ny }, () => Math.floor(u() * 6) / 5)
    for (const n of [1, 3, 5, 9, 21, 35]) {
      for (const f of [events, probs]) {
        const a = neighbourhoodFractions(f, nx, ny, n), b = bruteFractions(f, nx, ny, n)
        // Table differences of sums up to ~100 lose a few ulps: 1e-13 absolute.
        for (let k = 0; k < a.length; k++) expect(Math.abs(a[k]! - b[k]!)).toBeLessThan(1e-13)
      }
    }
  })

  it('rejects even or non-positive sizes', () => {
    for (const n of [0, 2, 4, -1, 1.5]) expect(() => neighbourhoodFractions(new Float64Array(4), 2, 2, n)).toThrow(/odd/)
  })
})

describe('fractions skill score', () => {
  it('a field against itself scores 1 at every size (Roberts & Lean 2008)', () => {
    const u = uniformSource(5)
    const f = Float64Array.from({ length: 30 * 20 }, () => u() * 10)
    const r = fractionsSkill(f, stack(30, 20, f), 7, [1, 3, 5, 9, 41])
    for (const v of r.fss.values()) expect(v).toBeCloseTo(1, 15)
  })

  it('two single points offset by (dx, dy) far from the edges: FSS = (n − |dx|)₊(n − |dy|)₊ / n²', () => {
    // Derivation: each field has n² fractions of 1/n², so ΣO² = ΣM² = 1/n²; ΣOM = overlap/n⁴ with
    // overlap = (n − |dx|)₊(n − |dy|)₊ cells; FSS = 1 − (2/n² − 2·overlap/n⁴)/(2/n²) = overlap/n².
    const nx = 41, ny = 41, i0 = 20, j0 = 20
    const obs = singlePoint(nx, ny, i0, j0)
    for (const [dx, dy] of [[0, 0], [1, 0], [0, -2], [2, 3], [-3, 1], [4, 4], [6, 0]]) {
      const fc = singlePoint(nx, ny, i0 + dx!, j0 + dy!)
      const r = fractionsSkill(obs, stack(nx, ny, fc), 0.5, [1, 3, 5, 7, 9, 11])
      for (const [n, v] of r.fss) {
        const overlap = Math.max(0, n - Math.abs(dx!)) * Math.max(0, n - Math.abs(dy!))
        expect(v).toBeCloseTo(overlap / (n * n), 14)
      }
    }
  })

  it('large-neighbourhood limit 2 f_o f_m / (f_o² + f_m²) once every square covers the grid (n ≥ 2·max(nx, ny) − 1)', () => {
    const u = uniformSource(8)
    const nx = 12, ny = 9
    const obs = Float64Array.from({ length: nx * ny }, () => (u() < 0.2 ? 1 : 0))
    const fc = Float64Array.from({ length: nx * ny }, () => (u() < 0.45 ? 1 : 0))
    const fo = obs.reduce((a, b) => a + b, 0) / obs.length
    const fm = fc.reduce((a, b) => a + b, 0) / fc.length
    const r = fractionsSkill(obs, stack(nx, ny, fc), 0.5, [23, 31])
    for (const v of r.fss.values()) expect(v).toBeCloseTo((2 * fo * fm) / (fo * fo + fm * fm), 14)
    expect(r.baseRate).toBeCloseTo(fo, 15)
    expect(r.useful).toBeCloseTo(0.5 + fo / 2, 15)
  })

  it('the ensemble M is the mean over members of member fractions', () => {
    const u = uniformSource(9)
    const nx = 10, ny = 8
    const truth = Float64Array.from({ length: nx * ny }, () => u())
    const members = [0, 1, 2].map(() => Float64Array.from({ length: nx * ny }, () => u()))
    const n = 3, t = 0.6
    const ev = (f: Float64Array) => f.map((v) => (v >= t ? 1 : 0))
    const memberFractions = members.map((m) => bruteFractions(ev(m), nx, ny, n))
    const mean = memberFractions[0]!.map((_, k) => memberFractions.reduce((s, f) => s + f[k]!, 0) / 3)
    const expected = fssOfFractions(bruteFractions(ev(truth), nx, ny, n), mean)
    expect(fractionsSkill(truth, stack(nx, ny, ...members), t, [n]).fss.get(n)).toBeCloseTo(expected, 14)
  })

  it('is undefined (NaN) with no event anywhere, and 0 when only one side has events at n = 1', () => {
    const z = new Float64Array(9)
    expect(fssOfFractions(z, z)).toBeNaN()
    expect(fractionsSkill(singlePoint(3, 3, 1, 1), stack(3, 3, z), 0.5, [1]).fss.get(1)).toBe(0)
    expect(fssUsefulLevel(0.1)).toBeCloseTo(0.55, 15)
  })
})
