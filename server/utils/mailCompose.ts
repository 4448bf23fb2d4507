/**
 * The words of Tessera's e-mails: briefing messages (issued, amended, withdrawn, test) and
 * invitations. Pure functions (no database), so the wording is unit-tested; the outbox stores
 * what they return, exactly as it is sent.
 */

export type BriefingMailKind = 'issue' | 'amended' | 'withdrawn' | 'test'

export interface BriefingMailFacts {
  kind: BriefingMailKind
  briefingId: number
  version: number
  title: string
  organisationName: string | null
  areaNames: string[]
  hazardLabels: string[]
  windowStart: string | null
  windowEnd: string | null
  issuedAt: string | null
  nextUpdateAt: string | null
  contact: string
  headline: string
  summary: string
  /** The printed key statements, grouped by area in the order given. */
  statements: { areaName: string; text: string }[]
  local: { name: string; offsetMinutes: number }
  portalUrl: string
  withdrawnReason: string | null
  /** Version this one replaces (amendments). */
  supersedesVersion: number | null
  /** Whether the PDF is attached. */
  withPdf: boolean
}

export interface ComposedMail { subject: string; text: string; html: string }

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec']
const two = (n: number) => String(n).padStart(2, '0')

/** "14 Nov 12:00" in UTC (the year is left to the body). */
function shortUtc(iso: string): string {
  const d = new Date(iso)
  return `${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]} ${two(d.getUTCHours())}:${two(d.getUTCMinutes())}`
}

/** "14 Nov 12:00–18:00 UTC", or "14 Nov 21:00 – 15 Nov 06:00 UTC" across midnight. */
export function compactWindow(start: string | null, end: string | null): string {
  if (!start || !end) return 'validity not set'
  const a = shortUtc(start)
  const b = shortUtc(end)
  const sameDay = a.slice(0, a.lastIndexOf(' ')) === b.slice(0, b.lastIndexOf(' '))
  return sameDay ? `${a}–${b.slice(b.lastIndexOf(' ') + 1)} UTC` : `${a} – ${b} UTC`
}

/** "14 Nov 2031 12:00 UTC (10:00 Serevan Coast time, UTC−02:00)". */
export function timeWithLocal(iso: string, local: { name: string; offsetMinutes: number }): string {
  const d = new Date(iso)
  const utc = `${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]} ${d.getUTCFullYear()} ${two(d.getUTCHours())}:${two(d.getUTCMinutes())} UTC`
  if (local.offsetMinutes === 0) return utc
  const l = new Date(d.getTime() + local.offsetMinutes * 60_000)
  const m = Math.abs(local.offsetMinutes)
  const offset = `UTC${local.offsetMinutes < 0 ? '−' : '+'}${two(Math.floor(m / 60))}:${two(m % 60)}`
  const sameDate = l.getUTCDate() === d.getUTCDate()
  const day = sameDate ? '' : `${l.getUTCDate()} ${MONTHS[l.getUTCMonth()]} `
  return `${utc} (${day}${two(l.getUTCHours())}:${two(l.getUTCMinutes())} ${local.name}, ${offset})`
}

/** "Kaldor Pass, Coast road and 2 more" — keeps subjects readable. */
export function listShort(items: string[], keep = 2): string {
  const unique = [...new Set(items.filter(Boolean))]
  if (unique.length === 0) return ''
  if (unique.length <= keep + 1) return unique.join(', ')
  return `${unique.slice(0, keep).join(', ')} and ${unique.length - keep} more`
}

const KIND_PREFIX: Record<BriefingMailKind, string> = { issue: '', amended: 'AMENDED ', withdrawn: 'WITHDRAWN ', test: '[TEST] ' }

/**
 * Subject: kind marker, organisation, hazard(s), area(s), validity window, issue time, version.
 * "AMENDED Serevan Regional Roads: Gusts, Kaldor Pass — valid 14 Nov 12:00–18:00 UTC — issued 14 Nov 09:30 UTC — v2"
 */
export function briefingSubject(f: BriefingMailFacts): string {
  const what = [listShort(f.hazardLabels), listShort(f.areaNames)].filter(Boolean).join(', ') || f.title
  const head = f.organisationName ? `${f.organisationName}: ${what}` : what
  const issued = f.issuedAt ? `issued ${shortUtc(f.issuedAt)} UTC` : 'not issued yet'
  return `${KIND_PREFIX[f.kind]}${head} — valid ${compactWindow(f.windowStart, f.windowEnd)} — ${issued} — v${f.version}`
}

function groupedStatements(f: BriefingMailFacts): { area: string; lines: string[] }[] {
  const groups: { area: string; lines: string[] }[] = []
  for (const s of f.statements) {
    let g = groups.find((x) => x.area === s.areaName)
    if (!g) groups.push(g = { area: s.areaName, lines: [] })
    g.lines.push(s.text)
  }
  return groups
}

function opening(f: BriefingMailFacts): string {
  switch (f.kind) {
    case 'amended':
      return `This is version ${f.version} of the briefing "${f.title}". It replaces version ${f.supersedesVersion ?? f.version - 1}; please use this one from now on.`
    case 'withdrawn':
      return `The briefing "${f.title}" (version ${f.version}) has been withdrawn. Do not use it for your decisions any more.`
    case 'test':
      return `TEST MESSAGE — not for action. This shows how the briefing "${f.title}" would arrive; it has ${f.issuedAt ? 'been issued already' : 'not been issued'}.`
    default:
      return `The forecasting office has issued the briefing "${f.title}" (version ${f.version}).`
  }
}

const CAUTION = 'The probabilities are statistical detail added to a coarse ensemble forecast, not a warning. Official warnings for your area take precedence.'

/** Plain-text and HTML bodies with the key statements, validity, next update, contact and the portal link. */
export function composeBriefingMail(f: BriefingMailFacts): ComposedMail {
  const subject = briefingSubject(f)
  const validity = f.windowStart && f.windowEnd
    ? `${timeWithLocal(f.windowStart, f.local)} to ${timeWithLocal(f.windowEnd, f.local)}`
    : 'not set'
  const facts: [string, string][] = [
    ['Valid', validity],
    ...(f.issuedAt ? [['Issued', timeWithLocal(f.issuedAt, f.local)] as [string, string]] : []),
    ...(f.kind !== 'withdrawn' ? [['Next update', f.nextUpdateAt ? timeWithLocal(f.nextUpdateAt, f.local) : 'none planned'] as [string, string]] : []),
    ['Contact', f.contact || 'the forecasting office duty lead'],
  ]
  const groups = f.kind === 'withdrawn' ? [] : groupedStatements(f)
  const attachmentLine = f.withPdf ? 'The briefing is attached as a PDF; it is the document of record.' : ''

  const text = [
    opening(f),
    ...(f.kind === 'withdrawn' && f.withdrawnReason ? ['', `Reason: ${f.withdrawnReason}`] : []),
    ...(f.headline ? ['', f.headline] : []),
    ...(f.summary && f.kind !== 'withdrawn' ? ['', f.summary] : []),
    ...(groups.length ? ['', 'Key statements'] : []),
    ...groups.flatMap((g) => [`  ${g.area}`, ...g.lines.map((l) => `   - ${l}`)]),
    '',
    ...facts.map(([k, v]) => `${k}: ${v}`),
    '',
    ...(attachmentLine ? [attachmentLine] : []),
    `Read it in your portal: ${f.portalUrl}`,
    '',
    CAUTION,
  ].join('\n')

  const esc = escapeHtml
  const html = `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>${esc(subject)}</title></head>
<body style="font-family: Arial, Helvetica, sans-serif; color: #1d2430; line-height: 1.45; max-width: 42rem;">
<p${f.kind === 'test' || f.kind === 'withdrawn' || f.kind === 'amended' ? ' style="font-weight: bold;"' : ''}>${esc(opening(f))}</p>
${f.kind === 'withdrawn' && f.withdrawnReason ? `<p><strong>Reason:</strong> ${esc(f.withdrawnReason)}</p>\n` : ''}${f.headline ? `<h1 style="font-size: 1.25rem;">${esc(f.headline)}</h1>\n` : ''}${f.summary && f.kind !== 'withdrawn' ? `<p>${esc(f.summary)}</p>\n` : ''}${groups.length ? `<h2 style="font-size: 1.05rem;">Key statements</h2>\n${groups.map((g) => `<h3 style="font-size: 1rem; margin-bottom: 0.25rem;">${esc(g.area)}</h3>\n<ul>${g.lines.map((l) => `<li>${esc(l)}</li>`).join('')}</ul>`).join('\n')}\n` : ''}<table style="border-collapse: collapse; margin: 1rem 0;">
${facts.map(([k, v]) => `<tr><th scope="row" style="text-align: left; padding: 0.2rem 1rem 0.2rem 0; vertical-align: top;">${esc(k)}</th><td style="padding: 0.2rem 0;">${esc(v)}</td></tr>`).join('\n')}
</table>
${attachmentLine ? `<p>${esc(attachmentLine)}</p>\n` : ''}<p><a href="${esc(f.portalUrl)}">Read the briefing in your portal</a></p>
<p style="font-size: 0.85rem; color: #4a5565;">${esc(CAUTION)}</p>
</body></html>`
  return { subject, text, html }
}

/** The set-password message for a new account or a reset. */
export function composeInvitationMail(input: { displayName: string; url: string; purpose: 'invite' | 'reset'; expiresAt: string }): ComposedMail {
  const invite = input.purpose === 'invite'
  const subject = invite ? 'Your Tessera account: choose a password' : 'Tessera: set a new password'
  const lead = invite
    ? `Hello ${input.displayName}, an account has been created for you in Tessera, the forecasting office's briefing system.`
    : `Hello ${input.displayName}, a link to set a new Tessera password was requested for you.`
  const expiry = `The link works once and until ${timeWithLocal(input.expiresAt, { name: 'UTC', offsetMinutes: 0 })}.`
  const text = [lead, '', 'Choose your password here:', input.url, '', expiry, 'If you did not expect this message, ignore it.'].join('\n')
  const esc = escapeHtml
  const html = `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>${esc(subject)}</title></head>
<body style="font-family: Arial, Helvetica, sans-serif; color: #1d2430; line-height: 1.45; max-width: 42rem;">
<p>${esc(lead)}</p>
<p><a href="${esc(input.url)}">Choose your password</a></p>
<p>${esc(expiry)} If you did not expect this message, ignore it.</p>
</body></html>`
  return { subject, text, html }
}

export function escapeHtml(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;')
}
