import { describe, expect, it } from 'vitest'
import { readEnsembleFile, readEnsembleFromPath } from '../../../server/ingest/readEnsemble'
import { summariseRun } from '../../../server/ingest/summary'
import { fixtureBytes, fixturePath, gdalCorners, gustUtmPacked, sameCornerSet, t2mKelvin } from './fixtures'

// The .tif files were written by gdal_translate (gdal-bin) from ASCII grids; see make-fixtures.sh.
describe('GeoTIFF, EPSG:4326, Float32 with nodata, bands = members (t2m_members.tif)', () => {
  it('reads the same lead-time-0 fields as the NetCDF file they were made from', async () => {
    const tif = await readEnsembleFile(fixtureBytes('t2m_members.tif'), 't2m_members.tif')
    const nc = await readEnsembleFile(fixtureBytes('t2m_latlon_classic.nc'), 't2m_latlon_classic.nc')
    expect(tif.format).toBe('geotiff')
    expect([tif.standardName, tif.units, tif.canonicalUnits, tif.longName, tif.heightM]).toEqual(['air_temperature', 'K', 'degC', 'Air temperature at 2 m', 2])
    expect(tif.members).toBe(3)
    expect(tif.memberLabels).toEqual(['member 0', 'member 1', 'member 2'])
    expect(tif.leadTimes).toEqual(['2031-03-04T06:00:00Z'])
    expect(tif.referenceTime).toBe('2031-03-04T00:00:00Z')
    expect(tif.forecastPeriodsHours).toEqual([6])
    expect(Array.from(tif.grid.x)).toEqual(Array.from(nc.grid.x))
    expect(Array.from(tif.grid.y)).toEqual(Array.from(nc.grid.y))
    expect(tif.extent).toEqual(nc.extent)
    const { nx } = tif.grid
    for (let m = 0; m < 3; m++) {
      for (let k = 0; k < tif.fields[m]!.length; k++) {
        const [j, i] = [Math.floor(k / nx), k % nx]
        if (m === 1 && j === 2 && i === 3) { expect(tif.fields[m]![k]).toBeNaN(); continue } // nodata cell (row 2 from the north)
        // the ASCII grids carry 4 decimals, then float32
        expect(Math.abs(tif.fields[m]![k]! - nc.fields[m]![k]!)).toBeLessThan(1e-4)
        expect(Math.abs(tif.fields[m]![k]! - (t2mKelvin(0, m, 4 - j, i) - 273.15))).toBeLessThan(1e-4)
      }
    }
  })
})

describe('GeoTIFF, UTM zone 26S, Int16 scaled, DEFLATE (gust_utm.tif)', () => {
  it('applies the band scale, converts km/h to m/s and matches GDAL corners', async () => {
    const run = await readEnsembleFromPath(fixturePath('gust_utm.tif'))
    expect([run.variable, run.units, run.canonicalUnits, run.cellMethods]).toEqual(['wind_speed_of_gust', 'km/h', 'm s-1', 'time: maximum'])
    expect(run.members).toBe(2)
    expect(run.memberLabels).toBeUndefined()
    // FORECAST_REFERENCE_TIME + FORECAST_PERIOD (9 h)
    expect(run.leadTimes).toEqual(['2031-03-04T09:00:00Z'])
    const { nx, ny } = run.grid
    expect([nx, ny, run.grid.dxKm, run.grid.dyKm]).toEqual([4, 3, 2, 2])
    expect(run.grid.crs).toBe('EPSG:32726')
    for (let m = 0; m < 2; m++) {
      for (let j = 0; j < ny; j++) {
        for (let i = 0; i < nx; i++) {
          expect(run.fields[m]![j * nx + i]).toBeCloseTo(gustUtmPacked(m, ny - 1 - j, i) * 0.1 / 3.6, 5)
        }
      }
    }
    // wgs84Extent from gdalinfo -json; proj4js and PROJ agree to far better than 1e-6°
    expect(sameCornerSet(run.corners, gdalCorners['gust_utm.tif']!, 1e-6)).toBe(true)
    expect(Array.from(run.grid.x)).toEqual([501000, 503000, 505000, 507000])
    expect(Array.from(run.grid.y)).toEqual([5401000, 5403000, 5405000])
  })

  it('gives the same summary from bytes and from a path', async () => {
    const a = summariseRun(await readEnsembleFile(fixtureBytes('gust_utm.tif'), 'gust_utm.tif'))
    const b = summariseRun(await readEnsembleFromPath(fixturePath('gust_utm.tif')))
    expect(a).toEqual(b)
  })
})
