// The median correlation shape behind the map glyph (shared/utils/correlationShape.ts).
import { describe, expect, it } from 'vitest'
import { ellipseOffsets, summariseShapes } from '#shared/utils/correlationShape'

const aniso = (major: number, minor: number, angle: number, adopted = true) => ({ lengthScale: Math.sqrt(major * minor), anisotropy: { adopted, majorLengthScale: major, minorLengthScale: minor, angle } })

describe('summariseShapes', () => {
  it('averages axes as axial data: 3° and 177° are 3° apart, so their mean is 0° (mod 180°), not 90°', () => {
    const d = Math.PI / 180
    const s = summariseShapes([aniso(6, 3, 3 * d), aniso(6, 3, 177 * d)])!
    expect(Math.min(s.angle, Math.PI - s.angle)).toBeLessThan(1e-12)
    expect(s.angle).toBeGreaterThanOrEqual(0)
    expect(s.angle).toBeLessThan(Math.PI)
  })

  it('uses medians of the adopted members when most adopted a stretched shape', () => {
    const s = summariseShapes([aniso(6, 2, 1), aniso(10, 4, 1.2), aniso(8, 3, 1.1), { lengthScale: 5, anisotropy: null }])!
    expect(s).toMatchObject({ members: 4, anisotropic: 3, major: 8, minor: 3 })
    expect(s.angle).toBeCloseTo(1.1, 2)
  })

  it('is a circle of the median ℓ when half or fewer adopted anisotropy; all-dry members (ℓ = 0) are left out', () => {
    const s = summariseShapes([aniso(6, 2, 1), { lengthScale: 4 }, { lengthScale: 6 }, { lengthScale: 0 }])!
    expect(s).toMatchObject({ members: 3, anisotropic: 1, angle: 0 })
    expect(s.major).toBe(s.minor)
    expect(s.major).toBe(4) // median of √12 ≈ 3.46 (the stretched member's ℓ), 4 and 6
    expect(summariseShapes([{ lengthScale: 0 }])).toBeNull()
  })
})

describe('ellipseOffsets', () => {
  it('is closed, has semi-axes a and b, and puts the major axis at θ from grid east toward grid north', () => {
    const a = 5, b = 2, theta = Math.PI / 6
    const ring = ellipseOffsets(a, b, theta, 360)
    expect(ring).toHaveLength(361)
    expect(ring[0]).toEqual(ring[360])
    expect(ring[0]![0]).toBeCloseTo(a * Math.cos(theta), 12)
    expect(ring[0]![1]).toBeCloseTo(a * Math.sin(theta), 12)
    const r = ring.map(([x, y]) => Math.hypot(x, y))
    expect(Math.max(...r)).toBeCloseTo(a, 12)
    expect(Math.min(...r)).toBeCloseTo(b, 4)
    // Every point satisfies the implicit equation of the rotated ellipse.
    for (const [x, y] of ring) {
      const u = x * Math.cos(theta) + y * Math.sin(theta), v = -x * Math.sin(theta) + y * Math.cos(theta)
      expect((u / a) ** 2 + (v / b) ** 2).toBeCloseTo(1, 12)
    }
  })
})
