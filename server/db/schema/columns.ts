import { customType, timestamp } from 'drizzle-orm/pg-core'

/** created_at / updated_at, spread into every mutable table. */
export const timestamps = {
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow().$onUpdate(() => new Date()),
}

/** Raw bytes (typed-array payloads: coarse fields, packed samples). */
export const bytea = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => 'bytea' })

/** A PostGIS geometry column that keeps its SRID in migrations (drizzle's built-in drops it). */
export const geometry4326 = (name: string, kind = 'Geometry') =>
  customType<{ data: string; driverData: string }>({ dataType: () => `geometry(${kind},4326)` })(name)
