/**
 * The mail outbox: every message is a row written before anything is sent, in the same
 * transaction as the change that causes it (issue, withdraw, invitation). The worker sends the
 * rows (worker/mailSender.ts). No Nitro globals: the worker and scripts import this file.
 */
import { createHash } from 'node:crypto'
import { and, asc, desc, eq, inArray, sql, type SQL } from 'drizzle-orm'
import { useDB, tables, type Database } from './db'
import { useBoss, MAIL_QUEUE } from './jobs'
import { mailSettings } from './mailSettings'
import { recordAudit } from './audit'
import type { H3Event } from 'h3'

type Tx = Pick<Database, 'insert' | 'execute'>
export type MailKind = (typeof tables.mailOutbox.$inferInsert)['kind']

export interface OutboxMessage {
  idempotencyKey: string
  kind: MailKind
  toAddress: string
  toName?: string | null
  subject: string
  textBody: string
  htmlBody: string
  briefingId?: number | null
  briefingVersion?: number | null
  contactId?: number | null
  userId?: number | null
  listNames?: string[]
  organisationName?: string | null
  attachmentName?: string | null
  attachmentSha256?: string | null
  createdById?: number | null
}

/** A Message-ID fixed per outbox row: every attempt at the same message carries the same one. */
export function outboxMessageId(idempotencyKey: string, domain = mailSettings().fromDomain): string {
  return `<tessera.${createHash('sha256').update(idempotencyKey).digest('hex').slice(0, 32)}@${domain}>`
}

/**
 * Writes messages to the outbox (a key already there is left alone, so repeating the call
 * queues nothing twice) and wakes the sender when the transaction commits. Returns how many
 * rows were new.
 */
export async function enqueueMail(tx: Tx, messages: OutboxMessage[]): Promise<number> {
  if (messages.length === 0) return 0
  const settings = mailSettings()
  const rows = await tx.insert(tables.mailOutbox).values(messages.map((m) => ({
    ...m,
    toAddress: m.toAddress.trim(),
    listNames: m.listNames ?? [],
    messageId: outboxMessageId(m.idempotencyKey, settings.fromDomain),
    maxAttempts: settings.maxAttempts,
  }))).onConflictDoNothing({ target: tables.mailOutbox.idempotencyKey }).returning({ id: tables.mailOutbox.id })
  if (rows.length) await wakeMailSender({ tx })
  return rows.length
}

/**
 * Asks the worker to look at the outbox: inside `tx` the wake-up job appears only if the
 * transaction commits; `startAfter` schedules it (the next retry). Best effort: the worker also
 * sweeps the outbox every few seconds, so a lost wake-up only delays a message.
 */
export async function wakeMailSender(opts: { tx?: Pick<Database, 'execute'>; startAfter?: Date } = {}): Promise<void> {
  try {
    const boss = await useBoss()
    await boss.send(MAIL_QUEUE, {}, {
      ...(opts.startAfter ? { startAfter: opts.startAfter } : {}),
      ...(opts.tx ? { db: bossConnection(opts.tx) } : {}),
    })
  } catch (err) {
    console.warn(`[mail] could not schedule the sender (the periodic sweep will pick the message up): ${(err as Error).message}`)
  }
}

/** pg-boss runs its SQL ("$1, $2 …" placeholders) through the caller's transaction. */
function bossConnection(tx: Pick<Database, 'execute'>) {
  return {
    async executeSql(text: string, values: unknown[]) {
      const pieces = text.split(/(\$\d+)/)
      const param = (v: unknown) => (v === undefined ? null : v !== null && typeof v === 'object' && !(v instanceof Date) ? JSON.stringify(v) : v)
      const query = sql.join(pieces.map((p): SQL => (/^\$\d+$/.test(p) ? sql`${param(values[Number(p.slice(1)) - 1])}` : sql.raw(p))), sql.raw(''))
      const res = await tx.execute(query)
      return { rows: res.rows as any[] }
    },
  }
}

const o = tables.mailOutbox

/** What the briefing page shows per recipient. */
export async function briefingDeliveries(briefingId: number) {
  const rows = await useDB().select({
    id: o.id, kind: o.kind, status: o.status, toAddress: o.toAddress, toName: o.toName, organisationName: o.organisationName,
    listNames: o.listNames, subject: o.subject, attempts: o.attempts, maxAttempts: o.maxAttempts, nextAttemptAt: o.nextAttemptAt,
    lastError: o.lastError, sentAt: o.sentAt, createdAt: o.createdAt, attachmentSha256: o.attachmentSha256, messageId: o.messageId,
  }).from(o).where(eq(o.briefingId, briefingId)).orderBy(asc(o.createdAt), asc(o.toAddress))
  const counts = { queued: 0, sent: 0, failed: 0, uncertain: 0 }
  for (const r of rows) counts[r.status]++
  return { deliveries: rows, counts }
}

/** The newest outbox rows (admin "Mail log" page, outgoing side). */
export async function recentOutbox(limit: number, offset: number) {
  const db = useDB()
  const [rows, [total]] = await Promise.all([
    db.select({
      id: o.id, kind: o.kind, status: o.status, toAddress: o.toAddress, subject: o.subject, attempts: o.attempts,
      lastError: o.lastError, sentAt: o.sentAt, createdAt: o.createdAt, briefingId: o.briefingId, messageId: o.messageId,
    }).from(o).orderBy(desc(o.id)).limit(limit).offset(offset),
    db.select({ n: sql<number>`count(*)::int` }).from(o),
  ])
  return { messages: rows, total: total?.n ?? 0 }
}

export class OutboxRetryError extends Error {
  constructor(message: string, readonly status: 404 | 409) { super(message) }
}

/**
 * Puts a failed or uncertain message back in the queue with a fresh allowance of attempts.
 * Sent messages cannot be retried (that would be a second copy).
 */
export async function retryOutboxMessage(id: number, actor: { id: number; email: string }, event?: H3Event) {
  return useDB().transaction(async (tx) => {
    const [row] = await tx.select().from(o).where(eq(o.id, id)).for('update')
    if (!row) throw new OutboxRetryError(`There is no message ${id} in the outbox.`, 404)
    if (row.status === 'sent') throw new OutboxRetryError('This message was delivered to the relay already; sending it again would make a second copy.', 409)
    if (row.status === 'queued') throw new OutboxRetryError('This message is already waiting to be sent.', 409)
    const [after] = await tx.update(o).set({
      status: 'queued', nextAttemptAt: new Date(), maxAttempts: row.attempts + mailSettings().maxAttempts,
      lastError: `${row.status === 'uncertain' ? 'Sent again' : 'Retried'} by ${actor.email} after: ${row.lastError ?? 'no error recorded'}`,
    }).where(and(eq(o.id, id), inArray(o.status, ['failed', 'uncertain']))).returning()
    await recordAudit({
      actor, action: 'mail.retry', entityType: 'mail', entityId: id,
      before: { status: row.status, to: row.toAddress, lastError: row.lastError }, after: { status: after!.status },
    }, event, tx)
    await wakeMailSender({ tx })
    return { id, status: after!.status }
  })
}
