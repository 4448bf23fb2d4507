import { and, count, eq, gt, sql } from 'drizzle-orm'
import { createError } from 'h3'
import { useDB, tables } from './db'

/** Failed sign-ins allowed per account (since its last success) and per address, per window. */
export const THROTTLE = { windowMinutes: 15, perAccount: 5, perAddress: 20 }

/** Throws 429 when the account or the address has too many recent failed sign-ins. */
export async function assertNotThrottled(email: string, ipAddress: string): Promise<void> {
  const db = useDB()
  const since = sql`now() - make_interval(mins => ${THROTTLE.windowMinutes})`
  const lastSuccess = db.select({ at: sql`max(${tables.signInAttempts.at})` }).from(tables.signInAttempts)
    .where(and(eq(tables.signInAttempts.email, email), eq(tables.signInAttempts.succeeded, true)))
  const [account] = await db.select({ n: count() }).from(tables.signInAttempts).where(and(
    eq(tables.signInAttempts.email, email),
    eq(tables.signInAttempts.succeeded, false),
    gt(tables.signInAttempts.at, since),
    sql`${tables.signInAttempts.at} > coalesce((${lastSuccess}), '-infinity'::timestamptz)`,
  ))
  if ((account?.n ?? 0) >= THROTTLE.perAccount) {
    throw createError({ statusCode: 429, statusMessage: 'Too Many Requests', message: `Too many failed sign-in attempts for this account. Wait ${THROTTLE.windowMinutes} minutes, or ask an administrator for a new set-password link.` })
  }
  const [address] = await db.select({ n: count() }).from(tables.signInAttempts).where(and(
    eq(tables.signInAttempts.ipAddress, ipAddress),
    eq(tables.signInAttempts.succeeded, false),
    gt(tables.signInAttempts.at, since),
  ))
  if ((address?.n ?? 0) >= THROTTLE.perAddress) {
    throw createError({ statusCode: 429, statusMessage: 'Too Many Requests', message: `Too many failed sign-in attempts from your network address. Wait ${THROTTLE.windowMinutes} minutes.` })
  }
}

export async function recordSignInAttempt(email: string, ipAddress: string, succeeded: boolean): Promise<void> {
  await useDB().insert(tables.signInAttempts).values({ email, ipAddress, succeeded })
}
