import { boolean, index, integer, pgTable, primaryKey, serial, text, timestamp, uniqueIndex } from 'drizzle-orm/pg-core'
import { sql } from 'drizzle-orm'
import { users } from './users'
import { briefings } from './briefings'
import { timestamps } from './columns'

/** Stakeholder organisations that receive briefings (road operators, ferry lines, event organisers…). */
export const organisations = pgTable('organisations', {
  id: serial('id').primaryKey(),
  name: text('name').notNull(),
  description: text('description').notNull().default(''),
  /** Seeded invented demo organisation (shown as such). */
  isDemo: boolean('is_demo').notNull().default(false),
  active: boolean('active').notNull().default(true),
  ...timestamps,
}, (t) => [uniqueIndex('organisations_name_unique').on(sql`lower(${t.name})`)])

/**
 * A person at an organisation who receives briefings by e-mail. `user_id` links the contact to a
 * stakeholder account: the portal shows that account the briefings sent to the contact's lists.
 */
export const contacts = pgTable('contacts', {
  id: serial('id').primaryKey(),
  organisationId: integer('organisation_id').notNull().references(() => organisations.id, { onDelete: 'cascade' }),
  name: text('name').notNull(),
  /** Stored lower-case; unique within the organisation. */
  email: text('email').notNull(),
  userId: integer('user_id').references(() => users.id, { onDelete: 'set null' }),
  active: boolean('active').notNull().default(true),
  ...timestamps,
}, (t) => [
  uniqueIndex('contacts_org_email_unique').on(t.organisationId, sql`lower(${t.email})`),
  index('contacts_user_idx').on(t.userId),
])

/**
 * A distribution list: per organisation (organisation_id set) or per purpose across organisations.
 * `key` is the stable name a briefing records in its recipients (e.g. "demo-serevan-regional-roads").
 */
export const distributionLists = pgTable('distribution_lists', {
  id: serial('id').primaryKey(),
  key: text('key').notNull().unique(),
  name: text('name').notNull(),
  description: text('description').notNull().default(''),
  organisationId: integer('organisation_id').references(() => organisations.id, { onDelete: 'set null' }),
  active: boolean('active').notNull().default(true),
  ...timestamps,
})

export const distributionListMembers = pgTable('distribution_list_members', {
  listId: integer('list_id').notNull().references(() => distributionLists.id, { onDelete: 'cascade' }),
  contactId: integer('contact_id').notNull().references(() => contacts.id, { onDelete: 'cascade' }),
  addedAt: timestamp('added_at', { withTimezone: true }).notNull().defaultNow(),
}, (t) => [primaryKey({ columns: [t.listId, t.contactId] }), index('distribution_list_members_contact_idx').on(t.contactId)])

/**
 * The lists a briefing version was sent to, written when it is issued (or withdrawn): what the
 * portal and the archive's list filter read. The list name is copied as it was at the time.
 */
export const briefingLists = pgTable('briefing_lists', {
  briefingId: integer('briefing_id').notNull().references(() => briefings.id, { onDelete: 'cascade' }),
  listId: integer('list_id').notNull().references(() => distributionLists.id, { onDelete: 'restrict' }),
  listName: text('list_name').notNull(),
  addedAt: timestamp('added_at', { withTimezone: true }).notNull().defaultNow(),
}, (t) => [primaryKey({ columns: [t.briefingId, t.listId] }), index('briefing_lists_list_idx').on(t.listId)])
