// Seeds the invented demo stakeholder directory: the organisations of shared/demo/region.ts, an
// invented contact or two each (addresses under *.example), and one distribution list per
// organisation plus the office's internal copy. List keys match the builder's recipient keys.
// The demo stakeholder account (Kalle Nordberg) is the portal user of Serevan Regional Roads.
import { and, eq, sql } from 'drizzle-orm'
import { useDB, tables } from '../../server/utils/db'
import { DEMO_STAKEHOLDERS } from '../../shared/demo/region'
import { PLACEHOLDER_RECIPIENT_LISTS } from '../../shared/schemas/briefings'
import { DEMO_ACCOUNTS } from './demoAccounts'

const OFFICE = { name: 'Tessera forecasting office', purpose: 'Internal copies for the duty team' }

/** Invented people; the portal account's contact uses the account's own address. */
const CONTACTS: Record<string, { name: string; email: string; account?: string }[]> = {
  'Serevan Regional Roads': [
    { name: 'Kalle Nordberg', email: 'stakeholder@tessera.example', account: 'stakeholder@tessera.example' },
    { name: 'Winter operations desk', email: 'winter-desk@serevan-roads.example' },
  ],
  'Aveline Ferry Line': [{ name: 'Odile Marsh-Tanaka', email: 'operations@aveline-ferry.example' }],
  'Brinmoor Open-Air Festival': [{ name: 'Priya Halvorsen', email: 'site-safety@brinmoor-festival.example' }],
  'Serevan Grid': [{ name: 'Jonas Abiodun-Lee', email: 'control-room@serevan-grid.example' }],
  [OFFICE.name]: [{ name: 'Duty desk', email: 'duty-desk@tessera.example' }],
}

/** Idempotent: only what is missing is added. Returns how many rows were new. */
export async function seedDemoDirectory(log: (m: string) => void): Promise<number> {
  const db = useDB()
  let created = 0
  const keyFor = (org: string) => (org === OFFICE.name ? 'duty-team' : PLACEHOLDER_RECIPIENT_LISTS.find((l) => l.name.startsWith(`${org} (`))?.key)
  for (const org of [...DEMO_STAKEHOLDERS, OFFICE]) {
    const inserted = await db.insert(tables.organisations).values({ name: org.name, description: org.purpose, isDemo: true }).onConflictDoNothing().returning({ id: tables.organisations.id })
    created += inserted.length
    const [row] = await db.select({ id: tables.organisations.id }).from(tables.organisations).where(sql`lower(${tables.organisations.name}) = lower(${org.name})`)
    const key = keyFor(org.name)
    if (!row || !key) continue
    const listName = org.name === OFFICE.name ? 'Forecasting office duty team (internal copy)' : org.name
    created += (await db.insert(tables.distributionLists).values({ key, name: listName, description: org.purpose, organisationId: row.id }).onConflictDoNothing().returning({ id: tables.distributionLists.id })).length
    const [list] = await db.select({ id: tables.distributionLists.id }).from(tables.distributionLists).where(eq(tables.distributionLists.key, key))
    for (const c of CONTACTS[org.name] ?? []) {
      const account = c.account ? DEMO_ACCOUNTS.find((a) => a.email === c.account) : undefined
      const [user] = account ? await db.select({ id: tables.users.id }).from(tables.users).where(eq(tables.users.email, account.email)) : []
      created += (await db.insert(tables.contacts).values({ organisationId: row.id, name: c.name, email: c.email, userId: user?.id ?? null }).onConflictDoNothing().returning({ id: tables.contacts.id })).length
      const [contact] = await db.select({ id: tables.contacts.id }).from(tables.contacts)
        .where(and(eq(tables.contacts.organisationId, row.id), sql`lower(${tables.contacts.email}) = ${c.email}`))
      if (contact && list) await db.insert(tables.distributionListMembers).values({ listId: list.id, contactId: contact.id }).onConflictDoNothing()
    }
  }
  log(`demo stakeholder directory: ${created} row(s) added`)
  return created
}
