// Helpers for tests that talk to the running test server (scripts/test.mjs starts it).
import type { Role } from '../../shared/utils/roles'
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../scripts/lib/demoAccounts'

export const BASE_URL = process.env.TESSERA_TEST_BASE_URL ?? 'http://localhost:3300'

export interface Reply { status: number; body: any; headers: Headers }

let addressCounter = 0
/** A fresh client address per call site, so throttling tests don't affect each other. */
export function freshAddress(): string {
  addressCounter++
  return `198.51.100.${(process.pid + addressCounter) % 250 + 1}`
}

export async function call(method: string, path: string, opts: { cookie?: string; body?: unknown; raw?: Uint8Array; headers?: Record<string, string> } = {}): Promise<Reply> {
  const res = await fetch(BASE_URL + path, {
    method,
    redirect: 'manual',
    headers: {
      accept: 'application/json',
      ...(opts.body !== undefined ? { 'content-type': 'application/json' } : {}),
      ...(opts.raw !== undefined ? { 'content-type': 'application/octet-stream' } : {}),
      ...(opts.cookie ? { cookie: opts.cookie } : {}),
      ...opts.headers,
    },
    // A copy backed by a plain ArrayBuffer: fetch's BodyInit does not accept views that may sit on a SharedArrayBuffer.
    body: opts.raw !== undefined ? new Uint8Array(opts.raw) : opts.body !== undefined ? JSON.stringify(opts.body) : undefined,
  })
  const text = await res.text()
  let body: any = text
  try { body = text ? JSON.parse(text) : null } catch { /* not JSON */ }
  return { status: res.status, body, headers: res.headers }
}

/** The session cookie (name=value) from a Set-Cookie header list. */
export function sessionCookie(headers: Headers): string | undefined {
  const cookie = headers.getSetCookie().find((c) => c.startsWith('nuxt-session='))
  return cookie?.split(';')[0]
}

export async function signIn(email: string, password: string, address = freshAddress()): Promise<string> {
  const res = await call('POST', '/api/auth/login', { body: { email, password }, headers: { 'x-forwarded-for': address } })
  if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${JSON.stringify(res.body)}`)
  const cookie = sessionCookie(res.headers)
  if (!cookie) throw new Error('no session cookie')
  return cookie
}

export function demoAccount(role: Role) {
  const account = DEMO_ACCOUNTS.find((a) => a.role === role)
  if (!account) throw new Error(`no demo account for ${role}`)
  return account
}

export function signInAs(role: Role): Promise<string> {
  return signIn(demoAccount(role).email, DEMO_PASSWORD)
}

/** A unique e-mail address for accounts a test creates. */
export function uniqueEmail(tag: string): string {
  return `${tag}-${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 7)}@test.tessera.example`
}
