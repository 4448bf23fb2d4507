import { only, STAFF, type RouteRow } from './expect'

/** Map workspace: products from stored samples, areas of interest, hazard threshold sets. */
export const rows: RouteRow[] = [
  { method: 'GET', path: '/api/runs/:id/products/map.png', url: '/api/runs/999999/products/map.png', expected: only(STAFF, 404) },
  { method: 'GET', path: '/api/runs/:id/products/summary', url: '/api/runs/999999/products/summary', expected: only(STAFF, 404) },
  { method: 'GET', path: '/api/runs/:id/products/point', url: '/api/runs/999999/products/point?lon=0&lat=0', expected: only(STAFF, 404) },
  { method: 'GET', path: '/api/runs/:id/fields/coarse.png', url: '/api/runs/999999/fields/coarse.png', expected: only(STAFF, 404) },
  { method: 'GET', path: '/api/runs/:id/fields/sample.png', url: '/api/runs/999999/fields/sample.png', expected: only(STAFF, 404) },
  { method: 'GET', path: '/api/runs/:id/areas/:areaId/products', url: '/api/runs/999999/areas/1/products', expected: only(STAFF, 404) },
  { method: 'GET', path: '/api/areas', expected: only(STAFF, 200) },
  { method: 'POST', path: '/api/areas', body: {}, expected: only(STAFF, 400) },
  { method: 'POST', path: '/api/areas/import', body: {}, expected: only(STAFF, 400) },
  { method: 'GET', path: '/api/areas/:id', url: '/api/areas/999999', expected: only(STAFF, 404) },
  { method: 'PATCH', path: '/api/areas/:id', url: '/api/areas/999999', body: {}, expected: only(STAFF, 400) },
  { method: 'DELETE', path: '/api/areas/:id', url: '/api/areas/999999', expected: only(STAFF, 404) },
  { method: 'GET', path: '/api/hazards', expected: only(STAFF, 200) },
  { method: 'PUT', path: '/api/hazards/:hazard', url: '/api/hazards/gust', body: {}, expected: only(STAFF, 400) },
]
