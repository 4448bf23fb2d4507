import { boolean, doublePrecision, index, integer, jsonb, pgEnum, pgTable, serial, text } from 'drizzle-orm/pg-core'
import { sql } from 'drizzle-orm'
import { users } from './users'
import { geometry4326, timestamps } from './columns'

/** How an area was made: drawn or uploaded polygon, lon-lat rectangle, or a circle (kept as its polygon too). */
export const areaKindEnum = pgEnum('area_kind', ['polygon', 'rectangle', 'circle'])

/**
 * Areas of interest, shared by the office. The geometry is always a WGS 84 MultiPolygon
 * (a circle is stored as its 64-vertex polygon, with centre and radius kept to edit it).
 */
export const areas = pgTable('areas', {
  id: serial('id').primaryKey(),
  name: text('name').notNull(),
  tags: text('tags').array().notNull().default(sql`'{}'::text[]`),
  kind: areaKindEnum('kind').notNull().default('polygon'),
  /** [longitude, latitude] of a circle's centre (circles only). */
  circleCentre: jsonb('circle_centre').$type<[number, number]>(),
  circleRadiusKm: doublePrecision('circle_radius_km'),
  geometry: geometry4326('geometry', 'MultiPolygon').notNull(),
  ownerId: integer('owner_id').references(() => users.id, { onDelete: 'set null' }),
  isDemo: boolean('is_demo').notNull().default(false),
  ...timestamps,
}, (t) => [
  index('areas_geometry_idx').using('gist', t.geometry),
  index('areas_owner_idx').on(t.ownerId),
])
