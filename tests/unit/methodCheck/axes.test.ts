// Axis geometry of the method-check charts (composables/methodCheck/axes.ts).
import { describe, expect, it } from 'vitest'
import { axisScale, extentOf, linePath, tickLabel } from '../../../composables/methodCheck/axes'

describe('method-check chart axes', () => {
  it('widens linear extents to whole 1-2-5 steps', () => {
    const s = axisScale([0.13, 0.97], [0, 100], false)
    expect(s.domain).toEqual([0, 1])
    expect(s.ticks.map((t) => t.label)).toEqual(['0', '0.2', '0.4', '0.6', '0.8', '1'])
    expect(s.at(0.5)).toBe(50)
  })

  it('widens log extents to whole decades, 1-2-5 ticks on a few decades, decades on many', () => {
    const s = axisScale([0.03, 0.4], [0, 200], true)
    expect(s.domain).toEqual([0.01, 1])
    expect(s.ticks.map((t) => t.label)).toEqual(['0.01', '0.02', '0.05', '0.1', '0.2', '0.5', '1'])
    expect(s.at(0.1)).toBeCloseTo(100, 12)
    expect(axisScale([2e-4, 50], [0, 1], true).ticks.map((t) => t.value)).toEqual([1e-4, 1e-3, 1e-2, 0.1, 1, 10, 100])
    // Custom labels, e.g. wavelength 1/k on a wavenumber axis.
    expect(axisScale([0.002, 0.08], [0, 1], true, (k) => String(1 / k)).ticks.map((t) => t.label).slice(3, 6)).toEqual(['100', '50', '20'])
  })

  it('labels extremes as powers of ten and breaks lines at missing values', () => {
    expect(tickLabel(2.5)).toBe('2.5')
    expect(tickLabel(1e6)).toBe('10^6')
    expect(tickLabel(2e-5)).toBe('2×10^-5')
    expect(tickLabel(-0.5)).toBe('−0.5')
    expect(extentOf([3, NaN, -1, 0, 8], true)).toEqual([3, 8])
    expect(extentOf([NaN], false)).toBeNull()
    const x = axisScale([0, 10], [0, 10], false), y = axisScale([0, 10], [10, 0], false)
    expect(linePath([[0, 0], [1, 1], null, [3, 3], [4, 4]], x, y)).toBe('M0,10L1,9M3,7L4,6')
  })
})
