// Display classes of probabilities, the point readout against the product maps, and area cells on a grid.
import { describe, expect, it } from 'vitest'
import { ProductPlan } from '../../../shared/numerics/ensemble/productPlan'
import { rasteriseOnAxes } from '../../../shared/numerics/geo/rasterise'
import { circlePolygon } from '../../../shared/numerics/geo/shapes'
import type { RunGrid } from '../../../server/db/schema/runs'
import { runPlacement, type LeadSamples, type RunRow } from '../../../server/utils/runSamples'
import {
  classesForEnsemble, eventPhrase, legendTitle, pointReadout, probabilityClassOf, probabilityDisplayClasses, validTimeText, windowTimeText,
} from '../../../server/utils/products'
import { areaCellsOnGrid } from '../../../server/utils/areaProducts'

/** A seeded LCG so the synthetic samples are reproducible. */
function lcg(seed: number) { let a = seed >>> 0; return () => { a = (Math.imul(a, 1664525) + 1013904223) >>> 0; return a / 4294967296 } }

const grid: RunGrid = {
  nx: 6, ny: 5, spacingKm: 20, dxKm: 20, dyKm: 20, crs: 'EPSG:4326', proj4: '+proj=longlat +datum=WGS84 +no_defs',
  x: Array.from({ length: 6 }, (_, i) => -25 + 0.25 * i), y: Array.from({ length: 5 }, (_, j) => -46 + 0.2 * j), xUnits: 'degrees_east', yUnits: 'degrees_north',
}
const run = {
  id: 9001, grid, settings: { factor: 4, samplesPerMember: 3, kernel: 'se', seed: 1 }, standardName: 'wind_speed_of_gust', variable: 'gust',
  heightM: 10, displayUnits: 'm/s', leadTimes: ['2031-11-14T06:00:00Z', '2031-11-14T12:00:00Z'], cellMethods: null, forecastPeriodsHours: [6, 12],
} as unknown as RunRow

function fakeEntry(members: number, perMember: number, seed = 7): LeadSamples {
  const placement = runPlacement(run)
  const { nx, ny } = placement.geometry
  const u = lcg(seed)
  const grids = Array.from({ length: members * perMember }, () => Float32Array.from({ length: nx * ny }, () => 10 + 15 * u()))
  return {
    runId: run.id, leadIndex: 0, fingerprint: 'test', plan: new ProductPlan({ nx, ny, members: grids }),
    memberIndices: Array.from({ length: members }, (_, m) => m), sampleStart: Array.from({ length: members + 1 }, (_, m) => m * perMember),
    samplesPerMember: perMember, timeCoherent: false, coarse: Array.from({ length: members }, () => new Float32Array(grid.nx * grid.ny).fill(15)),
    missing: null, valueRange: [10, 25], loadMs: 0, maps: new Map(),
  }
}

describe('probability display classes', () => {
  it('are never finer than one member: 18 members × 10 samples → 10 % bins; 5 × 10 → 20 %; 4 × 1 → one class per member', () => {
    const width = (members: number, samples: number) => { const c = classesForEnsemble(samples, members).classes; return c[1]!.upper - c[1]!.lower }
    expect(width(18, 180)).toBeCloseTo(0.1, 12)
    expect(width(5, 50)).toBeCloseTo(0.2, 12)
    expect(classesForEnsemble(4, 4).classes.map((c) => c.label)).toEqual(['no scenario (0 of 4)', '1 of 4', '2 of 4', '3 of 4', '4 of 4'])
    for (const [m, s] of [[18, 10], [5, 10], [3, 7], [12, 1]] as const) {
      const c = classesForEnsemble(m * s, m).classes
      for (const k of c.slice(1)) expect(k.upper - k.lower).toBeGreaterThanOrEqual(1 / m - 1e-12)
    }
  })

  it('put exactly 0 in "no scenario", any positive probability (even a tiny NEP) in a class ≥ 1, and k/N at its upper edge in its class', () => {
    const classes = probabilityDisplayClasses(classesForEnsemble(180, 18))
    expect(probabilityClassOf(0, classes)).toBe(0)
    expect(probabilityClassOf(1e-6, classes)).toBe(1)
    expect(probabilityClassOf(18 / 180, classes)).toBe(1)
    expect(probabilityClassOf(19 / 180, classes)).toBe(2)
    expect(probabilityClassOf(1, classes)).toBe(10)
  })
})

describe('wording', () => {
  it('states the event inclusively and the valid time in UTC; periods for accumulations', () => {
    expect(eventPhrase(run, 20, 'above')).toBe('gusts reach 20 m/s or more')
    expect(eventPhrase({ ...run, standardName: 'air_temperature', heightM: 2, displayUnits: '°C' } as RunRow, -3, 'below')).toBe('the 2 m temperature falls to −3 °C or lower')
    expect(validTimeText(run, 1)).toBe('valid 12 UTC 14 Nov 2031')
    expect(validTimeText({ ...run, cellMethods: 'time: sum' } as RunRow, 1)).toBe('06–12 UTC 14 Nov 2031')
  })

  it('names a time window by its valid times, or for period values by the span its periods cover', () => {
    expect(windowTimeText(run, 0, 1, 'any')).toBe('at any of the 2 valid times from 06 UTC 14 Nov 2031 to 12 UTC 14 Nov 2031')
    expect(windowTimeText(run, 0, 1, 'over')).toBe('over the 2 valid times from 06 UTC 14 Nov 2031 to 12 UTC 14 Nov 2031')
    const sums = { ...run, cellMethods: 'time: sum', leadTimes: ['2031-11-14T06:00:00Z', '2031-11-14T12:00:00Z', '2031-11-14T18:00:00Z', '2031-11-15T00:00:00Z'] } as RunRow
    // Four 6-hour periods ending 06, 12, 18 and 00 UTC: together they cover 00 UTC 14 Nov to 00 UTC 15 Nov.
    expect(windowTimeText(sums, 0, 3, 'any')).toBe('in any of the 4 periods of 6 h between 00 UTC 14 Nov 2031 and 00 UTC 15 Nov 2031')
    expect(windowTimeText(sums, 1, 2, 'over')).toBe('over the 2 periods of 6 h between 06 UTC 14 Nov 2031 and 18 UTC 14 Nov 2031')
  })

  it('the legend names product, radius, time and scenario count', () => {
    const entry = fakeEntry(3, 3)
    const title = legendTitle(run, entry, runPlacement(run), { product: 'nmep', threshold: 20, direction: 'above', radiusKm: 10 })
    expect(title).toBe('Probability that gusts reach 20 m/s or more somewhere within 10 km (NMEP), valid 06 UTC 14 Nov 2031 — 3 members × 3 samples')
  })
})

describe('point readout', () => {
  const entry = fakeEntry(4, 3)
  const placement = runPlacement(run)
  const g = placement.geometry

  it('agrees with the product maps at the cell (probability, NEP, NMEP) for several radii and both directions', () => {
    for (const [i, j] of [[0, 0], [5, 7], [23, 19], [12, 11]] as const) {
      const lon = g.xCentres[i]!, lat = g.yCentres[j]!
      for (const radiusKm of [0, 6, 11.3]) {
        for (const direction of ['above', 'below'] as const) {
          const r = pointReadout(run, entry, placement, lon, lat, 18, direction, radiusKm)
          const maps = entry.plan.probabilityMaps(18, direction, radiusKm / g.spacingKm)
          const k = j * g.nx + i
          expect(r.cell).toMatchObject({ i, j })
          expect(r.probability!.value).toBeCloseTo(maps.probability[k]!, 12)
          expect(r.neighbourhood!.nep).toBeCloseTo(maps.nep[k]!, 12)
          expect(r.neighbourhood!.nmep).toBeCloseTo(maps.nmep[k]!, 12)
        }
      }
    }
  })

  it('counts members agreeing by brute force and gives type-7 percentiles of the samples', () => {
    const i = 9, j = 4, k = j * g.nx + i
    const r = pointReadout(run, entry, placement, g.xCentres[i]!, g.yCentres[j]!, 17, 'above', 0)
    let agreeing = 0
    for (let m = 0; m < 4; m++) if ([0, 1, 2].some((s) => entry.plan.stack.members[m * 3 + s]![k]! >= 17)) agreeing++
    expect(r.membersAgreeing!.count).toBe(agreeing)
    expect(r.membersAgreeing!.of).toBe(4)
    const values = entry.plan.stack.members.map((gr) => gr[k]!).sort((a, b) => a - b)
    // Type 7 with n = 12: h = 11·0.1 = 1.1 → x(1) + 0.1·(x(2) − x(1)) (0-based order statistics).
    expect(r.value!.p10).toBeCloseTo(values[1]! + 0.1 * (values[2]! - values[1]!), 5)
    expect(r.value!.p50).toBeCloseTo((values[5]! + values[6]!) / 2, 5)
  })

  it('says when the place is outside the grid', () => {
    expect(pointReadout(run, entry, placement, 10, 10, 18, 'above', 0).inside).toBe(false)
  })
})

describe('area cells on the fine grid', () => {
  const placement = runPlacement(run)
  const g = placement.geometry

  it('are the cells whose centre is inside (same as the rasteriser), minus cells without coarse data', () => {
    const circle = circlePolygon([-24.4, -45.6], 15)
    const geometry = { type: 'MultiPolygon' as const, coordinates: [circle.coordinates] }
    const expected = rasteriseOnAxes(circle, g.xCentres, g.yCentres)
    const missing = new Uint8Array(g.nx * g.ny)
    const firstInside = expected.indexOf(1)
    missing[firstInside] = 1
    const onGrid = areaCellsOnGrid(placement, geometry, missing)
    const want = [...expected].flatMap((v, k) => (v && k !== firstInside ? [k] : []))
    expect([...onGrid.cells]).toEqual(want)
    expect(onGrid.note).toMatch(/1 cells/)
  })

  it('a circle smaller than a cell uses the cell under its centre; an area off the grid has no cells', () => {
    const tiny = circlePolygon([-24.41, -45.61], 0.3)
    const onGrid = areaCellsOnGrid(placement, { type: 'MultiPolygon', coordinates: [tiny.coordinates] }, null)
    expect(onGrid.cells.length).toBe(1)
    expect(onGrid.note).toMatch(/smaller than one grid cell/)
    const far = circlePolygon([40, 10], 30)
    expect(areaCellsOnGrid(placement, { type: 'MultiPolygon', coordinates: [far.coordinates] }, null).cells.length).toBe(0)
  })
})
