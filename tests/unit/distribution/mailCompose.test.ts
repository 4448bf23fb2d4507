import { describe, expect, it } from 'vitest'
import { briefingSubject, compactWindow, composeBriefingMail, composeInvitationMail, listShort, timeWithLocal, type BriefingMailFacts } from '../../../server/utils/mailCompose'
import { outboxMessageId } from '../../../server/utils/mailOutbox'
import { mailSettings, retryDelaySeconds, smtpConnectionOptions } from '../../../server/utils/mailSettings'

const facts = (over: Partial<BriefingMailFacts> = {}): BriefingMailFacts => ({
  kind: 'issue', briefingId: 42, version: 1, title: 'Gusts on the <pass>', organisationName: 'Serevan Regional Roads',
  areaNames: ['Kaldor Pass', 'Coast road'], hazardLabels: ['Gusts'],
  windowStart: '2031-11-14T12:00:00Z', windowEnd: '2031-11-14T18:00:00Z', issuedAt: '2031-11-14T09:30:00Z', nextUpdateAt: '2031-11-14T15:00:00Z',
  contact: 'Duty lead, +00 555 0100', headline: 'Strong gusts likely', summary: 'Gusts of 20 m/s are likely on the pass.',
  statements: [{ areaName: 'Kaldor Pass', text: 'about 70 % (13 of 18 scenarios) that gusts reach 20 m/s' }, { areaName: 'Coast road', text: 'about 30 % that gusts reach 20 m/s' }],
  local: { name: 'Serevan Coast time', offsetMinutes: -120 }, portalUrl: 'http://localhost:3000/portal/42',
  withdrawnReason: null, supersedesVersion: null, withPdf: true, ...over,
})

describe('briefing e-mail', () => {
  it('puts organisation, hazard, areas, validity, issue time and version in the subject', () => {
    expect(briefingSubject(facts())).toBe('Serevan Regional Roads: Gusts, Kaldor Pass, Coast road — valid 14 Nov 12:00–18:00 UTC — issued 14 Nov 09:30 UTC — v1')
  })

  it('marks amendments, withdrawals and tests at the start of the subject', () => {
    expect(briefingSubject(facts({ kind: 'amended', version: 2 }))).toMatch(/^AMENDED Serevan Regional Roads: .* — v2$/)
    expect(briefingSubject(facts({ kind: 'withdrawn' }))).toMatch(/^WITHDRAWN /)
    expect(briefingSubject(facts({ kind: 'test', organisationName: null }))).toMatch(/^\[TEST\] Gusts, Kaldor Pass/)
  })

  it('writes the statements, validity in UTC and local time, next update, contact and the portal link', () => {
    const { text, html } = composeBriefingMail(facts())
    expect(text).toContain('about 70 % (13 of 18 scenarios) that gusts reach 20 m/s')
    expect(text).toContain('Valid: 14 Nov 2031 12:00 UTC (10:00 Serevan Coast time, UTC−02:00) to 14 Nov 2031 18:00 UTC (16:00 Serevan Coast time, UTC−02:00)')
    expect(text).toContain('Next update: 14 Nov 2031 15:00 UTC')
    expect(text).toContain('Contact: Duty lead, +00 555 0100')
    expect(text).toContain('http://localhost:3000/portal/42')
    expect(text).toMatch(/attached as a PDF/)
    expect(html).toContain('<a href="http://localhost:3000/portal/42">')
    expect(html).toContain('Gusts on the &lt;pass&gt;')
    expect(html).not.toContain('<pass>')
  })

  it('gives the reason on a withdrawal and no statements to act on', () => {
    const { text } = composeBriefingMail(facts({ kind: 'withdrawn', withdrawnReason: 'Issued for the wrong day.', withPdf: false }))
    expect(text).toMatch(/has been withdrawn/)
    expect(text).toContain('Reason: Issued for the wrong day.')
    expect(text).not.toContain('about 70 %')
    expect(text).not.toMatch(/attached/)
  })

  it('says plainly that a test is a test', () => {
    expect(composeBriefingMail(facts({ kind: 'test' })).text).toMatch(/^TEST MESSAGE — not for action/)
  })

  it('formats windows and lists compactly', () => {
    expect(compactWindow('2031-11-14T21:00:00Z', '2031-11-15T06:00:00Z')).toBe('14 Nov 21:00 – 15 Nov 06:00 UTC')
    expect(compactWindow(null, null)).toBe('validity not set')
    expect(listShort(['A', 'B', 'C', 'D'])).toBe('A, B and 2 more')
    expect(listShort(['A', 'B', 'C'])).toBe('A, B, C')
    expect(timeWithLocal('2031-11-14T01:00:00Z', { name: 'Serevan Coast time', offsetMinutes: -120 })).toBe('14 Nov 2031 01:00 UTC (13 Nov 23:00 Serevan Coast time, UTC−02:00)')
  })

  it('sends the set-password link in an invitation', () => {
    const m = composeInvitationMail({ displayName: 'Kalle', url: 'http://x.example/set-password?token=abc', purpose: 'invite', expiresAt: '2031-11-21T09:30:00Z' })
    expect(m.text).toContain('http://x.example/set-password?token=abc')
    expect(m.subject).toMatch(/choose a password/)
  })
})

describe('mail settings and identity', () => {
  it('keeps one Message-ID per idempotency key', () => {
    expect(outboxMessageId('briefing:1:v1:issue:a@b.example', 'office.example')).toBe(outboxMessageId('briefing:1:v1:issue:a@b.example', 'office.example'))
    expect(outboxMessageId('briefing:1:v1:issue:a@b.example', 'office.example')).not.toBe(outboxMessageId('briefing:1:v1:amended:a@b.example', 'office.example'))
    expect(outboxMessageId('k', 'office.example')).toMatch(/^<tessera\.[0-9a-f]{32}@office\.example>$/)
  })

  it('backs off exponentially up to an hour', () => {
    expect([1, 2, 3, 4].map((n) => retryDelaySeconds(n, 30))).toEqual([30, 60, 120, 240])
    expect(retryDelaySeconds(20, 30)).toBe(3600)
  })

  it('allows plain SMTP only to a loopback relay', () => {
    const loop = smtpConnectionOptions(mailSettings({ TESSERA_SMTP_HOST: '127.0.0.1' }))
    expect(loop).toMatchObject({ ignoreTLS: true, secure: false })
    const remote = smtpConnectionOptions(mailSettings({ TESSERA_SMTP_HOST: 'relay.office.example', TESSERA_SMTP_PORT: '587' }))
    expect(remote).toMatchObject({ requireTLS: true, secure: false, port: 587 })
    expect(smtpConnectionOptions(mailSettings({ TESSERA_SMTP_HOST: 'relay.office.example', TESSERA_SMTP_SECURE: 'true' }))).toMatchObject({ secure: true })
    expect(mailSettings({ TESSERA_MAIL_FROM: 'Office <briefings@office.example>' }).fromDomain).toBe('office.example')
    expect(() => mailSettings({ TESSERA_SMTP_PORT: 'abc' })).toThrow(/TESSERA_SMTP_PORT/)
  })
})
