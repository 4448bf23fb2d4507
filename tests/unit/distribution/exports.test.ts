import { describe, expect, it } from 'vitest'
import { booleanClockwise } from '@turf/turf'
import { briefingCapXml, briefingGeoJson, briefingStatementsCsv, capCertainty, capDateTime, capPolygon, capUrgency, CAP_NAMESPACE } from '../../../server/utils/briefingExports'
import { capProblems, CAP_NS } from './capRules'
import { childrenNamed, childText, parseXml } from './xmlTree'
import { AREAS, exportBriefing } from './fixtures'

describe('CAP 1.2 export', () => {
  const cap = (over = {}) => parseXml(briefingCapXml(exportBriefing(over)))

  it('follows the CAP 1.2 rules for an alert, an update and a cancellation', () => {
    expect(CAP_NAMESPACE).toBe(CAP_NS)
    expect(capProblems(cap())).toEqual([])
    expect(capProblems(cap({ isDemo: false, version: 2, supersedes: { id: 41, issuedAt: new Date('2031-11-14T06:00:00Z') } }))).toEqual([])
    expect(capProblems(cap({ status: 'withdrawn', withdrawnAt: new Date('2031-11-14T10:15:00Z'), withdrawnReason: 'Wrong day & place' }))).toEqual([])
    expect(capProblems(cap({ utcOffsetMinutes: 0 }))).toEqual([])
  })

  it('the rule check itself catches broken messages', () => {
    const xml = briefingCapXml(exportBriefing())
    expect(capProblems(parseXml(xml.replace('2031-11-14T07:30:00-02:00', '2031-11-14T09:30:00Z')))).toContainEqual(expect.stringMatching(/<sent>/))
    expect(capProblems(parseXml(xml.replace('<certainty>Likely', '<certainty>Probable')))).toContainEqual(expect.stringMatching(/certainty/))
    expect(capProblems(parseXml(xml.replace(/<restriction>[^<]*<\/restriction>/, '')))).toContainEqual(expect.stringMatching(/restriction/))
    expect(capProblems(parseXml(xml.replace(CAP_NS, 'urn:oasis:names:tc:emergency:cap:1.1')))).not.toEqual([])
    expect(() => parseXml(xml.replace('</alert>', ''))).toThrow()
  })

  it('is Restricted, marked as not an official warning, and Exercise for the invented demo', () => {
    const a = cap()
    expect(childText(a, 'scope')).toBe('Restricted')
    expect(childText(a, 'restriction')).toMatch(/not an official warning/)
    expect(childText(a, 'note')).toMatch(/not an official warning/)
    expect(childText(a, 'status')).toBe('Exercise')
    expect(childText(cap({ isDemo: false }), 'status')).toBe('Actual')
    expect(childText(a, 'msgType')).toBe('Alert')
  })

  it('has one info per hazard with certainty from the highest probability', () => {
    const infos = childrenNamed(cap(), 'info')
    expect(infos.map((i) => childText(i, 'event'))).toEqual(['Gusts (statistical guidance)', 'Low temperature (statistical guidance)'])
    // Gusts: 0.72 on the pass (the 0.11 "fraction" is a share of the area, not a probability; 0.5 is left out).
    expect(childText(infos[0]!, 'certainty')).toBe('Likely')
    expect(childrenNamed(infos[0]!, 'parameter').map((p) => childText(p, 'value'))).toContain('0.72')
    expect(childText(infos[1]!, 'certainty')).toBe('Unlikely')
    expect(childText(infos[0]!, 'description')).not.toMatch(/left out/)
    expect(childText(infos[0]!, 'severity')).toBe('Unknown')
  })

  it('maps probabilities to CAP certainty as the standard defines it', () => {
    // CAP 1.2, 3.2.2 certainty: Likely p > ~50 %, Possible p <= ~50 %, Unlikely p ~ 0.
    expect(capCertainty(0.51)).toBe('Likely')
    expect(capCertainty(0.5)).toBe('Possible')
    expect(capCertainty(0.06)).toBe('Possible')
    expect(capCertainty(0.004)).toBe('Unlikely')
    expect(capCertainty(0)).toBe('Unlikely')
    expect(capCertainty(null)).toBe('Unknown')
  })

  it('writes polygons as lat,lon pairs, outer rings only, one per part', () => {
    const info = childrenNamed(cap(), 'info')[0]!
    const areas = childrenNamed(info, 'area')
    expect(areas.map((a) => childText(a, 'areaDesc'))).toEqual(['Kaldor Pass', 'Coast road'])
    const pass = childrenNamed(areas[0]!, 'polygon').map((p) => p.text)
    expect(pass).toHaveLength(1) // the hole cannot be expressed in CAP
    const ring = AREAS[0]!.geometry.coordinates[0]![0]!
    expect(pass[0]!.split(' ')).toEqual(ring.map(([lon, lat]) => `${lat},${lon}`))
    expect(childrenNamed(areas[1]!, 'polygon')).toHaveLength(2)
    expect(capPolygon([[0, 0], [1, 0], [1, 1]])).toBe('0,0 0,1 1,1 0,0')
    expect(capPolygon([[0, 0], [1, 0]])).toBeNull()
  })

  it('gives every time with an explicit offset, UTC as -00:00', () => {
    const a = cap()
    expect(childText(a, 'sent')).toBe('2031-11-14T07:30:00-02:00')
    const info = childrenNamed(a, 'info')[0]!
    expect(childText(info, 'onset')).toBe('2031-11-14T10:00:00-02:00')
    expect(childText(info, 'expires')).toBe('2031-11-14T16:00:00-02:00')
    expect(capDateTime(new Date('2031-11-14T09:30:00.400Z'), 0)).toBe('2031-11-14T09:30:00-00:00')
    expect(capDateTime(new Date('2031-11-14T23:30:00Z'), 330)).toBe('2031-11-15T05:00:00+05:30')
  })

  it('references the replaced version on update and the alert itself on cancel', () => {
    const upd = cap({ version: 2, supersedes: { id: 41, issuedAt: new Date('2031-11-14T06:00:00Z') } })
    expect(childText(upd, 'msgType')).toBe('Update')
    expect(childText(upd, 'references')).toBe('tessera@tessera.example,tessera-briefing-41,2031-11-14T04:00:00-02:00')
    const cancel = cap({ status: 'withdrawn', withdrawnAt: new Date('2031-11-14T10:15:00Z'), withdrawnReason: 'Wrong day & place' })
    expect(childText(cancel, 'msgType')).toBe('Cancel')
    expect(childText(cancel, 'identifier')).toBe('tessera-briefing-42-withdrawal')
    expect(childText(cancel, 'references')).toBe('tessera@tessera.example,tessera-briefing-42,2031-11-14T07:30:00-02:00')
    expect(childText(cancel, 'note')).toMatch(/Withdrawn: Wrong day & place/)
  })

  it('takes urgency from the validity window', () => {
    const sent = new Date('2031-11-14T09:30:00Z')
    expect(capUrgency(sent, new Date('2031-11-14T10:00:00Z'), new Date('2031-11-14T12:00:00Z'))).toBe('Expected')
    expect(capUrgency(sent, new Date('2031-11-14T12:00:00Z'), new Date('2031-11-14T18:00:00Z'))).toBe('Future')
    expect(capUrgency(sent, new Date('2031-11-14T03:00:00Z'), new Date('2031-11-14T09:00:00Z'))).toBe('Past')
  })
})

describe('GeoJSON export (RFC 7946)', () => {
  const fc = briefingGeoJson(exportBriefing())

  it('is a FeatureCollection of WGS 84 lon-lat polygons without a crs member', () => {
    expect(fc.type).toBe('FeatureCollection')
    expect('crs' in fc).toBe(false) // RFC 7946 section 4 removed crs
    for (const f of fc.features) {
      expect(f.type).toBe('Feature')
      expect(f.geometry.type).toBe('MultiPolygon')
      for (const poly of f.geometry.coordinates) {
        poly.forEach((ring, k) => {
          expect(ring.length).toBeGreaterThanOrEqual(4) // section 3.1.6: linear rings
          expect(ring[0]).toEqual(ring[ring.length - 1])
          for (const [lon, lat] of ring) { expect(Math.abs(lon!)).toBeLessThanOrEqual(180); expect(Math.abs(lat!)).toBeLessThanOrEqual(90) }
          // Section 3.1.6 right-hand rule: exterior counter-clockwise, holes clockwise (checked with turf).
          expect(booleanClockwise(ring as [number, number][])).toBe(k > 0)
        })
      }
    }
  })

  it('carries each area\'s statements and its highest probability', () => {
    const byName = Object.fromEntries(fc.features.map((f) => [f.properties.name, f.properties]))
    expect(byName['Kaldor Pass']!.maxProbability).toBe(0.72)
    expect(byName['Coast road']!.maxProbability).toBe(0.28)
    expect(byName['Coast road']!.statements.map((s) => s.kind)).toEqual(['anywhere', 'fraction'])
    expect(byName['Coast road']!.statements[1]!.expectedShare).toBe(0.11)
    expect(JSON.parse(JSON.stringify(fc)).briefing.version).toBe(1)
  })
})

/** A strict RFC 4180 reader (quoted fields, doubled quotes, CRLF records). */
function readCsv(text: string): string[][] {
  const rows: string[][] = []
  let row: string[] = []
  let field = ''
  let quoted = false
  for (let i = 0; i < text.length; i++) {
    const c = text[i]!
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') { field += '"'; i++ } else if (c === '"') quoted = false
      else field += c
    } else if (c === '"') quoted = true
    else if (c === ',') { row.push(field); field = '' }
    else if (c === '\r' && text[i + 1] === '\n') { row.push(field); rows.push(row); row = []; field = ''; i++ }
    else if (c === '\n') throw new Error('bare LF outside quotes')
    else field += c
  }
  if (field || row.length) throw new Error('last record without CRLF')
  return rows
}

describe('CSV export of the statements', () => {
  const rows = readCsv(briefingStatementsCsv(exportBriefing()))

  it('has a header and one CRLF record per printed statement, all the same width', () => {
    expect(rows[0]).toContain('probability')
    expect(rows).toHaveLength(1 + 4)
    expect(new Set(rows.map((r) => r.length)).size).toBe(1)
  })

  it('keeps quotes and commas in the text and defuses formula-like cells', () => {
    const h = rows[0]!
    const text = (r: string[]) => r[h.indexOf('text')]
    expect(rows.map(text)).toContain('about 11 % of the road, "on average", sees 20 m/s')
    expect(rows.map(text)).toContain("'=no scenario shows frost, near 0 %")
    const fraction = rows.find((r) => r[h.indexOf('kind')] === 'fraction')!
    expect(fraction[h.indexOf('probability')]).toBe('')
    expect(fraction[h.indexOf('expected_share')]).toBe('0.11')
    expect(rows.find((r) => r[h.indexOf('threshold')] === 'Frost')![h.indexOf('threshold_value')]).toBe('0')
  })
})
