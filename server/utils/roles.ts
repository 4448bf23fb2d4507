import { createError } from 'h3'
import type { Role } from '../../shared/utils/roles'
import { ROLE_LABELS } from '../../shared/utils/roles'

/**
 * Throws 401 when nobody is signed in and 403 when the role is not among `allowed`.
 * Pure, so it can be unit-tested; `requireRole` wraps it with the session and the database.
 */
export function assertRole<U extends { role: Role }>(user: U | null | undefined, allowed: readonly Role[]): U {
  if (!user) throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Sign in to continue.' })
  if (allowed.length > 0 && !allowed.includes(user.role)) {
    const needed = allowed.map((r) => ROLE_LABELS[r]).join(' or ')
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: `This needs the ${needed} role; you are signed in as ${ROLE_LABELS[user.role]}.` })
  }
  return user
}
