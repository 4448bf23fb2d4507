import { only, STAFF, type RouteRow } from './expect'

const AUTHORS = ['forecaster', 'duty_lead'] as const
const LEADS = ['duty_lead'] as const

/** Briefings and the caveat library: staff only; stakeholders see none of it. */
export const rows: RouteRow[] = [
  { method: 'GET', path: '/api/briefings', expected: only(STAFF, 200) },
  { method: 'POST', path: '/api/briefings', body: {}, expected: only([...AUTHORS], 400) },
  { method: 'GET', path: '/api/briefings/sources', expected: only(STAFF, 400) },
  { method: 'GET', path: '/api/briefings/:id', url: '/api/briefings/999999', expected: only(STAFF, 404) },
  { method: 'PATCH', path: '/api/briefings/:id', url: '/api/briefings/999999', body: {}, expected: only([...AUTHORS], 400) },
  { method: 'GET', path: '/api/briefings/:id/pdf', url: '/api/briefings/999999/pdf', expected: only(STAFF, 404) },
  { method: 'POST', path: '/api/briefings/:id/submit', url: '/api/briefings/999999/submit', body: {}, expected: only([...AUTHORS], 400) },
  { method: 'POST', path: '/api/briefings/:id/return', url: '/api/briefings/999999/return', body: {}, expected: only([...LEADS], 400) },
  { method: 'POST', path: '/api/briefings/:id/approve', url: '/api/briefings/999999/approve', body: {}, expected: only([...LEADS], 400) },
  { method: 'POST', path: '/api/briefings/:id/issue', url: '/api/briefings/999999/issue', body: {}, expected: only([...LEADS], 400) },
  { method: 'POST', path: '/api/briefings/:id/withdraw', url: '/api/briefings/999999/withdraw', body: {}, expected: only([...LEADS], 400) },
  { method: 'POST', path: '/api/briefings/:id/amend', url: '/api/briefings/999999/amend', body: {}, expected: only([...AUTHORS], 400) },
  { method: 'GET', path: '/api/caveats', expected: only(STAFF, 200) },
  { method: 'POST', path: '/api/caveats', body: {}, expected: only(['duty_lead', 'admin'], 400) },
  { method: 'PATCH', path: '/api/caveats/:id', url: '/api/caveats/999999', body: {}, expected: only(['duty_lead', 'admin'], 404) },
  { method: 'DELETE', path: '/api/caveats/:id', url: '/api/caveats/999999', expected: only(['duty_lead', 'admin'], 404) },
]
