// Production: creates the first administrator. Usage:
//   DATABASE_URL=… npm run create-admin -- --email you@example.org --name "Your Name"
// The password is read from TESSERA_ADMIN_PASSWORD, or asked for on the terminal.
import { parseArgs } from 'node:util'
import { createInterface } from 'node:readline/promises'
import { sql } from 'drizzle-orm'
import { useDB, closeDB, tables } from '../server/utils/db'
import { hashPasswordForScript } from './lib/passwordHash'
import { emailSchema, newPasswordSchema } from '../shared/schemas/auth'

const { values } = parseArgs({ options: { email: { type: 'string' }, name: { type: 'string' } } })
const email = emailSchema.safeParse(values.email ?? '')
if (!email.success || !values.name) {
  console.error('usage: npm run create-admin -- --email ADDRESS --name "Display Name"')
  process.exit(2)
}
let password = process.env.TESSERA_ADMIN_PASSWORD
if (!password) {
  const rl = createInterface({ input: process.stdin, output: process.stdout })
  password = await rl.question('Password for the new administrator (12+ characters): ')
  rl.close()
}
const checked = newPasswordSchema.safeParse(password)
if (!checked.success) { console.error(checked.error.issues[0]!.message); process.exit(2) }
const db = useDB()
const [existing] = await db.select({ id: tables.users.id }).from(tables.users).where(sql`lower(${tables.users.email}) = ${email.data}`)
if (existing) { console.error(`an account for ${email.data} already exists`); await closeDB(); process.exit(1) }
const [row] = await db.insert(tables.users).values({ email: email.data, displayName: values.name, role: 'admin', passwordHash: await hashPasswordForScript(checked.data) }).returning({ id: tables.users.id })
await db.insert(tables.auditLog).values({ action: 'user.create_admin', entityType: 'user', entityId: String(row!.id), after: { email: email.data, role: 'admin' } })
console.log(`[tessera] administrator ${email.data} created`)
await closeDB()
