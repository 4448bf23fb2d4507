// Archive search speed with 50 000 synthetic briefing versions: typical searches (words, phrases,
// filters, an area drawn on the map, pages) timed end to end through searchArchive, and EXPLAIN
// (ANALYZE) of each page query to show which indexes answer it. Target: under 200 ms each.
//
// Database: a sibling database "tessera_archive_bench" next to DATABASE_URL's (never the app's
// own), or, without DATABASE_URL, a throwaway cluster started here on 127.0.0.1:54331.
//   npx tsx -e "import('./bench/archive.ts').then(m=>m.bench())"      or      npm run bench -- archive
import { fileURLToPath } from 'node:url'
import { join } from 'node:path'
import pg from 'pg'
import { drizzle } from 'drizzle-orm/node-postgres'
import { migrate } from 'drizzle-orm/node-postgres/migrator'
import { PgDialect } from 'drizzle-orm/pg-core'
import * as schema from '../server/db/schema'
import { archivePageSql, searchArchive } from '../server/utils/archiveSearch'
import { archiveQuerySchema } from '../shared/schemas/distribution'
import { seedSyntheticArchive } from '../scripts/lib/archiveSeed'

const ROOT = fileURLToPath(new URL('..', import.meta.url))
const COUNT = Number(process.env.TESSERA_ARCHIVE_BENCH_COUNT ?? 50_000)
const RUNS = 15
const BENCH_DB = 'tessera_archive_bench'

interface Cluster { url: string; stop: () => void }

async function benchDatabase(): Promise<{ url: string; cluster: Cluster | null }> {
  const base = process.env.DATABASE_URL
  if (base) {
    const url = new URL(base)
    const admin = new pg.Client({ connectionString: base })
    await admin.connect()
    const exists = await admin.query('select 1 from pg_database where datname = $1', [BENCH_DB])
    if (!exists.rowCount) await admin.query(`create database ${BENCH_DB}`)
    await admin.end()
    url.pathname = `/${BENCH_DB}`
    return { url: url.toString(), cluster: null }
  }
  const { startCluster, resolveDataDir } = await import('../scripts/lib/postgres.mjs') as { startCluster: (o: object) => Cluster; resolveDataDir: (p: string) => string }
  const dataDir = resolveDataDir(join(ROOT, '.data', 'pg-bench'))
  const cluster = startCluster({ dataDir, port: Number(process.env.TESSERA_BENCH_PG_PORT ?? 54331), database: BENCH_DB, throwaway: true })
  return { url: cluster.url, cluster }
}

/** Index names a plan uses (Index Scan, Bitmap Index Scan, Index Only Scan nodes). */
function indexesIn(plan: unknown, out = new Set<string>()): Set<string> {
  if (plan && typeof plan === 'object') {
    const node = plan as Record<string, unknown>
    if (typeof node['Index Name'] === 'string') out.add(node['Index Name'] as string)
    for (const v of Object.values(node)) if (typeof v === 'object') indexesIn(v, out)
  }
  return out
}

const median = (xs: number[]) => { const s = [...xs].sort((a, b) => a - b); return s[Math.floor(s.length / 2)]! }

export async function bench(): Promise<Record<string, number | string | boolean>> {
  const { url, cluster } = await benchDatabase()
  const pool = new pg.Pool({ connectionString: url, max: 4 })
  const db = drizzle(pool, { schema })
  try {
    await migrate(db, { migrationsFolder: join(ROOT, 'server/db/migrations') })
    const seeded = await seedSyntheticArchive(db as never, COUNT, (m) => { if (/0000 of/.test(m)) console.log(m) })
    const rows = Number((await pool.query('select count(*)::int as n from briefing_search where issued_at is not null')).rows[0].n)
    console.log(`archive: ${rows} issued versions (${seeded.seconds.toFixed(1)} s to seed what was missing)`)

    const drawn = JSON.stringify({ type: 'Polygon', coordinates: [[[-25, -46], [-23.5, -46], [-23.5, -44.5], [-25, -44.5], [-25, -46]]] })
    const lists = (await pool.query("select id from distribution_lists where key like 'synthetic-list-%' order by id limit 1")).rows
    const author = (await pool.query("select id from users where email like 'synthetic-forecaster-%' order by id limit 1")).rows
    const cases: [string, Record<string, string>][] = [
      ['words', { q: 'gusts bridge' }],
      ['phrase, newest', { q: '"ferry berth"', order: 'newest' }],
      ['words + one year', { q: 'frost road', from: '2029-01-01', to: '2029-12-31' }],
      ['hazard only, page 3', { hazard: 'heavy_precipitation', page: '3' }],
      ['area on the map + words', { q: 'rain', area: drawn }],
      ['area on the map only', { area: drawn }],
      ['words + list', { q: 'harbour', list: String(lists[0]?.id ?? 1) }],
      ['withdrawn + words', { q: 'gusts', status: 'withdrawn' }],
      ['author + months', { author: String(author[0]?.id ?? 1), from: '2030-01-01', to: '2030-06-30' }],
    ]
    // Not a typical search: a word in every statement of every briefing, so all 50 000 are ranked.
    const stress: [string, Record<string, string>][] = [['word in every briefing', { q: 'scenarios' }]]
    const figures: Record<string, number | string | boolean> = { briefings: rows }
    const table: string[] = []
    let worst = 0
    for (const [name, raw] of [...cases, ...stress]) {
      const typical = cases.some(([n]) => n === name)
      const query = archiveQuerySchema.parse(raw)
      await searchArchive(query, db as never) // warm
      const times: number[] = []
      let total = 0
      for (let k = 0; k < RUNS; k++) {
        const t0 = performance.now()
        const r = await searchArchive(query, db as never)
        times.push(performance.now() - t0)
        total = r.total
      }
      const hasText = !!query.q
      const page = archivePageSql(query, hasText)
      const { sql: text, params } = new PgDialect().sqlToQuery(page)
      const explain = await pool.query(`explain (analyze, format json) ${text}`, params)
      const plan = (explain.rows[0] as Record<string, unknown>)['QUERY PLAN'] as [{ Plan: unknown; 'Execution Time': number }]
      const indexes = [...indexesIn(plan[0].Plan)].join(' + ') || 'none (sequential scan)'
      const ms = median(times)
      if (typical) worst = Math.max(worst, ms)
      figures[`${name} ms`] = Number(ms.toFixed(1))
      figures[`${name} indexes`] = indexes
      table.push(`${typical ? ' ' : '*'}${name.padEnd(25)} ${ms.toFixed(1).padStart(7)} ms  (p95 ${[...times].sort((a, b) => a - b)[Math.floor(RUNS * 0.95)]!.toFixed(1)} ms, ${String(total).padStart(5)} hits, plan ${plan[0]['Execution Time'].toFixed(1)} ms)  ${indexes}`)
    }
    console.log(`search over ${rows} briefing versions, median of ${RUNS} runs (whole searchArchive call: text check, page query, details and snippets)`)
    for (const line of table) console.log(`  ${line}`)
    console.log('  * stress case, not counted as typical')
    figures['worst median ms'] = Number(worst.toFixed(1))
    figures['all under 200 ms'] = worst < 200
    console.log(`worst typical median ${worst.toFixed(1)} ms — ${worst < 200 ? 'every typical search under 200 ms' : 'OVER the 200 ms target'}`)
    return figures
  } finally {
    await pool.end()
    cluster?.stop()
  }
}
