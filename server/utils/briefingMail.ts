/**
 * From a briefing to outbox rows: who receives it (the distribution lists it chose, their active
 * contacts, one message per e-mail address), what each message says (server/utils/mailCompose.ts)
 * and which PDF is attached (the stored one, checked by SHA-256 again when sent).
 * Called inside the transaction that issues or withdraws the briefing, so the messages exist
 * exactly when the new state does.
 */
import { createHash } from 'node:crypto'
import { createError } from 'h3'
import { and, eq, inArray, sql } from 'drizzle-orm'
import { HAZARD_DEFINITIONS, type Hazard } from '../../shared/schemas/products'
import type { BriefingRecipient } from '../../shared/schemas/briefings'
import { useDB, tables, type Database } from './db'
import { composeBriefingMail, composeInvitationMail, type BriefingMailFacts, type BriefingMailKind } from './mailCompose'
import { enqueueMail, type OutboxMessage } from './mailOutbox'
import { TOKEN_LIFETIME_DAYS } from './passwordTokens'

type Tx = Pick<Database, 'select' | 'insert' | 'execute'>
type BriefingRow = typeof tables.briefings.$inferSelect
const L = tables.distributionLists

/** The public address of the app, for links in messages. */
export function appBaseUrl(): string {
  return (process.env.NUXT_PUBLIC_BASE_URL || 'http://localhost:3000').replace(/\/$/, '')
}

/** The lists a briefing can be sent to (replaces the builder's placeholder list): key + name. */
export async function recipientListOptions(db: Pick<Database, 'select'> = useDB()): Promise<BriefingRecipient[]> {
  return db.select({ key: L.key, name: L.name }).from(L).where(eq(L.active, true)).orderBy(L.name)
}

/** Lists named by a briefing's recipients (unknown or inactive keys are left out). */
async function listsByKeys(tx: Pick<Database, 'select'>, keys: string[]) {
  if (keys.length === 0) return []
  return tx.select({ id: L.id, key: L.key, name: L.name }).from(L).where(and(inArray(L.key, keys), eq(L.active, true)))
}

async function listsSentTo(tx: Pick<Database, 'select'>, briefingId: number) {
  return tx.select({ id: L.id, key: L.key, name: tables.briefingLists.listName }).from(tables.briefingLists)
    .innerJoin(L, eq(L.id, tables.briefingLists.listId)).where(eq(tables.briefingLists.briefingId, briefingId))
}

export interface Recipient { contactId: number; name: string; email: string; userId: number | null; organisation: string; lists: string[] }

/** Active contacts of active organisations on the given lists, one per e-mail address. */
export async function recipientsOfLists(tx: Pick<Database, 'execute'>, listIds: number[]): Promise<Recipient[]> {
  if (listIds.length === 0) return []
  const res = await tx.execute(sql`
    SELECT (array_agg(c.id ORDER BY c.id))[1] AS "contactId", (array_agg(c.name ORDER BY c.id))[1] AS name, lower(c.email) AS email,
      (array_agg(c.user_id ORDER BY c.id))[1] AS "userId", (array_agg(o.name ORDER BY c.id))[1] AS organisation,
      array_agg(DISTINCT l.name ORDER BY l.name) AS lists
    FROM ${tables.distributionListMembers} m
    JOIN ${tables.contacts} c ON c.id = m.contact_id AND c.active
    JOIN ${tables.organisations} o ON o.id = c.organisation_id AND o.active
    JOIN ${L} l ON l.id = m.list_id
    WHERE m.list_id IN ${sql`(${sql.join(listIds.map((id) => sql`${id}`), sql`, `)})`}
    GROUP BY lower(c.email)
    ORDER BY lower(c.email)`)
  return res.rows as unknown as Recipient[]
}

function hazardLabels(b: BriefingRow, hazards: string[]): string[] {
  const known = hazards.filter((h): h is Hazard => h in HAZARD_DEFINITIONS).map((h) => HAZARD_DEFINITIONS[h].label)
  return known.length ? known : [...new Set(b.selection.thresholds.map((t) => t.label))]
}

/** The facts every message about `b` shares (the organisation is filled in per recipient). */
async function briefingFacts(tx: Pick<Database, 'select'>, b: BriefingRow, kind: BriefingMailKind, baseUrl: string): Promise<Omit<BriefingMailFacts, 'organisationName'>> {
  const [index] = await tx.select({ hazards: tables.briefingSearch.hazards, areaNames: tables.briefingSearch.areaNames })
    .from(tables.briefingSearch).where(eq(tables.briefingSearch.briefingId, b.id))
  let supersedesVersion: number | null = null
  if (b.supersedesId) {
    const [old] = await tx.select({ version: tables.briefings.version }).from(tables.briefings).where(eq(tables.briefings.id, b.supersedesId))
    supersedesVersion = old?.version ?? null
  }
  const printed = b.statements.filter((s) => s.included !== false)
  return {
    kind,
    briefingId: b.id,
    version: b.version,
    title: b.title,
    areaNames: index?.areaNames.length ? index.areaNames : [...new Set(printed.map((s) => s.areaName))],
    hazardLabels: hazardLabels(b, index?.hazards ?? []),
    windowStart: b.windowStart?.toISOString() ?? null,
    windowEnd: b.windowEnd?.toISOString() ?? null,
    issuedAt: b.issuedAt?.toISOString() ?? null,
    nextUpdateAt: b.nextUpdateAt?.toISOString() ?? null,
    contact: b.contact,
    headline: b.narrative.headline,
    summary: b.narrative.summary,
    statements: printed.map((s) => ({ areaName: s.areaName, text: s.text })),
    local: { name: b.localTimeName, offsetMinutes: b.utcOffsetMinutes },
    portalUrl: `${baseUrl}/portal/${b.id}`,
    withdrawnReason: b.withdrawnReason,
    supersedesVersion,
    withPdf: (kind === 'issue' || kind === 'amended' || kind === 'test') && !!b.pdf,
  }
}

export const pdfFileName = (b: Pick<BriefingRow, 'seriesId' | 'version'>) => `tessera-briefing-${b.seriesId}-v${b.version}.pdf`

/**
 * Queues the e-mails for an issued (`issue`; `amended` for a later version) or withdrawn
 * briefing, inside the caller's transaction, and records which lists the version went to.
 * Amendments also reach the lists of the version they replace; withdrawal notices go to the
 * lists the version was sent to. Repeating the call queues nothing twice.
 */
export async function queueBriefingMail(tx: Tx, briefingId: number, kind: 'issue' | 'amended' | 'withdrawn', opts: { actorId?: number | null; baseUrl?: string } = {}) {
  const [b] = await tx.select().from(tables.briefings).where(eq(tables.briefings.id, briefingId))
  if (!b) throw new Error(`briefing ${briefingId} not found`)
  const chosen = await listsByKeys(tx, b.recipients.map((r) => r.key))
  let lists = chosen
  if (kind === 'withdrawn') {
    const sent = await listsSentTo(tx, b.id)
    if (sent.length) lists = sent
  } else if (kind === 'amended' && b.supersedesId) {
    const earlier = await listsSentTo(tx, b.supersedesId)
    lists = [...chosen, ...earlier.filter((e) => !chosen.some((c) => c.id === e.id))]
  }
  if (kind !== 'withdrawn' && lists.length) {
    await tx.insert(tables.briefingLists).values(lists.map((l) => ({ briefingId: b.id, listId: l.id, listName: l.name }))).onConflictDoNothing()
  }
  const recipients = await recipientsOfLists(tx, lists.map((l) => l.id))
  const facts = await briefingFacts(tx, b, kind, opts.baseUrl ?? appBaseUrl())
  const attach = facts.withPdf && b.pdfSha256 ? { attachmentName: pdfFileName(b), attachmentSha256: b.pdfSha256 } : {}
  const messages: OutboxMessage[] = recipients.map((r) => {
    const mail = composeBriefingMail({ ...facts, organisationName: r.organisation })
    return {
      idempotencyKey: `briefing:${b.id}:v${b.version}:${kind}:${r.email}`,
      kind, toAddress: r.email, toName: r.name, subject: mail.subject, textBody: mail.text, htmlBody: mail.html,
      briefingId: b.id, briefingVersion: b.version, contactId: r.contactId, userId: r.userId, listNames: r.lists,
      organisationName: r.organisation, createdById: opts.actorId ?? null, ...attach,
    }
  })
  const queued = await enqueueMail(tx, messages)
  return { lists: lists.map((l) => l.name), recipients: recipients.length, queued }
}

/** "Send a test to myself": the current PDF and wording, marked as a test, to the signed-in person. */
export async function queueTestMail(user: { id: number; email: string; displayName: string }, briefingId: number, baseUrl = appBaseUrl()) {
  return useDB().transaction(async (tx) => {
    const [b] = await tx.select().from(tables.briefings).where(eq(tables.briefings.id, briefingId))
    if (!b) return null
    const facts = await briefingFacts(tx, b, 'test', baseUrl)
    const mail = composeBriefingMail({ ...facts, organisationName: null, portalUrl: `${baseUrl}/briefings/${b.id}` })
    const attach = facts.withPdf && b.pdfSha256 ? { attachmentName: pdfFileName(b), attachmentSha256: b.pdfSha256 } : {}
    const key = `test:${b.id}:${user.id}:${Date.now()}`
    await enqueueMail(tx, [{
      idempotencyKey: key, kind: 'test', toAddress: user.email.toLowerCase(), toName: user.displayName, subject: mail.subject,
      textBody: mail.text, htmlBody: mail.html, briefingId: b.id, briefingVersion: b.version, userId: user.id, createdById: user.id, ...attach,
    }])
    return { to: user.email, subject: mail.subject, withPdf: !!attach.attachmentSha256 }
  })
}

/** The set-password e-mail of an invitation or reset, through the same outbox. */
export async function queueInvitationMail(tx: Pick<Database, 'insert' | 'execute'>, input: {
  user: { id: number; email: string; displayName: string }; url: string; purpose: 'invite' | 'reset'; actorId: number | null
}) {
  const expiresAt = new Date(Date.now() + TOKEN_LIFETIME_DAYS * 86400_000).toISOString()
  const mail = composeInvitationMail({ displayName: input.user.displayName, url: input.url, purpose: input.purpose, expiresAt })
  // The token makes each link a different message; the key does not contain the token itself.
  const tokenTag = createHash('sha256').update(input.url).digest('hex').slice(0, 20)
  return enqueueMail(tx, [{
    idempotencyKey: `invitation:${input.user.id}:${tokenTag}`, kind: 'invitation', toAddress: input.user.email.toLowerCase(),
    toName: input.user.displayName, subject: mail.subject, textBody: mail.text, htmlBody: mail.html, userId: input.user.id, createdById: input.actorId,
  }])
}

/** 404 unless the briefing exists (routes under /api/briefings/:id that are not about its content). */
export async function assertBriefingExists(id: number): Promise<void> {
  const [row] = await useDB().select({ id: tables.briefings.id }).from(tables.briefings).where(eq(tables.briefings.id, id))
  if (!row) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `There is no briefing ${id}.` })
}
