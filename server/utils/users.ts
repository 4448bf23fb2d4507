import type { H3Event } from 'h3'
import { createError } from 'h3'
import { and, asc, count, eq, isNull, gt, ne, sql } from 'drizzle-orm'
import type { User } from '#auth-utils'
import type { Role } from '../../shared/utils/roles'
import { useDB, tables } from './db'
import { recordAudit } from './audit'
import { issuePasswordToken, setPasswordUrl } from './passwordTokens'
import { queueInvitationMail } from './briefingMail'

type UserRow = typeof tables.users.$inferSelect

/** What the People page shows of an account (never the hash). */
export function publicUser(row: UserRow, invitePending = false) {
  return {
    id: row.id, email: row.email, displayName: row.displayName, role: row.role, active: row.active,
    createdAt: row.createdAt, lastSignInAt: row.lastSignInAt, invitePending,
  }
}

export async function listUsers() {
  const db = useDB()
  const pending = db.select({ userId: tables.passwordTokens.userId }).from(tables.passwordTokens)
    .where(and(isNull(tables.passwordTokens.usedAt), gt(tables.passwordTokens.expiresAt, new Date())))
  const rows = await db.select({ user: tables.users, pending: sql<boolean>`${tables.users.id} in (${pending})` })
    .from(tables.users).orderBy(asc(tables.users.displayName))
  return rows.map((r) => publicUser(r.user, r.pending))
}

export async function findUserById(id: number): Promise<UserRow> {
  const [row] = await useDB().select().from(tables.users).where(eq(tables.users.id, id))
  if (!row) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `There is no account with id ${id}.` })
  return row
}

export function baseUrl(event: H3Event): string {
  return String(useRuntimeConfig(event).publicBaseUrl)
}

/**
 * Creates an account without a password and a one-time set-password link for it. The link is
 * e-mailed through the outbox (sent by the worker) and also returned to the admin.
 */
export async function inviteUser(event: H3Event, actor: User, input: { email: string; displayName: string; role: Role }) {
  return useDB().transaction(async (tx) => {
    const [existing] = await tx.select({ id: tables.users.id }).from(tables.users).where(sql`lower(${tables.users.email}) = ${input.email}`)
    if (existing) throw createError({ statusCode: 409, statusMessage: 'Conflict', message: `An account for ${input.email} already exists.` })
    const [row] = await tx.insert(tables.users).values(input).returning()
    const token = await issuePasswordToken(row!.id, 'invite', actor.id, tx)
    await recordAudit({ actor, action: 'user.invite', entityType: 'user', entityId: row!.id, after: publicUser(row!) }, event, tx)
    const inviteUrl = setPasswordUrl(baseUrl(event), token)
    await queueInvitationMail(tx, { user: row!, url: inviteUrl, purpose: 'invite', actorId: actor.id })
    return { user: publicUser(row!, true), inviteUrl }
  })
}

export async function reissueInvite(event: H3Event, actor: User, id: number) {
  const row = await findUserById(id)
  const purpose = row.passwordHash ? 'reset' : 'invite'
  return useDB().transaction(async (tx) => {
    const token = await issuePasswordToken(row.id, purpose, actor.id, tx)
    await recordAudit({ actor, action: 'user.password_link', entityType: 'user', entityId: row.id }, event, tx)
    const inviteUrl = setPasswordUrl(baseUrl(event), token)
    await queueInvitationMail(tx, { user: row, url: inviteUrl, purpose, actorId: actor.id })
    return { inviteUrl }
  })
}

/**
 * Changes name, role or active flag. A role change or deactivation ends the person's sessions.
 * Guards: nobody deactivates or demotes themselves, and the last active admin stays.
 */
export async function updateUser(event: H3Event, actor: User, id: number, patch: { displayName?: string; role?: Role; active?: boolean }) {
  return useDB().transaction(async (tx) => {
    const [before] = await tx.select().from(tables.users).where(eq(tables.users.id, id)).for('update')
    if (!before) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `There is no account with id ${id}.` })
    const losesAdmin = before.role === 'admin' && before.active && ((patch.role && patch.role !== 'admin') || patch.active === false)
    if (losesAdmin && id === actor.id) {
      throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'You cannot remove your own administrator access; ask another administrator.' })
    }
    if (losesAdmin) {
      const [others] = await tx.select({ n: count() }).from(tables.users)
        .where(and(eq(tables.users.role, 'admin'), eq(tables.users.active, true), ne(tables.users.id, id)))
      if ((others?.n ?? 0) === 0) throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'This is the last active administrator; appoint another first.' })
    }
    const endsSessions = (patch.role !== undefined && patch.role !== before.role) || (patch.active === false && before.active)
    const [after] = await tx.update(tables.users).set({
      ...patch,
      ...(endsSessions ? { sessionVersion: before.sessionVersion + 1 } : {}),
    }).where(eq(tables.users.id, id)).returning()
    await recordAudit({ actor, action: 'user.update', entityType: 'user', entityId: id, before: publicUser(before), after: publicUser(after!) }, event, tx)
    return { user: publicUser(after!) }
  })
}
