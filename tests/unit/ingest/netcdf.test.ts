import { beforeAll, describe, expect, it } from 'vitest'
import { readEnsembleFile, readEnsembleFromPath } from '../../../server/ingest/readEnsemble'
import { summariseRun } from '../../../server/ingest/summary'
import type { EnsembleRun } from '../../../server/ingest/types'
import { readCfRun } from '../../../server/ingest/cfReader'
import { openNetcdfClassic } from '../../../server/ingest/netcdfClassic'
import { withNetcdf4 } from '../../../server/ingest/netcdf4'
import { fixtureBytes, fixturePath, gdalCorners, gustPacked, lawOfCosinesKm, precipKgM2, sameCornerSet, t2mKelvin } from './fixtures'

// Values follow the formulas in each CDL file; the .nc files were written by ncgen (netcdf-bin), so these
// tests check the readers against the reference netCDF library's encoding. Float32 data carry ~1e-5 K rounding.
const FLOAT32_TOL = 3e-5
const KNOT = 1852 / 3600 // m/s, exact by definition of the international nautical mile

describe('NetCDF classic: 2 m temperature on a regular lat–lon grid (t2m_latlon_classic.nc)', () => {
  let run: EnsembleRun
  beforeAll(async () => { run = await readEnsembleFile(fixtureBytes('t2m_latlon_classic.nc'), 't2m_latlon_classic.nc') })

  it('reads metadata, members and times', () => {
    expect(run.format).toBe('netcdf-classic')
    expect(run.variable).toBe('air_temperature')
    expect(run.standardName).toBe('air_temperature')
    expect(run.longName).toBe('Air temperature at 2 m')
    expect([run.units, run.canonicalUnits, run.displayUnits]).toEqual(['K', 'degC', '°C'])
    expect(run.members).toBe(3)
    expect(run.memberLabels).toEqual(['0', '1', '2'])
    // reference: 720 minutes since 2031-03-03 12:00 = 2031-03-04 00:00; valid: 78 and 84 hours since 2031-03-01
    expect(run.referenceTime).toBe('2031-03-04T00:00:00Z')
    expect(run.leadTimes).toEqual(['2031-03-04T06:00:00Z', '2031-03-04T12:00:00Z'])
    expect(run.forecastPeriodsHours).toEqual([6, 12])
    expect(run.heightM).toBe(2)
    expect(run.fields).toHaveLength(6)
  })

  it('flips the north-first rows and converts K to °C cell by cell', () => {
    const { nx, ny } = run.grid
    expect([nx, ny]).toEqual([6, 5])
    expect(Array.from(run.grid.y)).toEqual([45, 45.25, 45.5, 45.75, 46])
    expect(run.notes.join(' ')).toMatch(/flipped so the first row is the southernmost/)
    for (let t = 0; t < 2; t++) {
      for (let m = 0; m < 3; m++) {
        const field = run.fields[t * 3 + m]!
        for (let j = 0; j < ny; j++) {
          for (let i = 0; i < nx; i++) {
            const v = field[j * nx + i]!
            if (t === 1 && m === 2 && j === 4 && i === 5) { expect(v).toBeNaN(); continue } // the _FillValue cell (file row 0)
            expect(Math.abs(v - (t2mKelvin(t, m, ny - 1 - j, i) - 273.15))).toBeLessThan(FLOAT32_TOL)
          }
        }
      }
    }
  })

  it('measures the spacing on the sphere and places the grid', () => {
    const R = 6371.0088 // IUGG mean radius, the default for grids without a figure of the Earth
    // dy: 0.25° of latitude = R·0.25·π/180; dx: mean over rows of the 0.25° longitude step (law of cosines)
    expect(run.grid.dyKm).toBeCloseTo(R * 0.25 * Math.PI / 180, 8)
    const rows = [45, 45.25, 45.5, 45.75, 46]
    const dx = rows.reduce((s, lat) => s + lawOfCosinesKm(0, lat, 0.25, lat, R), 0) / rows.length
    expect(run.grid.dxKm).toBeCloseTo(dx, 6)
    expect(run.grid.spacingKm).toBeCloseTo((dx + R * 0.25 * Math.PI / 180) / 2, 6)
    expect(run.grid.crs).toBe('EPSG:4326')
    // outer cell edges: centres ± half a cell (GDAL gives the same corners: -30.125 … -28.625, 44.875 … 46.125)
    expect(run.extent).toEqual([-30.125, 44.875, -28.625, 46.125])
    expect(run.corners).toEqual([[-30.125, 46.125], [-28.625, 46.125], [-28.625, 44.875], [-30.125, 44.875]])
  })

  it('reads the same from a path', async () => {
    const fromPath = await readEnsembleFromPath(fixturePath('t2m_latlon_classic.nc'))
    expect(summariseRun(fromPath)).toEqual(summariseRun(run))
    expect(fromPath.fields[4]).toEqual(run.fields[4])
  })
})

describe('NetCDF-4 (deflate + shuffle): packed gusts in knots on a rotated-pole grid (gust_rotated_nc4.nc)', () => {
  let run: EnsembleRun
  beforeAll(async () => { run = await readEnsembleFile(fixtureBytes('gust_rotated_nc4.nc'), 'gust_rotated_nc4.nc') })

  it('reads metadata with the member dimension first', () => {
    expect(run.format).toBe('netcdf-4')
    expect([run.variable, run.standardName, run.units, run.canonicalUnits]).toEqual(['gust', 'wind_speed_of_gust', 'knots', 'm s-1'])
    expect(run.members).toBe(3)
    expect(run.cellMethods).toBe('time: maximum')
    expect(run.heightM).toBe(10)
    // reference: 3 days since 2031-03-01; periods 10800/21600/32400 s agree with the valid times
    expect(run.referenceTime).toBe('2031-03-04T00:00:00Z')
    expect(run.leadTimes).toEqual(['2031-03-04T03:00:00Z', '2031-03-04T06:00:00Z', '2031-03-04T09:00:00Z'])
    expect(run.forecastPeriodsHours).toEqual([3, 6, 9])
  })

  it('unpacks scale_factor, masks _FillValue and converts knots to m/s', () => {
    const { nx, ny } = run.grid
    for (let t = 0; t < 3; t++) {
      for (let m = 0; m < 3; m++) {
        const field = run.fields[t * 3 + m]!
        for (let j = 0; j < ny; j++) {
          for (let i = 0; i < nx; i++) {
            const v = field[j * nx + i]!
            if (m === 1 && t === 2 && j === 4 && i === 0) { expect(v).toBeNaN(); continue }
            expect(v).toBeCloseTo(gustPacked(m, t, j, i) * 0.01 * KNOT, 5)
          }
        }
      }
    }
  })

  it('measures the rotated grid on the sphere of the file and matches PROJ corners', () => {
    const R = 6371.229 // earth_radius of the grid mapping
    expect(run.grid.crs).toBe('rotated_latitude_longitude')
    expect(run.grid.proj4).toContain('+proj=ob_tran')
    expect(run.grid.dyKm).toBeCloseTo(R * 0.11 * Math.PI / 180, 8)
    const rlat = [-0.22, -0.11, 0, 0.11, 0.22]
    const dx = rlat.reduce((s, lat) => s + lawOfCosinesKm(0, lat, 0.11, lat, R), 0) / rlat.length
    expect(run.grid.dxKm).toBeCloseTo(dx, 6)
    // corners of the outer cell edges, transformed by gdaltransform (PROJ) in make-fixtures.sh
    expect(sameCornerSet(run.corners, gdalCorners['gust_rotated_nc4.nc']!, 1e-7)).toBe(true)
    const lons = gdalCorners['gust_rotated_nc4.nc']!.map((c) => c[0])
    const lats = gdalCorners['gust_rotated_nc4.nc']!.map((c) => c[1])
    // the edges curve in lon–lat, so the box of the whole outline is at least the box of the corners
    expect(run.extent[0]).toBeLessThanOrEqual(Math.min(...lons) + 1e-9)
    expect(run.extent[2]).toBeGreaterThanOrEqual(Math.max(...lons) - 1e-9)
    expect(run.extent[1]).toBeLessThanOrEqual(Math.min(...lats) + 1e-9)
    expect(run.extent[3]).toBeGreaterThanOrEqual(Math.max(...lats) - 1e-9)
    expect(run.extent[3] - Math.max(...lats)).toBeLessThan(0.01)
  })

  it('reads the same in place from a path (h5wasm on the host file system)', async () => {
    const fromPath = await readEnsembleFromPath(fixturePath('gust_rotated_nc4.nc'))
    expect(summariseRun(fromPath)).toEqual(summariseRun(run))
    expect(fromPath.fields[8]).toEqual(run.fields[8])
  })
})

describe('NetCDF 64-bit offset: 6 h precipitation on a Lambert conformal grid in km (precip_lcc_64bit.nc)', () => {
  let run: EnsembleRun
  beforeAll(async () => { run = await readEnsembleFile(fixtureBytes('precip_lcc_64bit.nc'), 'precip_lcc_64bit.nc') })

  it('reads record (unlimited time) variables and derives the reference time', () => {
    expect(run.format).toBe('netcdf-classic')
    expect([run.standardName, run.units, run.canonicalUnits, run.cellMethods]).toEqual(['precipitation_amount', 'kg m-2', 'mm', 'time: sum'])
    expect(run.memberLabels).toEqual(['1', '2', '3'])
    expect(run.leadTimes).toEqual(['2031-03-04T06:00:00Z', '2031-03-04T12:00:00Z'])
    expect(run.referenceTime).toBe('2031-03-04T00:00:00Z') // time − forecast_period
    expect(run.notes.join(' ')).toMatch(/derived from time − forecast_period/)
  })

  it('flips east-to-west columns; kg m-2 are mm', () => {
    const { nx, ny } = run.grid
    expect(Array.from(run.grid.x)).toEqual([-5000, -2500, 0, 2500, 5000, 7500]) // km → m
    for (let t = 0; t < 2; t++) {
      for (let m = 0; m < 3; m++) {
        for (let j = 0; j < ny; j++) {
          for (let i = 0; i < nx; i++) {
            expect(Math.abs(run.fields[t * 3 + m]![j * nx + i]! - precipKgM2(t, m, j, nx - 1 - i))).toBeLessThan(1e-6)
          }
        }
      }
    }
  })

  it('has the nominal 2.5 km spacing and the corners GDAL computes', () => {
    expect(run.grid.crs).toBe('lambert_conformal_conic')
    expect([run.grid.dxKm, run.grid.dyKm, run.grid.spacingKm]).toEqual([2.5, 2.5, 2.5])
    expect(sameCornerSet(run.corners, gdalCorners['precip_lcc_64bit.nc']!, 1e-6)).toBe(true)
    const [nw, ne, se, sw] = run.corners
    expect(nw![0]).toBeLessThan(ne![0]); expect(sw![0]).toBeLessThan(se![0])
    expect(nw![1]).toBeGreaterThan(sw![1]); expect(ne![1]).toBeGreaterThan(se![1])
  })
})

describe('field-by-field reading (used for variables too large to read in one call)', () => {
  it('gives the same fields as reading the whole variable', async () => {
    const classic = openNetcdfClassic(fixtureBytes('precip_lcc_64bit.nc'))
    const a = readCfRun(classic, 'netcdf-classic', { maxDecodedBytes: 1e9 })
    const b = readCfRun(classic, 'netcdf-classic', { maxDecodedBytes: 1e9, wholeReadCells: 0 })
    expect(b.fields).toEqual(a.fields)
    const [c, d] = await Promise.all([0, undefined].map((wholeReadCells) =>
      withNetcdf4({ bytes: fixtureBytes('gust_rotated_nc4.nc') }, (ds) => readCfRun(ds, 'netcdf-4', { maxDecodedBytes: 1e9, wholeReadCells }))))
    expect(c!.fields).toEqual(d!.fields)
    expect(c!.fields[5]![7]).toBeCloseTo(gustPacked(2, 1, 1, 1) * 0.01 * KNOT, 5)
  })
})

describe('summariseRun', () => {
  it('gives the preview of the first member at the first lead time', async () => {
    const run = await readEnsembleFile(fixtureBytes('t2m_latlon_classic.nc'), 'x.nc')
    const s = summariseRun(run)
    let min = Infinity, max = -Infinity, sum = 0
    for (let jf = 0; jf < 5; jf++) for (let i = 0; i < 6; i++) {
      const c = t2mKelvin(0, 0, jf, i) - 273.15
      min = Math.min(min, c); max = Math.max(max, c); sum += c
    }
    expect(s.stats.min).toBeCloseTo(min, 4)
    expect(s.stats.max).toBeCloseTo(max, 4)
    expect(s.stats.mean).toBeCloseTo(sum / 30, 4)
    expect(s.stats.missingCells).toBe(0)
    expect(s.grid).toEqual({ nx: 6, ny: 5, spacingKm: expect.any(Number), dxKm: expect.any(Number), dyKm: expect.any(Number), crs: 'EPSG:4326' })
    expect(JSON.parse(JSON.stringify(s))).toEqual(s) // plain JSON, no typed arrays
  })
})
