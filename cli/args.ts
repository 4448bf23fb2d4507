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
