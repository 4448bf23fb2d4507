import { boolean, doublePrecision, index, integer, jsonb, pgEnum, pgTable, real, serial, text, timestamp, uniqueIndex } from 'drizzle-orm/pg-core'
import { users } from './users'
import { bytea, timestamps } from './columns'
import type { MethodCheckReport, MethodCheckSettings } from '../../../shared/numerics/pipeline/methodCheckReport'

/** queued → running → completed | failed (a failed or stale check can be queued again by the worker's sweeper). */
export const methodCheckStatusEnum = pgEnum('method_check_status', ['queued', 'running', 'completed', 'failed'])

/** Where a check's truth came from (kept with the check, so it stays meaningful after the truth is deleted). */
export interface MethodCheckTruthSource {
  kind: 'upload' | 'demo'
  name: string
  truthId: number | null
  demoKey?: string
  fileName?: string
  sha256?: string
  /** CF standard name: picks the latent transform as for a run ('auto'). */
  standardName?: string
  memberIndex: number
  leadIndex: number
}

/**
 * Fine "truth" fields for method checks: one member at one lead time of an uploaded file (any format
 * the run upload reads), or an invented demo field. data: Float32 little-endian, row-major ny×nx,
 * j = 0 the southernmost row, canonical units, complete (no missing cells).
 */
export const methodCheckTruths = pgTable('method_check_truths', {
  id: serial('id').primaryKey(),
  name: text('name').notNull(),
  description: text('description'),
  isDemo: boolean('is_demo').notNull().default(false),
  /** Stable key of a demo field (null for uploads); keeps seeding idempotent. */
  demoKey: text('demo_key'),
  variable: text('variable').notNull(),
  standardName: text('standard_name'),
  canonicalUnits: text('canonical_units').notNull(),
  displayUnits: text('display_units').notNull(),
  nx: integer('nx').notNull(),
  ny: integer('ny').notNull(),
  spacingKm: doublePrecision('spacing_km').notNull(),
  validTime: text('valid_time'),
  memberIndex: integer('member_index').notNull().default(0),
  leadIndex: integer('lead_index').notNull().default(0),
  sourceFileName: text('source_file_name'),
  sourceSha256: text('source_sha256'),
  stats: jsonb('stats').$type<{ min: number; max: number; mean: number; std: number }>().notNull(),
  data: bytea('data').notNull(),
  uploadedById: integer('uploaded_by_id').references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
}, (t) => [uniqueIndex('method_check_truths_demo_key').on(t.demoKey)])

/** Several checks started together (e.g. every demo truth × several factors), summarised as a distribution. */
export const methodCheckBatches = pgTable('method_check_batches', {
  id: serial('id').primaryKey(),
  name: text('name').notNull(),
  /** The settings every member shares (factor varies per member). */
  settings: jsonb('settings').$type<Omit<MethodCheckSettings, 'factor'> & { factors: number[] }>().notNull(),
  authorId: integer('author_id').references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
})

/**
 * One method check: the truth it was run on (a copy, Float32 as in method_check_truths), its settings,
 * live progress, and the report. The row is the truth about progress; pg-boss only dispatches, and a
 * worker owns a running check through worker_id and keeps heartbeat_at fresh.
 */
export const methodChecks = pgTable('method_checks', {
  id: serial('id').primaryKey(),
  name: text('name').notNull(),
  status: methodCheckStatusEnum('status').notNull().default('queued'),
  settings: jsonb('settings').$type<MethodCheckSettings>().notNull(),
  truthSource: jsonb('truth_source').$type<MethodCheckTruthSource>().notNull(),
  truthNx: integer('truth_nx').notNull(),
  truthNy: integer('truth_ny').notNull(),
  truthSpacingKm: doublePrecision('truth_spacing_km').notNull(),
  truthUnits: text('truth_units').notNull(),
  truthField: bytea('truth_field').notNull(),
  report: jsonb('report').$type<MethodCheckReport>(),
  /** 0…1 and what is being done, while running. */
  progress: real('progress').notNull().default(0),
  stage: text('stage'),
  error: text('error'),
  attempts: integer('attempts').notNull().default(0),
  workerId: text('worker_id'),
  heartbeatAt: timestamp('heartbeat_at', { withTimezone: true }),
  batchId: integer('batch_id').references(() => methodCheckBatches.id, { onDelete: 'cascade' }),
  authorId: integer('author_id').references(() => users.id, { onDelete: 'set null' }),
  startedAt: timestamp('started_at', { withTimezone: true }),
  finishedAt: timestamp('finished_at', { withTimezone: true }),
  elapsedMs: integer('elapsed_ms'),
  ...timestamps,
}, (t) => [
  index('method_checks_status_idx').on(t.status, t.heartbeatAt),
  index('method_checks_batch_idx').on(t.batchId),
])
