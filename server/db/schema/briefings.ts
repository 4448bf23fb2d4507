import { type AnyPgColumn, bigserial, boolean, index, integer, jsonb, pgEnum, pgTable, serial, text, timestamp, uniqueIndex } from 'drizzle-orm/pg-core'
import { BRIEFING_EVENT_ACTIONS, BRIEFING_STATUSES } from '../../../shared/utils/briefingStates'
import type {
  BriefingCaveats, BriefingFigure, BriefingMethod, BriefingNarrative, BriefingRecipient, BriefingSelection, BriefingStatement,
} from '../../../shared/schemas/briefings'
import { users } from './users'
import { runs } from './runs'
import { bytea, timestamps } from './columns'

export const briefingStatusEnum = pgEnum('briefing_status', BRIEFING_STATUSES)
export const briefingEventActionEnum = pgEnum('briefing_event_action', BRIEFING_EVENT_ACTIONS)

/**
 * One version of a briefing. All versions of a briefing share series_id; an amendment is a new
 * row with version + 1 and supersedes_id pointing at the issued version it corrects.
 * lock_version guards every change (optimistic locking: UPDATE … WHERE lock_version = ?).
 * pdf / pdf_sha256 hold the latest rendering; approved_pdf_sha256 the one the duty lead approved.
 */
export const briefings = pgTable('briefings', {
  id: serial('id').primaryKey(),
  seriesId: integer('series_id').notNull(),
  version: integer('version').notNull().default(1),
  supersedesId: integer('supersedes_id').references((): AnyPgColumn => briefings.id, { onDelete: 'set null' }),
  status: briefingStatusEnum('status').notNull().default('draft'),
  title: text('title').notNull(),
  runId: integer('run_id').references(() => runs.id, { onDelete: 'set null' }),
  windowStart: timestamp('window_start', { withTimezone: true }),
  windowEnd: timestamp('window_end', { withTimezone: true }),
  likelihoodScale: text('likelihood_scale').notNull(),
  selection: jsonb('selection').$type<BriefingSelection>().notNull(),
  narrative: jsonb('narrative').$type<BriefingNarrative>().notNull(),
  confidenceNote: text('confidence_note').notNull().default(''),
  nextUpdateAt: timestamp('next_update_at', { withTimezone: true }),
  contact: text('contact').notNull().default(''),
  caveats: jsonb('caveats').$type<BriefingCaveats>().notNull(),
  statements: jsonb('statements').$type<BriefingStatement[]>().notNull(),
  figures: jsonb('figures').$type<BriefingFigure[]>().notNull(),
  recipients: jsonb('recipients').$type<BriefingRecipient[]>().notNull(),
  method: jsonb('method').$type<BriefingMethod>(),
  localTimeName: text('local_time_name').notNull().default('UTC'),
  utcOffsetMinutes: integer('utc_offset_minutes').notNull().default(0),
  authorId: integer('author_id').references(() => users.id, { onDelete: 'set null' }),
  /** Everyone who edited this version (the author included): none of them may approve it. */
  editorIds: integer('editor_ids').array().notNull(),
  submittedAt: timestamp('submitted_at', { withTimezone: true }),
  submittedById: integer('submitted_by_id').references(() => users.id, { onDelete: 'set null' }),
  approvedAt: timestamp('approved_at', { withTimezone: true }),
  approvedById: integer('approved_by_id').references(() => users.id, { onDelete: 'set null' }),
  approvedPdfSha256: text('approved_pdf_sha256'),
  issuedAt: timestamp('issued_at', { withTimezone: true }),
  issuedById: integer('issued_by_id').references(() => users.id, { onDelete: 'set null' }),
  withdrawnAt: timestamp('withdrawn_at', { withTimezone: true }),
  withdrawnById: integer('withdrawn_by_id').references(() => users.id, { onDelete: 'set null' }),
  withdrawnReason: text('withdrawn_reason'),
  pdf: bytea('pdf'),
  pdfSha256: text('pdf_sha256'),
  pdfRenderedAt: timestamp('pdf_rendered_at', { withTimezone: true }),
  /** lock_version the stored PDF was rendered from (the PDF is current when it equals lock_version). */
  pdfLockVersion: integer('pdf_lock_version'),
  lockVersion: integer('lock_version').notNull().default(1),
  ...timestamps,
}, (t) => [
  uniqueIndex('briefings_series_version_unique').on(t.seriesId, t.version),
  index('briefings_status_idx').on(t.status, t.updatedAt),
  index('briefings_run_idx').on(t.runId),
])

/** The history shown on the briefing page: one row per transition or edit session. */
export const briefingEvents = pgTable('briefing_events', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  briefingId: integer('briefing_id').notNull().references(() => briefings.id, { onDelete: 'cascade' }),
  at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  actorId: integer('actor_id').references(() => users.id, { onDelete: 'set null' }),
  actorName: text('actor_name'),
  action: briefingEventActionEnum('action').notNull(),
  comment: text('comment'),
  fromStatus: briefingStatusEnum('from_status'),
  toStatus: briefingStatusEnum('to_status'),
  pdfSha256: text('pdf_sha256'),
}, (t) => [index('briefing_events_briefing_idx').on(t.briefingId, t.at)])

/**
 * Standard caveats kept by duty leads and administrators. Standing caveats are part of every
 * briefing; the others are offered in the builder. Briefings copy the texts they use.
 */
export const caveatLibrary = pgTable('caveat_library', {
  id: serial('id').primaryKey(),
  title: text('title').notNull(),
  text: text('text').notNull(),
  standing: boolean('standing').notNull().default(false),
  active: boolean('active').notNull().default(true),
  sort: integer('sort').notNull().default(100),
  updatedById: integer('updated_by_id').references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
})
