// Sign-in, throttling, sessions and the People flows against the running server and real PostgreSQL.
import { afterAll, describe, expect, it } from 'vitest'
import pg from 'pg'
import { seal, defaults } from 'iron-webcrypto'
import { call, demoAccount, freshAddress, sessionCookie, signIn, signInAs, uniqueEmail } from '../support/http'
import { DEMO_PASSWORD } from '../../scripts/lib/demoAccounts'

// iron-webcrypto types subtle.* with Uint8Array<ArrayBufferLike>, the DOM lib with ArrayBuffer-backed views only;
// at run time it is the same Web Crypto object.
const webCrypto = globalThis.crypto as unknown as Parameters<typeof seal>[0]
const db = new pg.Client({ connectionString: process.env.DATABASE_URL })
await db.connect()
afterAll(() => db.end())

async function invite(adminCookie: string, role = 'forecaster') {
  const email = uniqueEmail('person')
  const res = await call('POST', '/api/users', { cookie: adminCookie, body: { email, displayName: 'Test Person', role } })
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  const token = new URL(res.body.inviteUrl).searchParams.get('token')!
  return { email, id: res.body.user.id as number, token }
}

describe('sign-in', () => {
  it('sets a sealed session cookie that is HttpOnly, SameSite=Lax and Secure', async () => {
    const { email } = demoAccount('forecaster')
    const res = await call('POST', '/api/auth/login', { body: { email, password: DEMO_PASSWORD }, headers: { 'x-forwarded-for': freshAddress() } })
    expect(res.status).toBe(200)
    expect(res.body.user).toMatchObject({ email, role: 'forecaster' })
    expect(res.body.user.passwordHash).toBeUndefined()
    const header = res.headers.getSetCookie().find((c) => c.startsWith('nuxt-session='))!
    expect(header).toMatch(/;\s*HttpOnly/i)
    expect(header).toMatch(/;\s*SameSite=Lax/i)
    expect(header).toMatch(/;\s*Secure/i)
    expect(header).toMatch(/;\s*Path=\//i)
  })

  it('accepts the e-mail in any letter case and refuses a wrong password with one message', async () => {
    const { email } = demoAccount('duty_lead')
    await expect(signIn(email.toUpperCase(), DEMO_PASSWORD)).resolves.toMatch(/^nuxt-session=/)
    const wrong = await call('POST', '/api/auth/login', { body: { email, password: 'not the password' }, headers: { 'x-forwarded-for': freshAddress() } })
    const unknown = await call('POST', '/api/auth/login', { body: { email: 'nobody@tessera.example', password: 'x' }, headers: { 'x-forwarded-for': freshAddress() } })
    expect([wrong.status, unknown.status]).toEqual([401, 401])
    expect(wrong.body.message).toBe('E-mail or password is wrong.')
    expect(unknown.body.message).toBe(wrong.body.message)
  })

  it('throttles an account after 5 failures, even with the right password, from any address', async () => {
    const admin = await signInAs('admin')
    const person = await invite(admin)
    expect((await call('POST', '/api/auth/set-password', { body: { token: person.token, password: 'a long enough password' } })).status).toBe(200)
    for (let k = 0; k < 5; k++) {
      const r = await call('POST', '/api/auth/login', { body: { email: person.email, password: 'wrong' }, headers: { 'x-forwarded-for': freshAddress() } })
      expect(r.status).toBe(401)
    }
    const blocked = await call('POST', '/api/auth/login', { body: { email: person.email, password: 'a long enough password' }, headers: { 'x-forwarded-for': freshAddress() } })
    expect(blocked.status).toBe(429)
    expect(blocked.body.message).toMatch(/Too many failed sign-in attempts for this account/)
  })

  it('throttles an address after 20 failures across accounts, but not other addresses', async () => {
    const address = freshAddress().replace(/\.\d+$/, '.251')
    for (let k = 0; k < 20; k++) {
      await call('POST', '/api/auth/login', { body: { email: uniqueEmail('ghost'), password: 'x' }, headers: { 'x-forwarded-for': address } })
    }
    const { email } = demoAccount('forecaster')
    const blocked = await call('POST', '/api/auth/login', { body: { email, password: DEMO_PASSWORD }, headers: { 'x-forwarded-for': address } })
    expect(blocked.status).toBe(429)
    expect(blocked.body.message).toMatch(/network address/)
    await expect(signIn(email, DEMO_PASSWORD)).resolves.toBeTruthy()
  })
})

describe('sessions', () => {
  it('ends when the account is deactivated, and the account can no longer sign in', async () => {
    const admin = await signInAs('admin')
    const person = await invite(admin)
    await call('POST', '/api/auth/set-password', { body: { token: person.token, password: 'correct horse battery' } })
    const cookie = await signIn(person.email, 'correct horse battery')
    expect((await call('GET', '/api/profile', { cookie })).status).toBe(200)
    const off = await call('PATCH', `/api/users/${person.id}`, { cookie: admin, body: { active: false } })
    expect(off.status).toBe(200)
    const after = await call('GET', '/api/profile', { cookie })
    expect(after.status).toBe(401)
    expect(after.body.message).toMatch(/deactivated/)
    const again = await call('POST', '/api/auth/login', { body: { email: person.email, password: 'correct horse battery' }, headers: { 'x-forwarded-for': freshAddress() } })
    expect(again.status).toBe(403)
    expect(again.body.message).toMatch(/deactivated/)
  })

  it('ends on a role change, so the new role applies at once', async () => {
    const admin = await signInAs('admin')
    const person = await invite(admin, 'admin')
    await call('POST', '/api/auth/set-password', { body: { token: person.token, password: 'correct horse battery' } })
    const cookie = await signIn(person.email, 'correct horse battery')
    expect((await call('GET', '/api/users', { cookie })).status).toBe(200)
    await call('PATCH', `/api/users/${person.id}`, { cookie: admin, body: { role: 'stakeholder' } })
    expect((await call('GET', '/api/users', { cookie })).status).toBe(401)
    const fresh = await signIn(person.email, 'correct horse battery')
    expect((await call('GET', '/api/users', { cookie: fresh })).status).toBe(403)
  })

  it('refuses a session older than the maximum age even though its cookie is intact', async () => {
    // Seal a cookie exactly as h3's session does, with the test server's password, but a sign-in time 13 h ago.
    const password = process.env.TESSERA_TEST_SESSION_PASSWORD
    expect(password, 'scripts/test.mjs passes the server password').toBeTruthy()
    const { rows: [row] } = await db.query('select id, email, display_name, role, session_version from users where email = $1', [demoAccount('forecaster').email])
    const session = {
      id: crypto.randomUUID(), createdAt: Date.now(),
      data: { user: { id: row.id, email: row.email, displayName: row.display_name, role: row.role }, loggedInAt: Date.now() - 13 * 3600_000, sessionVersion: row.session_version },
    }
    const sealed = await seal(webCrypto, session, password!, { ...defaults, ttl: 12 * 3600_000 })
    const res = await call('GET', '/api/profile', { cookie: `nuxt-session=${sealed}` })
    expect(res.status).toBe(401)
    expect(res.body.message).toMatch(/expired/)
    // The same forged cookie with a recent sign-in time is accepted: the age check is what refused it.
    session.data.loggedInAt = Date.now()
    const ok = await seal(webCrypto, session, password!, { ...defaults, ttl: 12 * 3600_000 })
    expect((await call('GET', '/api/profile', { cookie: `nuxt-session=${ok}` })).status).toBe(200)
  })

  it('sign-out clears the cookie', async () => {
    const cookie = await signInAs('stakeholder')
    const res = await call('POST', '/api/auth/logout', { cookie })
    expect(res.status).toBe(204)
    expect(sessionCookie(res.headers)).toBe('nuxt-session=')
  })
})

describe('people and passwords', () => {
  it('a set-password link works once', async () => {
    const admin = await signInAs('admin')
    const person = await invite(admin)
    const short = await call('POST', '/api/auth/set-password', { body: { token: person.token, password: 'short' } })
    expect(short.status).toBe(400)
    expect((await call('POST', '/api/auth/set-password', { body: { token: person.token, password: 'a long enough password' } })).status).toBe(200)
    const reuse = await call('POST', '/api/auth/set-password', { body: { token: person.token, password: 'another long password' } })
    expect(reuse.status).toBe(400)
    expect(reuse.body.message).toMatch(/not valid any more/)
  })

  it('refuses a duplicate e-mail, and an admin removing their own access', async () => {
    const admin = await signInAs('admin')
    const dup = await call('POST', '/api/users', { cookie: admin, body: { email: demoAccount('forecaster').email.toUpperCase(), displayName: 'X', role: 'forecaster' } })
    expect(dup.status).toBe(409)
    const me = (await call('GET', '/api/profile', { cookie: admin })).body.user
    const self = await call('PATCH', `/api/users/${me.id}`, { cookie: admin, body: { active: false } })
    expect(self.status).toBe(409)
  })

  it('changing one\'s own password keeps this session and retires the old password', async () => {
    const admin = await signInAs('admin')
    const person = await invite(admin)
    await call('POST', '/api/auth/set-password', { body: { token: person.token, password: 'first long password' } })
    const cookie = await signIn(person.email, 'first long password')
    const wrong = await call('POST', '/api/profile/password', { cookie, body: { currentPassword: 'nope', newPassword: 'second long password' } })
    expect(wrong.status).toBe(400)
    const res = await call('POST', '/api/profile/password', { cookie, body: { currentPassword: 'first long password', newPassword: 'second long password' } })
    expect(res.status).toBe(200)
    const renewed = sessionCookie(res.headers) ?? cookie
    expect((await call('GET', '/api/profile', { cookie: renewed })).status).toBe(200)
    expect((await call('GET', '/api/profile', { cookie })).status).toBe(401)
    await expect(signIn(person.email, 'first long password')).rejects.toThrow(/401/)
    await expect(signIn(person.email, 'second long password')).resolves.toBeTruthy()
  })
})

describe('audit log', () => {
  it('records changes with before and after, and refuses updates and deletes', async () => {
    const admin = await signInAs('admin')
    const person = await invite(admin)
    await call('PATCH', `/api/users/${person.id}`, { cookie: admin, body: { displayName: 'Renamed Person' } })
    const { rows } = await db.query(`select action, before, after from audit_log where entity_type = 'user' and entity_id = $1 order by id`, [String(person.id)])
    expect(rows.map((r) => r.action)).toEqual(['user.invite', 'user.update'])
    expect(rows[1].before.displayName).toBe('Test Person')
    expect(rows[1].after.displayName).toBe('Renamed Person')
    await expect(db.query('update audit_log set action = $1', ['tampered'])).rejects.toThrow(/append-only/)
    await expect(db.query('delete from audit_log')).rejects.toThrow(/append-only/)
    const page = await call('GET', '/api/audit?limit=5', { cookie: admin })
    expect(page.body.entries.length).toBeLessThanOrEqual(5)
    expect(page.body.total).toBeGreaterThan(0)
  })
})
