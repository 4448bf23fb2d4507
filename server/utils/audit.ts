import type { H3Event } from 'h3'
import { getRequestIP } from 'h3'
import { count, desc } from 'drizzle-orm'
import { useDB, tables, type Database } from './db'

export interface AuditEntry {
  actor: { id: number; email: string } | null
  action: string
  entityType: string
  entityId?: string | number | null
  before?: unknown
  after?: unknown
}

/** Appends one entry to the audit log (inside the caller's transaction when `tx` is given). */
export async function recordAudit(entry: AuditEntry, event?: H3Event, tx: Pick<Database, 'insert'> = useDB()): Promise<void> {
  await tx.insert(tables.auditLog).values({
    actorId: entry.actor?.id ?? null,
    actorEmail: entry.actor?.email ?? null,
    action: entry.action,
    entityType: entry.entityType,
    entityId: entry.entityId == null ? null : String(entry.entityId),
    before: entry.before ?? null,
    after: entry.after ?? null,
    ipAddress: event ? clientAddress(event) : null,
  })
}

/** The client's address; X-Forwarded-For is trusted only behind a configured proxy. */
export function clientAddress(event: H3Event): string {
  const trustProxy = process.env.TESSERA_TRUST_PROXY === 'true'
  return getRequestIP(event, { xForwardedFor: trustProxy }) ?? 'unknown'
}

/** Newest first, for the audit page. */
export async function listAudit(limit: number, offset: number) {
  const db = useDB()
  const [entries, [total]] = await Promise.all([
    db.select().from(tables.auditLog).orderBy(desc(tables.auditLog.id)).limit(limit).offset(offset),
    db.select({ n: count() }).from(tables.auditLog),
  ])
  return { entries, total: total?.n ?? 0 }
}
