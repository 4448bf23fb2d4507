import { boolean, doublePrecision, integer, pgEnum, pgTable, serial, text, uniqueIndex } from 'drizzle-orm/pg-core'
import { users } from './users'
import { timestamps } from './columns'

export const hazardEnum = pgEnum('hazard', ['gust', 'low_temperature', 'heavy_precipitation', 'heat'])
export const thresholdDirectionEnum = pgEnum('threshold_direction', ['above', 'below'])

/**
 * The office's threshold set per hazard. Values are in the hazard's canonical units (m s-1,
 * degC, mm); is_default marks the values shipped as common practice (not official warning levels).
 */
export const hazardThresholds = pgTable('hazard_thresholds', {
  id: serial('id').primaryKey(),
  hazard: hazardEnum('hazard').notNull(),
  label: text('label').notNull(),
  value: doublePrecision('value').notNull(),
  units: text('units').notNull(),
  direction: thresholdDirectionEnum('direction').notNull(),
  isDefault: boolean('is_default').notNull().default(false),
  position: integer('position').notNull().default(0),
  updatedById: integer('updated_by_id').references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
}, (t) => [uniqueIndex('hazard_thresholds_unique').on(t.hazard, t.direction, t.value)])
