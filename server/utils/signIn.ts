import type { H3Event } from 'h3'
import { createError } from 'h3'
import { eq, sql } from 'drizzle-orm'
import { useDB, tables } from './db'
import { clientAddress, recordAudit } from './audit'
import { assertNotThrottled, recordSignInAttempt } from './throttle'
import { consumePasswordToken } from './passwordTokens'

const WRONG = 'E-mail or password is wrong.'
// Verified against when the account does not exist, so both paths cost one scrypt check.
let decoyHash: Promise<string> | undefined

/** E-mail + password sign-in with throttling; starts a sealed-cookie session. */
export async function signIn(event: H3Event, email: string, password: string) {
  const ip = clientAddress(event)
  await assertNotThrottled(email, ip)
  const db = useDB()
  const [row] = await db.select().from(tables.users).where(sql`lower(${tables.users.email}) = ${email}`)
  decoyHash ??= hashPassword('decoy password that never matches')
  const ok = await verifyPassword(row?.passwordHash ?? await decoyHash, password)
  if (!row || !row.passwordHash || !ok) {
    await recordSignInAttempt(email, ip, false)
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: WRONG })
  }
  if (!row.active) {
    await recordSignInAttempt(email, ip, false)
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'This account has been deactivated. Ask an administrator if you need access.' })
  }
  await recordSignInAttempt(email, ip, true)
  await db.update(tables.users).set({ lastSignInAt: new Date() }).where(eq(tables.users.id, row.id))
  const user = { id: row.id, email: row.email, displayName: row.displayName, role: row.role }
  await replaceUserSession(event, { user, loggedInAt: Date.now(), sessionVersion: row.sessionVersion })
  await recordAudit({ actor: user, action: 'auth.sign_in', entityType: 'user', entityId: row.id }, event)
  return { user }
}

/** Sets a password from a one-time link; ends any other sessions of that account. */
export async function setPasswordWithToken(event: H3Event, token: string, password: string) {
  const passwordHash = await hashPassword(password)
  await useDB().transaction(async (tx) => {
    const userId = await consumePasswordToken(token, tx)
    if (userId === null) throw createError({ statusCode: 400, statusMessage: 'Bad Request', message: 'This link is not valid any more (used, replaced or expired). Ask an administrator for a new one.' })
    const [row] = await tx.update(tables.users).set({ passwordHash, sessionVersion: sql`${tables.users.sessionVersion} + 1` })
      .where(eq(tables.users.id, userId)).returning()
    await recordAudit({ actor: { id: row!.id, email: row!.email }, action: 'user.set_password', entityType: 'user', entityId: row!.id }, event, tx)
  })
  return { ok: true }
}

/** Changes the signed-in person's password; other sessions end, this one continues. */
export async function changeOwnPassword(event: H3Event, userId: number, currentPassword: string, newPassword: string) {
  const db = useDB()
  const [row] = await db.select().from(tables.users).where(eq(tables.users.id, userId))
  if (!row?.passwordHash || !(await verifyPassword(row.passwordHash, currentPassword))) {
    throw createError({ statusCode: 400, statusMessage: 'Bad Request', message: 'Your current password is wrong.' })
  }
  const [updated] = await db.update(tables.users)
    .set({ passwordHash: await hashPassword(newPassword), sessionVersion: row.sessionVersion + 1 })
    .where(eq(tables.users.id, userId)).returning()
  const session = await getUserSession(event)
  await replaceUserSession(event, { ...session, sessionVersion: updated!.sessionVersion })
  await recordAudit({ actor: { id: row.id, email: row.email }, action: 'user.change_password', entityType: 'user', entityId: row.id }, event)
  return { ok: true }
}
