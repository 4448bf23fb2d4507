// Shape, transform, regime and all-dry helpers of the parameter table (pure, no Vue).
import { describe, expect, it } from 'vitest'
import {
  anisotropySortValue, anisotropyView, axisCompassPair, formatEllipseText, isAllDryFit, kmPerFineCell, latentNote, regimeText,
  svgMajorAxisEnd, svgRotationDegrees, transformLabel,
} from '../../../composables/runs/fitStructure'
import { sortFitRows } from '../../../composables/runs/fitRows'
import type { RunTask, TaskAnisotropy, TaskFit, TaskTransform } from '../../../composables/runs/types'

function fit(extra: Partial<TaskFit> = {}): TaskFit {
  return {
    kernel: 'matern32', lengthScale: 4, lengthScaleKm: 10, lengthScaleIntervalKm: [5, 20], variance: 1, mean: 0,
    logLikelihood: -10, atBound: null, method: 'exact', ...extra,
  }
}
function shape(extra: Partial<TaskAnisotropy>): TaskAnisotropy {
  return { source: 'fitted', adopted: true, ratio: 0.5, angle: 0, angleDegrees: 0, majorLengthScale: 4, minorLengthScale: 2, logLikelihoodGain: 9, ...extra }
}
const censored = (extra: Partial<TaskTransform> = {}): TaskTransform => ({ name: 'censored', lambda: 0.5, lambdaFitted: true, dryBlocks: 10, wetBlocks: 30, ...extra })
// What downscaleMember.ts allDryOutput stores: placeholders 0 and the censored summary with no wet block.
const allDry = (): TaskFit => fit({
  lengthScale: 0, lengthScaleKm: 0, lengthScaleIntervalKm: [0, 0], variance: 0, mean: 0, logLikelihood: 0,
  transform: censored({ lambdaFitted: false, wetBlocks: 0, dryBlocks: 40 }),
})

describe('SVG rotation of the ellipse (SVG y points down, the glyph is north up)', () => {
  it('rotates by −θ so that an axis anticlockwise from east turns anticlockwise on screen', () => {
    expect(svgRotationDegrees(0)).toBe(0)
    expect(svgRotationDegrees(35)).toBe(-35)
    expect(svgRotationDegrees(90)).toBe(-90)
    expect(svgRotationDegrees(215)).toBe(-35) // an axis has no sign: 215° is the same axis as 35°
  })
  it('puts the long axis end up (north) for θ = 90° and up-right (north-east) for θ = 45°', () => {
    expect(svgMajorAxisEnd(90, 10)).toEqual([0, -10])
    const [x, y] = svgMajorAxisEnd(45, 10)
    expect(x).toBeCloseTo(10 / Math.SQRT2, 12)
    expect(y).toBeCloseTo(-10 / Math.SQRT2, 12)
    expect(svgMajorAxisEnd(0, 10)).toEqual([10, 0])
  })
  it('agrees with SVG rotate(): rotating (r, 0) by the rotation gives the axis end', () => {
    // SVG rotate(a) maps (x, y) to (x cos a − y sin a, x sin a + y cos a) (SVG 1.1 §7.4, y down).
    for (const theta of [12, 35, 90, 133, 170]) {
      const a = (svgRotationDegrees(theta) * Math.PI) / 180
      const [ex, ey] = svgMajorAxisEnd(theta, 7)
      expect(7 * Math.cos(a)).toBeCloseTo(ex, 12)
      expect(7 * Math.sin(a)).toBeCloseTo(ey, 12)
    }
  })
})

describe('ellipse words', () => {
  it('names the long axis by its compass ends, northern end first', () => {
    expect(axisCompassPair(0)).toBe('E–W')
    expect(axisCompassPair(179)).toBe('E–W')
    expect(axisCompassPair(90)).toBe('N–S')
    expect(axisCompassPair(45)).toBe('NE–SW')
    expect(axisCompassPair(35)).toBe('NE–SW') // bearing 55°, nearer NE (45°) than ENE (67.5°)
    expect(axisCompassPair(135)).toBe('NW–SE')
    expect(axisCompassPair(120)).toBe('NNW–SSE') // bearing 330°
  })
  it('says long × short length scale and the direction', () => {
    expect(formatEllipseText(12, 6, 35)).toBe('12.0 × 6.0 km, NE–SW (35° from east)')
    expect(formatEllipseText(140, 21.25, 179.7)).toBe('140 × 21.3 km, E–W (0° from east)')
  })
  it('converts ℓ₁, ℓ₂ from fine cells to km with the fit’s own spacing', () => {
    const f = fit({ lengthScale: 4, lengthScaleKm: 10, anisotropy: shape({ majorLengthScale: 4, minorLengthScale: 1.2, ratio: 0.3, angleDegrees: 60 }) })
    const km = kmPerFineCell(f, null)
    expect(km).toBe(2.5)
    const view = anisotropyView(f, true, km)
    expect(view.kind).toBe('adopted')
    if (view.kind !== 'adopted') return
    expect(view.majorKm).toBeCloseTo(10, 12)
    expect(view.minorKm).toBeCloseTo(3, 12)
    expect(view.text).toBe('10.0 × 3.0 km, NNE–SSW (60° from east)')
    expect(view.label).toMatch(/long length scale 10\.0 km along NNE to SSW, 60 degrees anticlockwise from east; short length scale 3\.0 km \(ratio 0\.30\)\.$/)
    expect(kmPerFineCell(allDry(), 2.6)).toBe(2.6)
  })
  it('tells a shape that was fitted but not adopted, and a run without the setting', () => {
    expect(anisotropyView(fit({ anisotropy: shape({ adopted: false, ratio: 0.8 }) }), true, 2.5)).toMatchObject({ kind: 'isotropic', text: 'isotropic (test not significant)' })
    expect(anisotropyView(fit(), false, 2.5)).toMatchObject({ kind: 'off', text: '—' })
  })
  it('sorts by the ratio of the model used: adopted ratio, 1 when isotropic, none when off or all dry', () => {
    expect(anisotropySortValue(fit({ anisotropy: shape({ ratio: 0.4 }) }))).toBe(0.4)
    expect(anisotropySortValue(fit({ anisotropy: shape({ adopted: false, ratio: 0.4 }) }))).toBe(1)
    expect(anisotropySortValue(fit())).toBeNull()
    expect(anisotropySortValue(allDry())).toBeNull()
  })
})

describe('latent transform', () => {
  it('labels λ per row and stays silent without a transform', () => {
    expect(transformLabel({ name: 'boxcox', lambda: 0.4213, lambdaFitted: true })).toBe('Box–Cox λ = 0.42 (fitted)')
    expect(transformLabel(censored({ lambdaFitted: false }))).toBe('censored power λ = 0.50 (set)')
    expect(transformLabel({ name: 'boxcox', lambda: 2, lambdaFitted: true, lambdaAtBound: 'upper' })).toBe('Box–Cox λ = 2.00 (fitted, at upper bound)')
    expect(transformLabel({ name: 'log', lambda: 0, lambdaFitted: false })).toBe('log')
    expect(transformLabel(censored({ lambda: 0.694, lambdaMethod: 'indirect', coarseLambda: 0.484 }))).toBe('censored power λ = 0.69 (fitted, corrected for block averaging from 0.48)')
    expect(transformLabel({ name: 'none', lambda: 1, lambdaFitted: false })).toBeNull()
    expect(transformLabel(undefined)).toBeNull()
  })
  it('says above the table that ℓ and σ are latent, with the λ range', () => {
    expect(latentNote([fit(), fit({ transform: { name: 'none', lambda: 1, lambdaFitted: false } }), null])).toBeNull()
    const boxcox = (lambda: number) => fit({ transform: { name: 'boxcox', lambda, lambdaFitted: true } })
    expect(latentNote([boxcox(0.42), boxcox(0.421)])).toBe('ℓ, σ and the mean are of the latent (transformed) field, not of the values themselves: Box–Cox λ = 0.42.')
    expect(latentNote([boxcox(0.31), boxcox(0.52), fit()])).toBe(
      'ℓ, σ and the mean (marked “latent”) are of the latent (transformed) field, not of the values themselves: Box–Cox λ = 0.31–0.52.')
  })
  it('leaves all-dry members out of the note: nothing was fitted there', () => {
    expect(latentNote([allDry(), allDry()])).toBeNull()
    expect(latentNote([allDry(), fit({ transform: censored({ lambda: 0.6 }) })])).toMatch(/censored latent Gaussian .* power λ = 0\.60\.$/)
  })
})

describe('all-dry members', () => {
  it('are recognised from the censored summary with no wet block', () => {
    expect(isAllDryFit(allDry())).toBe(true)
    expect(isAllDryFit(fit({ transform: censored() }))).toBe(false)
    expect(isAllDryFit(fit({ lengthScale: 0, variance: 0 }))).toBe(false) // no transform: not the censored all-dry case
    expect(isAllDryFit(null)).toBe(false)
  })
  it('sort after the fitted members and before the unfitted ones, in both directions, for every fitted quantity', () => {
    const task = (id: number, f: TaskFit | null, status: RunTask['status'] = 'done'): RunTask => ({
      id, leadIndex: id, memberIndex: 0, status, attempts: 1, elapsedMs: 10 * id, error: null, startedAt: null, finishedAt: null, fit: f,
    })
    const tasks = [
      task(1, fit({ lengthScaleKm: 30, variance: 4, mean: 2, logLikelihood: -5, anisotropy: shape({ ratio: 0.7 }) })),
      task(2, null, 'running'),
      task(3, fit({ lengthScaleKm: 10, variance: 1, mean: -1, logLikelihood: -20, anisotropy: shape({ ratio: 0.3 }) })),
      task(4, allDry()), // a later lead than the unfitted member: its place is not the tie-break's doing
    ]
    for (const key of ['lengthScale', 'sigma', 'mean', 'logLikelihood', 'anisotropy'] as const) {
      expect(sortFitRows(tasks, { key, direction: 'ascending' }).map((t) => t.id).slice(2)).toEqual([4, 2])
      expect(sortFitRows(tasks, { key, direction: 'descending' }).map((t) => t.id).slice(2)).toEqual([4, 2])
    }
    expect(sortFitRows(tasks, { key: 'anisotropy', direction: 'ascending' }).map((t) => t.id)).toEqual([3, 1, 4, 2])
    expect(sortFitRows(tasks, { key: 'kernel', direction: 'ascending' }).map((t) => t.id)).toEqual([1, 3, 4, 2])
    // Quantities an all-dry member does have still sort normally.
    expect(sortFitRows(tasks, { key: 'time', direction: 'descending' }).map((t) => t.id)).toEqual([4, 3, 2, 1])
  })
})

describe('regime windows', () => {
  const window = (departs: boolean, lengthScaleKm: number) => ({ departs, lengthScale: lengthScaleKm / 2.5, lengthScaleKm, variance: 1 })
  it('counts the local windows and gives the range of their ℓ', () => {
    const windows = [window(true, 4), window(false, 7), window(true, 11), window(true, 6.5), ...Array.from({ length: 5 }, () => window(false, 8))]
    expect(regimeText({ used: true, tiles: [3, 3], departures: 3, windows })).toBe('3 of 9 windows local, ℓ 4.0–11.0 km')
  })
  it('says why the stationary model was kept', () => {
    expect(regimeText({ used: false, note: 'grid too small for two windows', tiles: [1, 1], departures: 0, windows: [] })).toBe('not used: grid too small for two windows')
    expect(regimeText({ used: true, tiles: [2, 1], departures: 0, windows: [window(false, 5), window(false, 6)] })).toBe('0 of 2 windows local')
    expect(regimeText(undefined)).toBeNull()
  })
})
