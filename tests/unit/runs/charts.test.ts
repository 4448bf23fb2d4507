// Axes, the profile-likelihood preparation and the extent-map frame (pure helpers, no DOM).
import { describe, expect, it } from 'vitest'
import { formatTick, linearScale, linearTicks, logScale, logTicks, niceStep, polylinePath } from '../../../composables/runs/chartAxes'
import { HALF_CHI2_95, PROFILE_FLOOR, prepareProfile } from '../../../composables/runs/profileChart'
import { frameAround, polygonRings, ringsPath, unwrapLongitudes } from '../../../composables/runs/extentMap'

describe('axes', () => {
  it('chooses 1-2-5 steps', () => {
    expect(niceStep(10, 5)).toBe(2)
    expect(niceStep(0.3, 5)).toBeCloseTo(0.05, 12) // raw 0.06: 6 < √50, so 5 × 0.01
    expect(niceStep(8, 5)).toBe(2) // raw 1.6 ≥ √2
    expect(niceStep(25, 5)).toBe(5)
    expect(linearTicks(-26, 4, 5)).toEqual([-25, -20, -15, -10, -5, 0])
    expect(linearTicks(-2.7, 0.4, 5)).toEqual([-2.5, -2, -1.5, -1, -0.5, 0])
  })
  it('puts log ticks at 1-2-5 per decade inside the range', () => {
    expect(logTicks(1.5, 80)).toEqual([2, 5, 10, 20, 50])
    expect(logTicks(0.01, 1e5)).toEqual([0.01, 0.1, 1, 10, 100, 1000, 10000, 100000])
    const narrow = logTicks(12, 40)
    expect(narrow.length).toBeGreaterThanOrEqual(2)
    for (const t of narrow) expect(t >= 12 && t <= 40).toBe(true)
    expect(logTicks(1.11, 1.38)).toEqual([1.11, 1.38])
  })
  it('maps domains onto ranges, log scales by decades', () => {
    const y = linearScale([-10, 0], [200, 0])
    expect(y(-10)).toBe(200)
    expect(y(-5)).toBe(100)
    const x = logScale([1, 100], [0, 400])
    expect(x(10)).toBeCloseTo(200, 10)
    expect(polylinePath([[0, 1], [2.345, 3]])).toBe('M0.00 1.00 L2.35 3.00')
    expect(formatTick(-20)).toBe('−20')
    expect(formatTick(0.30000000000000004)).toBe('0.3')
  })
})

describe('prepareProfile', () => {
  const curve = [
    { lengthScaleKm: 40, logLikelihood: -12 },
    { lengthScaleKm: 5, logLikelihood: -60 },
    { lengthScaleKm: 20, logLikelihood: -10.5 },
    { lengthScaleKm: 10, logLikelihood: -14 },
    { lengthScaleKm: 80, logLikelihood: Number.NaN },
  ]
  it('sorts by ℓ, drops non-finite points and measures against the fitted maximum', () => {
    const p = prepareProfile(curve, { lengthScaleKm: 22, logLikelihood: -10 })!
    expect(p.points.map((q) => q.lengthScaleKm)).toEqual([5, 10, 20, 40])
    expect(p.points.map((q) => q.relative)).toEqual([-50, -4, -0.5, -2])
    expect(p.maximum).toEqual({ lengthScaleKm: 22, logLikelihood: -10 })
    expect(p.floor).toBe(PROFILE_FLOOR)
    expect(p.clipped).toBe(true)
  })
  it('falls back to the highest point when the fitted maximum lies below the curve or is missing', () => {
    const p = prepareProfile(curve, { lengthScaleKm: 22, logLikelihood: -11 })!
    expect(p.maximum).toEqual({ lengthScaleKm: 20, logLikelihood: -10.5 })
    expect(prepareProfile(curve)!.maximum.lengthScaleKm).toBe(20)
    expect(prepareProfile([])).toBeNull()
  })
  it('always shows the 95 % cut-off, even for a flat curve', () => {
    const flat = prepareProfile([{ lengthScaleKm: 1, logLikelihood: 0 }, { lengthScaleKm: 2, logLikelihood: -0.1 }])!
    expect(flat.floor).toBeLessThan(-HALF_CHI2_95)
    expect(flat.clipped).toBe(false)
  })
  it('uses half the χ²(1) 0.95 quantile', () => {
    // scipy.stats.chi2.ppf(0.95, 1) = 3.841458820694124; it is also 1.959963984540054² (the normal 0.975 quantile squared).
    expect(HALF_CHI2_95 * 2).toBeCloseTo(1.959963984540054 ** 2, 12)
  })
})

describe('extent map frame', () => {
  it('keeps an outline across the antimeridian continuous', () => {
    expect(unwrapLongitudes([[179, 10], [-179, 10], [-179, 5], [179, 5]])).toEqual([[179, 10], [181, 10], [181, 5], [179, 5]])
  })
  it('contains the outline with north up and east right, equal scale after cos φ', () => {
    const corners: [number, number][] = [[-28, -42], [-20, -42], [-20, -48.4], [-28, -48.4]]
    const frame = frameAround(corners, 300)
    for (const c of corners) {
      const [px, py] = frame.project(c)
      expect(px).toBeGreaterThan(0)
      expect(px).toBeLessThan(frame.width)
      expect(py).toBeGreaterThan(0)
      expect(py).toBeLessThan(frame.height)
    }
    const [xw, yn] = frame.project([-28, -42])
    const [xe, ys] = frame.project([-20, -48.4])
    expect(xe).toBeGreaterThan(xw)
    expect(ys).toBeGreaterThan(yn)
    // One degree of longitude at the centre latitude is cos φ degrees of latitude long.
    const phi = ((frame.south + frame.north) / 2) * Math.PI / 180
    expect((xe - xw) / 8 / ((ys - yn) / 6.4)).toBeCloseTo(Math.cos(phi), 3) // pixels are rounded to 0.01
    for (const m of frame.meridians) expect(m > frame.west && m < frame.east).toBe(true)
  })
  it('draws only rings that reach the frame, shifted by a turn when needed', () => {
    const frame = frameAround([[178, 1], [182, 1], [182, -1], [178, -1]], 200)
    const near: [number, number][] = [[-179.5, 0], [-179, 0.5], [-179, -0.5]]
    const far: [number, number][] = [[0, 0], [1, 1], [1, 0]]
    expect(ringsPath([far], frame)).toBe('')
    expect(ringsPath([near], frame).startsWith('M')).toBe(true)
    expect(polygonRings({ type: 'MultiPolygon', coordinates: [[near, far], [far]] })).toHaveLength(3)
  })
})
