import { everyone, signedIn, only, type RouteRow } from './expect'

/** Sign-in, profile, people and audit. */
export const rows: RouteRow[] = [
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
]
