// Building blocks for the route × role table: each feature lists its routes in a file of this folder.
import type { Role } from '../../../shared/utils/roles'

export type Who = 'anonymous' | Role
export type Expected = Record<Who, number>
export interface RouteRow { method: string; path: string; url?: string; body?: unknown; expected: Expected }

export const STAFF: Role[] = ['admin', 'duty_lead', 'forecaster']
export const everyone = (status: number): Expected => ({ anonymous: status, admin: status, duty_lead: status, forecaster: status, stakeholder: status })
export const signedIn = (status: number): Expected => ({ ...everyone(status), anonymous: 401 })
export const only = (allowed: Role[], status: number): Expected => {
  const e = everyone(403)
  e.anonymous = 401
  for (const r of allowed) e[r] = status
  return e
}
