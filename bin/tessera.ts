#!/usr/bin/env -S npx tsx
/**
 * Tessera's command line: `npm run -s tessera -- <command> [options]`.
 * Each command lives in cli/<command>.ts and exports `run(argv): Promise<void>`.
 * Bad input exits non-zero with a one-line message on stderr.
 */
import { existsSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { UsageError } from '../cli/args'

const COMMANDS: Record<string, string> = {
  fit: 'Fit the covariance of a coarse grid by maximum likelihood',
  downscale: 'Draw conditional fine-scale samples from a coarse grid',
  inspect: 'Read an ensemble file and print what the upload preview shows',
  products: 'Exceedance, neighbourhood and area probabilities from members',
  check: 'Coarse-grain a fine field, downscale it and score the result',
  score: 'Score forecast members against a truth grid',
}

async function main(): Promise<number> {
  const [name, ...argv] = process.argv.slice(2)
  if (!name || name === '--help' || name === 'help') {
    process.stdout.write('usage: tessera <command> [options]\n\n' + Object.entries(COMMANDS).map(([k, v]) => `  ${k.padEnd(10)} ${v}`).join('\n') + '\n')
    return name ? 0 : 2
  }
  const file = fileURLToPath(new URL(`../cli/${name}.ts`, import.meta.url))
  if (!(name in COMMANDS) || !existsSync(file)) {
    process.stderr.write(`tessera: unknown command "${name}" (try: tessera help)\n`)
    return 2
  }
  const mod = await import(file) as { run: (argv: string[]) => Promise<void> }
  try {
    await mod.run(argv)
    return 0
  } catch (err) {
    const message = (err instanceof Error ? err.message : String(err)).split('\n')[0]
    process.stderr.write(`tessera ${name}: ${message}\n`)
    return err instanceof UsageError ? 2 : 1
  }
}

main().then((code) => { process.exitCode = code })
