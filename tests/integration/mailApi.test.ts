// Mail through the app's routes: invitations and set-password links by e-mail, "send a test to
// myself", delivery status per recipient, and a lead re-sending a message the worker gave up on.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { eq } from 'drizzle-orm'
import { simpleParser } from 'mailparser'
import { useDB, closeDB, tables } from '../../server/utils/db'
import { stopBoss } from '../../server/utils/jobs'
import { queueBriefingMail } from '../../server/utils/briefingMail'
import { outboxMessageId } from '../../server/utils/mailOutbox'
import { call, signInAs, uniqueEmail, BASE_URL } from '../support/http'
import { startWorker, waitFor, type WorkerProcess } from '../support/worker'
import { makeBriefing, makeOrganisationWithList, receivedWithMessageId } from './distribution/records'

const db = useDB()
let worker: WorkerProcess
const cookies: Record<string, string> = {}

beforeAll(async () => {
  for (const role of ['admin', 'duty_lead', 'forecaster'] as const) cookies[role] = await signInAs(role)
  worker = startWorker({ TESSERA_MAIL_SWEEP_SECONDS: '1' })
}, 60_000)
afterAll(async () => {
  await worker.kill('SIGTERM')
  await stopBoss()
  await closeDB()
})

const outboxTo = async (address: string) => db.select().from(tables.mailOutbox).where(eq(tables.mailOutbox.toAddress, address))
const arrived = async (messageId: string) => waitFor(`message ${messageId}`, async () => { const m = await receivedWithMessageId(messageId); return m.length ? m[0]! : null }, 60_000)

describe('invitations by e-mail', () => {
  it('sends the set-password link of a new account, and removes it from the outbox once sent', async () => {
    const email = uniqueEmail('invitee')
    const res = await call('POST', '/api/users', { cookie: cookies.admin, body: { email, displayName: 'Invited Person', role: 'stakeholder' } })
    expect(res.status).toBe(201)
    const [row] = await outboxTo(email)
    expect(row!.kind).toBe('invitation')
    const got = await arrived(row!.messageId)
    const parsed = await simpleParser(got.raw)
    expect(parsed.subject).toBe('Your Tessera account: choose a password')
    expect(parsed.text).toContain(res.body.inviteUrl)
    await waitFor('sent', async () => (await outboxTo(email))[0]!.status === 'sent', 30_000)
    expect((await outboxTo(email))[0]!.textBody).not.toContain('token=')
    // A fresh link later is a new message.
    const again = await call('POST', `/api/users/${res.body.user.id}/invite`, { cookie: cookies.admin })
    expect(again.status).toBe(200)
    await waitFor('second link', async () => (await outboxTo(email)).length === 2, 30_000)
  })
})

describe('briefing mail through the routes', () => {
  let briefingId = 0

  beforeAll(async () => {
    const { list } = await makeOrganisationWithList({ contacts: [{ name: 'Dana Holt', email: uniqueEmail('dana') }, { name: 'Eli Brook', email: uniqueEmail('eli') }] })
    const b = await makeBriefing({ status: 'approved', listKeys: [{ key: list.key, name: list.name }] })
    briefingId = b.id
    await db.transaction(async (tx) => {
      await tx.update(tables.briefings).set({ status: 'issued', issuedAt: new Date() }).where(eq(tables.briefings.id, b.id))
      await queueBriefingMail(tx, b.id, 'issue')
    })
  })

  it('sends a test to the signed-in person, marked as a test', async () => {
    const res = await call('POST', `/api/briefings/${briefingId}/test-mail`, { cookie: cookies.forecaster })
    expect(res.status).toBe(202)
    expect(res.body.subject).toMatch(/^\[TEST\] /)
    const [row] = (await outboxTo('forecaster@tessera.example')).filter((r) => r.briefingId === briefingId)
    const parsed = await simpleParser((await arrived(row!.messageId)).raw)
    expect(parsed.subject).toMatch(/^\[TEST\] /)
    expect(parsed.text).toMatch(/^TEST MESSAGE — not for action/)
  })

  it('shows the delivery state of every recipient', async () => {
    await waitFor('both delivered', async () => {
      const r = await call('GET', `/api/briefings/${briefingId}/deliveries`, { cookie: cookies.forecaster })
      return r.body.deliveries.filter((d: { kind: string; status: string }) => d.kind === 'issue' && d.status === 'sent').length === 2
    }, 60_000)
    const r = await call('GET', `/api/briefings/${briefingId}/deliveries`, { cookie: cookies.forecaster })
    expect(r.body.counts.sent).toBeGreaterThanOrEqual(2)
    expect(r.body.deliveries[0]).toHaveProperty('organisationName')
  })

  it('lets a lead re-send a failed message, and refuses to re-send a delivered one', async () => {
    const [delivered] = (await db.select().from(tables.mailOutbox).where(eq(tables.mailOutbox.briefingId, briefingId))).filter((r) => r.kind === 'issue' && r.status === 'sent')
    // A message the relay refused for good (as the worker leaves it after a 550).
    const key = `it-refused:${briefingId}:${Date.now()}`
    const [failed] = await db.insert(tables.mailOutbox).values({
      idempotencyKey: key, kind: 'issue', status: 'failed', briefingId, toAddress: uniqueEmail('refused'), subject: 'Refused once', textBody: 'x', htmlBody: '<p>x</p>',
      listNames: [], messageId: outboxMessageId(key), attempts: 1, maxAttempts: 8, lastError: 'The relay refused the message: 550 mailbox unavailable',
    }).returning()
    await db.insert(tables.mailAttempts).values({ outboxId: failed!.id, attempt: 1, worker: 'test', finishedAt: new Date(), outcome: 'refused', detail: '550 mailbox unavailable' })
    expect((await call('POST', `/api/mail/outbox/${failed!.id}/retry`, { cookie: cookies.forecaster })).status).toBe(403)
    const res = await call('POST', `/api/mail/outbox/${failed!.id}/retry`, { cookie: cookies.duty_lead })
    expect(res.status).toBe(200)
    expect(res.body.status).toBe('queued')
    await waitFor('re-sent', async () => (await receivedWithMessageId(failed!.messageId)).length === 1, 60_000)
    await waitFor('marked sent', async () => (await db.select().from(tables.mailOutbox).where(eq(tables.mailOutbox.id, failed!.id)))[0]!.status === 'sent', 30_000)
    expect((await call('POST', `/api/mail/outbox/${delivered!.id}/retry`, { cookie: cookies.duty_lead })).status).toBe(409)
    const audit = await db.select().from(tables.auditLog).where(eq(tables.auditLog.action, 'mail.retry'))
    expect(audit.some((a) => a.entityId === String(failed!.id))).toBe(true)
  }, 120_000)

  it('shows what arrived in the mail log, with the PDF as an attachment', async () => {
    const list = await call('GET', '/api/mail/received?limit=50', { cookie: cookies.admin })
    expect(list.status).toBe(200)
    const [row] = (await db.select().from(tables.mailOutbox).where(eq(tables.mailOutbox.briefingId, briefingId))).filter((r) => r.kind === 'issue')
    const entry = list.body.messages.find((m: { messageId: string }) => m.messageId === row!.messageId)
    expect(entry.attachments[0].contentType).toBe('application/pdf')
    const pdf = await fetch(`${BASE_URL}/api/mail/received/${entry.id}/attachments/0`, { headers: { cookie: cookies.admin! } })
    expect(pdf.headers.get('x-content-sha256')).toBe(row!.attachmentSha256)
    const detail = await call('GET', `/api/mail/received/${entry.id}`, { cookie: cookies.duty_lead })
    expect(detail.body.message.textBody).toContain('Read it in your portal')
  })
})
