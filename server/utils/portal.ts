/**
 * The stakeholder portal: a stakeholder account sees the briefing versions that were sent to a
 * distribution list one of its contacts is on (contacts.user_id links them), and nothing else.
 * Every query here carries that condition; a briefing outside it answers 404, not 403, so the
 * portal does not even confirm that it exists.
 */
import { createError } from 'h3'
import { and, asc, desc, eq, isNotNull, sql } from 'drizzle-orm'
import { useDB, tables } from './db'

const B = tables.briefings
const S = tables.briefingSearch

/** SQL condition: briefing `B` was sent to a list that has an active contact linked to `userId`. */
function sentToUser(userId: number) {
  return sql`exists (
    select 1 from ${tables.briefingLists} bl
    join ${tables.distributionListMembers} m on m.list_id = bl.list_id
    join ${tables.contacts} c on c.id = m.contact_id and c.active
    where bl.briefing_id = ${B.id} and c.user_id = ${userId})`
}

const summaryColumns = {
  id: B.id, seriesId: B.seriesId, version: B.version, status: B.status, title: B.title, headline: sql<string>`${B.narrative}->>'headline'`,
  windowStart: B.windowStart, windowEnd: B.windowEnd, issuedAt: B.issuedAt, withdrawnAt: B.withdrawnAt, nextUpdateAt: B.nextUpdateAt,
  hazards: S.hazards, areaNames: S.areaNames,
}

/**
 * The latest version of every briefing series sent to the user, newest issue first, with how
 * many versions of the series they received.
 */
export async function portalBriefings(userId: number) {
  const rows = await useDB().select({ ...summaryColumns, versions: sql<number>`count(*) over (partition by ${B.seriesId})::int`, rank: sql<number>`row_number() over (partition by ${B.seriesId} order by ${B.version} desc)::int` })
    .from(B).leftJoin(S, eq(S.briefingId, B.id))
    .where(and(isNotNull(B.issuedAt), sentToUser(userId)))
  return rows.filter((r) => r.rank === 1).map(({ rank: _r, ...r }) => r)
    .sort((a, b) => (b.issuedAt?.getTime() ?? 0) - (a.issuedAt?.getTime() ?? 0))
}

const notVisible = (id: number) => createError({ statusCode: 404, statusMessage: 'Not Found', message: `Briefing ${id} is not among the briefings sent to you.` })

/** One version as the stakeholder may read it, with the other versions of its series they received. */
export async function portalBriefing(userId: number, id: number) {
  const db = useDB()
  const [row] = await db.select({
    ...summaryColumns, narrative: B.narrative, statements: B.statements, caveats: B.caveats, confidenceNote: B.confidenceNote,
    contact: B.contact, withdrawnReason: B.withdrawnReason, supersedesId: B.supersedesId, pdfSha256: B.pdfSha256,
    localTimeName: B.localTimeName, utcOffsetMinutes: B.utcOffsetMinutes, likelihoodScale: B.likelihoodScale,
  }).from(B).leftJoin(S, eq(S.briefingId, B.id)).where(and(eq(B.id, id), isNotNull(B.issuedAt), sentToUser(userId)))
  if (!row) throw notVisible(id)
  const versions = await db.select({ id: B.id, version: B.version, status: B.status, issuedAt: B.issuedAt, withdrawnAt: B.withdrawnAt, withdrawnReason: B.withdrawnReason })
    .from(B).where(and(eq(B.seriesId, row.seriesId), isNotNull(B.issuedAt), sentToUser(userId))).orderBy(desc(B.version))
  const { statements, caveats, ...rest } = row
  return {
    ...rest,
    statements: statements.filter((s) => s.included !== false).map((s) => ({ areaName: s.areaName, text: s.text, value: s.value, count: s.count, scenarios: s.scenarios, kind: s.kind })),
    caveats: [...caveats.snapshot.map((c) => ({ title: c.title, text: c.text, standing: c.standing })), ...caveats.free.map((text) => ({ title: null, text, standing: false }))],
    versions,
    newerVersion: versions.find((v) => v.version > row.version) ?? null,
  }
}

/** The issued PDF of a version the stakeholder may read. */
export async function portalBriefingPdf(userId: number, id: number) {
  const [row] = await useDB().select({ pdf: B.pdf, pdfSha256: B.pdfSha256, seriesId: B.seriesId, version: B.version, status: B.status })
    .from(B).where(and(eq(B.id, id), isNotNull(B.issuedAt), sentToUser(userId)))
  if (!row?.pdf) throw notVisible(id)
  return row
}

/** The lists and organisations the account receives briefings through (shown in the portal). */
export async function portalSubscriptions(userId: number) {
  const C = tables.contacts
  const L = tables.distributionLists
  return useDB().selectDistinct({ list: L.name, organisation: tables.organisations.name })
    .from(C).innerJoin(tables.distributionListMembers, eq(tables.distributionListMembers.contactId, C.id))
    .innerJoin(L, eq(L.id, tables.distributionListMembers.listId)).innerJoin(tables.organisations, eq(tables.organisations.id, C.organisationId))
    .where(and(eq(C.userId, userId), eq(C.active, true), eq(L.active, true))).orderBy(asc(L.name))
}
