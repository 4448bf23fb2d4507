import type { Role } from '../../shared/utils/roles'

/** Demo-mode accounts, one per role. Invented people; listed in the README. Never seeded in production. */
export const DEMO_PASSWORD = 'tessera-demo-2026'
export const DEMO_ACCOUNTS: { email: string; displayName: string; role: Role }[] = [
  { email: 'admin@tessera.example', displayName: 'Ines Varga', role: 'admin' },
  { email: 'lead@tessera.example', displayName: 'Tomas Okonkwo-Reyes', role: 'duty_lead' },
  { email: 'forecaster@tessera.example', displayName: 'Mara Lindqvist', role: 'forecaster' },
  { email: 'stakeholder@tessera.example', displayName: 'Kalle Nordberg', role: 'stakeholder' },
]
