/** Renders a stored briefing to PDF: gathers names, the superseded version and the map figures. */
import type { MultiPolygon } from 'geojson'
import { eq } from 'drizzle-orm'
import { useDB, tables } from './db'
import { getArea } from './areas'
import { runForProducts, type RunRow } from './runSamples'
import { renderBriefingFigure, type FigureArea } from './briefingFigures'
import { renderBriefingPdf, type BriefingPdfInput, type PdfStamp, type RenderedPdf } from './briefingPdf'
import { displayNamesOf, type BriefingRecord } from './briefingRecords'

async function figuresOf(row: BriefingRecord): Promise<BriefingPdfInput['figures']> {
  if (row.figures.length === 0) return []
  let run: RunRow | null = null
  let runProblem: string | null = null
  if (row.runId == null) runProblem = 'the forecast run is no longer stored'
  else {
    try { run = await runForProducts(row.runId) } catch (err) { runProblem = (err as Error).message }
  }
  const areas: FigureArea[] = []
  for (const id of row.selection.areaIds) {
    try { const a = await getArea(id); areas.push({ name: a.name, geometry: a.geometry as MultiPolygon }) } catch { /* a deleted area is simply not outlined */ }
  }
  const out: BriefingPdfInput['figures'] = []
  for (const figure of row.figures) {
    if (!run) { out.push({ figure, rendered: null, problem: runProblem }); continue }
    try {
      out.push({ figure, rendered: await renderBriefingFigure(run, figure, areas), problem: null })
    } catch (err) {
      out.push({ figure, rendered: null, problem: (err as Error).message })
    }
  }
  return out
}

/** The PDF of a briefing record with the given stamp (preview, review or issued). */
export async function renderBriefingRecord(row: BriefingRecord, stamp: PdfStamp): Promise<RenderedPdf> {
  const names = await displayNamesOf([row.authorId])
  let supersedes: BriefingPdfInput['supersedes'] = null
  if (row.supersedesId) {
    const [old] = await useDB().select({ version: tables.briefings.version, issuedAt: tables.briefings.issuedAt }).from(tables.briefings).where(eq(tables.briefings.id, row.supersedesId))
    if (old) supersedes = old
  }
  return renderBriefingPdf({
    briefing: row, authorName: row.authorId ? names.get(row.authorId) ?? null : null, supersedes, figures: await figuresOf(row), stamp,
  })
}
