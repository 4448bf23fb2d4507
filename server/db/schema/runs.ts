import { boolean, doublePrecision, index, integer, jsonb, pgEnum, pgTable, primaryKey, real, serial, text, timestamp, uniqueIndex } from 'drizzle-orm/pg-core'
import { sql } from 'drizzle-orm'
import { users } from './users'
import { bytea, geometry4326, timestamps } from './columns'

/**
 * staged: read and validated, waiting for the forecaster to confirm the preview (hidden from lists);
 * ready: confirmed, not downscaled; queued/running/completed/failed/cancelled: the downscaling job.
 */
export const runStatusEnum = pgEnum('run_status', ['staged', 'ready', 'queued', 'running', 'completed', 'failed', 'cancelled'])
export const taskStatusEnum = pgEnum('task_status', ['pending', 'running', 'done', 'failed', 'cancelled'])

/** Grid placement as read from the file (see server/ingest/types.ts EnsembleGrid). */
export interface RunGrid {
  nx: number; ny: number; spacingKm: number; dxKm: number; dyKm: number; crs: string; proj4: string
  x: number[]; y: number[]; xUnits: string; yUnits: string
}

export interface DownscaleSettings {
  factor: number
  samplesPerMember: number
  kernel: 'auto' | 'se' | 'matern12' | 'matern32' | 'matern52'
  seed: number
  /** Extensions (absent in runs started before they existed = the basic model). */
  transform?: 'auto' | 'none' | 'boxcox' | 'log' | 'censored'
  anisotropy?: 'off' | 'fit'
  regimes?: 'off' | 'windows'
  timeCoherence?: boolean
  /** Decorrelation time τ fitted from the coarse members when the run started (hours). */
  timeScaleHours?: number
}

export const runs = pgTable('runs', {
  id: serial('id').primaryKey(),
  name: text('name').notNull(),
  status: runStatusEnum('status').notNull().default('staged'),
  format: text('format').notNull(),
  sourceFileName: text('source_file_name').notNull(),
  sourceSha256: text('source_sha256').notNull(),
  sourceBytes: integer('source_bytes').notNull(),
  variable: text('variable').notNull(),
  standardName: text('standard_name'),
  units: text('units').notNull(),
  canonicalUnits: text('canonical_units').notNull(),
  displayUnits: text('display_units').notNull(),
  members: integer('members').notNull(),
  leadTimes: jsonb('lead_times').$type<string[]>().notNull(),
  forecastPeriodsHours: jsonb('forecast_periods_hours').$type<number[]>().notNull(),
  referenceTime: timestamp('reference_time', { withTimezone: true }),
  heightM: real('height_m'),
  cellMethods: text('cell_methods'),
  grid: jsonb('grid').$type<RunGrid>().notNull(),
  extent: jsonb('extent').$type<[number, number, number, number]>().notNull(),
  corners: jsonb('corners').$type<[number, number][]>().notNull(),
  footprint: geometry4326('footprint', 'Polygon'),
  notes: jsonb('notes').$type<string[]>().notNull().default([]),
  settings: jsonb('settings').$type<DownscaleSettings>(),
  isDemo: boolean('is_demo').notNull().default(false),
  uploadedById: integer('uploaded_by_id').references(() => users.id),
  startedAt: timestamp('started_at', { withTimezone: true }),
  finishedAt: timestamp('finished_at', { withTimezone: true }),
  ...timestamps,
}, (t) => [
  index('runs_status_idx').on(t.status),
  index('runs_footprint_idx').using('gist', t.footprint),
  // The same file cannot be confirmed twice (double submission); staged copies may repeat.
  uniqueIndex('runs_source_unique').on(t.sourceSha256).where(sql`status <> 'staged'`),
])

/** Coarse fields exactly as read: Float32 little-endian, row-major ny×nx, canonical units, NaN = missing. */
export const runFields = pgTable('run_fields', {
  runId: integer('run_id').notNull().references(() => runs.id, { onDelete: 'cascade' }),
  leadIndex: integer('lead_index').notNull(),
  memberIndex: integer('member_index').notNull(),
  data: bytea('data').notNull(),
}, (t) => [primaryKey({ columns: [t.runId, t.leadIndex, t.memberIndex] })])

/**
 * One downscaling task per member and lead time. The row is the truth about progress; pg-boss
 * only dispatches. A worker owns a running task through worker_id and keeps heartbeat_at fresh.
 */
export const runTasks = pgTable('run_tasks', {
  id: serial('id').primaryKey(),
  runId: integer('run_id').notNull().references(() => runs.id, { onDelete: 'cascade' }),
  leadIndex: integer('lead_index').notNull(),
  memberIndex: integer('member_index').notNull(),
  status: taskStatusEnum('status').notNull().default('pending'),
  attempts: integer('attempts').notNull().default(0),
  workerId: text('worker_id'),
  heartbeatAt: timestamp('heartbeat_at', { withTimezone: true }),
  startedAt: timestamp('started_at', { withTimezone: true }),
  finishedAt: timestamp('finished_at', { withTimezone: true }),
  elapsedMs: integer('elapsed_ms'),
  error: text('error'),
  /** Fitted prior (kernel, ℓ in fine cells and km, σ², μ, log-likelihood, interval, profile, bound flag). */
  fit: jsonb('fit'),
  /** Samples packed as Int16 little-endian: value = sampleOffset + sampleScale · q; count × fineNy × fineNx. */
  samples: bytea('samples'),
  sampleOffset: doublePrecision('sample_offset'),
  sampleScale: doublePrecision('sample_scale'),
  sampleCount: integer('sample_count'),
  fineNx: integer('fine_nx'),
  fineNy: integer('fine_ny'),
}, (t) => [
  uniqueIndex('run_tasks_member_unique').on(t.runId, t.leadIndex, t.memberIndex),
  index('run_tasks_status_idx').on(t.status, t.heartbeatAt),
])
