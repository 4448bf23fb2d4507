import { createHash, randomBytes } from 'node:crypto'
import { and, eq, gt, isNull } from 'drizzle-orm'
import { useDB, tables, type Database } from './db'

export const TOKEN_LIFETIME_DAYS = 7

const hashToken = (token: string) => createHash('sha256').update(token).digest('hex')

/**
 * Issues a one-time set-password token for a user, revoking earlier unused ones.
 * Only its SHA-256 is stored; the returned token goes into the link once.
 */
export async function issuePasswordToken(userId: number, purpose: 'invite' | 'reset', createdById: number | null, tx: Database = useDB()): Promise<string> {
  const token = randomBytes(32).toString('base64url')
  await tx.update(tables.passwordTokens).set({ usedAt: new Date() })
    .where(and(eq(tables.passwordTokens.userId, userId), isNull(tables.passwordTokens.usedAt)))
  await tx.insert(tables.passwordTokens).values({
    userId, purpose, createdById, tokenHash: hashToken(token),
    expiresAt: new Date(Date.now() + TOKEN_LIFETIME_DAYS * 86400_000),
  })
  return token
}

/** Marks a valid token used and returns its user id, or null when unknown, used or expired. */
export async function consumePasswordToken(token: string, tx: Database): Promise<number | null> {
  const [row] = await tx.update(tables.passwordTokens).set({ usedAt: new Date() })
    .where(and(eq(tables.passwordTokens.tokenHash, hashToken(token)), isNull(tables.passwordTokens.usedAt), gt(tables.passwordTokens.expiresAt, new Date())))
    .returning({ userId: tables.passwordTokens.userId })
  return row?.userId ?? null
}

/** The link a person opens to set their password. */
export function setPasswordUrl(baseUrl: string, token: string): string {
  return `${baseUrl.replace(/\/$/, '')}/set-password?token=${encodeURIComponent(token)}`
}
