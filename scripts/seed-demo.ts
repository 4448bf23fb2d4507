// Seeds the invented demo scenario into an empty database (demo mode only). Idempotent.
import { useDB, closeDB, tables } from '../server/utils/db'
import { hashPasswordForScript } from './lib/passwordHash'
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from './lib/demoAccounts'
import { DEMO_SIZES, seedDemoRuns } from './lib/demoRuns'
import { seedDemoTruths } from './lib/demoTruths'
import { seedDemoDirectory } from './lib/demoDirectory'

const db = useDB()
const passwordHash = await hashPasswordForScript(DEMO_PASSWORD)
let created = 0
for (const account of DEMO_ACCOUNTS) {
  const rows = await db.insert(tables.users).values({ ...account, passwordHash })
    .onConflictDoNothing().returning({ id: tables.users.id })
  if (rows.length) {
    created++
    await db.insert(tables.auditLog).values({ action: 'user.seed_demo', entityType: 'user', entityId: String(rows[0]!.id), after: account })
  }
}
console.log(`[tessera] demo accounts: ${created} created, ${DEMO_ACCOUNTS.length - created} already there`)
await seedDemoDirectory((m) => console.log(`[tessera] ${m}`))
// TESSERA_DEMO_SIZE=small keeps test set-up quick; npm start seeds the full scenario.
const size = process.env.TESSERA_DEMO_SIZE === 'small' ? 'small' : 'full'
await seedDemoRuns(DEMO_SIZES[size], (m) => console.log(`[tessera] ${m}`))
await seedDemoTruths((m) => console.log(`[tessera] ${m}`))
await closeDB()
