import { only, STAFF, type RouteRow } from './expect'

/** Method check: truth fields, checks, batches and exports (staff only). */
export const rows: RouteRow[] = [
  { method: 'GET', path: '/api/method-checks', expected: only(STAFF, 200) },
  { method: 'POST', path: '/api/method-checks', body: {}, expected: only(STAFF, 400) },
  { method: 'GET', path: '/api/method-checks/:id', url: '/api/method-checks/999999', expected: only(STAFF, 404) },
  { method: 'DELETE', path: '/api/method-checks/:id', url: '/api/method-checks/999999', expected: only(STAFF, 404) },
  { method: 'GET', path: '/api/method-checks/:id/export', url: '/api/method-checks/999999/export?format=csv', expected: only(STAFF, 404) },
  { method: 'GET', path: '/api/method-checks/truths', expected: only(STAFF, 200) },
  // No fileName: refused before anything is read.
  { method: 'POST', path: '/api/method-checks/truths', expected: only(STAFF, 400) },
  // No body: the action needs an explicit JSON object, so this row creates nothing.
  { method: 'POST', path: '/api/method-checks/truths/demo', expected: only(STAFF, 400) },
  { method: 'DELETE', path: '/api/method-checks/truths/:id', url: '/api/method-checks/truths/999999', expected: only(STAFF, 404) },
  { method: 'GET', path: '/api/method-checks/batches', expected: only(STAFF, 200) },
  { method: 'POST', path: '/api/method-checks/batches', body: {}, expected: only(STAFF, 400) },
  { method: 'GET', path: '/api/method-checks/batches/:id', url: '/api/method-checks/batches/999999', expected: only(STAFF, 404) },
  { method: 'DELETE', path: '/api/method-checks/batches/:id', url: '/api/method-checks/batches/999999', expected: only(STAFF, 404) },
  { method: 'GET', path: '/api/method-checks/batches/:id/export', url: '/api/method-checks/batches/999999/export', expected: only(STAFF, 404) },
]
