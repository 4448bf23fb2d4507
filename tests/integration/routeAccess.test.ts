// Every API route × every role, against the running server and the real database.
// Allowed roles get past the access check: reads answer 200, writes sent an empty body answer
// 400 (validation runs after the role check) — so no test data is created here.
import { beforeAll, describe, expect, it } from 'vitest'
import { ROLES } from '../../shared/utils/roles'
import type { RouteRow, Who } from './routeTable/expect'
import { listApiRoutes } from '../support/routes'
import { call, signInAs } from '../support/http'

/** The route × role table: every file in routeTable/ (except expect.ts) exports `rows`. */
const modules = import.meta.glob<{ rows: RouteRow[] }>('./routeTable/*.ts', { eager: true })
export const ROUTE_TABLE: RouteRow[] = Object.entries(modules).filter(([f]) => !f.endsWith('/expect.ts')).flatMap(([, m]) => m.rows)

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
