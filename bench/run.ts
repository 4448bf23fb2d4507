// `npm run bench`: runs every bench/<topic>.ts in one process, prints each table, then one JSON
// line with every figure (prefixed "BENCH_JSON "), so runs can be compared. Optional arguments
// pick topics: `npm run bench -- engine fit`.
import { readdirSync } from 'node:fs'
import { fileURLToPath } from 'node:url'

const dir = fileURLToPath(new URL('.', import.meta.url))
const wanted = process.argv.slice(2)
const topics = readdirSync(dir).filter((f) => f.endsWith('.ts') && f !== 'run.ts').map((f) => f.replace(/\.ts$/, ''))
  .filter((t) => wanted.length === 0 || wanted.includes(t)).sort()

const figures: Record<string, Record<string, number | string | boolean>> = {}
for (const topic of topics) {
  console.log(`\n== ${topic} ==`)
  const mod = await import(`./${topic}.ts`) as { bench?: () => Promise<Record<string, number | string | boolean>> }
  if (typeof mod.bench !== 'function') { console.log('(no bench() export, skipped)'); continue }
  figures[topic] = await mod.bench()
}
console.log('BENCH_JSON ' + JSON.stringify({ node: process.version, at: new Date().toISOString(), figures }))
