import type { H3Event } from 'h3'
import { createError } from 'h3'
import { eq } from 'drizzle-orm'
import type { User, UserSession } from '#auth-utils'
import type { Role } from '../../shared/utils/roles'
import { useDB, tables } from './db'
import { assertRole } from './roles'

const expired = (message: string) => createError({ statusCode: 401, statusMessage: 'Unauthorized', message })

/**
 * Checks a sealed-cookie session against the database: the account must still be active,
 * its session version unchanged (bumped on deactivation, password or role change) and the
 * session younger than the configured maximum age. Returns the fresh user, or throws 401.
 */
export async function validateSession(event: H3Event, session: UserSession): Promise<User | null> {
  if (!session.user) return null
  const maxAgeMs = Number(useRuntimeConfig(event).sessionMaxAgeSeconds) * 1000
  if (!session.loggedInAt || Date.now() - session.loggedInAt > maxAgeMs) {
    await clearUserSession(event)
    throw expired('Your session has expired. Sign in again.')
  }
  const [row] = await useDB().select().from(tables.users).where(eq(tables.users.id, session.user.id))
  if (!row || !row.active || row.sessionVersion !== session.sessionVersion) {
    await clearUserSession(event)
    throw expired('Your session has ended because your account was changed or deactivated. Sign in again.')
  }
  return { id: row.id, email: row.email, displayName: row.displayName, role: row.role }
}

/**
 * The one access check every API route uses: 401 without a valid session, 403 when the
 * signed-in role is not listed. With no roles, any signed-in user passes.
 */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<User> {
  const session = await getUserSession(event)
  const user = await validateSession(event, session)
  return assertRole(user, roles)
}
