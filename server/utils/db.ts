import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres'
import pg from 'pg'
import * as schema from '../db/schema'

export type Database = NodePgDatabase<typeof schema>
export const tables = schema

let pool: pg.Pool | undefined
let db: Database | undefined

/** Connection string from NUXT_DATABASE_URL or DATABASE_URL (scripts and the worker use the same). */
export function databaseUrl(): string {
  const url = process.env.NUXT_DATABASE_URL || process.env.DATABASE_URL
  if (!url) throw new Error('DATABASE_URL is not set: point it at the PostgreSQL database (npm start sets it for you)')
  return url
}

/** The process-wide Drizzle client over a pg pool. */
export function useDB(): Database {
  if (!db) {
    pool = new pg.Pool({ connectionString: databaseUrl(), max: 10 })
    db = drizzle(pool, { schema })
  }
  return db
}

/** Closes the pool (scripts and tests). */
export async function closeDB(): Promise<void> {
  await pool?.end()
  pool = undefined
  db = undefined
}
