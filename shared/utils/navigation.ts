import type { Role } from './roles'

export interface NavItem {
  to: string
  label: string
  /** One line shown on the home page card and as the link's description. */
  description: string
  roles: readonly Role[]
}

/**
 * Every section of the app and who may use it. The server enforces access on each API
 * route itself; this table only decides what the navigation offers.
 */
export const NAV_ITEMS: readonly NavItem[] = [
  { to: '/runs', label: 'Forecast runs', description: 'Upload coarse ensembles and downscale every member.', roles: ['admin', 'duty_lead', 'forecaster'] },
  { to: '/workspace', label: 'Map workspace', description: 'Exceedance and neighbourhood probabilities, areas of interest.', roles: ['admin', 'duty_lead', 'forecaster'] },
  { to: '/briefings', label: 'Briefings', description: 'Build, review, approve and issue briefings.', roles: ['admin', 'duty_lead', 'forecaster'] },
  { to: '/archive', label: 'Archive', description: 'Search every issued briefing by words, dates and places.', roles: ['admin', 'duty_lead', 'forecaster'] },
  { to: '/method-check', label: 'Method check', description: 'Score the downscaling against truth and simple interpolation.', roles: ['admin', 'duty_lead', 'forecaster'] },
  { to: '/portal', label: 'My briefings', description: 'Briefings sent to your organisation.', roles: ['stakeholder'] },
  { to: '/admin/people', label: 'People', description: 'Accounts, roles and invitations.', roles: ['admin'] },
  { to: '/admin/stakeholders', label: 'Stakeholders', description: 'Organisations, contacts and distribution lists.', roles: ['admin', 'duty_lead'] },
  { to: '/admin/mail', label: 'Mail log', description: 'Messages sent and what the local mail stand-in received.', roles: ['admin', 'duty_lead'] },
  { to: '/admin/audit', label: 'Audit log', description: 'Every change, who made it and when.', roles: ['admin', 'duty_lead'] },
]

export function navFor(role: Role | undefined): NavItem[] {
  return role ? NAV_ITEMS.filter((item) => item.roles.includes(role)) : []
}
