import { z } from 'zod'

export const KERNEL_CHOICES = ['auto', 'se', 'matern12', 'matern32', 'matern52'] as const
/** Latent transform for non-Gaussian variables ('auto' picks it from the CF standard name). */
export const TRANSFORM_CHOICES = ['auto', 'none', 'boxcox', 'log', 'censored'] as const
export const ANISOTROPY_CHOICES = ['off', 'fit'] as const
export const REGIME_CHOICES = ['off', 'windows'] as const

export const confirmRunSchema = z.object({ name: z.string().trim().min(1, 'Give the run a name.').max(160) })

export const downscaleSettingsSchema = z.object({
  factor: z.number().int().min(2, 'The block factor is at least 2.').max(16, 'The block factor is at most 16.'),
  samplesPerMember: z.number().int().min(1).max(100, 'At most 100 samples per member.'),
  kernel: z.enum(KERNEL_CHOICES).default('auto'),
  seed: z.number().int().min(0).max(2 ** 31 - 1).default(1),
  transform: z.enum(TRANSFORM_CHOICES).default('auto'),
  anisotropy: z.enum(ANISOTROPY_CHOICES).default('off'),
  regimes: z.enum(REGIME_CHOICES).default('off'),
  /** Samples with the same index hang together across lead times (AR(1) noise, τ fitted from the members). */
  timeCoherence: z.boolean().default(true),
})
export type DownscaleSettingsInput = z.infer<typeof downscaleSettingsSchema>

export const uploadQuerySchema = z.object({ fileName: z.string().trim().min(1).max(255) })
export const runTaskParamsSchema = z.object({ id: z.coerce.number().int().positive(), taskId: z.coerce.number().int().positive() })

/** Bytes the packed samples of a run will take: int16 per fine cell per sample. */
export function estimateSampleBytes(members: number, leadTimes: number, samplesPerMember: number, nx: number, ny: number, factor: number): number {
  return members * leadTimes * samplesPerMember * nx * factor * ny * factor * 2
}
