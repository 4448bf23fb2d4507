// Directory, areas and briefing rows written straight into the test database, so the mail,
// portal and archive tests do not depend on building briefings through the pages.
import { createHash, randomBytes } from 'node:crypto'
import { eq, inArray, sql } from 'drizzle-orm'
import { useDB, tables } from '../../../server/utils/db'
import type { BriefingStatement } from '../../../shared/schemas/briefings'

export const tag = () => randomBytes(4).toString('hex')

export async function makeOrganisationWithList(opts: { contacts: { name: string; email: string; userId?: number | null }[]; name?: string }) {
  const db = useDB()
  const t = tag()
  const [org] = await db.insert(tables.organisations).values({ name: opts.name ?? `Test organisation ${t}` }).returning()
  const [list] = await db.insert(tables.distributionLists).values({ key: `test-${t}`, name: `Test list ${t}`, organisationId: org!.id }).returning()
  const contacts = []
  for (const c of opts.contacts) {
    const [row] = await db.insert(tables.contacts).values({ organisationId: org!.id, name: c.name, email: c.email, userId: c.userId ?? null }).returning()
    await db.insert(tables.distributionListMembers).values({ listId: list!.id, contactId: row!.id })
    contacts.push(row!)
  }
  return { org: org!, list: list!, contacts }
}

/** An invented polygon area (lon-lat ring, counter-clockwise). */
export async function makeArea(name: string, ring: [number, number][]) {
  const geometry = JSON.stringify({ type: 'MultiPolygon', coordinates: [[ring]] })
  const [row] = await useDB().insert(tables.areas).values({ name, geometry: sql`ST_SetSRID(ST_GeomFromGeoJSON(${geometry}), 4326)` as unknown as string }).returning({ id: tables.areas.id })
  return row!.id
}

export function statementFor(areaId: number, areaName: string, value: number, text: string, hazard: 'gust' | 'low_temperature' | 'heavy_precipitation' | 'heat' = 'gust'): BriefingStatement {
  return {
    key: `${areaId}:${hazard}:${value}`, areaId, areaName, threshold: { hazard, label: hazard === 'gust' ? 'Strong gusts' : 'Threshold', value: 20, direction: 'above' },
    kind: 'anywhere', value, count: Math.round(value * 18), scenarios: 18, members: 6, samplesPerMember: 3, membersShowing: 3,
    event: 'gusts reach 20 m/s or more', when: 'between 12 and 18 UTC', cells: 50, note: null, generatedText: text, text, edited: null, included: true,
  }
}

export interface BriefingInput {
  title?: string
  status?: 'approved' | 'issued' | 'withdrawn' | 'superseded' | 'draft'
  issuedAt?: Date | null
  listKeys?: { key: string; name: string }[]
  areaIds?: number[]
  statements?: BriefingStatement[]
  hazards?: ('gust' | 'low_temperature' | 'heavy_precipitation' | 'heat')[]
  headline?: string
  summary?: string
  details?: string
  caveats?: string[]
  authorId?: number | null
  approvedById?: number | null
  seriesId?: number
  version?: number
  supersedesId?: number | null
  withdrawnReason?: string | null
  pdf?: Buffer
}

/** Inserts a briefing version (issued by default) with a stored "PDF" (random bytes stand in for it). */
export async function makeBriefing(input: BriefingInput = {}) {
  const db = useDB()
  const status = input.status ?? 'issued'
  const pdf = input.pdf ?? Buffer.concat([Buffer.from('%PDF-1.7\n% test stand-in\n'), randomBytes(2048)])
  const issuedAt = input.issuedAt === undefined ? (status === 'approved' || status === 'draft' ? null : new Date()) : input.issuedAt
  const seriesId = input.seriesId ?? (await db.execute(sql`select coalesce(max(series_id), 0) + 1000 + floor(random() * 1000)::int as s from briefings`)).rows[0]!.s as number
  const [row] = await db.insert(tables.briefings).values({
    seriesId, version: input.version ?? 1, supersedesId: input.supersedesId ?? null, status,
    title: input.title ?? `Test briefing ${tag()}`,
    windowStart: new Date('2031-11-14T12:00:00Z'), windowEnd: new Date('2031-11-14T18:00:00Z'),
    likelihoodScale: 'plain', localTimeName: 'Serevan Coast time', utcOffsetMinutes: -120,
    selection: { leadFrom: 0, leadTo: 1, areaIds: input.areaIds ?? [], thresholds: (input.hazards ?? ['gust']).map((h) => ({ hazard: h, label: h, value: 20, direction: 'above' as const })), kinds: ['anywhere'] },
    narrative: { headline: input.headline ?? 'Strong gusts likely', summary: input.summary ?? 'Gusts are likely on the pass.', details: input.details ?? '' },
    caveats: { libraryIds: [], free: input.caveats ?? [], snapshot: [{ id: 1, title: 'Standing caution', text: 'Statistical detail, not a warning.', standing: true }] },
    statements: input.statements ?? [], figures: [], recipients: input.listKeys ?? [], editorIds: [],
    contact: 'Duty lead, +00 555 0100', nextUpdateAt: new Date('2031-11-14T15:00:00Z'),
    authorId: input.authorId ?? null, approvedById: input.approvedById ?? null, approvedAt: input.approvedById ? new Date() : null,
    issuedAt, withdrawnAt: status === 'withdrawn' ? new Date() : null, withdrawnReason: input.withdrawnReason ?? (status === 'withdrawn' ? 'Test withdrawal' : null),
    pdf, pdfSha256: createHash('sha256').update(pdf).digest('hex'),
  }).returning()
  // An issued version was sent to its lists (what queueBriefingMail records when it is issued).
  if (issuedAt && input.listKeys?.length) {
    const lists = await db.select().from(tables.distributionLists).where(inArray(tables.distributionLists.key, input.listKeys.map((l) => l.key)))
    await db.insert(tables.briefingLists).values(lists.map((l) => ({ briefingId: row!.id, listId: l.id, listName: l.name }))).onConflictDoNothing()
  }
  return row!
}

export async function outboxFor(briefingId: number) {
  return useDB().select().from(tables.mailOutbox).where(eq(tables.mailOutbox.briefingId, briefingId))
}

export async function receivedWithMessageId(messageId: string) {
  return useDB().select().from(tables.receivedMail).where(eq(tables.receivedMail.messageId, messageId))
}
