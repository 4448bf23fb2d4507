/**
 * Sends the mail outbox over SMTP, one row per database transaction.
 *
 * The delivery rule: at most one copy per outbox row (idempotency key), and every message the
 * relay has not certainly received is tried again until it is accepted or out of attempts.
 *
 *  - Claim: `SELECT … FOR NO KEY UPDATE SKIP LOCKED` inside a transaction that stays open for
 *    the whole SMTP exchange. The row lock is the claim: a second sender skips the row, and if
 *    this process dies PostgreSQL drops the lock at once (no lease or heartbeat needed). The
 *    session's idle-in-transaction limit frees it if a sender hangs.
 *  - Attempts are logged in mail_attempts through a second connection (autocommit), so the log
 *    survives a crash that rolls the claim back. `handed_over_at` is written, and committed,
 *    just before the last byte of the message (after which the relay's "250" makes it
 *    delivered).
 *  - The next sender to claim a row first reads its last attempt. Unfinished and never handed
 *    over: the relay cannot have accepted it (SMTP delivers only after the end of the data), so
 *    it is sent again. Unfinished but handed over: the relay may have it; the row becomes
 *    `uncertain` and is not re-sent unless a person decides to (the briefing page offers it).
 *    Finished as sent but the row still queued (crash between the two writes): marked sent.
 *  - A relay's error reply is unambiguous: 4xx → retry with exponential backoff, 5xx → failed.
 *    A broken connection before the hand-over → retry; after it → uncertain.
 *
 * The window left open is the few milliseconds between the hand-over mark and the relay's
 * answer: a crash there yields an `uncertain` row (a person checks), never a silent duplicate.
 * Every copy carries the row's fixed Message-ID, so even a copy sent again by hand can be
 * recognised as the same message by the recipient's mail system.
 */
import { createHash } from 'node:crypto'
import { Readable } from 'node:stream'
import { and, desc, eq, lte, sql } from 'drizzle-orm'
import SMTPConnection from 'nodemailer/lib/smtp-connection'
import MailComposer from 'nodemailer/lib/mail-composer'
import { useDB, tables } from '../server/utils/db'
import { mailSettings, retryDelaySeconds, smtpConnectionOptions, type MailSettings } from '../server/utils/mailSettings'

const o = tables.mailOutbox
const a = tables.mailAttempts
type OutboxRow = typeof o.$inferSelect

export interface MailSenderOptions {
  workerId: string
  log?: (message: string) => void
  settings?: MailSettings
  /** Rows sent at the same time (each holds one connection for its SMTP exchange). */
  concurrency?: number
}

export interface SendOutcome { id: number; status: OutboxRow['status']; retryAt: Date | null }

/** A message stream that waits for `beforeEnd` (the hand-over mark) before its end. */
class HandOverStream extends Readable {
  private pushed = false
  constructor(private readonly body: Buffer, private readonly beforeEnd: () => Promise<void>) { super() }
  override _read(): void {
    if (!this.pushed) {
      this.pushed = true
      this.push(this.body)
      return
    }
    this.beforeEnd().then(() => this.push(null), (err) => this.destroy(err as Error))
  }
}

interface SmtpError extends Error { responseCode?: number; code?: string; response?: string }

/**
 * One SMTP exchange on its own connection: connect, log in if configured, MAIL/RCPT/DATA, the
 * message, QUIT. nodemailer's SMTPConnection reads the message stream only after the relay
 * has answered DATA with 354, so the stream's end marks the hand-over precisely.
 */
function deliverOverSmtp(settings: MailSettings, envelope: { from: string; to: string[] }, message: Readable): Promise<string> {
  return new Promise((resolve, reject) => {
    const connection = new SMTPConnection(smtpConnectionOptions(settings))
    let settled = false
    const finish = (err: Error | null, response?: string) => {
      if (settled) return
      settled = true
      if (err) { connection.close(); reject(err) } else { connection.quit(); resolve(response ?? '') }
    }
    connection.on('error', (err: Error) => finish(err))
    connection.on('end', () => finish(Object.assign(new Error('The relay closed the connection'), { code: 'ECONNECTION' })))
    connection.connect((err) => {
      if (err) return finish(err)
      const send = () => connection.send(envelope, message, (sendErr, info) => finish(sendErr ?? null, info ? String(info.response ?? '') : undefined))
      if (!settings.user) return send()
      connection.login({ credentials: { user: settings.user, pass: settings.password ?? '' } }, (loginErr) => (loginErr ? finish(loginErr) : send()))
    })
  })
}

/** SHA-256 of bytes, hex. */
const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex')

export function createMailSender(opts: MailSenderOptions) {
  const settings = opts.settings ?? mailSettings()
  const log = opts.log ?? (() => {})
  const db = useDB()
  const fromAddress = /<([^>]+)>/.exec(settings.from)?.[1] ?? settings.from

  async function finishAttempt(id: number, outcome: string, detail: string | null) {
    await db.update(a).set({ finishedAt: new Date(), outcome, detail: detail?.slice(0, 2000) ?? null }).where(eq(a.id, id))
  }

  async function buildMessage(row: OutboxRow, tx: Pick<typeof db, 'select'>): Promise<Buffer> {
    const attachments: { filename: string; content: Buffer; contentType: string }[] = []
    if (row.attachmentSha256) {
      if (!row.briefingId) throw new PermanentProblem('The briefing this message belongs to no longer exists.')
      const [b] = await tx.select({ pdf: tables.briefings.pdf }).from(tables.briefings).where(eq(tables.briefings.id, row.briefingId))
      if (!b?.pdf) throw new PermanentProblem('The briefing has no stored PDF to attach.')
      const actual = sha256(b.pdf)
      if (actual !== row.attachmentSha256) {
        throw new PermanentProblem(`The stored PDF (SHA-256 ${actual.slice(0, 12)}…) is not the one this message was written for (${row.attachmentSha256.slice(0, 12)}…); nothing was sent.`)
      }
      attachments.push({ filename: row.attachmentName ?? 'briefing.pdf', content: b.pdf, contentType: 'application/pdf' })
    }
    const composer = new MailComposer({
      from: settings.from,
      to: row.toName ? { name: row.toName, address: row.toAddress } : row.toAddress,
      subject: row.subject,
      text: row.textBody,
      html: row.htmlBody,
      messageId: row.messageId,
      date: new Date(),
      headers: { 'Auto-Submitted': 'auto-generated', 'X-Tessera-Outbox': String(row.id) },
      attachments,
      disableFileAccess: true,
      disableUrlAccess: true,
    })
    return composer.compile().build()
  }

  /**
   * Claims and sends one due row. Returns null when nothing is due (or every due row is being
   * sent by someone else).
   */
  async function sendOne(): Promise<SendOutcome | null> {
    return db.transaction(async (tx) => {
      await tx.execute(sql`SET LOCAL idle_in_transaction_session_timeout = '300s'`)
      const [row] = await tx.select().from(o)
        .where(and(eq(o.status, 'queued'), lte(o.nextAttemptAt, sql`now()`)))
        .orderBy(o.nextAttemptAt, o.id).limit(1).for('no key update', { skipLocked: true })
      if (!row) return null

      const [last] = await tx.select().from(a).where(eq(a.outboxId, row.id)).orderBy(desc(a.attempt)).limit(1)
      if (last && !last.finishedAt) {
        // Its sender stopped without an outcome (we hold the lock, so that sender is gone).
        if (last.handedOverAt) {
          await finishAttempt(last.id, 'abandoned', 'the sender stopped after handing the message over')
          const lastError = `Delivery uncertain: the sender stopped after handing the whole message to the relay (${last.handedOverAt.toISOString()}) and before its answer. It may have arrived; check with the recipient before sending again.`
          await tx.update(o).set({ status: 'uncertain', attempts: last.attempt, lastError }).where(eq(o.id, row.id))
          log(`outbox ${row.id}: uncertain after an interrupted attempt ${last.attempt}`)
          return { id: row.id, status: 'uncertain' as const, retryAt: null }
        }
        await finishAttempt(last.id, 'abandoned', 'the sender stopped before the end of the message; sending again is safe')
      } else if (last?.outcome === 'sent') {
        await tx.update(o).set({ status: 'sent', attempts: last.attempt, sentAt: last.finishedAt, relayResponse: last.detail, lastError: null }).where(eq(o.id, row.id))
        return { id: row.id, status: 'sent' as const, retryAt: null }
      }

      const attempt = (last?.attempt ?? 0) + 1
      if (attempt > row.maxAttempts) {
        await tx.update(o).set({ status: 'failed', lastError: row.lastError ?? 'Out of attempts.' }).where(eq(o.id, row.id))
        return { id: row.id, status: 'failed' as const, retryAt: null }
      }
      const [record] = await db.insert(a).values({ outboxId: row.id, attempt, worker: opts.workerId }).returning({ id: a.id })
      let handedOver = false
      try {
        const message = await buildMessage(row, tx)
        const response = await deliverOverSmtp(settings, { from: fromAddress, to: [row.toAddress] }, new HandOverStream(message, async () => {
          await db.update(a).set({ handedOverAt: new Date() }).where(eq(a.id, record!.id))
          handedOver = true
        })) || '250'
        await finishAttempt(record!.id, 'sent', response)
        const redacted = row.kind === 'invitation'
          ? { textBody: '[The set-password link was removed from the outbox after sending.]', htmlBody: '<p>[The set-password link was removed from the outbox after sending.]</p>' }
          : {}
        await tx.update(o).set({ status: 'sent', attempts: attempt, sentAt: new Date(), relayResponse: response.slice(0, 500), lastError: null, ...redacted }).where(eq(o.id, row.id))
        log(`outbox ${row.id}: sent to ${row.toAddress} (attempt ${attempt})`)
        return { id: row.id, status: 'sent' as const, retryAt: null }
      } catch (err) {
        const e = err as SmtpError
        const said = e.response ?? e.message
        const detail = (e.responseCode && !said.startsWith(String(e.responseCode)) ? `${e.responseCode} ${said}` : said).slice(0, 1000)
        if (e instanceof PermanentProblem) {
          await finishAttempt(record!.id, 'error', e.message)
          await tx.update(o).set({ status: 'failed', attempts: attempt, lastError: e.message }).where(eq(o.id, row.id))
          return { id: row.id, status: 'failed' as const, retryAt: null }
        }
        if (typeof e.responseCode !== 'number' && handedOver) {
          await finishAttempt(record!.id, 'error', detail)
          const lastError = `Delivery uncertain: the connection broke after the whole message was handed to the relay (${detail}). It may have arrived; check with the recipient before sending again.`
          await tx.update(o).set({ status: 'uncertain', attempts: attempt, lastError }).where(eq(o.id, row.id))
          log(`outbox ${row.id}: uncertain (${detail})`)
          return { id: row.id, status: 'uncertain' as const, retryAt: null }
        }
        await finishAttempt(record!.id, typeof e.responseCode === 'number' ? 'refused' : 'error', detail)
        const permanent = typeof e.responseCode === 'number' && e.responseCode >= 500
        if (permanent || attempt >= row.maxAttempts) {
          const why = permanent ? `The relay refused the message: ${detail}` : `Out of attempts (${attempt}); last error: ${detail}`
          await tx.update(o).set({ status: 'failed', attempts: attempt, lastError: why }).where(eq(o.id, row.id))
          log(`outbox ${row.id}: failed (${detail})`)
          return { id: row.id, status: 'failed' as const, retryAt: null }
        }
        const retryAt = new Date(Date.now() + retryDelaySeconds(attempt, settings.retrySeconds) * 1000)
        await tx.update(o).set({ attempts: attempt, nextAttemptAt: retryAt, lastError: `Attempt ${attempt}: ${detail}` }).where(eq(o.id, row.id))
        log(`outbox ${row.id}: attempt ${attempt} failed (${detail}); next at ${retryAt.toISOString()}`)
        return { id: row.id, status: 'queued' as const, retryAt }
      }
    })
  }

  let running: Promise<SendOutcome[]> | null = null
  let again = false
  /** Sends every due row (with `concurrency` parallel exchanges); overlapping calls are merged. */
  async function drain(): Promise<SendOutcome[]> {
    if (running) { again = true; return running }
    running = (async () => {
      const outcomes: SendOutcome[] = []
      do {
        again = false
        await Promise.all(Array.from({ length: opts.concurrency ?? 2 }, async () => {
          for (;;) {
            const r = await sendOne()
            if (!r) break
            outcomes.push(r)
          }
        }))
      } while (again)
      return outcomes
    })().finally(() => { running = null })
    return running
  }

  return { sendOne, drain }
}

/** A problem with the message itself (no PDF, PDF changed): retrying will not help. */
class PermanentProblem extends Error {}
