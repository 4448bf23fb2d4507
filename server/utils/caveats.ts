/**
 * The caveat library: standard caveats kept by duty leads and administrators. Standing caveats go
 * into every briefing; briefings keep a copy of the texts they use, so editing the library never
 * changes a briefing that was already submitted or issued.
 */
import type { H3Event } from 'h3'
import { createError } from 'h3'
import { and, asc, eq, inArray } from 'drizzle-orm'
import type { User } from '#auth-utils'
import type { BriefingCaveatSnapshot } from '../../shared/schemas/briefings'
import { useDB, tables } from './db'
import { recordAudit } from './audit'

type CaveatRow = typeof tables.caveatLibrary.$inferSelect
type CaveatInput = { title?: string; text?: string; standing?: boolean; active?: boolean; sort?: number }

const c = tables.caveatLibrary
const caveatNotFound = (id: number) => createError({ statusCode: 404, statusMessage: 'Not Found', message: `There is no caveat ${id}.` })

export async function listCaveats(includeInactive = true): Promise<CaveatRow[]> {
  const rows = await useDB().select().from(c).where(includeInactive ? undefined : eq(c.active, true)).orderBy(asc(c.sort), asc(c.id))
  return rows
}

/** Refuses a change that would leave no active standing caveat: every briefing must carry the standing caution. */
async function assertStandingRemains(excludingId: number | null, next: Pick<CaveatRow, 'standing' | 'active'> | null): Promise<void> {
  const rows = await useDB().select({ id: c.id }).from(c).where(and(eq(c.standing, true), eq(c.active, true)))
  const others = rows.filter((r) => r.id !== excludingId).length
  if (others === 0 && !(next?.standing && next.active)) {
    throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'At least one standing caveat must stay active: every briefing carries the standing caution.' })
  }
}

export async function createCaveat(event: H3Event, user: User, input: Required<CaveatInput>): Promise<CaveatRow> {
  return useDB().transaction(async (tx) => {
    const [row] = await tx.insert(c).values({ ...input, updatedById: user.id }).returning()
    await recordAudit({ actor: user, action: 'caveat.create', entityType: 'caveat', entityId: row!.id, after: input }, event, tx)
    return row!
  })
}

export async function updateCaveat(event: H3Event, user: User, id: number, patch: CaveatInput): Promise<CaveatRow> {
  const [before] = await useDB().select().from(c).where(eq(c.id, id))
  if (!before) throw caveatNotFound(id)
  const next = { standing: patch.standing ?? before.standing, active: patch.active ?? before.active }
  if (before.standing && before.active) await assertStandingRemains(id, next)
  return useDB().transaction(async (tx) => {
    const [row] = await tx.update(c).set({ ...patch, updatedById: user.id, updatedAt: new Date() }).where(eq(c.id, id)).returning()
    await recordAudit({ actor: user, action: 'caveat.update', entityType: 'caveat', entityId: id, before: { title: before.title, text: before.text, standing: before.standing, active: before.active, sort: before.sort }, after: patch }, event, tx)
    return row!
  })
}

export async function deleteCaveat(event: H3Event, user: User, id: number): Promise<void> {
  const [before] = await useDB().select().from(c).where(eq(c.id, id))
  if (!before) throw caveatNotFound(id)
  if (before.standing && before.active) await assertStandingRemains(id, null)
  await useDB().transaction(async (tx) => {
    await tx.delete(c).where(eq(c.id, id))
    await recordAudit({ actor: user, action: 'caveat.delete', entityType: 'caveat', entityId: id, before: { title: before.title, text: before.text, standing: before.standing } }, event, tx)
  })
}

/**
 * The caveat texts a briefing carries: every active standing caveat, then the chosen library
 * caveats that are still active, in library order. Unknown or inactive ids are refused (422).
 */
export async function snapshotCaveats(libraryIds: number[]): Promise<BriefingCaveatSnapshot[]> {
  const db = useDB()
  const chosen = libraryIds.length ? await db.select().from(c).where(inArray(c.id, libraryIds)) : []
  const unusable = libraryIds.filter((id) => !chosen.some((r) => r.id === id && r.active))
  if (unusable.length) {
    throw createError({ statusCode: 422, statusMessage: 'Invalid caveat', message: `Caveat ${unusable.join(', ')} is not in the library or no longer active; reload the list.` })
  }
  const standing = await db.select().from(c).where(and(eq(c.standing, true), eq(c.active, true)))
  const all = new Map([...standing, ...chosen].map((r) => [r.id, r]))
  return [...all.values()].sort((a, b) => a.sort - b.sort || a.id - b.id).map((r) => ({ id: r.id, title: r.title, text: r.text, standing: r.standing }))
}
