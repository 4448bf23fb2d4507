import { bigserial, boolean, index, integer, jsonb, pgTable, text, timestamp } from 'drizzle-orm/pg-core'
import { users } from './users'

/**
 * Append-only record of every change: a trigger in the migrations refuses UPDATE and DELETE.
 * actor_email is copied so the entry stays readable if the account is renamed.
 */
export const auditLog = pgTable('audit_log', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  actorId: integer('actor_id').references(() => users.id),
  actorEmail: text('actor_email'),
  action: text('action').notNull(),
  entityType: text('entity_type').notNull(),
  entityId: text('entity_id'),
  before: jsonb('before'),
  after: jsonb('after'),
  ipAddress: text('ip_address'),
}, (t) => [index('audit_log_entity_idx').on(t.entityType, t.entityId), index('audit_log_at_idx').on(t.at)])

/** Every sign-in attempt, for throttling per account and per address. */
export const signInAttempts = pgTable('sign_in_attempts', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  email: text('email').notNull(),
  ipAddress: text('ip_address').notNull(),
  succeeded: boolean('succeeded').notNull(),
}, (t) => [index('sign_in_attempts_email_idx').on(t.email, t.at), index('sign_in_attempts_ip_idx').on(t.ipAddress, t.at)])
