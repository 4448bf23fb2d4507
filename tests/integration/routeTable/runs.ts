import { only, STAFF, type RouteRow } from './expect'

/** Forecast runs: upload, confirm, downscale, progress. */
export const rows: RouteRow[] = [
  { method: 'GET', path: '/api/runs', expected: only(STAFF, 200) },
  { method: 'POST', path: '/api/runs/uploads', expected: only(['admin', 'forecaster'], 400) },
  { method: 'GET', path: '/api/runs/:id', url: '/api/runs/999999', expected: only(STAFF, 404) },
  { method: 'DELETE', path: '/api/runs/:id', url: '/api/runs/999999', expected: only(['admin', 'forecaster'], 404) },
  { method: 'POST', path: '/api/runs/:id/confirm', url: '/api/runs/999999/confirm', body: {}, expected: only(['admin', 'forecaster'], 400) },
  { method: 'POST', path: '/api/runs/:id/downscale', url: '/api/runs/999999/downscale', body: {}, expected: only(['admin', 'forecaster'], 400) },
  { method: 'POST', path: '/api/runs/:id/cancel', url: '/api/runs/999999/cancel', expected: only(STAFF, 404) },
  { method: 'GET', path: '/api/runs/:id/tasks/:taskId', url: '/api/runs/999999/tasks/1', expected: only(STAFF, 404) },
]
