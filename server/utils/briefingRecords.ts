/**
 * Low-level access to briefing rows: loading without the PDF bytes, the optimistic-lock update
 * (UPDATE … WHERE id = ? AND lock_version = ?; no row → 409), the history and the user names.
 */
import { createError } from 'h3'
import { and, desc, eq, getTableColumns, inArray, sql } from 'drizzle-orm'
import type { User } from '#auth-utils'
import { ruleOnBriefingAction, type BriefingAction, type BriefingActionInput, type BriefingEventAction, type BriefingStatus } from '../../shared/utils/briefingStates'
import { useDB, tables, type Database } from './db'

const b = tables.briefings
const { pdf: _pdf, ...withoutPdf } = getTableColumns(b)
/** Every column but the PDF bytes. */
export const briefingColumns = withoutPdf
export type BriefingRecord = Omit<typeof b.$inferSelect, 'pdf'>
type Tx = Parameters<Parameters<Database['transaction']>[0]>[0]
type Reader = Pick<Database, 'select'>

export const briefingNotFound = (id: number) => createError({ statusCode: 404, statusMessage: 'Not Found', message: `There is no briefing ${id}.` })
export const briefingConflict = (message: string) => createError({ statusCode: 409, statusMessage: 'Conflict', message })
export const BRIEFING_STALE_MESSAGE = 'Someone else changed this briefing a moment ago; reload to see their change.'

export async function loadBriefing(id: number, db: Reader = useDB()): Promise<BriefingRecord> {
  const [row] = await db.select(briefingColumns).from(b).where(eq(b.id, id))
  if (!row) throw briefingNotFound(id)
  return row
}

/** 409 when the client's copy is older than the stored one. */
export function assertBriefingFresh(row: Pick<BriefingRecord, 'lockVersion'>, lockVersion: number): void {
  if (row.lockVersion !== lockVersion) throw briefingConflict(BRIEFING_STALE_MESSAGE)
}

/** Applies the state rules (shared/utils/briefingStates.ts) or throws their refusal. */
export function assertBriefingAllowed(action: BriefingAction, row: BriefingRecord, user: User, input: BriefingActionInput = {}): BriefingStatus {
  const ruling = ruleOnBriefingAction(action, { status: row.status, authorId: row.authorId, editorIds: row.editorIds, pdfSha256: row.pdfSha256 }, user, input)
  if (!ruling.ok) {
    const statusMessage = ruling.status === 403 ? 'Forbidden' : ruling.status === 409 ? 'Conflict' : 'Unprocessable Content'
    throw createError({ statusCode: ruling.status, statusMessage, message: ruling.message })
  }
  return ruling.to
}

/**
 * The optimistic-lock write: succeeds only if nobody changed the row since `lockVersion` was read
 * (a concurrent writer waits on the row lock, then finds lock_version moved on and matches no row).
 */
export async function updateBriefingIfUnchanged(tx: Tx, id: number, lockVersion: number, set: Partial<typeof b.$inferInsert>): Promise<BriefingRecord> {
  const [row] = await tx.update(b).set({ ...set, lockVersion: sql`${b.lockVersion} + 1`, updatedAt: new Date() })
    .where(and(eq(b.id, id), eq(b.lockVersion, lockVersion))).returning(briefingColumns)
  if (!row) throw briefingConflict(BRIEFING_STALE_MESSAGE)
  return row
}

export interface BriefingEventEntry {
  briefingId: number
  actor: User | null
  action: BriefingEventAction
  comment?: string | null
  from?: BriefingStatus | null
  to?: BriefingStatus | null
  pdfSha256?: string | null
}

/**
 * Adds a history entry. Edits by the same person in a row that keep the status form one "edit
 * session": its time is moved forward instead of adding an entry per autosave.
 */
export async function recordBriefingEvent(tx: Tx, e: BriefingEventEntry): Promise<void> {
  const ev = tables.briefingEvents
  if (e.action === 'edited' && e.from === e.to && e.actor) {
    const [last] = await tx.select().from(ev).where(eq(ev.briefingId, e.briefingId)).orderBy(desc(ev.id)).limit(1)
    if (last && last.action === 'edited' && last.actorId === e.actor.id && last.fromStatus === last.toStatus) {
      await tx.update(ev).set({ at: new Date() }).where(eq(ev.id, last.id))
      return
    }
  }
  await tx.insert(ev).values({
    briefingId: e.briefingId, actorId: e.actor?.id ?? null, actorName: e.actor?.displayName ?? null, action: e.action,
    comment: e.comment ?? null, fromStatus: e.from ?? null, toStatus: e.to ?? null, pdfSha256: e.pdfSha256 ?? null,
  })
}

export async function briefingHistory(briefingId: number) {
  const ev = tables.briefingEvents
  return useDB().select().from(ev).where(eq(ev.briefingId, briefingId)).orderBy(ev.at, ev.id)
}

/** Display names by user id (for authors, editors, approvers). */
export async function displayNamesOf(ids: (number | null | undefined)[]): Promise<Map<number, string>> {
  const wanted = [...new Set(ids.filter((x): x is number => typeof x === 'number'))]
  if (!wanted.length) return new Map()
  const rows = await useDB().select({ id: tables.users.id, name: tables.users.displayName }).from(tables.users).where(inArray(tables.users.id, wanted))
  return new Map(rows.map((r) => [r.id, r.name]))
}

/** The small audit form of a briefing (no statements, no PDF). */
export function briefingAuditForm(row: BriefingRecord) {
  return { seriesId: row.seriesId, version: row.version, status: row.status, title: row.title, lockVersion: row.lockVersion, pdfSha256: row.pdfSha256 }
}
