// Seeds the invented demo truth fields for the method check (idempotent). For scripts/seed-demo.ts:
//   import { seedDemoTruths } from './lib/demoTruths'
//   await seedDemoTruths((m) => console.log(`[tessera] ${m}`))
import { ensureDemoTruths } from '../../server/utils/methodCheckTruths'

/** Adds the demo truth fields that are missing; returns how many were added. */
export async function seedDemoTruths(log: (m: string) => void): Promise<number> {
  const started = Date.now()
  const added = await ensureDemoTruths()
  log(added ? `demo truth fields for the method check: ${added} added in ${((Date.now() - started) / 1000).toFixed(1)} s` : 'demo truth fields already there')
  return added
}
