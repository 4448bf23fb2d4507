import { customType, index, integer, jsonb, pgTable, text, timestamp } from 'drizzle-orm/pg-core'
import { sql } from 'drizzle-orm'
import { briefings, briefingStatusEnum } from './briefings'
import { geometry4326 } from './columns'

/** An area as it was when the briefing was last editable (RFC 7946 winding, WGS 84 lon-lat). */
export interface BriefingAreaShape { id: number; name: string; geometry: { type: 'MultiPolygon'; coordinates: number[][][][] } }

const tsvector = customType<{ data: string; driverData: string }>({ dataType: () => 'tsvector' })

/**
 * The archive's search index, one row per briefing version, kept up to date by a trigger on
 * `briefings` (migration "archive_search"): the weighted text-search document (title and headline
 * A, area names and statements B, summary C, details, confidence and caveats D), the hazards, the
 * area names and the union of the briefing's areas (GiST) for the map filter. A separate table so
 * the briefings rows, immutable once issued, stay exactly as they were written.
 */
export const briefingSearch = pgTable('briefing_search', {
  briefingId: integer('briefing_id').primaryKey().references(() => briefings.id, { onDelete: 'cascade' }),
  /** Copied from the briefing so filters and date ordering are answered from this table's indexes. */
  status: briefingStatusEnum('status').notNull(),
  issuedAt: timestamp('issued_at', { withTimezone: true }),
  authorId: integer('author_id'),
  approvedById: integer('approved_by_id'),
  /** Lists the version was sent to (kept by a trigger on briefing_lists). */
  listIds: integer('list_ids').array().notNull().default(sql`'{}'::int[]`),
  document: tsvector('document').notNull(),
  hazards: text('hazards').array().notNull().default(sql`'{}'::text[]`),
  areaNames: text('area_names').array().notNull().default(sql`'{}'::text[]`),
  footprint: geometry4326('footprint', 'MultiPolygon'),
  /** Each area's own outline, frozen with the content (the exports read it). */
  areaShapes: jsonb('area_shapes').$type<BriefingAreaShape[]>().notNull().default([]),
  refreshedAt: timestamp('refreshed_at', { withTimezone: true }).notNull().defaultNow(),
}, (t) => [
  index('briefing_search_issued_idx').on(t.issuedAt),
  index('briefing_search_author_idx').on(t.authorId),
  index('briefing_search_approver_idx').on(t.approvedById),
  index('briefing_search_lists_idx').using('gin', t.listIds),
  index('briefing_search_document_idx').using('gin', t.document),
  index('briefing_search_hazards_idx').using('gin', t.hazards),
  index('briefing_search_footprint_idx').using('gist', t.footprint),
])
