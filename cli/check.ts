/**
 * `tessera check --truth FILE --factor B [--kernel auto|se|matern12|matern32|matern52]
 *   [--length-scale L --variance V [--mean M]] [--samples N] [--seed S]
 *   [--threshold T[,T…] | --percentile P[,P…]] [--neighbourhoods 1,3,5,9] [--spacing KM] [--units U]
 *   [--transform auto|none|boxcox|log|censored] [--standard-name NAME] [--anisotropy off|fit] [--regimes off|windows]
 *   [--member M] [--lead L] [--variable NAME] [--out report.json] [--csv report.csv]`
 *
 * Method check: averages the fine truth over b×b blocks, downscales that coarse field (prior fitted
 * to it by maximum likelihood, or fixed by --kernel --length-scale --variance in fine cells), and
 * scores the posterior mean, every sample, the sample ensemble and five interpolation baselines against
 * the truth. Prints (or writes) the same report JSON the method-check job stores
 * (shared/numerics/pipeline/methodCheckReport.ts); --csv also writes the tidy CSV the page exports.
 * The truth is a grid JSON { nx, ny, values, spacing? } (spacing in km; no missing cells), or any
 * ensemble file the run upload reads (NetCDF, GeoTIFF, Tessera JSON: --member and --lead choose the
 * field, default 0 and 0). Defaults: kernel auto, 20 samples, seed 1, percentiles 75,90,97,
 * neighbourhoods 1,3,5,9,17,33,65, and the run options of a new forecast run (transform auto: chosen
 * from the CF standard name, which an ensemble file gives and --standard-name gives for a grid JSON;
 * anisotropy off; regimes off). A truth that is not a multiple of B is cropped (reported).
 */
import { readFileSync, writeFileSync } from 'node:fs'
import { joinNegativeValues, numberOption, parseOptions, UsageError } from './args'
import { readGridFile, writeJson } from './gridFiles'
import { METHOD_CHECK_DEFAULTS, runMethodCheck, validateMethodCheckSettings } from '../shared/numerics/pipeline/methodCheck'
import type { GivenKernel, MethodCheckKernelChoice, MethodCheckSettings } from '../shared/numerics/pipeline/methodCheckReport'
import { methodCheckReportCsv } from '../shared/numerics/io/methodCheckCsv'
import { IngestError, readEnsembleFromPath } from '../server/ingest'

const KERNELS = ['auto', 'se', 'matern12', 'matern32', 'matern52'] as const

interface Truth { values: ArrayLike<number>; nx: number; ny: number; spacingKm?: number; units?: string; standardName?: string }

function numberList(text: string, name: string, integer = false): number[] {
  const items = text.split(',').map((s) => s.trim())
  const values = items.map(Number)
  if (items.some((s) => s === '') || values.some((v) => !Number.isFinite(v) || (integer && !Number.isInteger(v)))) {
    throw new UsageError(`--${name} must be ${integer ? 'integers' : 'numbers'} separated by commas, got "${text}"`)
  }
  return values
}

/** A grid JSON file when it looks like one, otherwise an ensemble file read as an upload would be. */
async function readTruth(path: string, member: number, lead: number, variable: string | undefined): Promise<Truth> {
  let looksLikeGrid = false
  try {
    const head = readFileSync(path, { encoding: 'utf8' }).slice(0, 4096)
    looksLikeGrid = /^\s*\{/.test(head) && /"values"\s*:/.test(head) && !/"tessera"\s*:/.test(head)
  } catch { throw new UsageError(`cannot read ${path}`) }
  if (looksLikeGrid) {
    const g = readGridFile(path)
    return { values: g.values, nx: g.nx, ny: g.ny, spacingKm: g.spacing }
  }
  let run
  try {
    run = await readEnsembleFromPath(path, variable ? { variable } : {})
  } catch (err) {
    if (err instanceof IngestError) throw new UsageError(`${path}: ${err.message}`)
    throw err
  }
  if (member >= run.members) throw new UsageError(`--member ${member}: the file has ${run.members} member(s)`)
  if (lead >= run.leadTimes.length) throw new UsageError(`--lead ${lead}: the file has ${run.leadTimes.length} lead time(s)`)
  return {
    values: run.fields[lead * run.members + member]!, nx: run.grid.nx, ny: run.grid.ny, spacingKm: run.grid.spacingKm, units: run.displayUnits,
    ...(run.standardName ? { standardName: run.standardName } : {}),
  }
}

export async function run(argv: string[]): Promise<void> {
  const { values, positionals } = parseOptions(joinNegativeValues(argv, ['threshold', 'mean']), {
    truth: { type: 'string' },
    factor: { type: 'string' },
    kernel: { type: 'string' },
    'length-scale': { type: 'string' },
    variance: { type: 'string' },
    mean: { type: 'string' },
    samples: { type: 'string' },
    seed: { type: 'string' },
    threshold: { type: 'string' },
    percentile: { type: 'string' },
    neighbourhoods: { type: 'string' },
    spacing: { type: 'string' },
    units: { type: 'string' },
    transform: { type: 'string' },
    'standard-name': { type: 'string' },
    anisotropy: { type: 'string' },
    regimes: { type: 'string' },
    member: { type: 'string' },
    lead: { type: 'string' },
    variable: { type: 'string' },
    out: { type: 'string' },
    csv: { type: 'string' },
  })
  if (positionals.length) throw new UsageError(`unexpected argument "${positionals[0]}"`)
  if (!values.truth) throw new UsageError('--truth is required (a grid JSON { nx, ny, values, spacing? } or an ensemble file)')
  const factor = numberOption(values.factor, 'factor', { integer: true })
  const kernel = (values.kernel ?? METHOD_CHECK_DEFAULTS.kernel) as MethodCheckKernelChoice
  if (!(KERNELS as readonly string[]).includes(kernel)) throw new UsageError(`--kernel must be one of ${KERNELS.join(', ')}, got "${values.kernel}"`)
  let givenKernel: GivenKernel | undefined
  if (values['length-scale'] !== undefined || values.variance !== undefined) {
    if (values['length-scale'] === undefined || values.variance === undefined || kernel === 'auto') {
      throw new UsageError('to fix the prior give --kernel (not auto), --length-scale and --variance (and optionally --mean)')
    }
    givenKernel = {
      kernel, lengthScale: numberOption(values['length-scale'], 'length-scale', { min: 0 }), variance: numberOption(values.variance, 'variance', { min: 0 }),
      ...(values.mean !== undefined ? { mean: numberOption(values.mean, 'mean') } : {}),
    }
  } else if (values.mean !== undefined) throw new UsageError('--mean only goes with a fixed prior (--length-scale and --variance)')
  if (values.threshold !== undefined && values.percentile !== undefined) throw new UsageError('give --threshold or --percentile, not both')
  const thresholds: MethodCheckSettings['thresholds'] = values.threshold !== undefined
    ? { kind: 'value', values: numberList(values.threshold, 'threshold') }
    : values.percentile !== undefined ? { kind: 'percentile', values: numberList(values.percentile, 'percentile') }
      : { kind: METHOD_CHECK_DEFAULTS.thresholds.kind, values: [...METHOD_CHECK_DEFAULTS.thresholds.values] }
  const options = {
    transform: (values.transform ?? METHOD_CHECK_DEFAULTS.transform) as NonNullable<MethodCheckSettings['transform']>,
    anisotropy: (values.anisotropy ?? METHOD_CHECK_DEFAULTS.anisotropy) as NonNullable<MethodCheckSettings['anisotropy']>,
    regimes: (values.regimes ?? METHOD_CHECK_DEFAULTS.regimes) as NonNullable<MethodCheckSettings['regimes']>,
  }
  const settings: MethodCheckSettings = {
    factor, kernel, ...(givenKernel ? { givenKernel } : options),
    samples: values.samples === undefined ? METHOD_CHECK_DEFAULTS.samples : numberOption(values.samples, 'samples', { integer: true }),
    seed: values.seed === undefined ? METHOD_CHECK_DEFAULTS.seed : numberOption(values.seed, 'seed', { integer: true, min: 0 }),
    thresholds,
    neighbourhoods: values.neighbourhoods === undefined ? [...METHOD_CHECK_DEFAULTS.neighbourhoods] : numberList(values.neighbourhoods, 'neighbourhoods', true),
  }
  try { validateMethodCheckSettings(settings) } catch (err) { throw new UsageError((err as Error).message) }
  const member = values.member === undefined ? 0 : numberOption(values.member, 'member', { integer: true, min: 0 })
  const lead = values.lead === undefined ? 0 : numberOption(values.lead, 'lead', { integer: true, min: 0 })
  const truth = await readTruth(values.truth, member, lead, values.variable)
  const spacingKm = values.spacing === undefined ? truth.spacingKm : numberOption(values.spacing, 'spacing', { min: 0 })

  let report
  try {
    const standardName = values['standard-name'] ?? truth.standardName
    report = runMethodCheck({ truth: truth.values, nx: truth.nx, ny: truth.ny, settings, spacingKm, units: values.units ?? truth.units, ...(standardName ? { standardName } : {}) })
  } catch (err) {
    // Everything the check refuses is a property of the truth or the settings (missing cells, too small, constant field…).
    throw new UsageError((err as Error).message)
  }
  writeJson(values.out, report)
  if (values.csv) writeFileSync(values.csv, methodCheckReportCsv(report))
}
