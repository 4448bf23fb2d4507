import { bigint, bigserial, index, integer, jsonb, pgEnum, pgTable, text, timestamp } from 'drizzle-orm/pg-core'
import { users } from './users'
import { briefings } from './briefings'
import { contacts } from './distribution'
import { bytea, timestamps } from './columns'

export const MAIL_KINDS = ['issue', 'amended', 'withdrawn', 'test', 'invitation'] as const
/**
 * queued: waiting (or waiting for its next attempt); sent: the relay accepted it; failed: refused
 * for good or out of attempts; uncertain: the sender stopped after handing the whole message to
 * the relay and before its answer, so it may have arrived (never re-sent without a person deciding).
 */
export const MAIL_STATUSES = ['queued', 'sent', 'failed', 'uncertain'] as const
export const mailKindEnum = pgEnum('mail_kind', MAIL_KINDS)
export const mailStatusEnum = pgEnum('mail_status', MAIL_STATUSES)

/**
 * One message to one recipient, written before anything is sent (inside the transaction that
 * issues, withdraws or invites). `idempotency_key` makes a second write of the same message a
 * no-op; `message_id` is fixed here so every attempt carries the same Message-ID header.
 * The body is stored as composed; the PDF is read from the briefing at send time and must
 * match `attachment_sha256`.
 */
export const mailOutbox = pgTable('mail_outbox', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  idempotencyKey: text('idempotency_key').notNull().unique(),
  kind: mailKindEnum('kind').notNull(),
  status: mailStatusEnum('status').notNull().default('queued'),
  briefingId: integer('briefing_id').references(() => briefings.id, { onDelete: 'set null' }),
  briefingVersion: integer('briefing_version'),
  contactId: integer('contact_id').references(() => contacts.id, { onDelete: 'set null' }),
  userId: integer('user_id').references(() => users.id, { onDelete: 'set null' }),
  /** Names of the lists that brought this recipient in (copied). */
  listNames: text('list_names').array().notNull(),
  organisationName: text('organisation_name'),
  toAddress: text('to_address').notNull(),
  toName: text('to_name'),
  subject: text('subject').notNull(),
  textBody: text('text_body').notNull(),
  htmlBody: text('html_body').notNull(),
  attachmentName: text('attachment_name'),
  attachmentSha256: text('attachment_sha256'),
  messageId: text('message_id').notNull().unique(),
  attempts: integer('attempts').notNull().default(0),
  maxAttempts: integer('max_attempts').notNull().default(8),
  nextAttemptAt: timestamp('next_attempt_at', { withTimezone: true }).notNull().defaultNow(),
  lastError: text('last_error'),
  relayResponse: text('relay_response'),
  sentAt: timestamp('sent_at', { withTimezone: true }),
  createdById: integer('created_by_id').references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
}, (t) => [
  index('mail_outbox_due_idx').on(t.status, t.nextAttemptAt),
  index('mail_outbox_briefing_idx').on(t.briefingId),
])

/**
 * Each try at sending an outbox row, written on a separate connection while the sender holds the
 * row lock. `handed_over_at` is set just before the end of the message is written to the relay:
 * an attempt with it set and no outcome means the relay may have accepted the message.
 */
export const mailAttempts = pgTable('mail_attempts', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  outboxId: bigint('outbox_id', { mode: 'number' }).notNull().references(() => mailOutbox.id, { onDelete: 'cascade' }),
  attempt: integer('attempt').notNull(),
  worker: text('worker').notNull(),
  startedAt: timestamp('started_at', { withTimezone: true }).notNull().defaultNow(),
  handedOverAt: timestamp('handed_over_at', { withTimezone: true }),
  finishedAt: timestamp('finished_at', { withTimezone: true }),
  /** sent | refused (the relay answered with an error) | error (no answer) | abandoned (found unfinished). */
  outcome: text('outcome'),
  detail: text('detail'),
}, (t) => [index('mail_attempts_outbox_idx').on(t.outboxId, t.attempt)])

export interface ReceivedAttachmentMeta { index: number; filename: string | null; contentType: string; size: number; sha256: string }

/** What the local SMTP stand-in received (the demo's and the tests' inbox), as parsed by mailparser. */
export const receivedMail = pgTable('received_mail', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
  /** The stand-in that took it (port), so tests with several stand-ins can tell them apart. */
  listener: text('listener').notNull(),
  envelopeFrom: text('envelope_from'),
  envelopeTo: text('envelope_to').array().notNull(),
  messageId: text('message_id'),
  subject: text('subject'),
  fromHeader: text('from_header'),
  toHeader: text('to_header'),
  textBody: text('text_body'),
  htmlBody: text('html_body'),
  attachments: jsonb('attachments').$type<ReceivedAttachmentMeta[]>().notNull(),
  size: integer('size').notNull(),
  raw: bytea('raw').notNull(),
}, (t) => [index('received_mail_message_id_idx').on(t.messageId), index('received_mail_received_idx').on(t.receivedAt)])

export const receivedMailAttachments = pgTable('received_mail_attachments', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  mailId: bigint('mail_id', { mode: 'number' }).notNull().references(() => receivedMail.id, { onDelete: 'cascade' }),
  index: integer('index').notNull(),
  filename: text('filename'),
  contentType: text('content_type').notNull(),
  sha256: text('sha256').notNull(),
  content: bytea('content').notNull(),
}, (t) => [index('received_mail_attachments_mail_idx').on(t.mailId, t.index)])
