/**
 * `tessera fit --in coarse.json --factor B [--kernel se|matern12|matern32|matern52|matern|auto]
 *   [--nu V] [--method auto|exact|whittle] [--nugget ETA|estimate] [--min-length-scale L] [--max-length-scale L]`
 * Fits the fine-field covariance to a coarse grid of b×b block means by maximum likelihood and prints JSON:
 * kernel, lengthScale (fine-grid cells), variance, mean, logLikelihood, lengthScaleInterval, and the
 * diagnostics of shared/numerics/fit/fitCoarse.ts (standardError, atBound, method, profile, …).
 */
import { numberOption, parseOptions, UsageError } from './args'
import { readGridFile, writeJson } from './gridFiles'
import { defaultLengthScaleBounds, fitCoarseField, type FitOptions } from '../shared/numerics/fit/fitCoarse'

const KERNELS = ['se', 'matern12', 'matern32', 'matern52', 'matern', 'auto'] as const
const METHODS = ['auto', 'exact', 'whittle'] as const

export async function run(argv: string[]): Promise<void> {
  const { values } = parseOptions(argv, {
    in: { type: 'string' },
    factor: { type: 'string' },
    kernel: { type: 'string', default: 'auto' },
    nu: { type: 'string' },
    method: { type: 'string', default: 'auto' },
    nugget: { type: 'string' },
    'min-length-scale': { type: 'string' },
    'max-length-scale': { type: 'string' },
  })
  if (!values.in) throw new UsageError('--in is required (a grid JSON file { nx, ny, values })')
  const factor = numberOption(values.factor, 'factor', { integer: true, min: 1 })
  const kernel = values.kernel as FitOptions['kernel']
  if (!(KERNELS as readonly string[]).includes(kernel)) throw new UsageError(`--kernel must be one of ${KERNELS.join(', ')}, got "${kernel}"`)
  const method = values.method as NonNullable<FitOptions['method']>
  if (!(METHODS as readonly string[]).includes(method)) throw new UsageError(`--method must be one of ${METHODS.join(', ')}, got "${method}"`)
  const nu = values.nu === undefined ? undefined : numberOption(values.nu, 'nu', { min: 0 })
  if (kernel === 'matern' && nu === undefined) throw new UsageError('--kernel matern needs --nu (the smoothness)')
  // Nugget: white-noise variance per coarse cell as a fraction of σ², or "estimate" (default for se).
  let nugget: number | 'estimate' | undefined
  if (values.nugget === 'estimate') nugget = 'estimate'
  else if (values.nugget !== undefined) {
    nugget = Number(values.nugget)
    if (!(nugget >= 0 && Number.isFinite(nugget))) throw new UsageError(`--nugget must be a number ≥ 0 or "estimate", got "${values.nugget}"`)
  }
  const grid = readGridFile(values.in)
  const [lo, hi] = defaultLengthScaleBounds(grid.nx, grid.ny, factor)
  const bounds: [number, number] = [
    values['min-length-scale'] === undefined ? lo : numberOption(values['min-length-scale'], 'min-length-scale', { min: 0 }),
    values['max-length-scale'] === undefined ? hi : numberOption(values['max-length-scale'], 'max-length-scale', { min: 0 }),
  ]
  let result
  try {
    result = fitCoarseField(grid.values, grid.nx, grid.ny, { factor, kernel, method, nu, nugget, lengthScaleBounds: bounds })
  } catch (err) {
    // Everything fitCoarseField rejects is a property of the input (constant field, too few cells, bad factor, …).
    throw new UsageError((err as Error).message)
  }
  writeJson(undefined, { ...result, factor, nx: grid.nx, ny: grid.ny, ...(grid.spacing !== undefined ? { lengthScaleKm: result.lengthScale * grid.spacing / factor } : {}) })
}
