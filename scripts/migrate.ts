// Applies the committed Drizzle migrations to DATABASE_URL (idempotent).
import { migrate } from 'drizzle-orm/node-postgres/migrator'
import { fileURLToPath } from 'node:url'
import { useDB, closeDB } from '../server/utils/db'

const migrationsFolder = fileURLToPath(new URL('../server/db/migrations', import.meta.url))
await migrate(useDB(), { migrationsFolder })
await closeDB()
console.log('[tessera] database migrated')
