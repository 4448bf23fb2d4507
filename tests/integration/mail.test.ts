// Mail through real SMTP: the outbox written in the issuing transaction, a real worker process
// sending to the SMTP stand-in (scripts/lib/smtpStandIn.ts), what arrived parsed with mailparser.
// Relays that refuse, and workers killed mid-send, must never produce a second copy.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createHash } from 'node:crypto'
import { eq, inArray, sql } from 'drizzle-orm'
import { simpleParser } from 'mailparser'
import { useDB, closeDB, tables } from '../../server/utils/db'
import { stopBoss } from '../../server/utils/jobs'
import { enqueueMail } from '../../server/utils/mailOutbox'
import { queueBriefingMail } from '../../server/utils/briefingMail'
import { startSmtpStandIn, type StandIn } from '../../scripts/lib/smtpStandIn'
import { startWorker, waitFor, type WorkerProcess } from '../support/worker'
import { makeBriefing, makeOrganisationWithList, outboxFor, receivedWithMessageId, tag } from './distribution/records'

const MAIN_PORT = process.env.TESSERA_SMTP_PORT ?? '2526'
const db = useDB()
const workers: WorkerProcess[] = []
const standIns: StandIn[] = []

function worker(port: string | number, extra: Record<string, string> = {}) {
  const w = startWorker({ TESSERA_SMTP_HOST: '127.0.0.1', TESSERA_SMTP_PORT: String(port), TESSERA_MAIL_RETRY_SECONDS: '0.5', TESSERA_MAIL_SWEEP_SECONDS: '1', ...extra })
  workers.push(w)
  return w
}
async function standIn(opts: Parameters<typeof startSmtpStandIn>[0]) {
  const s = await startSmtpStandIn(opts)
  standIns.push(s)
  return s
}
async function stopWorkers() {
  await Promise.all(workers.splice(0).map((w) => w.kill('SIGTERM')))
}
const outboxRow = async (id: number) => (await db.select().from(tables.mailOutbox).where(eq(tables.mailOutbox.id, id)))[0]!
const attemptsOf = async (id: number) => db.select().from(tables.mailAttempts).where(eq(tables.mailAttempts.outboxId, id)).orderBy(tables.mailAttempts.attempt)

/** One queued test message (no briefing) to a fresh address; returns its outbox row. */
async function queueOne(subject: string) {
  const key = `it:${tag()}`
  await db.transaction((tx) => enqueueMail(tx, [{ idempotencyKey: key, kind: 'test', toAddress: `${tag()}@relay-test.example`, subject, textBody: 'body', htmlBody: '<p>body</p>' }]))
  const [row] = await db.select().from(tables.mailOutbox).where(eq(tables.mailOutbox.idempotencyKey, key))
  return row!
}

afterAll(async () => {
  await stopWorkers()
  await Promise.all(standIns.map((s) => s.close()))
  await stopBoss()
  await closeDB()
})

describe('issuing sends the briefing by e-mail', () => {
  let briefing: Awaited<ReturnType<typeof makeBriefing>>
  let rows: (typeof tables.mailOutbox.$inferSelect)[]

  beforeAll(async () => {
    const { list } = await makeOrganisationWithList({
      name: `Kaldor Pass Operators ${tag()}`,
      contacts: [{ name: 'Ada Quill', email: `ada-${tag()}@pass-ops.example` }, { name: 'Ben Arrow', email: `ben-${tag()}@pass-ops.example` }],
    })
    briefing = await makeBriefing({ status: 'approved', listKeys: [{ key: list.key, name: list.name }] })
    // As the issue route does: the state change and the outbox rows in one transaction.
    await db.transaction(async (tx) => {
      await tx.update(tables.briefings).set({ status: 'issued', issuedAt: new Date('2031-11-14T09:30:00Z') }).where(eq(tables.briefings.id, briefing.id))
      const first = await queueBriefingMail(tx, briefing.id, 'issue')
      expect(first).toMatchObject({ recipients: 2, queued: 2 })
      // A second call in the same transaction (a retried request) queues nothing more.
      expect(await queueBriefingMail(tx, briefing.id, 'issue')).toMatchObject({ recipients: 2, queued: 0 })
    })
    rows = await outboxFor(briefing.id)
    worker(MAIN_PORT)
  }, 120_000)

  it('records the lists the version went to and one queued row per recipient', async () => {
    expect(rows).toHaveLength(2)
    const lists = await db.select().from(tables.briefingLists).where(eq(tables.briefingLists.briefingId, briefing.id))
    expect(lists).toHaveLength(1)
    for (const r of rows) expect(r.attachmentSha256).toBe(briefing.pdfSha256)
  })

  it('arrives through the stand-in with the right subject and the same PDF', async () => {
    for (const r of rows) {
      const [got] = await waitFor(`message ${r.messageId}`, async () => { const m = await receivedWithMessageId(r.messageId); return m.length ? m : null }, 60_000)
      const parsed = await simpleParser(got!.raw)
      expect(parsed.subject).toBe(r.subject)
      expect(parsed.subject).toMatch(/^Kaldor Pass Operators [0-9a-f]+: Gusts — valid 14 Nov 12:00–18:00 UTC — issued 14 Nov 09:30 UTC — v1$/)
      expect(parsed.messageId).toBe(r.messageId)
      expect((parsed.to as { value: { address: string }[] }).value[0]!.address).toBe(r.toAddress)
      expect(parsed.text).toContain('Read it in your portal:')
      const pdf = parsed.attachments.find((a) => a.contentType === 'application/pdf')!
      expect(pdf.filename).toBe(`tessera-briefing-${briefing.seriesId}-v1.pdf`)
      expect(createHash('sha256').update(pdf.content).digest('hex')).toBe(briefing.pdfSha256)
    }
    await waitFor('rows marked sent', async () => (await outboxFor(briefing.id)).every((r) => r.status === 'sent'), 30_000)
  }, 90_000)

  it('sends an amendment to the new lists and to everyone who had the version it replaces', async () => {
    const extra = await makeOrganisationWithList({ contacts: [{ name: 'Cai Lund', email: `cai-${tag()}@ferry-ops.example` }] })
    const v2 = await makeBriefing({ status: 'approved', seriesId: briefing.seriesId, version: 2, supersedesId: briefing.id, listKeys: [{ key: extra.list.key, name: extra.list.name }] })
    await db.transaction(async (tx) => {
      await tx.update(tables.briefings).set({ status: 'issued', issuedAt: new Date('2031-11-14T11:00:00Z') }).where(eq(tables.briefings.id, v2.id))
      expect(await queueBriefingMail(tx, v2.id, 'amended')).toMatchObject({ recipients: 3, queued: 3 })
    })
    const amended = await outboxFor(v2.id)
    expect(amended.map((r) => r.kind)).toEqual(['amended', 'amended', 'amended'])
    for (const r of amended) {
      expect(r.subject).toMatch(/^AMENDED .* — v2$/)
      expect(r.textBody).toContain('It replaces version 1')
      expect(r.attachmentSha256).toBe(v2.pdfSha256)
    }
    const got = await waitFor('amendment', async () => { const m = await receivedWithMessageId(amended[0]!.messageId); return m.length ? m : null }, 60_000)
    expect(got).toHaveLength(1)
  }, 90_000)

  it('sends a withdrawal notice to the same lists, without the PDF', async () => {
    await db.transaction(async (tx) => {
      await tx.update(tables.briefings).set({ status: 'withdrawn', withdrawnAt: new Date(), withdrawnReason: 'Issued for the wrong day.' }).where(eq(tables.briefings.id, briefing.id))
      expect(await queueBriefingMail(tx, briefing.id, 'withdrawn')).toMatchObject({ recipients: 2, queued: 2 })
    })
    const notices = (await outboxFor(briefing.id)).filter((r) => r.kind === 'withdrawn')
    for (const n of notices) {
      const [got] = await waitFor('withdrawal notice', async () => { const m = await receivedWithMessageId(n.messageId); return m.length ? m : null }, 60_000)
      const parsed = await simpleParser(got!.raw)
      expect(parsed.subject).toMatch(/^WITHDRAWN /)
      expect(parsed.text).toContain('Reason: Issued for the wrong day.')
      expect(parsed.attachments).toHaveLength(0)
    }
    await stopWorkers()
  }, 90_000)
})

describe('a relay that refuses the first attempts', () => {
  it('is retried with backoff and delivers exactly once (RCPT and DATA refusals)', async () => {
    const relay = await standIn({ port: 2541, listener: 'refusing', refuseFirstRcpt: 2, refuseFirstData: 1 })
    const row = await queueOne('Refused at first')
    worker(2541)
    await waitFor('sent', async () => (await outboxRow(row.id)).status === 'sent', 60_000)
    const attempts = await attemptsOf(row.id)
    // Two RCPT refusals (never handed over), one refusal after the data (451 answer: not accepted), then accepted.
    expect(attempts.map((a) => a.outcome)).toEqual(['refused', 'refused', 'refused', 'sent'])
    expect(attempts.map((a) => a.handedOverAt !== null)).toEqual([false, false, true, true])
    // Backoff: attempt k + 1 waits at least 0.5 s · 2^(k − 1) after attempt k ended.
    const gaps = attempts.slice(1).map((a, k) => a.startedAt.getTime() - attempts[k]!.finishedAt!.getTime())
    gaps.forEach((gap, k) => expect(gap).toBeGreaterThanOrEqual(500 * 2 ** k - 50))
    await new Promise((r) => setTimeout(r, 2500)) // a sweep or two later: still one copy
    expect(await receivedWithMessageId(row.messageId)).toHaveLength(1)
    expect(relay.counts.stored).toBe(1)
    expect((await outboxRow(row.id)).attempts).toBe(4)
    await stopWorkers()
  }, 90_000)

  it('marks a message failed at once when the relay refuses it for good (5xx)', async () => {
    await standIn({ port: 2542, listener: 'rejecting', refuseFirstRcpt: 100, refuseCode: 550 })
    const row = await queueOne('Refused for good')
    worker(2542)
    await waitFor('failed', async () => (await outboxRow(row.id)).status === 'failed', 60_000)
    const after = await outboxRow(row.id)
    expect(after.attempts).toBe(1)
    expect(after.lastError).toMatch(/The relay refused the message: 550/)
    expect(await receivedWithMessageId(row.messageId)).toHaveLength(0)
    await stopWorkers()
  }, 90_000)

  it('gives up after the last attempt when no relay answers', async () => {
    const row = await queueOne('Nobody listens')
    await db.update(tables.mailOutbox).set({ maxAttempts: 2 }).where(eq(tables.mailOutbox.id, row.id))
    worker(2549) // nothing listens there: connection refused
    await waitFor('failed', async () => (await outboxRow(row.id)).status === 'failed', 60_000)
    const after = await outboxRow(row.id)
    expect(after.attempts).toBe(2)
    expect(after.lastError).toMatch(/Out of attempts \(2\)/)
    await stopWorkers()
  }, 90_000)
})

describe('a worker killed in the middle of sending', () => {
  it('before the message was handed over: the next worker sends it, once', async () => {
    const slow = await standIn({ port: 2543, listener: 'slow-rcpt', rcptDelayMs: 8000 })
    const row = await queueOne('Killed during RCPT')
    const a = worker(2543)
    await waitFor('RCPT in progress', async () => slow.counts.rcpt >= 1, 60_000)
    await a.kill('SIGKILL')
    worker(MAIN_PORT)
    await waitFor('sent', async () => (await outboxRow(row.id)).status === 'sent', 60_000)
    const attempts = await attemptsOf(row.id)
    expect(attempts.map((x) => x.outcome)).toEqual(['abandoned', 'sent'])
    await new Promise((r) => setTimeout(r, 9000)) // past the slow relay's pause
    expect(slow.counts.stored).toBe(0)
    expect(await receivedWithMessageId(row.messageId)).toHaveLength(1)
    await stopWorkers()
  }, 120_000)

  it('after the whole message was handed over: marked uncertain, not sent again', async () => {
    const slow = await standIn({ port: 2544, listener: 'slow-answer', dataDelayMs: 8000 })
    const row = await queueOne('Killed before the answer')
    const a = worker(2544)
    await waitFor('message stored by the relay', async () => slow.counts.stored >= 1, 60_000)
    await a.kill('SIGKILL')
    worker(MAIN_PORT)
    await waitFor('resolved', async () => (await outboxRow(row.id)).status !== 'queued', 60_000)
    const after = await outboxRow(row.id)
    expect(after.status).toBe('uncertain')
    expect(after.lastError).toMatch(/may have arrived/)
    await new Promise((r) => setTimeout(r, 3000))
    // The relay took it once; nothing was sent a second time.
    expect(await receivedWithMessageId(row.messageId)).toHaveLength(1)
    expect((await attemptsOf(row.id)).map((x) => x.outcome)).toEqual(['abandoned'])
    await stopWorkers()
  }, 120_000)

  it('two workers never send the same row twice', async () => {
    const rows = await Promise.all(Array.from({ length: 12 }, (_, k) => queueOne(`Parallel ${k}`)))
    worker(MAIN_PORT)
    worker(MAIN_PORT)
    const ids = rows.map((r) => r.id)
    await waitFor('all sent', async () => {
      const got = await db.select({ status: tables.mailOutbox.status }).from(tables.mailOutbox).where(inArray(tables.mailOutbox.id, ids))
      return got.every((g) => g.status === 'sent')
    }, 90_000)
    const counts = await db.execute(sql`select message_id, count(*)::int as n from received_mail where message_id in (${sql.join(rows.map((r) => sql`${r.messageId}`), sql`, `)}) group by message_id`)
    expect(counts.rows).toHaveLength(12)
    expect(counts.rows.every((r: any) => r.n === 1)).toBe(true)
    await stopWorkers()
  }, 120_000)
})
