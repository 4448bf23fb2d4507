import { boolean, integer, pgEnum, pgTable, serial, text, timestamp, uniqueIndex } from 'drizzle-orm/pg-core'
import { sql } from 'drizzle-orm'
import { ROLES } from '../../../shared/utils/roles'
import { timestamps } from './columns'

export const roleEnum = pgEnum('role', ROLES)

export const users = pgTable('users', {
  id: serial('id').primaryKey(),
  /** Stored lower-case; unique. */
  email: text('email').notNull(),
  displayName: text('display_name').notNull(),
  role: roleEnum('role').notNull(),
  /** scrypt hash from nuxt-auth-utils; null until an invited person sets a password. */
  passwordHash: text('password_hash'),
  active: boolean('active').notNull().default(true),
  /** Bumped to end every session of the user (deactivation, password change, role change). */
  sessionVersion: integer('session_version').notNull().default(1),
  lastSignInAt: timestamp('last_sign_in_at', { withTimezone: true }),
  ...timestamps,
}, (t) => [uniqueIndex('users_email_unique').on(sql`lower(${t.email})`)])

/** One-time set-password links (invitations and resets). Only the SHA-256 of the token is stored. */
export const passwordTokens = pgTable('password_tokens', {
  id: serial('id').primaryKey(),
  userId: integer('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  tokenHash: text('token_hash').notNull().unique(),
  purpose: text('purpose', { enum: ['invite', 'reset'] }).notNull(),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
  usedAt: timestamp('used_at', { withTimezone: true }),
  createdById: integer('created_by_id').references(() => users.id),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
})
