import { describe, expect, it } from 'vitest'
import { assertRole } from '../../server/utils/roles'
import { ROLES, isRole } from '../../shared/utils/roles'
import { navFor, NAV_ITEMS } from '../../shared/utils/navigation'

function statusOf(fn: () => unknown): number | 'ok' {
  try { fn(); return 'ok' } catch (err) { return (err as { statusCode: number }).statusCode }
}

describe('assertRole', () => {
  it('refuses with 401 when nobody is signed in', () => {
    expect(statusOf(() => assertRole(null, ['admin']))).toBe(401)
    expect(statusOf(() => assertRole(undefined, []))).toBe(401)
  })

  it('refuses with 403 and names both roles when the role is not allowed', () => {
    let message = ''
    try { assertRole({ role: 'stakeholder' }, ['admin', 'duty_lead']) } catch (err) { message = (err as Error).message }
    expect(message).toContain('Administrator or Duty lead')
    expect(message).toContain('Stakeholder')
    expect(statusOf(() => assertRole({ role: 'forecaster' }, ['admin']))).toBe(403)
  })

  it('lets every listed role through, and any signed-in role when none is listed', () => {
    for (const role of ROLES) {
      expect(statusOf(() => assertRole({ role }, [role]))).toBe('ok')
      expect(statusOf(() => assertRole({ role }, []))).toBe('ok')
    }
  })
})

describe('navigation table', () => {
  it('shows stakeholders only their portal', () => {
    expect(navFor('stakeholder').map((i) => i.to)).toEqual(['/portal'])
  })
  it('offers People only to admins', () => {
    for (const role of ROLES) expect(navFor(role).some((i) => i.to === '/admin/people')).toBe(role === 'admin')
  })
  it('names only real roles', () => {
    for (const item of NAV_ITEMS) for (const r of item.roles) expect(isRole(r)).toBe(true)
    expect(navFor(undefined)).toEqual([])
  })
})
