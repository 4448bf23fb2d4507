import { sql } from 'drizzle-orm'

/** Liveness for scripts and monitoring; public, reveals nothing but up/down. */
export default defineEventHandler(async () => {
  await useDB().execute(sql`select 1`)
  return { ok: true }
})
