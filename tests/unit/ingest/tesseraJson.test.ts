import { describe, expect, it } from 'vitest'
import { readFileSync } from 'node:fs'
import { readEnsembleFile, readEnsembleFromPath } from '../../../server/ingest/readEnsemble'
import { fixturePath } from './fixtures'

const encode = (doc: unknown) => new TextEncoder().encode(JSON.stringify(doc))
const gustJson = (m: number, t: number, j: number, i: number) => 12 + 2 * t + 0.5 * m + 0.25 * j + 0.125 * i // write_cdl.py

describe('Tessera JSON ensemble grid (gust_grid.json)', () => {
  it('reads values in given row order, labels and times', async () => {
    const run = await readEnsembleFromPath(fixturePath('gust_grid.json'))
    expect(run.format).toBe('tessera-json')
    expect([run.variable, run.standardName, run.units, run.canonicalUnits, run.heightM, run.cellMethods])
      .toEqual(['gust', 'wind_speed_of_gust', 'm s-1', 'm s-1', 10, 'time: maximum'])
    expect(run.memberLabels).toEqual(['A', 'B'])
    expect(run.leadTimes).toEqual(['2031-03-04T06:00:00Z', '2031-03-04T12:00:00Z'])
    expect(run.forecastPeriodsHours).toEqual([6, 12])
    const { nx, ny } = run.grid
    for (let t = 0; t < 2; t++) for (let m = 0; m < 2; m++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
      const v = run.fields[t * 2 + m]![j * nx + i]!
      if (m === 1 && t === 0 && j === 0 && i === 0) expect(v).toBeNaN()
      else expect(v).toBeCloseTo(gustJson(m, t, j, i), 5)
    }
    expect(run.extent.map((x) => Number(x.toFixed(9)))).toEqual([19.95, -40.05, 20.35, -39.75])
  })

  it('flips rows given north first and converts units by standard name', async () => {
    const doc = JSON.parse(readFileSync(fixturePath('gust_grid.json'), 'utf8'))
    doc.units = 'knots'
    doc.grid.lat = [...doc.grid.lat].reverse()
    const run = await readEnsembleFile(encode(doc), 'g.json')
    const { nx, ny } = run.grid
    expect(Array.from(run.grid.y)).toEqual([-40, -39.9, -39.8].map((v) => v))
    // given row k is now at the northern end: reader row j = ny − 1 − k
    expect(run.fields[0]![(ny - 1) * nx + 2]).toBeCloseTo(gustJson(0, 0, 0, 2) * 1852 / 3600, 5)
    expect(run.notes.join(' ')).toMatch(/north to south/)
  })

  it('reads a projected grid given by a proj4 string (x, y in metres)', async () => {
    const doc = JSON.parse(readFileSync(fixturePath('gust_grid.json'), 'utf8'))
    delete doc.grid.lon; delete doc.grid.lat
    doc.grid.proj4 = '+proj=lcc +lat_1=-35 +lat_2=-45 +lat_0=-40 +lon_0=20 +x_0=0 +y_0=0 +R=6371229 +units=m +no_defs'
    doc.grid.x = [0, 1500, 3000, 4500]
    doc.grid.y = [0, 1500, 3000]
    const run = await readEnsembleFile(encode(doc), 'g.json')
    expect(run.grid.crs).toBe('lcc')
    expect([run.grid.dxKm, run.grid.dyKm]).toEqual([1.5, 1.5])
    // the projection origin (0, 0) is at 40° S, 20° E: the south-west corner lies 0.75 km west and south of it
    const [, , , sw] = run.corners
    expect(sw![0]).toBeLessThan(20); expect(sw![1]).toBeLessThan(-40)
    expect(sw![0]).toBeGreaterThan(19.98); expect(sw![1]).toBeGreaterThan(-40.01)
  })
})
