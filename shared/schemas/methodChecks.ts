import { z } from 'zod'
import { METHOD_CHECK_DEFAULTS } from '../numerics/pipeline/methodCheckReport'
import { ANISOTROPY_CHOICES, REGIME_CHOICES, TRANSFORM_CHOICES } from './runs'

export const METHOD_CHECK_KERNELS = ['auto', 'se', 'matern12', 'matern32', 'matern52'] as const
const FIXED_KERNELS = ['se', 'matern12', 'matern32', 'matern52'] as const

/** Largest fine truth accepted (cells): the check draws every sample on it and scores each. */
export const MAX_TRUTH_CELLS = 1024 * 1024
/** Most samples a method check draws from the page or the API (the command line allows more). */
export const MAX_CHECK_SAMPLES = 50
/** Most cases (truths × factors) in one batch. */
export const MAX_BATCH_CASES = 24

const thresholdsSchema = z.object({
  kind: z.enum(['value', 'percentile']),
  values: z.array(z.number()).min(1, 'Give at least one threshold.').max(6, 'At most 6 thresholds.'),
}).refine((t) => t.kind === 'value' || t.values.every((v) => v >= 0 && v <= 100), { message: 'Percentiles lie between 0 and 100.', path: ['values'] })

/** Settings shared by a single check and a batch (everything but the truth and the factor). */
const settingsShape = {
  kernel: z.enum(METHOD_CHECK_KERNELS).default(METHOD_CHECK_DEFAULTS.kernel),
  /** The run options of the member pipeline (as in a run's downscaling settings). */
  transform: z.enum(TRANSFORM_CHOICES).default('auto'),
  anisotropy: z.enum(ANISOTROPY_CHOICES).default('off'),
  regimes: z.enum(REGIME_CHOICES).default('off'),
  /** Fixed prior instead of a fit: ℓ in fine cells, σ² in the field's units², optional mean. */
  givenKernel: z.object({
    kernel: z.enum(FIXED_KERNELS),
    lengthScale: z.number().positive('The length scale must be positive.').max(10_000),
    variance: z.number().positive('The variance must be positive.'),
    mean: z.number().optional(),
  }).optional(),
  samples: z.number().int().min(2, 'At least 2 samples (the fair CRPS needs two).').max(MAX_CHECK_SAMPLES, `At most ${MAX_CHECK_SAMPLES} samples.`).default(METHOD_CHECK_DEFAULTS.samples),
  seed: z.number().int().min(0).max(2 ** 31 - 1).default(METHOD_CHECK_DEFAULTS.seed),
  thresholds: thresholdsSchema.default({ kind: METHOD_CHECK_DEFAULTS.thresholds.kind, values: [...METHOD_CHECK_DEFAULTS.thresholds.values] }),
  neighbourhoods: z.array(z.number().int().positive().max(1025).refine((n) => n % 2 === 1, 'Neighbourhood sizes are odd (a square centred on a cell).'))
    .min(1).max(12).default([...METHOD_CHECK_DEFAULTS.neighbourhoods]),
}

const factorSchema = z.number().int().min(2, 'The block factor is at least 2.').max(16, 'The block factor is at most 16.')

export const createMethodCheckSchema = z.object({
  name: z.string().trim().max(160).optional(),
  truthId: z.number().int().positive(),
  factor: factorSchema,
  ...settingsShape,
})
export type CreateMethodCheckInput = z.infer<typeof createMethodCheckSchema>

export const createMethodCheckBatchSchema = z.object({
  name: z.string().trim().min(1, 'Give the batch a name.').max(160),
  truthIds: z.array(z.number().int().positive()).min(1, 'Choose at least one truth field.').max(12),
  factors: z.array(factorSchema).min(1, 'Choose at least one block factor.').max(6),
  ...settingsShape,
}).refine((b) => new Set(b.truthIds).size * new Set(b.factors).size <= MAX_BATCH_CASES, { message: `At most ${MAX_BATCH_CASES} cases (truth fields × factors) per batch.`, path: ['factors'] })
export type CreateMethodCheckBatchInput = z.infer<typeof createMethodCheckBatchSchema>

export const truthUploadQuerySchema = z.object({
  fileName: z.string().trim().min(1).max(255),
  member: z.coerce.number().int().min(0).default(0),
  lead: z.coerce.number().int().min(0).default(0),
  variable: z.string().trim().min(1).max(120).optional(),
  name: z.string().trim().min(1).max(160).optional(),
})

/** The demo-truth action takes an explicit (possibly empty) JSON object, so a bare POST does nothing. */
export const demoTruthsSchema = z.object({})

export const exportQuerySchema = z.object({ format: z.enum(['json', 'csv']).default('json') })
