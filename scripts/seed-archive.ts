// Seeds invented briefing versions for the archive benchmark into DATABASE_URL:
//   DATABASE_URL=… npx tsx scripts/seed-archive.ts [count]      (default 50 000)
// The rows are synthetic and marked as such (see scripts/lib/archiveSeed.ts); `npm run bench`
// does this itself in a database of its own, so there is rarely a reason to run it by hand.
import { useDB, closeDB } from '../server/utils/db'
import { seedSyntheticArchive } from './lib/archiveSeed'

const count = Number(process.argv[2] ?? 50_000)
if (!Number.isInteger(count) || count <= 0) throw new Error('usage: seed-archive.ts [count]')
const r = await seedSyntheticArchive(useDB() as never, count, (m) => console.log(`[tessera] ${m}`))
console.log(`[tessera] synthetic archive: ${r.briefings} briefing versions over ${r.areas} areas in ${r.seconds.toFixed(1)} s`)
await closeDB()
