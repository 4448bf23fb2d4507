/**
 * The briefing as an A4 PDF (pdfmake, Atkinson Hyperlegible embedded). Reading order follows the
 * document: title and facts (issue time, validity in UTC and local time, version and status,
 * issuer, contact), headline, key statements per area, the likelihood scale, map figures with
 * legends, narrative and confidence, caveats with the standing caution, method, then the footer
 * (briefing id, version, page numbers) on every page. Until issued, every page carries a watermark.
 *
 * Rendering is deterministic for the same content and stamp (fixed creation date), so the same
 * briefing renders to the same bytes and SHA-256.
 */
import { createHash } from 'node:crypto'
import { DEMO_NOTICE } from '../../shared/demo/region'
import {
  DEFAULT_LIKELIHOOD_SCALE, LIKELIHOOD_SCALES, STATEMENT_KIND_LABELS, bandRangeText, formatPercent, isLikelihoodScaleKey, scenarioCountText, statementWords,
} from '../../shared/utils/likelihood'
import { formatBriefingTimePair, formatBriefingUtc, utcOffsetText } from '../../shared/utils/briefingTimes'
import { BRIEFING_STATUS_LABELS } from '../../shared/utils/briefingStates'
import type { BriefingFigure, BriefingMethod, BriefingStatement } from '../../shared/schemas/briefings'
import { timeCoherenceSentence, typicalLeadSpacingHours } from '../../shared/utils/timeCoherenceText'
import type { tables } from './db'
import type { RenderedFigure } from './briefingFigures'
import { PDF_FONT_FAMILY, usePdfMake } from './pdfFonts'

type BriefingRow = Omit<typeof tables.briefings.$inferSelect, 'pdf'>
type Node = Record<string, unknown> | string | Node[]

/** Which rendering this is: a draft preview, the copy submitted for review (approval binds to it), or the issued copy. */
export type PdfStamp =
  | { kind: 'preview'; at: Date }
  | { kind: 'review'; at: Date }
  | { kind: 'issued'; at: Date; issuerName: string; approverName: string | null }

export interface BriefingPdfInput {
  briefing: BriefingRow
  authorName: string | null
  /** The version this one supersedes, when it is an amendment. */
  supersedes: { version: number; issuedAt: Date | null } | null
  figures: { figure: BriefingFigure; rendered: RenderedFigure | null; problem: string | null }[]
  stamp: PdfStamp
}

export interface RenderedPdf { bytes: Buffer; sha256: string }

const INK = '#182535'
const MIST = '#565f67'
const RULE = '#c3c9ce'
const TIDE = '#135f5a'

const KERNEL_NAMES: Record<string, string> = {
  // Plain fractions: the font has no Greek letters.
  se: 'squared-exponential', matern12: 'Matérn 1/2 (exponential)', matern32: 'Matérn 3/2', matern52: 'Matérn 5/2',
}

const km = (v: number) => `${v >= 10 ? Math.round(v) : Math.round(v * 10) / 10} km`

function watermarkFor(stamp: PdfStamp): string | null {
  if (stamp.kind === 'preview') return 'DRAFT PREVIEW – NOT ISSUED'
  if (stamp.kind === 'review') return 'FOR REVIEW – NOT ISSUED'
  return null
}

function statusLine(b: BriefingRow, stamp: PdfStamp): string {
  if (stamp.kind === 'issued') return `Version ${b.version} · Issued`
  if (stamp.kind === 'review') return `Version ${b.version} · Submitted for approval, not issued`
  return `Version ${b.version} · ${BRIEFING_STATUS_LABELS[b.status]} (preview), not issued`
}

function factsTable(input: BriefingPdfInput): Node {
  const b = input.briefing
  const local = { name: b.localTimeName, offsetMinutes: b.utcOffsetMinutes }
  const time = (d: Date | null) => (d ? formatBriefingTimePair(d, local) : 'not set')
  const rows: [string, string][] = [
    ['Issued', input.stamp.kind === 'issued' ? time(input.stamp.at) : `not issued (rendered ${formatBriefingUtc(input.stamp.at)})`],
    ['Valid from', time(b.windowStart)],
    ['Valid until', time(b.windowEnd)],
    ['Version and status', statusLine(b, input.stamp)],
    ...(input.supersedes ? [['Supersedes', `version ${input.supersedes.version}${input.supersedes.issuedAt ? `, issued ${formatBriefingUtc(input.supersedes.issuedAt)}` : ''}`] as [string, string]] : []),
    ['Prepared by', input.authorName ?? 'unknown'],
    ...(input.stamp.kind === 'issued'
      ? [['Approved by', input.stamp.approverName ?? 'unknown'], ['Issued by', input.stamp.issuerName]] as [string, string][]
      : []),
    ['Contact', b.contact || 'not set'],
    ['Next update', time(b.nextUpdateAt)],
    ['Local time used', `${b.localTimeName} (${utcOffsetText(b.utcOffsetMinutes)})`],
    ['Sent to', b.recipients.map((r) => r.name).join('; ') || 'not chosen'],
  ]
  return {
    table: { widths: [110, '*'], body: rows.map(([k, v]) => [{ text: k, bold: true }, v]) },
    layout: { hLineColor: RULE, vLineWidth: () => 0, hLineWidth: () => 0.5, paddingTop: () => 3, paddingBottom: () => 3 },
    margin: [0, 6, 0, 12],
  }
}

function statementRows(statements: BriefingStatement[], scaleKey: string): Node {
  const scale = LIKELIHOOD_SCALES[isLikelihoodScaleKey(scaleKey) ? scaleKey : DEFAULT_LIKELIHOOD_SCALE]
  const header = ['Statement', 'Likelihood', 'Number (computed from the run)'].map((t) => ({ text: t, bold: true, fillColor: '#eef0f1' }))
  const body = statements.map((s) => [
    {
      stack: [
        { text: `${STATEMENT_KIND_LABELS[s.kind]}: ${s.threshold.label}`, bold: true, fontSize: 9, color: MIST },
        { text: s.text },
        ...(s.edited ? [{ text: `Wording edited by ${s.edited.byName}, ${formatBriefingUtc(s.edited.at)}; the number beside it is the computed value.`, italics: true, fontSize: 8.5, color: MIST }] : []),
        ...(s.note ? [{ text: s.note, italics: true, fontSize: 8.5, color: MIST }] : []),
      ],
    },
    { text: statementWords(scale, s), bold: true },
    { stack: [{ text: formatPercent(s.value), bold: true, fontSize: 12 }, { text: scenarioCountText(s), fontSize: 9 }] },
  ])
  return {
    table: { headerRows: 1, keepWithHeaderRows: 1, dontBreakRows: true, widths: ['*', 80, 110], body: [header, ...body] },
    layout: { hLineColor: RULE, vLineColor: RULE, hLineWidth: () => 0.5, vLineWidth: () => 0.5, paddingTop: () => 4, paddingBottom: () => 4 },
    margin: [0, 2, 0, 10],
  }
}

function keyStatements(b: BriefingRow): Node[] {
  const included = b.statements.filter((s) => s.included)
  const byArea = new Map<number, BriefingStatement[]>()
  for (const s of included) byArea.set(s.areaId, [...(byArea.get(s.areaId) ?? []), s])
  const out: Node[] = [{ text: 'Key statements', style: 'h2' }]
  if (byArea.size === 0) out.push({ text: 'No key statements were chosen.', italics: true })
  // An area's heading stays with its table (short tables are kept on one page).
  for (const [, list] of byArea) out.push({ stack: [{ text: list[0]!.areaName, style: 'h3' }, statementRows(list, b.likelihoodScale)], unbreakable: list.length <= 4 })
  const scale = LIKELIHOOD_SCALES[isLikelihoodScaleKey(b.likelihoodScale) ? b.likelihoodScale : DEFAULT_LIKELIHOOD_SCALE]
  out.push({
    unbreakable: true,
    stack: [
      { text: `Likelihood scale used in this briefing: ${scale.name.toLowerCase()}`, style: 'h3' },
      {
        table: { headerRows: 1, widths: [150, 90], body: [[{ text: 'Words', bold: true }, { text: 'Probability', bold: true }], ...scale.bands.map((band) => [band.words, bandRangeText(band)])] },
        layout: { hLineColor: RULE, vLineColor: RULE, hLineWidth: () => 0.5, vLineWidth: () => 0.5 },
      },
      {
        text: 'A value on a boundary belongs to the higher band. "Share of the area" statements give the expected fraction of the area affected, which is not a probability, so they are described in words of extent (small patches, parts, much, most).',
        fontSize: 9, color: MIST, margin: [0, 4, 0, 10],
      },
    ],
  })
  return out
}

function legendTable(rendered: RenderedFigure): Node {
  const cells = rendered.legend.classes.map((c) => ({
    text: c.hatched ? `${c.label} (hatched)` : c.label,
    fillColor: c.hatched ? '#ffffff' : c.colour,
    color: c.hatched ? INK : c.textColour,
    fontSize: 8.5,
    alignment: 'center',
  }))
  const perRow = 6
  const rows: Node[][] = []
  for (let k = 0; k < cells.length; k += perRow) {
    const row: Node[] = cells.slice(k, k + perRow)
    while (row.length < perRow) row.push({ text: '' })
    rows.push(row)
  }
  return {
    table: { widths: Array(perRow).fill('*'), body: rows },
    layout: { hLineColor: INK, vLineColor: INK, hLineWidth: () => 0.5, vLineWidth: () => 0.5 },
    margin: [0, 4, 0, 2],
  }
}

function figureSection(input: BriefingPdfInput, images: Record<string, string>): Node[] {
  if (input.figures.length === 0) return []
  const out: Node[] = []
  input.figures.forEach(({ figure, rendered, problem }, k) => {
    const name = `figure${k}`
    // The section heading travels with the first figure, so it never stands alone at a page end.
    const block: Node[] = [
      ...(k === 0 ? [{ text: 'Maps', style: 'h2' }] : []),
      { text: `Figure ${k + 1}. ${rendered?.legend.title ?? figure.caption}`, bold: true, margin: [0, 6, 0, 4] },
    ]
    if (rendered) {
      images[name] = `data:image/png;base64,${rendered.png.toString('base64')}`
      block.push({ image: name, fit: [499, 330], alignment: 'center' })
      block.push(legendTable(rendered))
      if (rendered.legend.explanation) block.push({ text: rendered.legend.explanation, fontSize: 9, color: MIST })
      if (rendered.legend.windowNote) block.push({ text: rendered.legend.windowNote, fontSize: 9, color: MIST })
      block.push({ text: `Classes are labelled in percent; "no scenario" (hatched) means none of the scenarios showed it there. ${rendered.basemapNote}`, fontSize: 9, color: MIST })
      if (rendered.legend.missingNote) block.push({ text: rendered.legend.missingNote, fontSize: 9, color: MIST })
    } else {
      block.push({ text: `This map could not be drawn: ${problem ?? 'unknown reason'}.`, italics: true })
    }
    if (figure.caption) block.push({ text: figure.caption, margin: [0, 2, 0, 0] })
    out.push({ stack: block, unbreakable: true, margin: [0, 0, 0, 12] })
  })
  return out
}

function caveatSection(b: BriefingRow): Node[] {
  const standing = b.caveats.snapshot.filter((c) => c.standing)
  const others = b.caveats.snapshot.filter((c) => !c.standing)
  const out: Node[] = [{ text: 'Caveats', style: 'h2' }]
  for (const c of standing) {
    out.push({
      table: { widths: ['*'], body: [[{ stack: [{ text: c.title, bold: true }, c.text], margin: [6, 4, 6, 4] }]] },
      layout: { hLineColor: TIDE, vLineColor: TIDE, hLineWidth: () => 1.5, vLineWidth: () => 1.5 },
      margin: [0, 2, 0, 8],
    })
  }
  const items: Node[] = [
    ...others.map((c) => ({ text: [{ text: `${c.title}. `, bold: true }, c.text] })),
    ...b.caveats.free.map((text) => ({ text })),
  ]
  if (items.length) out.push({ ul: items, margin: [0, 0, 0, 10] })
  return out
}

function methodText(m: BriefingMethod | null): string {
  if (!m) return 'The forecast run behind this briefing is no longer stored; the numbers above were computed when the briefing was written.'
  const kernels = m.kernels.map((k) => KERNEL_NAMES[k] ?? k).join(', ')
  const lengths = m.lengthScaleKm ? (Math.abs(m.lengthScaleKm[1] - m.lengthScaleKm[0]) < 0.05 ? `about ${km(m.lengthScaleKm[0])}` : `between ${km(m.lengthScaleKm[0])} and ${km(m.lengthScaleKm[1])}`) : 'not recorded'
  const reference = m.referenceTime ? `, reference time ${formatBriefingUtc(m.referenceTime)}` : ''
  return [
    `The numbers come from the ensemble forecast “${m.runName}”${reference}: ${m.members} members on a grid of about ${km(m.coarseSpacingKm)}.`,
    `For each member, Tessera fitted how strongly values at nearby places go together (a spatial correlation model; fitted length scales ${lengths}${kernels ? `; model types: ${kernels}` : ''})`,
    `and drew ${m.samplesPerMember ?? 'several'} fine-scale versions of the member at about ${km(m.fineSpacingKm)} spacing, each averaging exactly to the member's coarse values.`,
    `That gives ${m.scenarios} scenarios in all (${m.members} members × ${m.samplesPerMember ?? '?'} each).`,
    'A probability here is the share of those scenarios in which the event happens. "Anywhere" counts a scenario when the threshold is reached at one or more grid cells of the area; "area average" when the average over the area reaches it;',
    '"share of the area" is the expected fraction of the area where it is reached. Thresholds include the value itself. Over a time window, a scenario counts when the event happens at one or more of the window\'s times.',
    ...extensionSentences(m),
    `Differences smaller than 1 in ${m.scenarios} carry no meaning.`,
  ].join(' ')
}

const TRANSFORM_WORDS: Record<string, string> = {
  boxcox: 'a power (Box–Cox) transform of the values, its exponent fitted per member',
  log: 'the logarithm of the values',
  censored: 'a hidden Gaussian field that is dry wherever it is below zero (a censored model), so no scenario has negative amounts',
}

/** What the engine's extensions did to the numbers, in plain words (nothing for briefings written before they existed). */
export function extensionSentences(m: BriefingMethod): string[] {
  const x = m.extensions
  if (!x) return []
  const out: string[] = []
  const transforms = x.transforms.filter((t) => t !== 'none').map((t) => TRANSFORM_WORDS[t] ?? t)
  if (transforms.length) out.push(`The correlation model was fitted to ${transforms.join('; or to ')}, and each scenario was turned back into ${m.units} with its coarse averages kept.`)
  if (x.anisotropicFits) out.push(`In ${x.anisotropicFits} of ${x.fits} member fits the correlation was stretched along one direction (a fitted ellipse, not a circle).`)
  if (x.regimeFits) out.push(`In ${x.regimeFits} of ${x.fits} member fits the length scale was allowed to change across the domain (fitted on overlapping windows and blended).`)
  out.push(timeCoherenceSentence(x.timeScaleHours, typicalLeadSpacingHours(m.leadTimes)))
  return out
}

/** The pdfmake document definition (exported for tests that inspect structure). */
export function briefingDocDefinition(input: BriefingPdfInput): { definition: Record<string, unknown> } {
  const b = input.briefing
  const images: Record<string, string> = {}
  const watermark = watermarkFor(input.stamp)
  const idText = `Tessera briefing ${b.seriesId} · version ${b.version}`
  const content: Node[] = [
    { text: b.title || 'Untitled briefing', style: 'h1' },
    ...(b.method?.isDemo ? [{ text: DEMO_NOTICE, italics: true, color: MIST, margin: [0, 0, 0, 4] }] : []),
    factsTable(input),
    ...(b.narrative.headline ? [{ text: b.narrative.headline, style: 'headline' }] : []),
    ...(b.narrative.summary ? [{ text: b.narrative.summary, margin: [0, 0, 0, 10] }] : []),
    ...keyStatements(b),
    ...figureSection(input, images),
    ...(b.narrative.details || b.confidenceNote ? [{ text: 'Forecaster\'s discussion', style: 'h2' }] : []),
    ...(b.narrative.details ? [{ text: b.narrative.details, margin: [0, 0, 0, 8] }] : []),
    ...(b.confidenceNote ? [{ text: [{ text: 'Confidence. ', bold: true }, b.confidenceNote], margin: [0, 0, 0, 10] }] : []),
    ...caveatSection(b),
    { text: 'How these numbers were made', style: 'h2' },
    { text: methodText(b.method), fontSize: 10 },
  ]
  const definition = {
    pageSize: 'A4',
    pageMargins: [48, 48, 48, 56],
    version: '1.7',
    tagged: true,
    displayTitle: true,
    language: 'en',
    info: {
      title: b.title || 'Untitled briefing', author: input.authorName ?? 'Tessera', subject: idText, creator: 'Tessera', producer: 'Tessera',
      creationDate: input.stamp.at, modDate: input.stamp.at,
    },
    ...(watermark ? { watermark: { text: watermark, color: '#9fb1c5', opacity: 0.22, bold: true, fontSize: 40 } } : {}),
    footer: (page: number, pages: number) => ({
      columns: [
        { text: `${idText} · ${input.stamp.kind === 'issued' ? 'issued' : 'not issued'}`, alignment: 'left' },
        { text: `Page ${page} of ${pages}`, alignment: 'right' },
      ],
      margin: [48, 20, 48, 0], fontSize: 8.5, color: MIST,
    }),
    content,
    images,
    styles: {
      h1: { fontSize: 20, bold: true, color: INK, margin: [0, 0, 0, 2] },
      h2: { fontSize: 14, bold: true, color: INK, margin: [0, 10, 0, 4] },
      h3: { fontSize: 11.5, bold: true, color: INK, margin: [0, 6, 0, 3] },
      headline: { fontSize: 13, bold: true, color: TIDE, margin: [0, 2, 0, 6] },
    },
    defaultStyle: { font: PDF_FONT_FAMILY, fontSize: 10.5, lineHeight: 1.2, color: INK },
  }
  return { definition }
}

/** Renders the briefing; returns the bytes and their SHA-256 (hex). */
export async function renderBriefingPdf(input: BriefingPdfInput): Promise<RenderedPdf> {
  const pdfmake = await usePdfMake()
  const { definition } = briefingDocDefinition(input)
  const bytes = await pdfmake.createPdf(definition).getBuffer()
  return { bytes, sha256: createHash('sha256').update(bytes).digest('hex') }
}
