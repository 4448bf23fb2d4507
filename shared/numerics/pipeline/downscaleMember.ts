/**
 * One ensemble member at one lead time: fit the prior on the coarse field alone (maximum
 * likelihood), then draw conditional fine-scale samples (conditioning by kriging) and pack them.
 * Pure: used by the job worker's threads, the demo seeding and the command line alike.
 */
import { defaultLengthScaleBounds, fitCoarseField, type FitResult } from '../fit/fitCoarse'
import { createDownscaler } from '../grf/downscaler'
import type { KernelName } from '../grf/kernels'
import { packInt16, type PackedInt16 } from '../io/packInt16'

export interface DownscaleMemberInput {
  /** Coarse field, row-major ny×nx, NaN = missing. */
  coarse: Float32Array | Float64Array
  nx: number
  ny: number
  /** Block factor b: fine grid is (b·nx)×(b·ny). */
  factor: number
  kernel: KernelName | 'auto'
  samples: number
  seed: number
  /** Coarse grid spacing, km (to report ℓ in km). */
  spacingKm: number
  /**
   * Upper bound of the length-scale search, in coarse cells (default 5). Longer scales are already
   * fixed by the coarse field itself, and would make the sampling torus very large; a member whose
   * fit reaches the bound is flagged (atBound = 'upper').
   */
  maxLengthScaleCoarseCells?: number
}

/** Default cap on the fitted length scale, in coarse cells (see DownscaleMemberInput). */
export const DEFAULT_MAX_LENGTH_SCALE_COARSE_CELLS = 5

export interface MemberFit extends Omit<FitResult, 'profile'> {
  /** ℓ in km on the fine grid. */
  lengthScaleKm: number
  lengthScaleIntervalKm: [number, number]
  profile: { lengthScaleKm: number; logLikelihood: number }[]
}

export interface DownscaleMemberOutput {
  fit: MemberFit
  packed: PackedInt16
  fineNx: number
  fineNy: number
  /** Largest |block mean of a sample − coarse value| over valid cells (should be rounding-level). */
  blockMeanError: number
  diagnostics: Record<string, unknown>
}

/** Derives a task's seed from the run seed, lead index and member index (splitmix-style mixing). */
export function taskSeed(runSeed: number, leadIndex: number, memberIndex: number): number {
  let h = (runSeed ^ Math.imul(leadIndex + 1, 0x9e3779b1) ^ Math.imul(memberIndex + 1, 0x85ebca77)) >>> 0
  h = Math.imul(h ^ (h >>> 16), 0x7feb352d) >>> 0
  h = Math.imul(h ^ (h >>> 15), 0x846ca68b) >>> 0
  return (h ^ (h >>> 16)) >>> 0
}

export function downscaleMember(input: DownscaleMemberInput): DownscaleMemberOutput {
  const { nx, ny, factor } = input
  const coarse = Float64Array.from(input.coarse)
  const [lower, upper] = defaultLengthScaleBounds(nx, ny, factor)
  const cap = (input.maxLengthScaleCoarseCells ?? DEFAULT_MAX_LENGTH_SCALE_COARSE_CELLS) * factor
  const fit = fitCoarseField(coarse, nx, ny, { factor, kernel: input.kernel, lengthScaleBounds: [lower, Math.max(lower * 2, Math.min(upper, cap))] })
  const kmPerFine = input.spacingKm / factor
  const downscaler = createDownscaler({
    coarse, nx, ny, factor,
    kernel: { kernel: fit.kernel, lengthScale: fit.lengthScale, variance: fit.variance, nu: fit.nu, nugget: fit.nugget },
    mean: fit.mean,
  })
  const samples = downscaler.samples(input.samples, input.seed)
  const fineNx = nx * factor, fineNy = ny * factor
  let blockMeanError = 0
  for (const s of samples) {
    for (let J = 0; J < ny; J++) for (let I = 0; I < nx; I++) {
      const y = coarse[J * nx + I]!
      if (!Number.isFinite(y)) continue
      let sum = 0
      for (let dj = 0; dj < factor; dj++) for (let di = 0; di < factor; di++) sum += s[(J * factor + dj) * fineNx + I * factor + di]!
      blockMeanError = Math.max(blockMeanError, Math.abs(sum / (factor * factor) - y))
    }
  }
  const { profile, ...rest } = fit
  return {
    fit: {
      ...rest,
      lengthScaleKm: fit.lengthScale * kmPerFine,
      lengthScaleIntervalKm: [fit.lengthScaleInterval[0] * kmPerFine, fit.lengthScaleInterval[1] * kmPerFine],
      profile: profile.map((p) => ({ lengthScaleKm: p.lengthScale * kmPerFine, logLikelihood: p.logLikelihood })),
    },
    packed: packInt16(samples),
    fineNx, fineNy, blockMeanError,
    diagnostics: { ...(downscaler.diagnostics as unknown as Record<string, unknown>) },
  }
}
