import { parseArgs, type ParseArgsConfig } from 'node:util'

/** Thrown for bad command-line input; the dispatcher prints its message on one line and exits 2. */
export class UsageError extends Error {}

/** Parses `--name value` options strictly (unknown options are usage errors). */
export function parseOptions<T extends NonNullable<ParseArgsConfig['options']>>(argv: string[], options: T) {
  try {
    return parseArgs({ args: argv, options, allowPositionals: true, strict: true })
  } catch (err) {
    throw new UsageError((err as Error).message)
  }
}

/** Reads a required finite number option. */
export function numberOption(value: string | undefined, name: string, { integer = false, min = -Infinity } = {}): number {
  if (value === undefined) throw new UsageError(`--${name} is required`)
  const x = Number(value)
  if (!Number.isFinite(x) || (integer && !Number.isInteger(x)) || x < min) {
    throw new UsageError(`--${name} must be ${integer ? 'an integer' : 'a number'}${min > -Infinity ? ` ≥ ${min}` : ''}, got "${value}"`)
  }
  return x
}

/**
 * Rewrites `--name -2` as `--name=-2` for the given numeric options, so negative values
 * (frost thresholds, percentiles of negative fields) are not mistaken for options by parseArgs.
 */
export function joinNegativeValues(argv: string[], names: readonly string[]): string[] {
  const out: string[] = []
  for (let k = 0; k < argv.length; k++) {
    const next = argv[k + 1]
    if (names.some((n) => argv[k] === `--${n}`) && next !== undefined && /^-(\d|\.\d|Infinity)/.test(next)) { out.push(`${argv[k]}=${next}`); k++ }
    else out.push(argv[k]!)
  }
  return out
}
