/**
 * `tessera downscale --in coarse.json --factor B --samples N --seed S
 *   [--kernel K --length-scale L --variance V --mean M [--nugget T] [--nu NU]] [--out result.json]`
 * Draws N conditional fine-scale samples (b·nx × b·ny) whose b×b block means equal the coarse grid,
 * plus the conditional mean and pointwise standard deviation (shared/numerics/grf/downscaler.ts).
 * With all of --kernel --length-scale --variance --mean the prior is taken as given; otherwise it is
 * fitted to the coarse grid by maximum likelihood (optionally for the --kernel given) first.
 * Output JSON: { nx, ny (fine), mean, std, samples: number[][], params }, missing values as null.
 */
import { numberOption, parseOptions, UsageError } from './args'
import { readGridFile, toJsonArray, writeJson } from './gridFiles'
import { createDownscaler } from '../shared/numerics/grf/downscaler'
import type { KernelName, KernelParams } from '../shared/numerics/grf/kernels'
import { fitCoarseField, type FitOptions } from '../shared/numerics/fit/fitCoarse'

const KERNELS = ['se', 'matern12', 'matern32', 'matern52', 'matern'] as const

export async function run(argv: string[]): Promise<void> {
  const { values } = parseOptions(argv, {
    in: { type: 'string' },
    factor: { type: 'string' },
    samples: { type: 'string' },
    seed: { type: 'string' },
    kernel: { type: 'string' },
    'length-scale': { type: 'string' },
    variance: { type: 'string' },
    mean: { type: 'string' },
    nugget: { type: 'string' },
    nu: { type: 'string' },
    out: { type: 'string' },
  })
  if (!values.in) throw new UsageError('--in is required (a grid JSON file { nx, ny, values })')
  const factor = numberOption(values.factor, 'factor', { integer: true })
  if (factor < 2 || factor > 16) throw new UsageError(`--factor must be an integer from 2 to 16, got ${factor}`)
  const count = numberOption(values.samples, 'samples', { integer: true, min: 0 })
  const seed = numberOption(values.seed, 'seed', { integer: true })
  if (!Number.isSafeInteger(seed)) throw new UsageError(`--seed must be a safe integer, got "${values.seed}"`)
  const kernel = values.kernel
  if (kernel !== undefined && kernel !== 'auto' && !(KERNELS as readonly string[]).includes(kernel)) {
    throw new UsageError(`--kernel must be one of ${KERNELS.join(', ')}${values['length-scale'] === undefined ? ', auto' : ''}, got "${kernel}"`)
  }
  const nu = values.nu === undefined ? undefined : numberOption(values.nu, 'nu', { min: 0 })
  if (kernel === 'matern' && !(nu !== undefined && nu > 0)) throw new UsageError('--kernel matern needs --nu > 0 (the smoothness)')

  const grid = readGridFile(values.in)
  const priorGiven = [values['length-scale'], values.variance, values.mean]
  const given = priorGiven.filter((v) => v !== undefined).length
  if (given > 0 && (given < 3 || kernel === undefined || kernel === 'auto')) {
    throw new UsageError('give all of --kernel --length-scale --variance --mean to fix the prior, or none of the last three to fit it')
  }

  let params: KernelParams
  let mean: number
  let fit: Record<string, unknown> | undefined
  if (given === 3) {
    params = {
      kernel: kernel as KernelName,
      lengthScale: numberOption(values['length-scale'], 'length-scale'),
      variance: numberOption(values.variance, 'variance'),
      nugget: values.nugget === undefined ? 0 : numberOption(values.nugget, 'nugget', { min: 0 }),
      ...(nu !== undefined ? { nu } : {}),
    }
    if (!(params.lengthScale > 0)) throw new UsageError('--length-scale must be > 0 (fine-grid cells)')
    if (!(params.variance > 0)) throw new UsageError('--variance must be > 0')
    mean = numberOption(values.mean, 'mean')
  } else {
    let result
    try {
      result = fitCoarseField(grid.values, grid.nx, grid.ny, { factor, kernel: (kernel ?? 'auto') as FitOptions['kernel'], nu })
    } catch (err) {
      throw new UsageError(`cannot fit the prior: ${(err as Error).message}`)
    }
    params = { kernel: result.kernel, lengthScale: result.lengthScale, variance: result.variance, nugget: result.nugget, ...(result.nu !== undefined ? { nu: result.nu } : {}) }
    mean = result.mean
    fit = { logLikelihood: result.logLikelihood, lengthScaleInterval: result.lengthScaleInterval, method: result.method }
  }

  let downscaler
  try {
    downscaler = createDownscaler({ coarse: grid.values, nx: grid.nx, ny: grid.ny, factor, kernel: params, mean })
  } catch (err) {
    const message = (err as Error).message
    // Input problems (no observed cells, bad parameters) are usage errors; numerical failures are not.
    if (/no observed cells|must be|expected nx·ny/.test(message)) throw new UsageError(message)
    throw err
  }
  const meanField = downscaler.mean()
  const std = downscaler.std()
  const samples = downscaler.samples(count, seed)
  const { diagnostics } = downscaler
  writeJson(values.out, {
    nx: downscaler.nx,
    ny: downscaler.ny,
    mean: toJsonArray(meanField),
    std: toJsonArray(std),
    samples: samples.map((s) => toJsonArray(s)),
    params: {
      kernel: params.kernel, lengthScale: params.lengthScale, variance: params.variance, mean, nugget: params.nugget ?? 0,
      ...(params.nu !== undefined ? { nu: params.nu } : {}),
      factor, coarseNx: grid.nx, coarseNy: grid.ny, seed, fitted: fit !== undefined, ...(fit ?? {}),
      diagnostics,
    },
  })
}
