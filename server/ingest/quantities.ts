/**
 * The variables Tessera knows by CF standard name and the canonical units it keeps them in:
 * temperatures in degC (°C), wind speeds in m s-1 (m/s), precipitation amounts in mm of liquid
 * water (1 kg m-2 = 1 mm for water of density 1000 kg m-3), precipitation rates in mm h-1.
 * Any other standard name passes through in the file's own units (which must still parse).
 */
import { IngestError } from './errors'
import { conversion, parseUnits, sameDimensions, type Unit } from './units'

interface Quantity { canonical: string; display: string; kind: string; waterEquivalent?: boolean }

const TEMPERATURE: Quantity = { canonical: 'degC', display: '°C', kind: 'a temperature' }
const SPEED: Quantity = { canonical: 'm s-1', display: 'm/s', kind: 'a speed' }
const AMOUNT: Quantity = { canonical: 'mm', display: 'mm', kind: 'a precipitation amount', waterEquivalent: true }
const RATE: Quantity = { canonical: 'mm h-1', display: 'mm/h', kind: 'a precipitation rate', waterEquivalent: true }

const BY_STANDARD_NAME: Record<string, Quantity> = {
  air_temperature: TEMPERATURE,
  wet_bulb_temperature: TEMPERATURE,
  wet_bulb_potential_temperature: TEMPERATURE,
  dew_point_temperature: TEMPERATURE,
  surface_temperature: TEMPERATURE,
  wind_speed_of_gust: SPEED,
  wind_speed: SPEED,
  eastward_wind: SPEED,
  northward_wind: SPEED,
  x_wind: SPEED,
  y_wind: SPEED,
  precipitation_amount: AMOUNT,
  lwe_thickness_of_precipitation_amount: AMOUNT,
  thickness_of_rainfall_amount: AMOUNT,
  rainfall_amount: AMOUNT,
  lwe_thickness_of_snowfall_amount: AMOUNT,
  snowfall_amount: AMOUNT,
  precipitation_flux: RATE,
  lwe_precipitation_rate: RATE,
  rainfall_flux: RATE,
  rainfall_rate: RATE,
}

/** Density of liquid water used for kg m-2 ↔ mm, kg m-3 (common practice; exact by definition of the CF "lwe" quantities). */
const WATER_DENSITY = 1000
/** Dimensions of a density (kg m-3): mass per area = length × density. */
const DENSITY_DIMS = [-3, 1, 0, 0] as const

export interface ResolvedUnits {
  canonicalUnits: string
  displayUnits: string
  /** canonical = scale·(value in file units) + offset */
  scale: number
  offset: number
}

/** Chooses canonical units for a variable and the affine map from the file's units to them. */
export function resolveUnits(standardName: string | null, units: string, what: string): ResolvedUnits {
  const from = parseUnits(units)
  const quantity = standardName ? BY_STANDARD_NAME[standardName] : undefined
  if (!quantity) return { canonicalUnits: units.trim(), displayUnits: units.trim(), scale: 1, offset: 0 }
  const to = parseUnits(quantity.canonical)
  let source: Unit = from
  if (!sameDimensions(from.dims, to.dims) && quantity.waterEquivalent &&
      sameDimensions(from.dims, to.dims.map((v, k) => v + DENSITY_DIMS[k]!) as Unit['dims'])) {
    source = { scale: from.scale / WATER_DENSITY, offset: 0, dims: to.dims } // kg m-2 of water → m of water
  }
  if (!sameDimensions(source.dims, to.dims)) {
    throw new IngestError('incompatible_units', `${what} is ${standardName} but its units "${units}" are not ${quantity.kind}.`)
  }
  return { canonicalUnits: quantity.canonical, displayUnits: quantity.display, ...conversion(source, to) }
}
