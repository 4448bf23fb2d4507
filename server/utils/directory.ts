/**
 * The stakeholder directory: organisations, their contacts and the distribution lists briefings
 * are sent to. Kept by administrators and duty leads; every change is audited.
 */
import type { H3Event } from 'h3'
import { createError } from 'h3'
import { and, asc, eq, inArray, ne, notInArray, sql } from 'drizzle-orm'
import type { z } from 'zod'
import type { User } from '#auth-utils'
import { useDB, tables, type Database } from './db'
import { recordAudit } from './audit'
import {
  listKeyFromName, type contactSchema, type contactUpdateSchema, type distributionListSchema, type distributionListUpdateSchema,
  type organisationSchema, type organisationUpdateSchema,
} from '../../shared/schemas/distribution'

const O = tables.organisations
const C = tables.contacts
const L = tables.distributionLists
const M = tables.distributionListMembers

const notFound = (what: string, id: number) => createError({ statusCode: 404, statusMessage: 'Not Found', message: `There is no ${what} with id ${id}.` })
const conflict = (message: string) => createError({ statusCode: 409, statusMessage: 'Conflict', message })

/** Unique-index violations become a 409 with a sentence about what clashed. */
async function explainUnique<T>(work: () => Promise<T>, message: string): Promise<T> {
  try {
    return await work()
  } catch (err) {
    const e = err as { code?: string; cause?: { code?: string } }
    if (e.code === '23505' || e.cause?.code === '23505') throw conflict(message)
    throw err
  }
}

// --- Organisations -------------------------------------------------------------------------------

export async function listOrganisations() {
  const contactsPerOrg = useDB().select({ organisationId: C.organisationId, n: sql<number>`count(*)::int`.as('n') }).from(C).groupBy(C.organisationId).as('cc')
  const rows = await useDB().select({ organisation: O, contacts: sql<number>`coalesce(${contactsPerOrg.n}, 0)` })
    .from(O).leftJoin(contactsPerOrg, eq(contactsPerOrg.organisationId, O.id)).orderBy(asc(O.name))
  return rows.map((r) => ({ ...r.organisation, contacts: r.contacts }))
}

export async function createOrganisation(event: H3Event, actor: User, input: z.infer<typeof organisationSchema>) {
  return explainUnique(() => useDB().transaction(async (tx) => {
    const [row] = await tx.insert(O).values(input).returning()
    await recordAudit({ actor, action: 'organisation.create', entityType: 'organisation', entityId: row!.id, after: row }, event, tx)
    return row!
  }), `An organisation called "${input.name}" exists already.`)
}

export async function updateOrganisation(event: H3Event, actor: User, id: number, patch: z.infer<typeof organisationUpdateSchema>) {
  return explainUnique(() => useDB().transaction(async (tx) => {
    const [before] = await tx.select().from(O).where(eq(O.id, id)).for('update')
    if (!before) throw notFound('organisation', id)
    const [after] = await tx.update(O).set(patch).where(eq(O.id, id)).returning()
    await recordAudit({ actor, action: 'organisation.update', entityType: 'organisation', entityId: id, before, after }, event, tx)
    return after!
  }), `An organisation called "${patch.name}" exists already.`)
}

/** Only an organisation without contacts or lists can be deleted; otherwise deactivate it. */
export async function deleteOrganisation(event: H3Event, actor: User, id: number) {
  return useDB().transaction(async (tx) => {
    const [before] = await tx.select().from(O).where(eq(O.id, id)).for('update')
    if (!before) throw notFound('organisation', id)
    const [contacts] = await tx.select({ n: sql<number>`count(*)::int` }).from(C).where(eq(C.organisationId, id))
    const [lists] = await tx.select({ n: sql<number>`count(*)::int` }).from(L).where(eq(L.organisationId, id))
    if ((contacts?.n ?? 0) + (lists?.n ?? 0) > 0) throw conflict('This organisation still has contacts or lists. Remove them first, or mark the organisation inactive to keep its history.')
    await tx.delete(O).where(eq(O.id, id))
    await recordAudit({ actor, action: 'organisation.delete', entityType: 'organisation', entityId: id, before }, event, tx)
    return { deleted: id }
  })
}

// --- Contacts --------------------------------------------------------------------------------------

async function assertStakeholderAccount(tx: Pick<Database, 'select'>, userId: number | null | undefined) {
  if (userId == null) return
  const [u] = await tx.select({ role: tables.users.role }).from(tables.users).where(eq(tables.users.id, userId))
  if (!u) throw createError({ statusCode: 422, statusMessage: 'Unprocessable', message: `There is no account with id ${userId}.` })
  if (u.role !== 'stakeholder') throw createError({ statusCode: 422, statusMessage: 'Unprocessable', message: 'Only a stakeholder account can be linked to a contact (staff see briefings in the app itself).' })
}

export async function listContacts(organisationId?: number) {
  const rows = await useDB().select({
    contact: C, organisation: O.name, account: tables.users.email,
    lists: sql<number[]>`coalesce((select array_agg(${M.listId} order by ${M.listId}) from ${M} where ${M.contactId} = ${C.id}), '{}')`,
  }).from(C).innerJoin(O, eq(O.id, C.organisationId)).leftJoin(tables.users, eq(tables.users.id, C.userId))
    .where(organisationId ? eq(C.organisationId, organisationId) : undefined).orderBy(asc(O.name), asc(C.name))
  return rows.map((r) => ({ ...r.contact, organisationName: r.organisation, accountEmail: r.account, listIds: r.lists }))
}

export async function createContact(event: H3Event, actor: User, input: z.infer<typeof contactSchema>) {
  return explainUnique(() => useDB().transaction(async (tx) => {
    await assertStakeholderAccount(tx, input.userId)
    const [org] = await tx.select({ id: O.id }).from(O).where(eq(O.id, input.organisationId))
    if (!org) throw notFound('organisation', input.organisationId)
    const [row] = await tx.insert(C).values(input).returning()
    await recordAudit({ actor, action: 'contact.create', entityType: 'contact', entityId: row!.id, after: row }, event, tx)
    return row!
  }), `${input.email} is already a contact of this organisation.`)
}

export async function updateContact(event: H3Event, actor: User, id: number, patch: z.infer<typeof contactUpdateSchema>) {
  return explainUnique(() => useDB().transaction(async (tx) => {
    const [before] = await tx.select().from(C).where(eq(C.id, id)).for('update')
    if (!before) throw notFound('contact', id)
    await assertStakeholderAccount(tx, patch.userId)
    const [after] = await tx.update(C).set(patch).where(eq(C.id, id)).returning()
    await recordAudit({ actor, action: 'contact.update', entityType: 'contact', entityId: id, before, after }, event, tx)
    return after!
  }), `${patch.email ?? 'That address'} is already a contact of this organisation.`)
}

/** Removes a contact from every list; messages already sent keep the address they went to. */
export async function deleteContact(event: H3Event, actor: User, id: number) {
  return useDB().transaction(async (tx) => {
    const [before] = await tx.delete(C).where(eq(C.id, id)).returning()
    if (!before) throw notFound('contact', id)
    await recordAudit({ actor, action: 'contact.delete', entityType: 'contact', entityId: id, before }, event, tx)
    return { deleted: id }
  })
}

// --- Distribution lists ----------------------------------------------------------------------------

export async function listDistributionLists() {
  const rows = await useDB().select({
    list: L, organisation: O.name,
    memberIds: sql<number[]>`coalesce((select array_agg(${M.contactId} order by ${M.contactId}) from ${M} where ${M.listId} = ${L.id}), '{}')`,
    activeMembers: sql<number>`(select count(*)::int from ${M} join ${C} on ${C.id} = ${M.contactId} and ${C.active} where ${M.listId} = ${L.id})`,
    briefings: sql<number>`(select count(*)::int from ${tables.briefingLists} where ${tables.briefingLists.listId} = ${L.id})`,
  }).from(L).leftJoin(O, eq(O.id, L.organisationId)).orderBy(asc(L.name))
  return rows.map((r) => ({ ...r.list, organisationName: r.organisation, memberIds: r.memberIds, activeMembers: r.activeMembers, briefingsSent: r.briefings }))
}

async function setMembers(tx: Database, listId: number, memberIds: number[]) {
  if (memberIds.length) {
    const found = await tx.select({ id: C.id }).from(C).where(inArray(C.id, memberIds))
    const missing = memberIds.filter((id) => !found.some((f) => f.id === id))
    if (missing.length) throw createError({ statusCode: 422, statusMessage: 'Unprocessable', message: `Unknown contact id(s): ${missing.join(', ')}.` })
  }
  await tx.delete(M).where(and(eq(M.listId, listId), memberIds.length ? notInArray(M.contactId, memberIds) : undefined))
  if (memberIds.length) await tx.insert(M).values(memberIds.map((contactId) => ({ listId, contactId }))).onConflictDoNothing()
}

export async function createDistributionList(event: H3Event, actor: User, input: z.infer<typeof distributionListSchema>) {
  const { memberIds, ...fields } = input
  const key = fields.key ?? listKeyFromName(fields.name)
  return explainUnique(() => useDB().transaction(async (tx) => {
    const [row] = await tx.insert(L).values({ ...fields, key }).returning()
    await setMembers(tx, row!.id, memberIds)
    await recordAudit({ actor, action: 'distribution_list.create', entityType: 'distribution_list', entityId: row!.id, after: { ...row, memberIds } }, event, tx)
    return { ...row!, memberIds }
  }), `A list with the key "${key}" exists already; choose another name or key.`)
}

export async function updateDistributionList(event: H3Event, actor: User, id: number, patch: z.infer<typeof distributionListUpdateSchema>) {
  const { memberIds, ...fields } = patch
  return useDB().transaction(async (tx) => {
    const [before] = await tx.select().from(L).where(eq(L.id, id)).for('update')
    if (!before) throw notFound('distribution list', id)
    const beforeMembers = (await tx.select({ id: M.contactId }).from(M).where(eq(M.listId, id))).map((m) => m.id).sort((x, y) => x - y)
    const [after] = Object.keys(fields).length ? await tx.update(L).set(fields).where(eq(L.id, id)).returning() : [before]
    if (memberIds) await setMembers(tx, id, memberIds)
    await recordAudit({
      actor, action: 'distribution_list.update', entityType: 'distribution_list', entityId: id,
      before: { ...before, memberIds: beforeMembers }, after: { ...after, memberIds: memberIds ?? beforeMembers },
    }, event, tx)
    return { ...after!, memberIds: memberIds ?? beforeMembers }
  })
}

/** A list that briefings were sent to stays (mark it inactive); an unused one can be deleted. */
export async function deleteDistributionList(event: H3Event, actor: User, id: number) {
  return useDB().transaction(async (tx) => {
    const [before] = await tx.select().from(L).where(eq(L.id, id)).for('update')
    if (!before) throw notFound('distribution list', id)
    const [used] = await tx.select({ n: sql<number>`count(*)::int` }).from(tables.briefingLists).where(eq(tables.briefingLists.listId, id))
    if ((used?.n ?? 0) > 0) throw conflict('Briefings were sent to this list, so it stays in the record. Mark it inactive instead.')
    await tx.delete(L).where(eq(L.id, id))
    await recordAudit({ actor, action: 'distribution_list.delete', entityType: 'distribution_list', entityId: id, before }, event, tx)
    return { deleted: id }
  })
}

/** Stakeholder accounts, for linking contacts to portal users. */
export async function stakeholderAccounts() {
  return useDB().select({ id: tables.users.id, email: tables.users.email, displayName: tables.users.displayName, active: tables.users.active })
    .from(tables.users).where(and(eq(tables.users.role, 'stakeholder'), ne(tables.users.active, false))).orderBy(asc(tables.users.displayName))
}
