// The briefing PDF without a database: a synthetic briefing rendered by pdfmake, read back with
// poppler (pdftotext, pdffonts, pdftoppm — `npm test` installs poppler-utils).
import { describe, expect, it } from 'vitest'
import { execFileSync } from 'node:child_process'
import { mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { PNG } from 'pngjs'
import { briefingDocDefinition, extensionSentences, renderBriefingPdf, type BriefingPdfInput } from '../../../server/utils/briefingPdf'
import { LIKELIHOOD_SCALES, statementSentence } from '../../../shared/utils/likelihood'

function mapPng(width: number, height: number): Buffer {
  const png = new PNG({ width, height })
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) {
    const k = 4 * (y * width + x)
    // A plum-to-amber ramp, like a probability map.
    png.data.set([120 + Math.round((135 * x) / width), 40 + Math.round((150 * y) / height), 60, 255], k)
  }
  return PNG.sync.write(png)
}

const facts = { kind: 'anywhere' as const, value: 5 / 12, count: 5, scenarios: 12, members: 4, membersShowing: 3, event: 'gusts reach 25 m/s or more', areaName: 'Test Ridge', when: 'at 12 UTC 14 Nov 2031' }
const sentence = statementSentence(LIKELIHOOD_SCALES['five-band'], facts)

function input(stamp: BriefingPdfInput['stamp']): BriefingPdfInput {
  const statement = {
    key: '1|above|25|anywhere', areaId: 1, threshold: { hazard: 'gust' as const, label: 'Damaging gusts', value: 25, direction: 'above' as const },
    ...facts, samplesPerMember: 3, cells: 40, note: null, generatedText: sentence, text: sentence, edited: null, included: true,
  }
  return {
    briefing: {
      id: 41, seriesId: 41, version: 2, supersedesId: 40, status: 'approved', title: 'Gusts over Test Ridge', runId: 1,
      windowStart: new Date('2031-11-14T06:00:00Z'), windowEnd: new Date('2031-11-14T12:00:00Z'), likelihoodScale: 'five-band',
      selection: { leadFrom: 0, leadTo: 1, areaIds: [1], thresholds: [statement.threshold], kinds: ['anywhere'] },
      narrative: { headline: 'Damaging gusts possible on the ridge', summary: 'A summary.', details: 'The discussion.' },
      confidenceNote: 'Moderate.', nextUpdateAt: new Date('2031-11-14T18:00:00Z'), contact: 'Duty forecaster, +00 000',
      caveats: { libraryIds: [1, 2], free: ['Roads near the ridge are closed for works.'], snapshot: [
        { id: 1, title: 'Standing caution', text: 'These numbers are not a physical forecast.', standing: true },
        { id: 2, title: 'Near 0 %', text: 'No scenario does not mean impossible.', standing: false },
      ] },
      statements: [statement],
      figures: [{ leadIndex: 1, product: 'probability', threshold: 25, direction: 'above', radiusKm: 0, caption: 'The ridge.' }],
      recipients: [{ key: 'duty-team', name: 'Duty team' }],
      method: { runId: 1, runName: 'Test run', referenceTime: '2031-11-14T00:00:00.000Z', isDemo: false, members: 4, samplesPerMember: 3, scenarios: 12, factor: 8,
        coarseSpacingKm: 20.7, fineSpacingKm: 2.59, kernels: ['matern32', 'se'], lengthScaleKm: [36.8, 103.5], quantity: 'wind_speed_of_gust', units: 'm/s', leadTimes: [] },
      localTimeName: 'Test local time', utcOffsetMinutes: -120, authorId: 3, editorIds: [3],
      submittedAt: null, submittedById: null, approvedAt: null, approvedById: null, approvedPdfSha256: null, issuedAt: null, issuedById: null,
      withdrawnAt: null, withdrawnById: null, withdrawnReason: null, pdfSha256: null, pdfRenderedAt: null, pdfLockVersion: null, lockVersion: 4,
      createdAt: new Date(), updatedAt: new Date(),
    },
    authorName: 'Test Author',
    supersedes: { version: 1, issuedAt: new Date('2031-11-14T03:00:00Z') },
    figures: [{
      figure: { leadIndex: 1, product: 'probability', threshold: 25, direction: 'above', radiusKm: 0, caption: 'The ridge.' },
      rendered: {
        png: mapPng(300, 200), width: 300, height: 200, basemapNote: 'Grey lines: coastlines.',
        legend: { kind: 'probability', title: 'Probability that gusts reach 25 m/s or more, per 2.59 km cell', units: '%', classes: [
          { index: 0, label: 'no scenario', lower: 0, upper: 0, colour: '#ffffff', textColour: '#000000', hatched: true, noScenario: true },
          { index: 1, label: 'above 0 %, up to 50 %', lower: 0, upper: 0.5, colour: '#e8b04a', textColour: '#000000', hatched: false, noScenario: false },
          { index: 2, label: '50 %–100 %', lower: 0.5, upper: 1, colour: '#7a1f4d', textColour: '#ffffff', hatched: false, noScenario: false },
        ] },
      },
      problem: null,
    }],
    stamp,
  }
}

const at = new Date('2031-11-14T05:30:00Z')

describe('briefing PDF', () => {
  it('renders the same bytes for the same content and stamp', async () => {
    const a = await renderBriefingPdf(input({ kind: 'review', at }))
    const b = await renderBriefingPdf(input({ kind: 'review', at }))
    expect(a.bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-')
    expect(a.sha256).toBe(b.sha256)
    const other = await renderBriefingPdf(input({ kind: 'review', at: new Date(at.getTime() + 60_000) }))
    expect(other.sha256).not.toBe(a.sha256)
  })

  it('reads back with statements, numbers, times, caveats, method and footer; watermark until issued', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'tessera-pdf-unit-'))
    const text = async (stamp: BriefingPdfInput['stamp']) => {
      const file = join(dir, `${stamp.kind}.pdf`)
      writeFileSync(file, (await renderBriefingPdf(input(stamp))).bytes)
      if (process.env.TESSERA_TEST_RESULTS) writeFileSync(join(process.env.TESSERA_TEST_RESULTS, `briefing-unit-${stamp.kind}.pdf`), readFileSync(file))
      return { file, text: execFileSync('pdftotext', [file, '-']).toString('utf8').replace(/\s+/g, ' ').replace(/ %/g, '%') }
    }
    // The watermark's letters interleave with the page text in extraction, so check it in the definition.
    expect(briefingDocDefinition(input({ kind: 'review', at })).definition.watermark).toMatchObject({ text: 'FOR REVIEW – NOT ISSUED' })
    expect(briefingDocDefinition(input({ kind: 'preview', at })).definition.watermark).toMatchObject({ text: 'DRAFT PREVIEW – NOT ISSUED' })
    expect(briefingDocDefinition(input({ kind: 'issued', at, issuerName: 'x', approverName: null })).definition.watermark).toBeUndefined()
    const review = await text({ kind: 'review', at })
    expect(review.text).toContain('not issued (rendered 14 Nov 2031 05:30 UTC)')
    expect(review.text).toContain('Version 2 · Submitted for approval, not issued')
    const issued = await text({ kind: 'issued', at, issuerName: 'Issuing Lead', approverName: 'Approving Lead' })
    const t = issued.text
    expect(t).not.toContain('NOT ISSUED')
    expect(t).toContain('Gusts over Test Ridge')
    expect(t).toContain('14 Nov 2031 05:30 UTC (14 Nov 2031 03:30 Test local time, UTC−02:00)')
    expect(t).toContain('14 Nov 2031 06:00 UTC (14 Nov 2031 04:00 Test local time, UTC−02:00)')
    expect(t).toContain('Version 2 · Issued')
    expect(t).toContain('Supersedes version 1, issued 14 Nov 2031 03:00 UTC')
    expect(t).toContain('Approving Lead')
    expect(t).toContain('Issuing Lead')
    expect(t).toContain('42%')
    expect(t).toContain('5 of 12 scenarios, from 3 of 4 members')
    expect(t).toContain('somewhere in Test Ridge at 12 UTC 14 Nov 2031')
    expect(t).toContain('roughly even chance')
    expect(t).toContain('Standing caution These numbers are not a physical forecast.')
    expect(t).toContain('Roads near the ridge are closed for works.')
    expect(t).toContain('very unlikely 0–10%')
    expect(t).toContain('12 scenarios in all (4 members × 3 each)')
    expect(t).toContain('between 37 km and 104 km; model types: Matérn 3/2,')
    expect(t).toContain('Figure 1. Probability that gusts reach 25 m/s or more, per 2.59 km cell')
    expect(t).toContain('no scenario (hatched)')
    expect(t).toContain('Tessera briefing 41 · version 2 · issued')
    expect(t).toMatch(/Page 1 of \d/)

    const fonts = execFileSync('pdffonts', [issued.file]).toString('utf8')
    expect(fonts).toMatch(/AtkinsonHyperlegible-Regular\s+CID TrueType\s+Identity-H\s+yes/)
    expect(fonts).toMatch(/AtkinsonHyperlegible-Bold\s+CID TrueType\s+Identity-H\s+yes/)

    execFileSync('pdftoppm', ['-png', '-r', '60', issued.file, join(dir, 'page')])
    let coloured = 0
    for (const f of readdirSync(dir).filter((n) => n.startsWith('page') && n.endsWith('.png'))) {
      const png = PNG.sync.read(readFileSync(join(dir, f)))
      for (let k = 0; k < png.width * png.height; k++) {
        const r = png.data[4 * k]!, g = png.data[4 * k + 1]!, b = png.data[4 * k + 2]!
        const max = Math.max(r, g, b)
        if (max > 0 && (max - Math.min(r, g, b)) / max > 0.3) coloured++
      }
    }
    // The 300×200 map drawn into the page at 60 dpi covers thousands of strongly coloured pixels.
    expect(coloured).toBeGreaterThan(3000)
  })
})

describe('method text: engine extensions', () => {
  const base = {
    runId: 1, runName: 'r', referenceTime: null, isDemo: false, members: 4, samplesPerMember: 3, scenarios: 12, factor: 8,
    coarseSpacingKm: 20, fineSpacingKm: 2.5, kernels: ['matern32'], lengthScaleKm: [10, 12] as [number, number], quantity: 'precipitation_amount', units: 'mm',
    leadTimes: ['2031-11-14T06:00:00Z', '2031-11-14T12:00:00Z', '2031-11-14T18:00:00Z'],
  }
  it('says nothing for briefings written before the extensions existed', () => {
    expect(extensionSentences(base)).toEqual([])
  })
  it('names the censored transform, stretched fits and time-coherent noise with its fitted time scale', () => {
    const text = extensionSentences({ ...base, extensions: { transforms: ['censored'], anisotropicFits: 3, regimeFits: 0, fits: 16, timeScaleHours: 8.6 } }).join(' ')
    expect(text).toMatch(/no scenario has negative amounts/)
    expect(text).toMatch(/In 3 of 16 member fits the correlation was stretched/)
    expect(text).not.toMatch(/allowed to change across the domain/)
    // exp(−6/8.6) = 0.498 (6 h between lead times).
    expect(text).toMatch(/keeps a correlation of about 0\.50 from one lead time to the next \(6 h apart; decorrelation time about 8\.6 h/)
  })
  it('does not call a short decorrelation time coherent: exp(−6/1.3) ≈ 0.01 is practically redrawn', () => {
    const text = extensionSentences({ ...base, extensions: { transforms: ['none'], anisotropicFits: 0, regimeFits: 0, fits: 16, timeScaleHours: 1.3 } }).join(' ')
    expect(text).toMatch(/short next to the 6 h between lead times, so the detail is practically redrawn/)
    expect(text).not.toMatch(/hangs together/)
  })
  it('warns that window chances may run high when the detail was drawn separately at each lead time', () => {
    const text = extensionSentences({ ...base, extensions: { transforms: ['none'], anisotropicFits: 0, regimeFits: 2, fits: 16, timeScaleHours: null } }).join(' ')
    expect(text).toMatch(/drawn separately at each lead time/)
    expect(text).toMatch(/In 2 of 16 member fits the length scale was allowed to change/)
    expect(text).not.toMatch(/fitted to/)
  })
})
