import { describe, expect, it } from 'vitest'
import { readFileSync, statSync } from 'node:fs'
import { readEnsembleFile, readEnsembleFromPath } from '../../../server/ingest/readEnsemble'
import { readCfRun } from '../../../server/ingest/cfReader'
import { openNetcdfClassic } from '../../../server/ingest/netcdfClassic'
import { IngestError, type IngestErrorCode } from '../../../server/ingest/errors'
import type { Dataset } from '../../../server/ingest/dataModel'
import { fixtureBytes, fixturePath } from './fixtures'
import { baseSpec, memoryDataset, type DatasetSpec } from './memoryDataset'

async function refusal(read: () => Promise<unknown> | unknown): Promise<IngestError> {
  try {
    await read()
  } catch (err) {
    if (err instanceof IngestError) return err
    throw new Error(`expected an IngestError, got ${String(err)}`)
  }
  throw new Error('expected the file to be refused')
}

async function expectRefused(read: () => Promise<unknown> | unknown, code: IngestErrorCode, message: RegExp | string) {
  const err = await refusal(read)
  expect(err.code).toBe(code)
  if (typeof message === 'string') expect(err.message).toBe(message)
  else expect(err.message).toMatch(message)
  expect(err.message).not.toMatch(/\n/) // one line for the CLI and the upload form
  return err
}

const OPTIONS = { maxDecodedBytes: 1e9 }
const readSpec = (spec: DatasetSpec, variable?: string) => readCfRun(memoryDataset(spec), 'netcdf-classic', { ...OPTIONS, ...(variable ? { variable } : {}) })
const readDataset = (ds: Dataset, variable?: string) => readCfRun(ds, 'netcdf-classic', { ...OPTIONS, ...(variable ? { variable } : {}) })
const json = () => JSON.parse(readFileSync(fixturePath('gust_grid.json'), 'utf8'))
const readJson = (doc: unknown) => readEnsembleFile(new TextEncoder().encode(typeof doc === 'string' ? doc : JSON.stringify(doc)), 'grid.json')

describe('the in-memory base dataset is valid', () => {
  it('reads 2 members × 2 lead times', () => {
    const run = readSpec(baseSpec())
    expect([run.members, run.leadTimes.length, run.grid.nx, run.grid.ny]).toEqual([2, 2, 4, 3])
    expect(run.fields[3]![11]).toBeCloseTo(280 + 1 + 0.5 + 0.2 + 0.03 - 273.15, 4)
  })
})

describe('every refusal has its code and a message a forecaster can act on', () => {
  it('unreadable_file: a path that does not exist', async () => {
    const err = await expectRefused(() => readEnsembleFromPath('/no/such/file.nc'), 'unreadable_file', 'Cannot read "/no/such/file.nc" (ENOENT).')
    expect(err.httpStatus).toBe(400)
  })

  it('too_large: over the size cap, checked before parsing (bytes and path), and decoded size', async () => {
    const bytes = fixtureBytes('t2m_latlon_classic.nc')
    const err = await expectRefused(() => readEnsembleFile(bytes, 'a.nc', { maxBytes: 1024 }), 'too_large', 'The file is 2.12 kB; the limit is 1 kB.')
    expect(err.httpStatus).toBe(413)
    // even garbage is refused for its size first: nothing was parsed
    await expectRefused(() => readEnsembleFile(new Uint8Array(5000), 'junk.bin', { maxBytes: 4096 }), 'too_large', /limit is 4 kB/)
    const nc4Kb = (statSync(fixturePath('gust_rotated_nc4.nc')).size / 1024).toPrecision(3) // 3 significant digits, as for 2.12 kB above
    await expectRefused(() => readEnsembleFromPath(fixturePath('gust_rotated_nc4.nc'), { maxBytes: 10_000 }), 'too_large', `The file is ${nc4Kb} kB; the limit is 9.77 kB.`)
    // 3 members × 2 lead times × 30 cells × 4 bytes = 720 bytes decoded
    await expectRefused(() => readEnsembleFile(bytes, 'a.nc', { maxDecodedBytes: 700 }), 'too_large', 'The decoded ensemble would take 720 bytes in memory, over the limit of 700 bytes.')
  })

  it('unknown_format: not NetCDF, GeoTIFF or JSON, with hints for common mistakes', async () => {
    const err = await expectRefused(() => readEnsembleFile(new TextEncoder().encode('hello,world\n1,2\n'), 'grid.csv'), 'unknown_format',
      '"grid.csv" is not a format Tessera reads (it starts with bytes 68 65 6c 6c). Tessera reads NetCDF (classic or NetCDF-4), GeoTIFF and Tessera JSON.')
    expect(err.httpStatus).toBe(415)
    await expectRefused(() => readEnsembleFile(new TextEncoder().encode('GRIB\u0000\u0000'), 'run.grib2'), 'unknown_format', /GRIB file; convert it to NetCDF first/)
    await expectRefused(() => readEnsembleFile(new Uint8Array([0x1f, 0x8b, 8, 0]), 'run.nc.gz'), 'unknown_format', /compressed with gzip/)
    await expectRefused(() => readEnsembleFile(new Uint8Array(0), 'empty.nc'), 'unknown_format', /The file is empty/)
    await expectRefused(() => readEnsembleFile(new Uint8Array([0x43, 0x44, 0x46, 5, 0, 0, 0, 0]), 'cdf5.nc'), 'unknown_format', /CDF-5.*not supported/)
    await expectRefused(() => readJson({ nx: 2, ny: 2, values: [1, 2, 3, 4] }), 'unknown_format', /not a Tessera ensemble grid/)
    await expectRefused(() => readJson({ ...json(), tessera: 'ensemble-grid/9' }), 'unknown_format', /version "ensemble-grid\/9"/)
  })

  it('corrupt_file: truncated or damaged files of every format, never a crash', async () => {
    for (const name of ['t2m_latlon_classic.nc', 'precip_lcc_64bit.nc', 'gust_rotated_nc4.nc', 't2m_members.tif', 'gust_utm.tif', 'gust_grid.json']) {
      const full = fixtureBytes(name)
      for (const keep of [8, 40, Math.floor(full.length / 2), full.length - 4]) {
        const err = await refusal(() => readEnsembleFile(full.slice(0, keep), name))
        expect(err.code, `${name} cut at ${keep}`).toBe('corrupt_file')
        expect(err.message).toMatch(/damaged or truncated|cannot be parsed|incomplete or malformed/)
      }
    }
    // a damaged NetCDF header (the dimension-list tag overwritten)
    const bytes = fixtureBytes('t2m_latlon_classic.nc')
    bytes.set([0xff, 0xff, 0xff, 0xff], 8)
    await expectRefused(() => readEnsembleFile(bytes, 'x.nc'), 'corrupt_file', /^The NetCDF file is damaged or truncated/)
    await expectRefused(() => readJson({ ...json(), units: undefined }), 'corrupt_file', 'The Tessera JSON file is incomplete or malformed: "units" is missing.')
    await expectRefused(() => readJson('{"tessera": "ensemble-grid/1", '), 'corrupt_file', /cannot be parsed/)
  })

  it('damaged bytes anywhere give an IngestError, never another exception or a hang', async () => {
    for (const name of ['t2m_latlon_classic.nc', 'gust_rotated_nc4.nc', 't2m_members.tif', 'gust_utm.tif']) {
      const full = fixtureBytes(name)
      const step = Math.ceil(full.length / 24)
      for (let at = 0; at < full.length; at += step) {
        const damaged = full.slice()
        for (let k = at; k < Math.min(at + 8, damaged.length); k++) damaged[k]! ^= 0xa5
        try { await readEnsembleFile(damaged, name) } catch (err) { expect(err, `${name} damaged at ${at}`).toBeInstanceOf(IngestError) }
      }
    }
  })

  it('no_members: no data variable, or an empty member list', async () => {
    await expectRefused(() => readEnsembleFile(fixtureBytes('err_novariable.nc'), 'n.nc'), 'no_members',
      'The file has no ensemble members (no data variable on a latitude–longitude or projected grid).')
    await expectRefused(() => readJson({ ...json(), members: [] }), 'no_members', /"members" is empty/)
    const spec = baseSpec()
    spec.dims.realization = 0
    spec.vars.realization!.values = []
    spec.vars.t2m!.values = []
    await expectRefused(() => readSpec(spec), 'no_members', 'The file has no ensemble members (the dimension "realization" is empty).')
  })

  it('ambiguous_variable and variable_not_found: several candidates', () => {
    const ds = openNetcdfClassic(fixtureBytes('t2m_latlon_classic.nc'))
    const t = ds.variables.get('air_temperature')!
    ds.variables.set('dew_point', { ...t, name: 'dew_point' })
    expect(() => readDataset(ds)).toThrow(/several forecast variables \("air_temperature", "dew_point"\); choose one/)
    expect(readDataset(ds, 'dew_point').variable).toBe('dew_point')
    try { readDataset(ds, 'gusts') } catch (err) {
      expect((err as IngestError).code).toBe('variable_not_found')
      expect((err as IngestError).message).toBe('The file has no variable "gusts"; it has "air_temperature", "dew_point".')
    }
    expect.assertions(4)
  })

  it('unsupported_layout: an extra dimension with several levels', async () => {
    const spec = baseSpec()
    spec.dims.pressure = 2
    spec.vars.pressure = { dims: ['pressure'], attrs: { units: 'hPa' }, values: [850, 500] }
    spec.vars.t2m!.dims = ['time', 'realization', 'pressure', 'lat', 'lon']
    spec.vars.t2m!.values = [...spec.vars.t2m!.values, ...spec.vars.t2m!.values]
    await expectRefused(() => readSpec(spec), 'unsupported_layout', /dimension "pressure" of 2 values besides member, time and the grid/)
    // a single level is fine
    spec.dims.pressure = 1
    spec.vars.pressure.values = [850]
    spec.vars.t2m!.values = baseSpec().vars.t2m!.values
    expect(readSpec(spec).members).toBe(2)
  })

  it('missing_coordinates: dimensions without coordinates, projected coordinates without a grid mapping', async () => {
    const spec = baseSpec()
    spec.dims = { time: 2, realization: 2, nj: 3, ni: 4 }
    delete spec.vars.lat; delete spec.vars.lon
    spec.vars.t2m!.dims = ['time', 'realization', 'nj', 'ni']
    await expectRefused(() => readSpec(spec), 'missing_coordinates', /"t2m" has no latitude\/longitude or projection coordinates for its dimensions \(time, realization, nj, ni\)/)
    const projected = baseSpec()
    projected.vars.lat!.attrs = { standard_name: 'projection_y_coordinate', units: 'm' }
    projected.vars.lon!.attrs = { standard_name: 'projection_x_coordinate', units: 'm' }
    await expectRefused(() => readSpec(projected), 'missing_coordinates', /no grid_mapping saying which projection/)
  })

  it('unsupported_projection: an unknown or incomplete grid mapping', async () => {
    const spec = baseSpec()
    spec.vars.lat!.attrs = { standard_name: 'projection_y_coordinate', units: 'km' }
    spec.vars.lon!.attrs = { standard_name: 'projection_x_coordinate', units: 'km' }
    spec.vars.crs = { dims: [], attrs: { grid_mapping_name: 'vertical_perspective' }, values: [0] }
    spec.vars.t2m!.attrs!.grid_mapping = 'crs'
    await expectRefused(() => readSpec(spec), 'unsupported_projection', /The grid mapping "crs" \(vertical_perspective\) is not supported/)
    spec.vars.crs.attrs = { grid_mapping_name: 'lambert_conformal_conic', standard_parallel: 50, longitude_of_central_meridian: 10 }
    await expectRefused(() => readSpec(spec), 'unsupported_projection', 'The grid mapping "crs" (lambert_conformal_conic) lacks the attribute latitude_of_projection_origin.')
  })

  it('grid_too_small: one cell along an axis', async () => {
    const doc = json()
    doc.grid.lat = [-40]
    doc.members = doc.members.map((leads: number[][]) => leads.map((f) => f.slice(0, 4)))
    await expectRefused(() => readJson(doc), 'grid_too_small', 'The grid has 1 cell along "grid.lat"; Tessera needs at least 2 in each direction.')
  })

  it('shape_mismatch: fields of the wrong size or count', async () => {
    const doc = json()
    doc.members[1][0].pop()
    await expectRefused(() => readJson(doc), 'shape_mismatch', 'members[1][0] has 11 values; the grid has 12 cells.')
    const doc2 = json()
    doc2.members[0].pop()
    await expectRefused(() => readJson(doc2), 'shape_mismatch', 'members[0] must hold one field for each of the 2 lead times.')
    await expectRefused(() => readJson({ ...json(), memberLabels: ['A'] }), 'shape_mismatch', /one label for each of the 2 members/)
    const spec = baseSpec()
    spec.vars.time!.dims = []
    spec.vars.time!.values = [6]
    await expectRefused(() => readSpec(spec), 'shape_mismatch', 'The time coordinate "time" has 1 value but the data have 2 lead times.')
  })

  it('non_monotonic: coordinates or valid times out of order', async () => {
    await expectRefused(() => readEnsembleFile(fixtureBytes('err_nonmonotonic.nc'), 'n.nc'), 'non_monotonic',
      'The coordinate "latitude" is not in strictly increasing or decreasing order (-45 then -45.5 at positions 1 and 2).')
    const doc = json()
    doc.leadTimes.reverse()
    await expectRefused(() => readJson(doc), 'non_monotonic', 'The valid times are not in increasing order (2031-03-04T12:00:00Z is followed by 2031-03-04T06:00:00Z).')
    const spec = baseSpec()
    spec.vars.lon!.values = [-20, -19.5, -19.5, -19]
    await expectRefused(() => readSpec(spec), 'non_monotonic', /"lon" is not in strictly increasing/)
  })

  it('unknown_units and incompatible_units', async () => {
    await expectRefused(() => readEnsembleFile(fixtureBytes('err_units.nc'), 'u.nc'), 'unknown_units', /The units "degrees of warmth" are not recognised/)
    await expectRefused(() => readEnsembleFile(fixtureBytes('err_units_mismatch.nc'), 'u.nc'), 'incompatible_units',
      'The variable "air_temperature" is air_temperature but its units "m s-1" are not a temperature.')
    const spec = baseSpec()
    delete spec.vars.t2m!.attrs!.units
    await expectRefused(() => readSpec(spec), 'unknown_units', 'The variable "t2m" has no units attribute.')
  })

  it('missing_time, bad_time_units, unsupported_calendar, inconsistent_times', async () => {
    const none = baseSpec()
    delete none.vars.time; delete none.vars.forecast_reference_time
    none.dims.time = 2
    await expectRefused(() => readSpec(none), 'missing_time', /"t2m" has no valid time: add a time coordinate, or forecast_reference_time and forecast_period/)
    await expectRefused(() => readJson({ ...json(), leadTimes: [], members: [[], []] }), 'missing_time', 'The file has no lead times.')

    const months = baseSpec()
    months.vars.time!.attrs!.units = 'months since 2031-01-01'
    await expectRefused(() => readSpec(months), 'bad_time_units', /"time" has units "months"; expected seconds, minutes, hours or days/)

    await expectRefused(() => readEnsembleFile(fixtureBytes('err_calendar.nc'), 'c.nc'), 'unsupported_calendar',
      'The time coordinate "time" uses the "360_day" calendar; Tessera reads only the standard (Gregorian) calendar. Convert the times first.')

    const disagree = baseSpec()
    disagree.vars.forecast_period = { dims: ['time'], attrs: { standard_name: 'forecast_period', units: 'hours' }, values: [6, 18] }
    await expectRefused(() => readSpec(disagree), 'inconsistent_times',
      'forecast_period says 18 h for 2031-03-04T12:00:00Z, but that is 12 h after the reference time 2031-03-04T00:00:00Z.')
    // forecast_period alone (no forecast_reference_time) gives the reference time; when it agrees, all is well
    const derived = baseSpec()
    delete derived.vars.forecast_reference_time
    derived.vars.forecast_period = { dims: ['time'], attrs: { standard_name: 'forecast_period', units: 'minutes' }, values: [360, 720] }
    expect(readSpec(derived).referenceTime).toBe('2031-03-04T00:00:00Z')
    derived.vars.forecast_period.values = [360, 600]
    await expectRefused(() => readSpec(derived), 'inconsistent_times', /different reference time for different lead times/)
  })

  it('all_missing: a member with no valid cell', async () => {
    await expectRefused(() => readEnsembleFile(fixtureBytes('err_allmissing.nc'), 'a.nc'), 'all_missing',
      'Member 1 at 2031-03-04T06:00:00Z has no valid values: every cell is missing.')
    const doc = json()
    doc.members[0][1] = doc.members[0][1].map(() => null)
    await expectRefused(() => readJson(doc), 'all_missing', 'Member A at 2031-03-04T12:00:00Z has no valid values: every cell is missing.')
  })

  it('non_finite: NaN or infinity that is not a declared fill value', async () => {
    await expectRefused(() => readEnsembleFile(fixtureBytes('err_nonfinite.nc'), 'n.nc'), 'non_finite',
      'Member 1 at 2031-03-04T06:00:00Z has 1 cell holding NaN or infinite values that the file does not declare as missing (no fill value matches).')
    // JSON has no NaN, but 1e999 parses to Infinity
    const text = readFileSync(fixturePath('gust_grid.json'), 'utf8').replace('12.125', '1e999')
    await expectRefused(() => readJson(text), 'non_finite', /^Member A at 2031-03-04T06:00:00Z has 1 cell holding NaN or infinite values/)
    // a declared NaN fill value makes the same cell merely missing
    const spec = baseSpec()
    spec.vars.t2m!.values[5] = NaN
    await expectRefused(() => readSpec(spec), 'non_finite', /has 1 cell/)
    spec.vars.t2m!.attrs!._FillValue = NaN
    expect(readSpec(spec).fields[0]![5]).toBeNaN()
  })
})

describe('CF missing-value rules', () => {
  it('masks missing_value, valid_range and the netCDF default fill value', () => {
    const spec = baseSpec()
    const v = spec.vars.t2m!
    v.values[0] = -999
    v.values[1] = 9.969209968386869e36 // NC_FILL_FLOAT applies without a _FillValue attribute
    v.values[2] = 400
    v.attrs!.missing_value = -999
    v.attrs!.valid_max = 350
    const f = readSpec(spec).fields[0]!
    expect([f[0], f[1], f[2]].every(Number.isNaN)).toBe(true)
    expect(f[3]).toBeCloseTo(280.03 - 273.15, 4)
  })

  it('applies _Unsigned to classic integer data', () => {
    const spec = baseSpec()
    const v = spec.vars.t2m!
    v.type = 'short'
    v.values = v.values.map((x, k) => (k === 0 ? -1 : Math.round(x * 100) - 65536)) // stored as signed shorts
    v.attrs = { standard_name: 'air_temperature', units: 'K', _Unsigned: 'true', scale_factor: 0.01, _FillValue: -1 }
    const f = readSpec(spec).fields[0]!
    expect(f[0]).toBeNaN() // -1 reads as 65535, the (also reinterpreted) fill value
    expect(f[1]).toBeCloseTo((Math.round(280.01 * 100) * 0.01) - 273.15, 4)
  })
})
