// Checks a CAP message against the rules of OASIS "Common Alerting Protocol Version 1.2"
// (OASIS Standard, 1 July 2010). Section numbers refer to that document; the value lists and
// element orders below are copied from its data dictionary (3.2) and XML schema (3.4), written
// down from the specification as remembered — where a rule is from memory it says so.
import { childrenNamed, childText, type XmlNode } from './xmlTree'

export const CAP_NS = 'urn:oasis:names:tc:emergency:cap:1.2'

// 3.2.1 alert: element sequence of the schema.
const ALERT_ORDER = ['identifier', 'sender', 'sent', 'status', 'msgType', 'source', 'scope', 'restriction', 'addresses', 'code', 'note', 'references', 'incidents', 'info']
const ALERT_REQUIRED = ['identifier', 'sender', 'sent', 'status', 'msgType', 'scope']
// 3.2.2 info: element sequence of the schema.
const INFO_ORDER = ['language', 'category', 'event', 'responseType', 'urgency', 'severity', 'certainty', 'audience', 'eventCode', 'effective', 'onset', 'expires',
  'senderName', 'headline', 'description', 'instruction', 'web', 'contact', 'parameter', 'resource', 'area']
const INFO_REQUIRED = ['category', 'event', 'urgency', 'severity', 'certainty']

// Value lists of 3.2.1 and 3.2.2.
export const CAP_VALUES = {
  status: ['Actual', 'Exercise', 'System', 'Test', 'Draft'],
  msgType: ['Alert', 'Update', 'Cancel', 'Ack', 'Error'],
  scope: ['Public', 'Restricted', 'Private'],
  category: ['Geo', 'Met', 'Safety', 'Security', 'Rescue', 'Fire', 'Health', 'Env', 'Transport', 'Infra', 'CBRNE', 'Other'],
  responseType: ['Shelter', 'Evacuate', 'Prepare', 'Execute', 'Avoid', 'Monitor', 'Assess', 'AllClear', 'None'],
  urgency: ['Immediate', 'Expected', 'Future', 'Past', 'Unknown'],
  severity: ['Extreme', 'Severe', 'Moderate', 'Minor', 'Unknown'],
  certainty: ['Observed', 'Likely', 'Possible', 'Unlikely', 'Unknown'],
} as const

// 3.3.2 dateTime: "2002-05-24T16:49:00-07:00"; the "Z" designator MUST NOT be used (UTC is "-00:00").
export const CAP_DATETIME = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}[-+]\d{2}:\d{2}$/

function checkOrder(node: XmlNode, order: string[], where: string, problems: string[]) {
  let last = -1
  for (const c of node.children) {
    const i = order.indexOf(c.name)
    if (i < 0) { problems.push(`${where}: unexpected element <${c.name}>`); continue }
    if (i < last) problems.push(`${where}: <${c.name}> is out of the schema's order`)
    last = Math.max(last, i)
    if (c.uri !== CAP_NS) problems.push(`${where}: <${c.name}> is not in the CAP 1.2 namespace`)
  }
}

function inList(node: XmlNode, name: keyof typeof CAP_VALUES, where: string, problems: string[]) {
  for (const c of childrenNamed(node, name)) {
    if (!(CAP_VALUES[name] as readonly string[]).includes(c.text)) problems.push(`${where}: <${name}> "${c.text}" is not one of ${CAP_VALUES[name].join(', ')}`)
  }
}

/** Every rule broken, as sentences (empty when the message follows them). */
export function capProblems(alert: XmlNode): string[] {
  const p: string[] = []
  if (alert.name !== 'alert' || alert.uri !== CAP_NS) p.push(`root must be <alert> in ${CAP_NS}`)
  checkOrder(alert, ALERT_ORDER, 'alert', p)
  for (const r of ALERT_REQUIRED) if (childrenNamed(alert, r).length !== 1) p.push(`alert: exactly one <${r}> is required`)
  // 3.2.1 identifier / sender: no spaces, commas or restricted characters (< and &).
  for (const r of ['identifier', 'sender']) {
    const v = childText(alert, r) ?? ''
    if (!v || /[\s,<&]/.test(v)) p.push(`alert: <${r}> "${v}" must be non-empty without spaces, commas, < or &`)
  }
  const sent = childText(alert, 'sent') ?? ''
  if (!CAP_DATETIME.test(sent)) p.push(`alert: <sent> "${sent}" is not a CAP dateTime with an explicit offset`)
  for (const k of ['status', 'msgType', 'scope'] as const) inList(alert, k, 'alert', p)
  // 3.2.1 restriction is used when scope is Restricted; addresses are required when it is Private.
  if (childText(alert, 'scope') === 'Restricted' && !childText(alert, 'restriction')) p.push('alert: scope Restricted needs <restriction>')
  if (childText(alert, 'scope') === 'Private' && !childText(alert, 'addresses')) p.push('alert: scope Private needs <addresses>')
  // 3.2.1 references: whitespace-separated "sender,identifier,sent" triples (expected on Update and Cancel — from memory, a SHOULD).
  const refs = childText(alert, 'references')
  if (['Update', 'Cancel'].includes(childText(alert, 'msgType') ?? '') && !refs) p.push('alert: an Update or Cancel should carry <references>')
  if (refs) {
    for (const t of refs.trim().split(/\s+/)) {
      const parts = t.split(',')
      if (parts.length !== 3 || !CAP_DATETIME.test(parts[2]!)) p.push(`alert: reference "${t}" is not sender,identifier,sent`)
    }
  }
  childrenNamed(alert, 'info').forEach((info, k) => {
    const where = `info ${k + 1}`
    checkOrder(info, INFO_ORDER, where, p)
    for (const r of INFO_REQUIRED) if (childrenNamed(info, r).length < 1) p.push(`${where}: <${r}> is required`)
    for (const r of ['event', 'urgency', 'severity', 'certainty']) if (childrenNamed(info, r).length > 1) p.push(`${where}: only one <${r}>`)
    for (const k2 of ['category', 'responseType', 'urgency', 'severity', 'certainty'] as const) inList(info, k2, where, p)
    for (const t of ['effective', 'onset', 'expires']) {
      const v = childText(info, t)
      if (v !== null && !CAP_DATETIME.test(v)) p.push(`${where}: <${t}> "${v}" is not a CAP dateTime`)
    }
    for (const par of childrenNamed(info, 'parameter')) {
      if (!childText(par, 'valueName') || childText(par, 'value') === null) p.push(`${where}: <parameter> needs <valueName> and <value>`)
    }
    // 3.2.3 resource: resourceDesc and mimeType required; digest is the SHA-1 of the resource.
    for (const res of childrenNamed(info, 'resource')) {
      if (!childText(res, 'resourceDesc') || !childText(res, 'mimeType')) p.push(`${where}: <resource> needs <resourceDesc> and <mimeType>`)
      const d = childText(res, 'digest')
      if (d !== null && !/^[0-9a-f]{40}$/i.test(d)) p.push(`${where}: <digest> must be a SHA-1 (40 hex digits)`)
      const size = childText(res, 'size')
      if (size !== null && !/^\d+$/.test(size)) p.push(`${where}: <size> must be an integer number of bytes`)
    }
    // 3.2.4 area: areaDesc required; 3.3.1 polygon: >= 4 "lat,lon" WGS 84 pairs, first and last the same.
    for (const area of childrenNamed(info, 'area')) {
      if (!childText(area, 'areaDesc')) p.push(`${where}: <area> needs <areaDesc>`)
      for (const poly of childrenNamed(area, 'polygon')) {
        const pairs = poly.text.trim().split(/\s+/)
        if (pairs.length < 4) p.push(`${where}: a polygon needs at least 4 pairs`)
        if (pairs[0] !== pairs[pairs.length - 1]) p.push(`${where}: a polygon's first and last pairs must be equal`)
        for (const pair of pairs) {
          const m = /^(-?\d+(?:\.\d+)?),(-?\d+(?:\.\d+)?)$/.exec(pair)
          if (!m || Math.abs(Number(m[1])) > 90 || Math.abs(Number(m[2])) > 180) p.push(`${where}: "${pair}" is not a lat,lon pair`)
        }
      }
    }
  })
  return p
}
