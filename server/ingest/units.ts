/**
 * A small reader for UDUNITS-style unit strings as used in CF files ("K", "degC", "m s-1", "kg m-2",
 * "km/h", "knots", "mm h-1", "%", "1"), with dimensional analysis so any two compatible units convert.
 * A unit is an affine map to SI: si = value·scale + offset (offset only for a lone temperature unit,
 * as in UDUNITS-2: "degC" is a temperature, "degC s-1" a temperature rate).
 */
import { IngestError } from './errors'

/** Exponents of the SI base units m, kg, s, K. */
export type Dimensions = [number, number, number, number]

export interface Unit { scale: number; offset: number; dims: Dimensions }

interface Atom { scale: number; dims: Dimensions; offset?: number; prefixable?: boolean }

const LENGTH: Dimensions = [1, 0, 0, 0]
const MASS: Dimensions = [0, 1, 0, 0]
const TIME: Dimensions = [0, 0, 1, 0]
const TEMPERATURE: Dimensions = [0, 0, 0, 1]
const NONE: Dimensions = [0, 0, 0, 0]
const VELOCITY: Dimensions = [1, 0, -1, 0]
const ZERO_CELSIUS_K = 273.15

function atoms(names: string[], atom: Atom): [string, Atom][] { return names.map((n) => [n, atom]) }

/** Symbols are case-sensitive (k ≠ K, m ≠ M); spelled-out names are matched case-insensitively. */
const SYMBOLS = new Map<string, Atom>([
  ...atoms(['m'], { scale: 1, dims: LENGTH, prefixable: true }),
  ...atoms(['g'], { scale: 1e-3, dims: MASS, prefixable: true }),
  ...atoms(['t'], { scale: 1e3, dims: MASS }),
  ...atoms(['s'], { scale: 1, dims: TIME, prefixable: true }),
  ...atoms(['min'], { scale: 60, dims: TIME }),
  ...atoms(['h'], { scale: 3600, dims: TIME }),
  ...atoms(['d'], { scale: 86400, dims: TIME }),
  ...atoms(['K'], { scale: 1, dims: TEMPERATURE, offset: 0, prefixable: true }),
  ...atoms(['degC', 'deg_C', '°C', '℃'], { scale: 1, dims: TEMPERATURE, offset: ZERO_CELSIUS_K }),
  ...atoms(['degF', 'deg_F', '°F'], { scale: 5 / 9, dims: TEMPERATURE, offset: ZERO_CELSIUS_K - 32 * 5 / 9 }),
  ...atoms(['Pa'], { scale: 1, dims: [-1, 1, -2, 0], prefixable: true }),
  ...atoms(['bar'], { scale: 1e5, dims: [-1, 1, -2, 0], prefixable: true }),
  ...atoms(['mb'], { scale: 100, dims: [-1, 1, -2, 0] }),
  ...atoms(['N'], { scale: 1, dims: [1, 1, -2, 0], prefixable: true }),
  ...atoms(['J'], { scale: 1, dims: [2, 1, -2, 0], prefixable: true }),
  ...atoms(['W'], { scale: 1, dims: [2, 1, -3, 0], prefixable: true }),
  ...atoms(['Hz'], { scale: 1, dims: [0, 0, -1, 0], prefixable: true }),
  ...atoms(['L', 'l'], { scale: 1e-3, dims: [3, 0, 0, 0], prefixable: true }),
  ...atoms(['kt', 'kts', 'kn'], { scale: 1852 / 3600, dims: VELOCITY }),
  ...atoms(['kph'], { scale: 1000 / 3600, dims: VELOCITY }),
  ...atoms(['mph'], { scale: 0.44704, dims: VELOCITY }),
  ...atoms(['ft'], { scale: 0.3048, dims: LENGTH }),
  ...atoms(['%'], { scale: 0.01, dims: NONE }),
  ...atoms(['ppm'], { scale: 1e-6, dims: NONE }),
  ...atoms(['°', 'deg'], { scale: Math.PI / 180, dims: NONE }),
  ...atoms(['rad', 'sr'], { scale: 1, dims: NONE }),
])

const NAMES = new Map<string, Atom>([
  ...atoms(['metre', 'metres', 'meter', 'meters'], { scale: 1, dims: LENGTH, prefixable: true }),
  ...atoms(['gram', 'grams'], { scale: 1e-3, dims: MASS, prefixable: true }),
  ...atoms(['tonne', 'tonnes'], { scale: 1e3, dims: MASS }),
  ...atoms(['second', 'seconds', 'sec', 'secs'], { scale: 1, dims: TIME }),
  ...atoms(['minute', 'minutes', 'mins'], { scale: 60, dims: TIME }),
  ...atoms(['hour', 'hours', 'hr', 'hrs'], { scale: 3600, dims: TIME }),
  ...atoms(['day', 'days'], { scale: 86400, dims: TIME }),
  ...atoms(['kelvin'], { scale: 1, dims: TEMPERATURE, offset: 0 }),
  ...atoms(['celsius', 'degree_celsius', 'degrees_celsius', 'degree_c', 'degrees_c', 'degreec', 'degreesc', 'deg c', 'degrees c'],
    { scale: 1, dims: TEMPERATURE, offset: ZERO_CELSIUS_K }),
  ...atoms(['fahrenheit', 'degree_fahrenheit', 'degrees_fahrenheit', 'degree_f', 'degrees_f', 'deg f', 'degrees f'],
    { scale: 5 / 9, dims: TEMPERATURE, offset: ZERO_CELSIUS_K - 32 * 5 / 9 }),
  ...atoms(['pascal', 'pascals'], { scale: 1, dims: [-1, 1, -2, 0], prefixable: true }),
  ...atoms(['mbar', 'millibar', 'millibars'], { scale: 100, dims: [-1, 1, -2, 0] }),
  ...atoms(['knot', 'knots'], { scale: 1852 / 3600, dims: VELOCITY }),
  ...atoms(['mile', 'miles'], { scale: 1609.344, dims: LENGTH }),
  ...atoms(['foot', 'feet'], { scale: 0.3048, dims: LENGTH }),
  ...atoms(['inch', 'inches'], { scale: 0.0254, dims: LENGTH }),
  ...atoms(['litre', 'litres', 'liter', 'liters'], { scale: 1e-3, dims: [3, 0, 0, 0], prefixable: true }),
  ...atoms(['percent'], { scale: 0.01, dims: NONE }),
  ...atoms(['degree', 'degrees', 'degree_north', 'degrees_north', 'degree_n', 'degrees_n', 'degreen', 'degreesn',
    'degree_east', 'degrees_east', 'degree_e', 'degrees_e', 'degreee', 'degreese'], { scale: Math.PI / 180, dims: NONE }),
  ...atoms(['radian', 'radians'], { scale: 1, dims: NONE }),
  ...atoms(['dimensionless'], { scale: 1, dims: NONE }),
])

const PREFIX_SYMBOLS: [string, number][] = [
  ['da', 1e1], ['Y', 1e24], ['Z', 1e21], ['E', 1e18], ['P', 1e15], ['T', 1e12], ['G', 1e9], ['M', 1e6], ['k', 1e3], ['h', 1e2],
  ['d', 1e-1], ['c', 1e-2], ['m', 1e-3], ['u', 1e-6], ['µ', 1e-6], ['μ', 1e-6], ['n', 1e-9], ['p', 1e-12],
]
const PREFIX_NAMES: [string, number][] = [
  ['kilo', 1e3], ['hecto', 1e2], ['deca', 1e1], ['deci', 1e-1], ['centi', 1e-2], ['milli', 1e-3], ['micro', 1e-6],
  ['mega', 1e6], ['giga', 1e9], ['nano', 1e-9],
]

function lookupAtom(name: string): Atom | undefined {
  const direct = SYMBOLS.get(name) ?? NAMES.get(name.toLowerCase())
  if (direct) return direct
  for (const [prefix, factor] of PREFIX_SYMBOLS) {
    if (!name.startsWith(prefix)) continue
    const base = SYMBOLS.get(name.slice(prefix.length))
    if (base?.prefixable) return { scale: base.scale * factor, dims: base.dims, offset: base.offset === undefined ? undefined : 0 }
  }
  const lower = name.toLowerCase()
  for (const [prefix, factor] of PREFIX_NAMES) {
    if (!lower.startsWith(prefix)) continue
    const base = NAMES.get(lower.slice(prefix.length))
    if (base?.prefixable) return { scale: base.scale * factor, dims: base.dims }
  }
  return undefined
}

const NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?/
const ATOM = /^([A-Za-z_°%℃µμ]+)(?:(?:\^|\*\*)?([+-]?\d+))?/

function unknown(text: string, detail: string): never {
  throw new IngestError('unknown_units', `The units "${text}" are not recognised (${detail}). Use UDUNITS spelling such as "K", "degC", "m s-1", "kg m-2".`)
}

/** Parses a unit string; throws IngestError('unknown_units') for anything it cannot read. */
export function parseUnits(text: string): Unit {
  const source = text.trim()
  if (source === '') unknown(text, 'empty')
  const phrase = NAMES.get(source.toLowerCase().replace(/\s+/g, ' '))
  if (phrase) return { scale: phrase.scale, offset: phrase.offset ?? 0, dims: [...phrase.dims] }
  let rest = source.replace(/[·⋅]/g, ' ')
  let scale = 1
  const dims: Dimensions = [0, 0, 0, 0]
  let factors = 0
  let single: Atom | undefined
  let invertNext = false
  while (rest.length > 0) {
    const sep = /^[\s.*]+/.exec(rest)
    if (sep) { rest = rest.slice(sep[0].length); continue }
    if (rest[0] === '/') {
      if (invertNext || factors === 0) unknown(text, 'misplaced "/"')
      invertNext = true
      rest = rest.slice(1)
      continue
    }
    const number = NUMBER.exec(rest)
    if (number) {
      const v = Number(number[0])
      if (!(v > 0) || !Number.isFinite(v)) unknown(text, `factor ${number[0]}`)
      scale *= invertNext ? 1 / v : v
      rest = rest.slice(number[0].length)
      factors++
      single = undefined
      invertNext = false
      continue
    }
    const atomMatch = ATOM.exec(rest)
    if (!atomMatch) unknown(text, `unexpected "${rest[0]}"`)
    const atom = lookupAtom(atomMatch[1]!)
    if (!atom) unknown(text, `unknown unit "${atomMatch[1]}"`)
    const power = (atomMatch[2] === undefined ? 1 : Number(atomMatch[2])) * (invertNext ? -1 : 1)
    scale *= atom.scale ** power
    for (let k = 0; k < 4; k++) dims[k] = dims[k]! + atom.dims[k]! * power
    single = factors === 0 && power === 1 ? atom : undefined
    factors++
    invertNext = false
    rest = rest.slice(atomMatch[0].length)
  }
  if (invertNext) unknown(text, 'nothing after "/"')
  const lone = factors === 1 ? single : undefined
  return { scale, offset: lone?.offset ?? 0, dims }
}

/** True when both units measure the same kind of quantity. */
export function sameDimensions(a: Dimensions, b: Dimensions): boolean {
  return a.every((v, k) => Math.abs(v - b[k]!) < 1e-12)
}

/** The affine map y = scale·x + offset from unit `from` to unit `to` (same dimensions required by the caller). */
export function conversion(from: Unit, to: Unit): { scale: number; offset: number } {
  return { scale: from.scale / to.scale, offset: (from.offset - to.offset) / to.scale }
}
