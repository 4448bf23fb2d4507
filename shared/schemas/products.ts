import { z } from 'zod'

/** What a map can show: per-cell probability, neighbourhood probabilities, or a value statistic. */
export const PRODUCTS = ['probability', 'nep', 'nmep', 'mean', 'spread', 'p10', 'p50', 'p90'] as const
export type ProductName = (typeof PRODUCTS)[number]
export const PROBABILITY_PRODUCTS: readonly ProductName[] = ['probability', 'nep', 'nmep']
export const isProbabilityProduct = (p: ProductName) => PROBABILITY_PRODUCTS.includes(p)

export const PRODUCT_LABELS: Record<ProductName, string> = {
  probability: 'Probability per cell',
  nep: 'Neighbourhood probability, mean form (NEP)',
  nmep: 'Neighbourhood probability, anywhere form (NMEP)',
  mean: 'Ensemble mean',
  spread: 'Ensemble spread (standard deviation)',
  p10: '10th percentile',
  p50: 'Median (50th percentile)',
  p90: '90th percentile',
}

/** One sentence, shown wherever NEP or NMEP is: what each answers. */
export const NEP_NMEP_EXPLANATION =
  'NMEP is the chance that the event happens somewhere within the radius of a place; NEP is the expected share of the ' +
  'neighbourhood where it happens, so NEP is never larger than NMEP.'

export const HAZARDS = ['gust', 'low_temperature', 'heavy_precipitation', 'heat'] as const
export type Hazard = (typeof HAZARDS)[number]
export type ThresholdDirection = 'above' | 'below'

export interface HazardDefinition {
  label: string
  /** Canonical units of the values (what the ingest converts runs to) and how a forecaster writes them. */
  units: string
  displayUnits: string
  direction: ThresholdDirection
  /** CF standard names of the runs the set applies to. */
  standardNames: string[]
  /** Common-practice values shipped with Tessera (not official warning levels). */
  defaults: { label: string; value: number }[]
  note: string
}

/**
 * Threshold sets per hazard. The defaults are round values in common forecasting use, from
 * memory and marked as such in the interface; offices are expected to replace them with their own.
 */
export const HAZARD_DEFINITIONS: Record<Hazard, HazardDefinition> = {
  gust: {
    label: 'Gusts', units: 'm s-1', displayUnits: 'm/s', direction: 'above', standardNames: ['wind_speed_of_gust'],
    defaults: [{ label: 'Strong gusts', value: 20 }, { label: 'Damaging gusts', value: 25 }, { label: 'Severe gusts', value: 30 }],
    note: 'Gust speed at the height of the run (usually 10 m).',
  },
  low_temperature: {
    label: 'Low temperature', units: 'degC', displayUnits: '°C', direction: 'below', standardNames: ['air_temperature', 'surface_temperature'],
    defaults: [{ label: 'Frost', value: 0 }, { label: 'Moderate frost', value: -3 }, { label: 'Hard frost', value: -5 }],
    note: 'At or below the value.',
  },
  heavy_precipitation: {
    label: 'Heavy precipitation', units: 'mm', displayUnits: 'mm', direction: 'above',
    standardNames: ['precipitation_amount', 'lwe_thickness_of_precipitation_amount', 'thickness_of_rainfall_amount', 'rainfall_amount'],
    defaults: [{ label: 'Heavy', value: 10 }, { label: 'Very heavy', value: 20 }, { label: 'Extreme', value: 30 }],
    note: 'Defaults are meant for 6-hour accumulations; other accumulation periods need other values.',
  },
  heat: {
    label: 'Heat', units: 'degC', displayUnits: '°C', direction: 'above', standardNames: ['air_temperature'],
    defaults: [{ label: 'Warm', value: 25 }, { label: 'Hot', value: 30 }],
    note: 'At or above the value.',
  },
}

/** The hazards whose thresholds fit a run (by standard name, and canonical units as a guard). */
export function hazardsForRun(standardName: string | null, canonicalUnits: string): Hazard[] {
  return HAZARDS.filter((h) => {
    const d = HAZARD_DEFINITIONS[h]
    return d.units === canonicalUnits && (standardName === null || d.standardNames.includes(standardName))
  })
}

/** One display class of a map: what it covers, its colour and the text colour for its label. */
export interface DisplayClass {
  index: number
  label: string
  /** Probability classes: (lower, upper]; value classes: [lower, upper). */
  lower: number
  upper: number
  colour: string
  textColour: string
  /** "No scenario": drawn as hatching, never filled. */
  hatched: boolean
  noScenario: boolean
  /** Member counts k (of N samples) in a probability class. */
  minCount?: number
  maxCount?: number
}

/** The numbers at one place (point readout). */
export interface PointReadout {
  inside: boolean
  missing?: boolean
  lon: number
  lat: number
  cell?: { i: number; j: number; lon: number; lat: number }
  samples?: number
  members?: number
  value?: { mean: number; min: number; max: number; p10: number; p50: number; p90: number; units: string }
  coarse?: { mean: number; min: number; max: number }
  probability?: { value: number; count: number }
  /** Members with at least one of their samples crossing the threshold at this cell. */
  membersAgreeing?: { count: number; of: number; rule: string }
  neighbourhood?: { radiusKm: number; cells: number; nep: number; nmep: number; nmepCount: number; membersWithin: number }
}

/** Area products of one lead time or one time window, from the joint samples. */
export interface AreaRowProducts {
  samples: number
  members: number
  anywhere: number
  anywhereCount: number
  areaMean: number
  areaMeanCount: number
  fractionExpected: number
  /** Members with at least one sample crossing somewhere in the area. */
  membersAnywhere: number
  areaMax: { p10: number; p50: number; p90: number }
  areaMin: { p10: number; p50: number; p90: number }
}

const finite = z.coerce.number().refine(Number.isFinite, 'Enter a finite number.')

export const hazardParamSchema = z.object({ hazard: z.enum(HAZARDS) })

export const thresholdSetSchema = z.object({
  thresholds: z.array(z.object({
    label: z.string().trim().min(1, 'Give each threshold a label.').max(60),
    value: z.number().refine(Number.isFinite, 'Enter a finite number.'),
  })).max(12, 'At most 12 thresholds per hazard.').refine(
    (list) => new Set(list.map((t) => t.value)).size === list.length, 'Two thresholds have the same value.'),
})
export type ThresholdSetInput = z.infer<typeof thresholdSetSchema>

export const runLeadParamsSchema = z.object({ id: z.coerce.number().int().positive() })

const leadQuery = { lead: z.coerce.number().int().min(0).default(0) }
/** A time window from `lead` to `windowTo` (inclusive): products count an event at any of its valid times. */
const windowQuery = { windowTo: z.coerce.number().int().min(0).optional() }
const thresholdQuery = {
  threshold: finite.default(0),
  direction: z.enum(['above', 'below']).default('above'),
  /** Neighbourhood radius in km (0 = the cell alone). */
  radius: z.coerce.number().min(0, 'The radius is at least 0 km.').max(500, 'The radius is at most 500 km.').default(0),
}

/** Widest image the map endpoints render, in pixels. */
export const MAX_IMAGE_WIDTH = 2048

export const mapQuerySchema = z.object({
  ...leadQuery, ...windowQuery, ...thresholdQuery,
  product: z.enum(PRODUCTS).default('probability'),
  width: z.coerce.number().int().min(16).max(MAX_IMAGE_WIDTH).optional(),
  boundaries: z.enum(['0', '1']).default('1'),
})
export const summaryQuerySchema = z.object({ ...leadQuery, ...windowQuery, ...thresholdQuery, product: z.enum(PRODUCTS).default('probability') })
export const pointQuerySchema = z.object({
  ...leadQuery, ...windowQuery, ...thresholdQuery,
  lon: z.coerce.number().min(-360).max(360),
  lat: z.coerce.number().min(-90).max(90),
})
export const coarseFieldQuerySchema = z.object({
  ...leadQuery,
  member: z.coerce.number().int().min(0).default(0),
  width: z.coerce.number().int().min(16).max(MAX_IMAGE_WIDTH).optional(),
})
export const sampleFieldQuerySchema = coarseFieldQuerySchema.extend({ sample: z.coerce.number().int().min(0).default(0) })

export const areaProductsParamsSchema = z.object({ id: z.coerce.number().int().positive(), areaId: z.coerce.number().int().positive() })
export const areaProductsQuerySchema = z.object({
  threshold: finite.default(0),
  direction: z.enum(['above', 'below']).default('above'),
  /** First and last lead index of the time window (inclusive); default: every lead time. */
  windowFrom: z.coerce.number().int().min(0).optional(),
  windowTo: z.coerce.number().int().min(0).optional(),
})
