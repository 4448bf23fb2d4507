// Every API route × every role, against the running server and the real database.
// Allowed roles get past the access check: reads answer 200, writes sent an empty body answer
// 400 (validation runs after the role check) — so no test data is created here.
import { beforeAll, describe, expect, it } from 'vitest'
import { ROLES, type Role } from '../../shared/utils/roles'
import { listApiRoutes } from '../support/routes'
import { call, signInAs } from '../support/http'

type Who = 'anonymous' | Role
const STAFF: Role[] = ['admin', 'duty_lead', 'forecaster']
type Expected = Record<Who, number>

const everyone = (status: number): Expected => ({ anonymous: status, admin: status, duty_lead: status, forecaster: status, stakeholder: status })
const signedIn = (status: number): Expected => ({ ...everyone(status), anonymous: 401 })
const only = (allowed: Role[], status: number): Expected => {
  const e = everyone(403)
  e.anonymous = 401
  for (const r of allowed) e[r] = status
  return e
}

/** The route × role table. Later features add their rows here; a route without a row fails the first test. */
export const ROUTE_TABLE: { method: string; path: string; url?: string; body?: unknown; expected: Expected }[] = [
  { method: 'GET', path: '/api/health', expected: everyone(200) },
  { method: 'POST', path: '/api/auth/login', body: {}, expected: everyone(400) },
  { method: 'POST', path: '/api/auth/logout', expected: everyone(204) },
  { method: 'POST', path: '/api/auth/set-password', body: {}, expected: everyone(400) },
  { method: 'GET', path: '/api/profile', expected: signedIn(200) },
  { method: 'POST', path: '/api/profile/password', body: {}, expected: signedIn(400) },
  { method: 'GET', path: '/api/users', expected: only(['admin'], 200) },
  { method: 'POST', path: '/api/users', body: {}, expected: only(['admin'], 400) },
  { method: 'PATCH', path: '/api/users/:id', url: '/api/users/999999', body: {}, expected: only(['admin'], 400) },
  { method: 'POST', path: '/api/users/:id/invite', url: '/api/users/999999/invite', expected: only(['admin'], 404) },
  { method: 'GET', path: '/api/audit', expected: only(['admin', 'duty_lead'], 200) },
  { method: 'GET', path: '/api/runs', expected: only(STAFF, 200) },
  { method: 'POST', path: '/api/runs/uploads', expected: only(['admin', 'forecaster'], 400) },
  { method: 'GET', path: '/api/runs/:id', url: '/api/runs/999999', expected: only(STAFF, 404) },
  { method: 'DELETE', path: '/api/runs/:id', url: '/api/runs/999999', expected: only(['admin', 'forecaster'], 404) },
  { method: 'POST', path: '/api/runs/:id/confirm', url: '/api/runs/999999/confirm', body: {}, expected: only(['admin', 'forecaster'], 400) },
  { method: 'POST', path: '/api/runs/:id/downscale', url: '/api/runs/999999/downscale', body: {}, expected: only(['admin', 'forecaster'], 400) },
  { method: 'POST', path: '/api/runs/:id/cancel', url: '/api/runs/999999/cancel', expected: only(STAFF, 404) },
  { method: 'GET', path: '/api/runs/:id/tasks/:taskId', url: '/api/runs/999999/tasks/1', expected: only(STAFF, 404) },
]

describe('route × role table', () => {
  const cookies: Partial<Record<Who, string>> = {}
  beforeAll(async () => {
    for (const role of ROLES) cookies[role] = await signInAs(role)
  })

  it('has exactly one row for every route file under server/api', () => {
    const files = listApiRoutes().map((r) => `${r.method} ${r.path}`).sort()
    const rows = ROUTE_TABLE.map((r) => `${r.method} ${r.path}`).sort()
    expect(rows).toEqual(files)
  })

  for (const row of ROUTE_TABLE) {
    for (const who of ['anonymous', ...ROLES] as Who[]) {
      it(`${row.method} ${row.path} as ${who} → ${row.expected[who]}`, async () => {
        // Signing out would end the shared session: give that row a session of its own.
        const cookie = who === 'anonymous' ? undefined : row.path === '/api/auth/logout' ? await signInAs(who) : cookies[who]
        const res = await call(row.method, row.url ?? row.path, { cookie, body: row.body })
        expect(res.status, JSON.stringify(res.body)).toBe(row.expected[who])
        if (res.status === 401 || res.status === 403) expect(res.body.message).toMatch(/Sign in|needs the .* role/)
      })
    }
  }
})
