import { only, STAFF, type RouteRow } from './expect'

const EDITORS = ['admin', 'duty_lead'] as const
const editors = (status: number) => only([...EDITORS], status)

/** Distribution (directory, mail, deliveries), the stakeholder portal, archive search and exports. */
export const rows: RouteRow[] = [
  { method: 'GET', path: '/api/organisations', expected: only(STAFF, 200) },
  { method: 'POST', path: '/api/organisations', body: {}, expected: editors(400) },
  { method: 'PATCH', path: '/api/organisations/:id', url: '/api/organisations/999999', body: {}, expected: editors(400) },
  { method: 'DELETE', path: '/api/organisations/:id', url: '/api/organisations/999999', expected: editors(404) },
  { method: 'GET', path: '/api/contacts', expected: editors(200) },
  { method: 'GET', path: '/api/contacts/accounts', expected: editors(200) },
  { method: 'POST', path: '/api/contacts', body: {}, expected: editors(400) },
  { method: 'PATCH', path: '/api/contacts/:id', url: '/api/contacts/999999', body: {}, expected: editors(400) },
  { method: 'DELETE', path: '/api/contacts/:id', url: '/api/contacts/999999', expected: editors(404) },
  { method: 'GET', path: '/api/distribution-lists', expected: only(STAFF, 200) },
  { method: 'POST', path: '/api/distribution-lists', body: {}, expected: editors(400) },
  { method: 'PATCH', path: '/api/distribution-lists/:id', url: '/api/distribution-lists/999999', body: {}, expected: editors(400) },
  { method: 'DELETE', path: '/api/distribution-lists/:id', url: '/api/distribution-lists/999999', expected: editors(404) },
  { method: 'GET', path: '/api/mail/received', expected: editors(200) },
  { method: 'GET', path: '/api/mail/received/:id', url: '/api/mail/received/999999', expected: editors(404) },
  { method: 'GET', path: '/api/mail/received/:id/attachments/:index', url: '/api/mail/received/999999/attachments/0', expected: editors(404) },
  { method: 'GET', path: '/api/mail/outbox', expected: editors(200) },
  { method: 'POST', path: '/api/mail/outbox/:id/retry', url: '/api/mail/outbox/999999/retry', expected: editors(404) },
  { method: 'GET', path: '/api/briefings/:id/deliveries', url: '/api/briefings/999999/deliveries', expected: only(STAFF, 404) },
  { method: 'POST', path: '/api/briefings/:id/test-mail', url: '/api/briefings/999999/test-mail', expected: only(STAFF, 404) },
  { method: 'GET', path: '/api/briefings/:id/export/:format', url: '/api/briefings/999999/export/cap', expected: only(STAFF, 404) },
  { method: 'GET', path: '/api/portal/briefings', expected: only(['stakeholder'], 200) },
  { method: 'GET', path: '/api/portal/briefings/:id', url: '/api/portal/briefings/999999', expected: only(['stakeholder'], 404) },
  { method: 'GET', path: '/api/portal/briefings/:id/pdf', url: '/api/portal/briefings/999999/pdf', expected: only(['stakeholder'], 404) },
  { method: 'GET', path: '/api/archive/search', expected: only(STAFF, 200) },
  { method: 'GET', path: '/api/archive/filters', expected: only(STAFF, 200) },
]
