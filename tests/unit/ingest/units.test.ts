import { describe, expect, it } from 'vitest'
import { conversion, parseUnits, sameDimensions } from '../../../server/ingest/units'
import { resolveUnits } from '../../../server/ingest/quantities'
import { IngestError } from '../../../server/ingest/errors'

const toCanonical = (standardName: string | null, units: string, x: number) => {
  const r = resolveUnits(standardName, units, 'test')
  return r.scale * x + r.offset
}

describe('unit conversion to canonical units', () => {
  it('temperatures go to °C', () => {
    // 0 °C = 273.15 K by definition of the Celsius scale (SI Brochure, 9th ed., §2.3.4)
    expect(toCanonical('air_temperature', 'K', 273.15)).toBeCloseTo(0, 12)
    expect(toCanonical('air_temperature', 'kelvin', 300)).toBeCloseTo(26.85, 12)
    expect(toCanonical('wet_bulb_temperature', 'degC', 12.5)).toBe(12.5)
    expect(toCanonical('wet_bulb_temperature', 'degree_Celsius', -3)).toBe(-3)
    // °F: 32 °F = 0 °C, 212 °F = 100 °C (definition of the Fahrenheit scale)
    expect(toCanonical('air_temperature', 'degF', 32)).toBeCloseTo(0, 12)
    expect(toCanonical('air_temperature', 'degF', 212)).toBeCloseTo(100, 12)
    const r = resolveUnits('air_temperature', 'K', 'test')
    expect([r.canonicalUnits, r.displayUnits]).toEqual(['degC', '°C'])
  })

  it('wind speeds go to m/s', () => {
    // 1 knot = 1852 m per hour (international nautical mile, exact): 10 kt = 5.1444… m/s
    expect(toCanonical('wind_speed_of_gust', 'knots', 10)).toBeCloseTo(18520 / 3600, 12)
    expect(toCanonical('wind_speed_of_gust', 'kt', 10)).toBeCloseTo(5.144444, 6)
    expect(toCanonical('wind_speed', 'km/h', 36)).toBeCloseTo(10, 12)
    expect(toCanonical('wind_speed', 'km h-1', 36)).toBeCloseTo(10, 12)
    // 1 mile = 1609.344 m exactly (international yard and pound agreement, 1959)
    expect(toCanonical('wind_speed', 'mph', 1)).toBeCloseTo(1609.344 / 3600, 12)
    expect(toCanonical('wind_speed', 'm s-1', 7)).toBe(7)
    expect(toCanonical('wind_speed', 'm/s', 7)).toBe(7)
    expect(resolveUnits('wind_speed', 'knots', 'test').displayUnits).toBe('m/s')
  })

  it('precipitation amounts go to mm of water (1 kg m-2 = 1 mm at 1000 kg m-3)', () => {
    expect(toCanonical('precipitation_amount', 'kg m-2', 3.2)).toBeCloseTo(3.2, 12)
    expect(toCanonical('precipitation_amount', 'mm', 3.2)).toBeCloseTo(3.2, 12)
    expect(toCanonical('lwe_thickness_of_precipitation_amount', 'm', 0.0032)).toBeCloseTo(3.2, 12)
    expect(toCanonical('precipitation_amount', 'g cm-2', 1)).toBeCloseTo(10, 12) // 1 g cm-2 = 10 kg m-2
    // a flux of 1 kg m-2 s-1 is 3600 mm per hour
    expect(toCanonical('precipitation_flux', 'kg m-2 s-1', 1)).toBeCloseTo(3600, 9)
    expect(resolveUnits('precipitation_flux', 'kg m-2 s-1', 'test').canonicalUnits).toBe('mm h-1')
  })

  it('unknown standard names pass through in their own units, which must still parse', () => {
    const r = resolveUnits('relative_humidity', '%', 'test')
    expect(r).toEqual({ canonicalUnits: '%', displayUnits: '%', scale: 1, offset: 0 })
    expect(resolveUnits(null, 'W m-2', 'test').canonicalUnits).toBe('W m-2')
    expect(() => resolveUnits('relative_humidity', 'furlongs', 'test')).toThrow(IngestError)
  })

  it('refuses units that do not fit the standard name', () => {
    try {
      resolveUnits('air_temperature', 'm s-1', 'The variable "t"')
      expect.unreachable()
    } catch (err) {
      expect((err as IngestError).code).toBe('incompatible_units')
      expect((err as IngestError).message).toBe('The variable "t" is air_temperature but its units "m s-1" are not a temperature.')
    }
    expect(() => resolveUnits('precipitation_amount', 'K', 't')).toThrow(/not a precipitation amount/)
  })
})

describe('UDUNITS-style parsing', () => {
  it('reads products, powers, prefixes and division', () => {
    const kgm2 = parseUnits('kg m-2')
    expect(kgm2.dims).toEqual([-2, 1, 0, 0])
    expect(kgm2.scale).toBe(1)
    expect(parseUnits('kg m^-2').dims).toEqual([-2, 1, 0, 0])
    expect(parseUnits('kg.m**-2').dims).toEqual([-2, 1, 0, 0])
    expect(parseUnits('hPa').scale).toBeCloseTo(100, 12)
    expect(parseUnits('mm').scale).toBeCloseTo(1e-3, 15)
    expect(parseUnits('m/s/s').dims).toEqual([1, 0, -2, 0])
    expect(parseUnits('1e-3 kg kg-1').scale).toBeCloseTo(1e-3, 15)
    expect(parseUnits('1').dims).toEqual([0, 0, 0, 0])
  })

  it('keeps the Celsius offset only for a lone temperature unit', () => {
    expect(parseUnits('degC').offset).toBe(273.15)
    const rate = parseUnits('degC h-1')
    expect(rate.offset).toBe(0)
    expect(sameDimensions(rate.dims, parseUnits('K s-1').dims)).toBe(true)
    expect(conversion(rate, parseUnits('K s-1')).scale).toBeCloseTo(1 / 3600, 15)
  })

  it('distinguishes symbols by case and names without', () => {
    expect(parseUnits('Knots').scale).toBeCloseTo(1852 / 3600, 15)
    expect(parseUnits('Mm').scale).toBe(1e6) // megametre, not millimetre
    expect(() => parseUnits('k')).toThrow(IngestError)
  })

  it('refuses what it cannot read with code unknown_units', () => {
    for (const bad of ['', 'bananas', 'm /', '/ s', 'degrees of warmth', '0 m', 'm (s)']) {
      try {
        parseUnits(bad)
        expect.unreachable(`"${bad}" should not parse`)
      } catch (err) {
        expect(err).toBeInstanceOf(IngestError)
        expect((err as IngestError).code).toBe('unknown_units')
        expect((err as IngestError).message).toContain(`The units "${bad}" are not recognised`)
      }
    }
  })
})
