import { describe, expect, it } from 'vitest'
import { packInt16, unpackInt16 } from '../../shared/numerics/io/packInt16'

describe('packInt16', () => {
  it('round-trips within the stated precision, which is half a quantisation step', () => {
    const a = Float64Array.from({ length: 1000 }, (_, i) => Math.sin(i / 7) * 13.7 + 2)
    const b = Float64Array.from({ length: 1000 }, (_, i) => Math.cos(i / 3) * 4 - 1)
    const p = packInt16([a, b])
    // Range 27.4 over 65534 steps → precision ≈ 2.1e-4 (closed form of the quantiser).
    expect(p.precision).toBeCloseTo((Math.max(...a, ...b) - Math.min(...a, ...b)) / 65534 / 2, 12)
    const ua = unpackInt16(p.data, p.offset, p.scale, 0, 1000)
    const ub = unpackInt16(p.data, p.offset, p.scale, 1, 1000)
    let worst = 0
    for (let i = 0; i < 1000; i++) worst = Math.max(worst, Math.abs(ua[i]! - a[i]!), Math.abs(ub[i]! - b[i]!))
    // Float32 output adds at most ~1 ulp of |value| ≤ 16 (≈ 1e-6).
    expect(worst).toBeLessThanOrEqual(p.precision + 2e-6)
    expect(worst).toBeGreaterThan(0)
  })

  it('keeps a constant field exact and refuses NaN', () => {
    const p = packInt16([new Float64Array(10).fill(5.5)])
    expect(Array.from(unpackInt16(p.data, p.offset, p.scale, 0, 10))).toEqual(new Array(10).fill(5.5))
    expect(() => packInt16([Float64Array.of(1, NaN)])).toThrow(/non-finite/)
  })
})
