/**
 * Open-standard exports of an issued briefing version:
 *  - OASIS CAP 1.2 XML (Common Alerting Protocol), scope Restricted, one <info> per hazard;
 *  - GeoJSON (RFC 7946) of its areas with the statements' probabilities;
 *  - CSV (RFC 4180) of its statements.
 * The builders are pure (tests check them against the standards' rules); `loadExportBriefing`
 * gathers their input from the database (areas as frozen in the archive index).
 */
import { createHash } from 'node:crypto'
import { eq } from 'drizzle-orm'
import { HAZARD_DEFINITIONS, type Hazard } from '../../shared/schemas/products'
import type { BriefingStatement } from '../../shared/schemas/briefings'
import type { BriefingAreaShape } from '../db/schema/archive'
import { useDB, tables } from './db'
import { mailSettings } from './mailSettings'
import { escapeHtml } from './mailCompose'

export interface ExportBriefing {
  id: number
  seriesId: number
  version: number
  status: 'issued' | 'withdrawn' | 'superseded'
  title: string
  headline: string
  summary: string
  contact: string
  issuedAt: Date
  windowStart: Date | null
  windowEnd: Date | null
  withdrawnAt: Date | null
  withdrawnReason: string | null
  /** The version this one amends, with its issue time (CAP references). */
  supersedes: { id: number; issuedAt: Date } | null
  utcOffsetMinutes: number
  isDemo: boolean
  statements: BriefingStatement[]
  areas: BriefingAreaShape[]
  pdf: { size: number; sha1: string } | null
  portalUrl: string
  /** Where a stakeholder downloads the PDF (the portal's API). */
  pdfUrl: string
  /** CAP sender: the office's mail domain, e.g. "tessera@office.example". */
  sender: string
}

export const CAP_NAMESPACE = 'urn:oasis:names:tc:emergency:cap:1.2'

const two = (n: number) => String(n).padStart(2, '0')

/**
 * CAP 1.2 dateTime (section 3.3.2): "YYYY-MM-DDThh:mm:ss" with an explicit offset; UTC is
 * written "-00:00" because the standard forbids the "Z" designator. Times are given in the
 * briefing's fixed local offset.
 */
export function capDateTime(at: Date, offsetMinutes: number): string {
  const t = new Date(Math.round(at.getTime() / 1000) * 1000 + offsetMinutes * 60_000)
  const date = `${t.getUTCFullYear()}-${two(t.getUTCMonth() + 1)}-${two(t.getUTCDate())}T${two(t.getUTCHours())}:${two(t.getUTCMinutes())}:${two(t.getUTCSeconds())}`
  const m = Math.abs(offsetMinutes)
  const sign = offsetMinutes > 0 ? '+' : '-'
  return `${date}${sign}${two(Math.floor(m / 60))}:${two(m % 60)}`
}

export type CapCertainty = 'Observed' | 'Likely' | 'Possible' | 'Unlikely' | 'Unknown'

/**
 * CAP 1.2 certainty from a forecast probability p (section 3.2.2, certainty): "Likely" p > ~50 %,
 * "Possible" p ≤ ~50 %, "Unlikely" p ≈ 0. Tessera calls p "about 0" when it rounds to 0 %
 * (p < 0.005, i.e. (almost) no scenario showed the event) — a choice of this product.
 * "Observed" never applies to a forecast; no probability gives "Unknown".
 */
export function capCertainty(p: number | null): CapCertainty {
  if (p === null || !Number.isFinite(p)) return 'Unknown'
  if (p > 0.5) return 'Likely'
  if (p < 0.005) return 'Unlikely'
  return 'Possible'
}

/**
 * CAP urgency from the validity window as seen at `sent`: "Expected" (responsive action within
 * the next hour), "Future" (later), "Past" (the window has ended).
 */
export function capUrgency(sent: Date, start: Date | null, end: Date | null): 'Expected' | 'Future' | 'Past' | 'Unknown' {
  if (!start || !end) return 'Unknown'
  if (end.getTime() <= sent.getTime()) return 'Past'
  return start.getTime() - sent.getTime() <= 3600_000 ? 'Expected' : 'Future'
}

/** A CAP polygon (section 3.3.1): "lat,lon" pairs separated by spaces, closed, at least 4 pairs. */
export function capPolygon(ring: number[][]): string | null {
  const pairs = ring.map(([lon, lat]) => `${round(lat!, 5)},${round(lon!, 5)}`)
  if (pairs.length && pairs[0] !== pairs[pairs.length - 1]) pairs.push(pairs[0]!)
  return pairs.length >= 4 ? pairs.join(' ') : null
}

const round = (x: number, digits: number) => String(Number(x.toFixed(digits)))
const xml = (s: string) => escapeHtml(s).replace(/&#39;/g, '&apos;')
const el = (name: string, value: string, indent: string) => `${indent}<${name}>${xml(value)}</${name}>`

interface HazardGroup { key: string; label: string; hazard: Hazard | null; statements: BriefingStatement[] }

function hazardGroups(b: ExportBriefing): HazardGroup[] {
  const groups = new Map<string, HazardGroup>()
  for (const s of b.statements.filter((x) => x.included !== false)) {
    const h = s.threshold.hazard
    const key = h ?? `threshold:${s.threshold.label}`
    const label = h ? HAZARD_DEFINITIONS[h].label : s.threshold.label
    if (!groups.has(key)) groups.set(key, { key, label, hazard: h, statements: [] })
    groups.get(key)!.statements.push(s)
  }
  return [...groups.values()]
}

/** Probability statements ("anywhere", "area mean") carry a probability; "fraction" is a share. */
const probabilityOf = (s: BriefingStatement) => (s.kind === 'fraction' ? null : s.value)

const NOT_OFFICIAL = 'Statistical guidance from a forecasting office for the planning of the named stakeholders. It is not an official warning; official warnings for the area take precedence.'

/** The CAP 1.2 alert of a briefing version (Alert, Update for an amendment, Cancel once withdrawn). */
export function briefingCapXml(b: ExportBriefing): string {
  const off = b.utcOffsetMinutes
  const identifier = (id: number) => `tessera-briefing-${id}`
  const cancelled = b.status === 'withdrawn' && b.withdrawnAt
  const sent = cancelled ? b.withdrawnAt! : b.issuedAt
  const msgType = cancelled ? 'Cancel' : b.supersedes ? 'Update' : 'Alert'
  const references = cancelled
    ? `${b.sender},${identifier(b.id)},${capDateTime(b.issuedAt, off)}`
    : b.supersedes ? `${b.sender},${identifier(b.supersedes.id)},${capDateTime(b.supersedes.issuedAt, off)}` : null
  const note = `Tessera briefing ${b.seriesId}, version ${b.version}: ${b.title}. ${NOT_OFFICIAL}${cancelled ? ` Withdrawn: ${b.withdrawnReason ?? 'no reason given'}.` : ''}${b.isDemo ? ' Invented demo scenario: the places and the forecast do not exist.' : ''}`
  const i1 = '  '
  const i2 = '    '
  const i3 = '      '
  const infos = hazardGroups(b).map((g) => {
    const probabilities = g.statements.map(probabilityOf).filter((p): p is number => p !== null)
    const pMax = probabilities.length ? Math.max(...probabilities) : null
    const areaIds = [...new Set(g.statements.map((s) => s.areaId))]
    const areas = areaIds.map((id) => {
      const shape = b.areas.find((a) => a.id === id)
      const name = shape?.name ?? g.statements.find((s) => s.areaId === id)?.areaName ?? `Area ${id}`
      // CAP polygons have no holes: each outer ring of the MultiPolygon becomes one <polygon>.
      const polygons = (shape?.geometry.coordinates ?? []).map((poly) => capPolygon(poly[0] ?? [])).filter((p): p is string => p !== null)
      return [`${i2}<area>`, el('areaDesc', name, i3), ...polygons.map((p) => el('polygon', p, i3)), `${i2}</area>`].join('\n')
    })
    const description = g.statements.map((s) => `${s.areaName}: ${s.text}`).join('\n')
    const threshold = g.statements[0]!.threshold
    return [
      `${i1}<info>`,
      el('language', 'en', i2),
      el('category', 'Met', i2),
      el('event', `${g.label} (statistical guidance)`, i2),
      el('urgency', capUrgency(sent, b.windowStart, b.windowEnd), i2),
      // Tessera grades likelihood, not severity: no severity scale is claimed.
      el('severity', 'Unknown', i2),
      el('certainty', capCertainty(pMax), i2),
      el('audience', 'Stakeholders on the briefing\'s distribution lists', i2),
      ...(b.windowStart ? [el('onset', capDateTime(b.windowStart, off), i2)] : []),
      ...(b.windowEnd ? [el('expires', capDateTime(b.windowEnd, off), i2)] : []),
      el('senderName', 'Tessera forecasting office', i2),
      el('headline', (b.headline || b.title).slice(0, 160), i2),
      el('description', description, i2),
      el('instruction', 'Use with your own procedures. Follow official warnings where they exist.', i2),
      el('web', b.portalUrl, i2),
      ...(b.contact ? [el('contact', b.contact, i2)] : []),
      `${i2}<parameter>`, el('valueName', 'tesseraThreshold', i3), el('value', `${threshold.label}: ${threshold.direction === 'below' ? '≤' : '≥'} ${threshold.value}${g.hazard ? ` ${HAZARD_DEFINITIONS[g.hazard].displayUnits}` : ''}`, i3), `${i2}</parameter>`,
      ...(pMax !== null ? [`${i2}<parameter>`, el('valueName', 'tesseraMaximumProbability', i3), el('value', round(pMax, 3), i3), `${i2}</parameter>`] : []),
      ...(b.pdf ? [
        `${i2}<resource>`, el('resourceDesc', 'Briefing (PDF, the document of record)', i3), el('mimeType', 'application/pdf', i3),
        el('size', String(b.pdf.size), i3), el('uri', b.pdfUrl, i3),
        // CAP 1.2 <digest> is SHA-1 of the resource (section 3.2.3).
        el('digest', b.pdf.sha1, i3), `${i2}</resource>`,
      ] : []),
      ...areas,
      `${i1}</info>`,
    ].join('\n')
  })
  return [
    '<?xml version="1.0" encoding="UTF-8"?>',
    `<alert xmlns="${CAP_NAMESPACE}">`,
    el('identifier', cancelled ? `${identifier(b.id)}-withdrawal` : identifier(b.id), i1),
    el('sender', b.sender, i1),
    el('sent', capDateTime(sent, off), i1),
    el('status', b.isDemo ? 'Exercise' : 'Actual', i1),
    el('msgType', msgType, i1),
    el('source', 'Tessera', i1),
    el('scope', 'Restricted', i1),
    el('restriction', NOT_OFFICIAL, i1),
    el('note', note, i1),
    ...(references ? [el('references', references, i1)] : []),
    ...(cancelled ? [] : infos),
    '</alert>',
    '',
  ].join('\n')
}

/** RFC 7946 FeatureCollection: one Feature per area with its statements and highest probability. */
export function briefingGeoJson(b: ExportBriefing) {
  const printed = b.statements.filter((s) => s.included !== false)
  const features = b.areas.map((a) => {
    const mine = printed.filter((s) => s.areaId === a.id)
    const probabilities = mine.map(probabilityOf).filter((p): p is number => p !== null)
    return {
      type: 'Feature' as const,
      id: a.id,
      geometry: a.geometry,
      properties: {
        name: a.name,
        maxProbability: probabilities.length ? Math.max(...probabilities) : null,
        statements: mine.map((s) => ({
          hazard: s.threshold.hazard, threshold: s.threshold.label, value: s.threshold.value, direction: s.threshold.direction,
          kind: s.kind, probability: probabilityOf(s), expectedShare: s.kind === 'fraction' ? s.value : null,
          count: s.count, scenarios: s.scenarios, when: s.when, text: s.text,
        })),
      },
    }
  })
  return {
    type: 'FeatureCollection' as const,
    // Foreign members (RFC 7946 section 6.1): what the collection is.
    briefing: {
      id: b.id, series: b.seriesId, version: b.version, status: b.status, title: b.title, issuedAt: b.issuedAt.toISOString(),
      validFrom: b.windowStart?.toISOString() ?? null, validTo: b.windowEnd?.toISOString() ?? null, note: NOT_OFFICIAL,
    },
    features,
  }
}

const CSV_COLUMNS = ['briefing_id', 'series', 'version', 'status', 'issued_at_utc', 'area_id', 'area', 'hazard', 'threshold', 'threshold_value', 'direction',
  'kind', 'probability', 'expected_share', 'count', 'scenarios', 'members', 'when', 'text', 'edited'] as const

/** RFC 4180 field: quoted when needed; text that a spreadsheet would run as a formula is prefixed with '. */
function csvField(value: string | number | null, text = false): string {
  if (value === null) return ''
  let s = String(value)
  if (text && /^[=+\-@\t\r]/.test(s)) s = `'${s}`
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s
}

/** One row per printed statement, CRLF line ends (RFC 4180), header first. */
export function briefingStatementsCsv(b: ExportBriefing): string {
  const rows = b.statements.filter((s) => s.included !== false).map((s) => [
    csvField(b.id), csvField(b.seriesId), csvField(b.version), csvField(b.status), csvField(b.issuedAt.toISOString()),
    csvField(s.areaId), csvField(s.areaName, true), csvField(s.threshold.hazard ?? ''), csvField(s.threshold.label, true),
    csvField(s.threshold.value), csvField(s.threshold.direction), csvField(s.kind),
    csvField(probabilityOf(s)), csvField(s.kind === 'fraction' ? s.value : null), csvField(s.count), csvField(s.scenarios), csvField(s.members),
    csvField(s.when, true), csvField(s.text, true), csvField(s.edited ? 'yes' : 'no'),
  ].join(','))
  return [CSV_COLUMNS.join(','), ...rows].join('\r\n') + '\r\n'
}

export class ExportRefusal extends Error {
  constructor(message: string, readonly status: 404 | 409) { super(message) }
}

/** Everything the exports need, for a version that has been issued. */
export async function loadExportBriefing(id: number, baseUrl: string): Promise<ExportBriefing> {
  const db = useDB()
  const B = tables.briefings
  const [b] = await db.select().from(B).where(eq(B.id, id))
  if (!b) throw new ExportRefusal(`There is no briefing ${id}.`, 404)
  if (!b.issuedAt || (b.status !== 'issued' && b.status !== 'withdrawn' && b.status !== 'superseded')) {
    throw new ExportRefusal('Only issued briefings are exported: this version has not been issued.', 409)
  }
  const [index] = await db.select({ areaShapes: tables.briefingSearch.areaShapes }).from(tables.briefingSearch).where(eq(tables.briefingSearch.briefingId, id))
  let supersedes: ExportBriefing['supersedes'] = null
  if (b.supersedesId) {
    const [old] = await db.select({ id: B.id, issuedAt: B.issuedAt }).from(B).where(eq(B.id, b.supersedesId))
    if (old?.issuedAt) supersedes = { id: old.id, issuedAt: old.issuedAt }
  }
  return {
    id: b.id, seriesId: b.seriesId, version: b.version, status: b.status, title: b.title, headline: b.narrative.headline,
    summary: b.narrative.summary, contact: b.contact, issuedAt: b.issuedAt, windowStart: b.windowStart, windowEnd: b.windowEnd,
    withdrawnAt: b.withdrawnAt, withdrawnReason: b.withdrawnReason, supersedes, utcOffsetMinutes: b.utcOffsetMinutes,
    isDemo: b.method?.isDemo ?? false, statements: b.statements, areas: index?.areaShapes ?? [],
    pdf: b.pdf ? { size: b.pdf.length, sha1: createHash('sha1').update(b.pdf).digest('hex') } : null,
    portalUrl: `${baseUrl.replace(/\/$/, '')}/portal/${b.id}`,
    pdfUrl: `${baseUrl.replace(/\/$/, '')}/api/portal/briefings/${b.id}/pdf`,
    sender: `tessera@${mailSettings().fromDomain}`,
  }
}
