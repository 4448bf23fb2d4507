/** The four roles of Tessera, in the order used for display. */
export const ROLES = ['admin', 'duty_lead', 'forecaster', 'stakeholder'] as const
export type Role = (typeof ROLES)[number]

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Administrator',
  duty_lead: 'Duty lead',
  forecaster: 'Forecaster',
  stakeholder: 'Stakeholder',
}

/** Staff roles that work inside the forecasting office (everyone but stakeholders). */
export const STAFF_ROLES: readonly Role[] = ['admin', 'duty_lead', 'forecaster']

export function isRole(value: unknown): value is Role {
  return typeof value === 'string' && (ROLES as readonly string[]).includes(value)
}
