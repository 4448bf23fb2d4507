/**
 * `tessera inspect FILE [--variable NAME] [--max-mb N]`: reads an ensemble file exactly as an upload
 * would and prints the preview (variable, units, members, lead times, grid, extent, first-member stats)
 * as JSON. A file Tessera refuses exits non-zero with the same message the upload gives.
 */
import { numberOption, parseOptions, UsageError } from './args'
import { readEnsembleFromPath } from '../server/ingest/readEnsemble'
import { summariseRun } from '../server/ingest/summary'

export async function run(argv: string[]): Promise<void> {
  const { values, positionals } = parseOptions(argv, {
    variable: { type: 'string' },
    'max-mb': { type: 'string' },
  })
  if (positionals.length !== 1) throw new UsageError('usage: tessera inspect FILE [--variable NAME] [--max-mb N]')
  const maxMb = values['max-mb'] === undefined ? undefined : numberOption(values['max-mb'], 'max-mb', { min: 0 })
  const run = await readEnsembleFromPath(positionals[0]!, {
    ...(values.variable ? { variable: values.variable } : {}),
    ...(maxMb !== undefined ? { maxBytes: maxMb * 2 ** 20 } : {}),
  })
  process.stdout.write(JSON.stringify(summariseRun(run), null, 2) + '\n')
}
