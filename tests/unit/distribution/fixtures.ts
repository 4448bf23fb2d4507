// An invented issued briefing for the export and mail tests (the demo's fictional Serevan Coast).
import type { BriefingStatement } from '../../../shared/schemas/briefings'
import type { ExportBriefing } from '../../../server/utils/briefingExports'

export function statement(over: Partial<BriefingStatement> & Pick<BriefingStatement, 'areaId' | 'areaName' | 'value'>): BriefingStatement {
  const scenarios = 18
  return {
    key: `${over.areaId}:${over.kind ?? 'anywhere'}:${over.threshold?.value ?? 20}`,
    threshold: { hazard: 'gust', label: 'Strong gusts', value: 20, direction: 'above' },
    kind: 'anywhere',
    count: Math.round(over.value * scenarios),
    scenarios, members: 6, samplesPerMember: 3, membersShowing: 3,
    event: 'gusts reach 20 m/s or more', when: 'between 12 and 18 UTC 14 Nov 2031',
    cells: 120, note: null, generatedText: 'generated', text: `about ${Math.round(over.value * 100)} % that gusts reach 20 m/s in ${over.areaName}`,
    edited: null, included: true,
    ...over,
  }
}

/** Kaldor Pass: a square with a hole; Coast road: two separate parts. Exterior rings counter-clockwise. */
export const AREAS: ExportBriefing['areas'] = [
  {
    id: 11, name: 'Kaldor Pass',
    geometry: { type: 'MultiPolygon', coordinates: [[
      [[-24, -45], [-23, -45], [-23, -44], [-24, -44], [-24, -45]],
      [[-23.6, -44.6], [-23.6, -44.4], [-23.4, -44.4], [-23.4, -44.6], [-23.6, -44.6]],
    ]] },
  },
  {
    id: 12, name: 'Coast road',
    geometry: { type: 'MultiPolygon', coordinates: [
      [[[-22.5, -45.2], [-21.9, -45.2], [-21.9, -44.9], [-22.5, -44.9], [-22.5, -45.2]]],
      [[[-21.8, -44.8], [-21.5, -44.8], [-21.5, -44.5], [-21.8, -44.5], [-21.8, -44.8]]],
    ] },
  },
]

export function exportBriefing(over: Partial<ExportBriefing> = {}): ExportBriefing {
  return {
    id: 42, seriesId: 7, version: 1, status: 'issued', title: 'Gusts on the Kaldor Pass & coast road',
    headline: 'Strong gusts likely on the pass this afternoon', summary: 'Gusts of 20 m/s are likely on the pass.',
    contact: 'Duty lead, +00 555 0100', issuedAt: new Date('2031-11-14T09:30:00Z'),
    windowStart: new Date('2031-11-14T12:00:00Z'), windowEnd: new Date('2031-11-14T18:00:00Z'),
    withdrawnAt: null, withdrawnReason: null, supersedes: null, utcOffsetMinutes: -120, isDemo: true,
    statements: [
      statement({ areaId: 11, areaName: 'Kaldor Pass', value: 0.72 }),
      statement({ areaId: 12, areaName: 'Coast road', value: 0.28 }),
      statement({ areaId: 12, areaName: 'Coast road', value: 0.11, kind: 'fraction', count: null, text: 'about 11 % of the road, "on average", sees 20 m/s' }),
      statement({ areaId: 11, areaName: 'Kaldor Pass', value: 0, threshold: { hazard: 'low_temperature', label: 'Frost', value: 0, direction: 'below' }, text: '=no scenario shows frost, near 0 %' }),
      statement({ areaId: 12, areaName: 'Coast road', value: 0.5, included: false, text: 'left out of the briefing' }),
    ],
    areas: AREAS,
    pdf: { size: 123456, sha1: 'a'.repeat(40) },
    portalUrl: 'http://localhost:3000/portal/42',
    pdfUrl: 'http://localhost:3000/api/portal/briefings/42/pdf',
    sender: 'tessera@tessera.example',
    ...over,
  }
}
