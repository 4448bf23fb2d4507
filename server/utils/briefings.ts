/**
 * Briefings: creation from a run, editing (autosave), listing, the page's view, the builder's
 * sources, and the PDF. Transitions (submit, return, approve, issue, amend, withdraw) are in
 * briefingTransitions.ts. Every change goes through the optimistic lock and the state rules.
 */
import type { H3Event } from 'h3'
import { createError } from 'h3'
import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm'
import type { User } from '#auth-utils'
import { HAZARD_DEFINITIONS, hazardsForRun } from '../../shared/schemas/products'
import {
  type BriefingFigure, type BriefingSelection, type BriefingStatement, type CreateBriefingInput, type UpdateBriefingInput,
} from '../../shared/schemas/briefings'
import { DEFAULT_LIKELIHOOD_SCALE, LIKELIHOOD_SCALES, isLikelihoodScaleKey, wordingNumberProblem, type LikelihoodScaleKey } from '../../shared/utils/likelihood'
import { DEMO_LOCAL_TIME, briefingWhenText, briefingWindowBounds, parseUtcOffset } from '../../shared/utils/briefingTimes'
import { availableBriefingActions } from '../../shared/utils/briefingStates'
import { briefingReadiness } from '../../shared/utils/briefingReadiness'
import { useDB, tables } from './db'
import { recordAudit } from './audit'
import { ensureDemoAreas, listAreas } from './areas'
import { recipientListOptions } from './briefingMail'
import { runForProducts, type RunRow } from './runSamples'
import { briefingMethodFacts, computeBriefingStatements, rewordStatements } from './briefingStatements'
import { listCaveats, snapshotCaveats } from './caveats'
import { renderBriefingRecord } from './briefingRender'
import {
  assertBriefingAllowed, assertBriefingFresh, briefingAuditForm, briefingColumns, briefingConflict, briefingHistory, loadBriefing, recordBriefingEvent,
  updateBriefingIfUnchanged, displayNamesOf, type BriefingRecord,
} from './briefingRecords'

const b = tables.briefings

const unprocessable = (message: string) => createError({ statusCode: 422, statusMessage: 'Unprocessable Content', message })

/** The local time printed beside UTC: the demo zone for demo runs, else TESSERA_LOCAL_TIME_NAME / TESSERA_LOCAL_UTC_OFFSET. */
export function defaultLocalTime(run: Pick<RunRow, 'isDemo'>): { name: string; offsetMinutes: number } {
  if (run.isDemo) return { ...DEMO_LOCAL_TIME }
  const offset = parseUtcOffset(process.env.TESSERA_LOCAL_UTC_OFFSET ?? '') ?? 0
  const name = process.env.TESSERA_LOCAL_TIME_NAME?.trim() || (offset === 0 ? 'UTC' : 'local time')
  return { name, offsetMinutes: offset }
}

function checkWindow(run: RunRow, selection: Pick<BriefingSelection, 'leadFrom' | 'leadTo'>): void {
  if (selection.leadTo >= run.leadTimes.length) throw unprocessable(`The window ends at lead time ${selection.leadTo + 1}, but the run has ${run.leadTimes.length}.`)
}

function checkFigures(run: RunRow, figures: BriefingFigure[]): void {
  for (const f of figures) {
    const last = Math.max(f.leadIndex, f.windowTo ?? f.leadIndex)
    if (last >= run.leadTimes.length) throw unprocessable(`A map asks for lead time ${last + 1}; the run has ${run.leadTimes.length}.`)
  }
}

/** One probability map per threshold (at most three) over the briefing's window: the event at any of its valid times. */
function defaultFigures(selection: BriefingSelection): BriefingFigure[] {
  return selection.thresholds.slice(0, 3).map((t) => ({
    leadIndex: selection.leadFrom, windowTo: selection.leadTo > selection.leadFrom ? selection.leadTo : null,
    product: 'probability' as const, threshold: t.value, direction: t.direction, radiusKm: 0, caption: '',
  }))
}

export async function createBriefing(event: H3Event, user: User, input: CreateBriefingInput) {
  const run = await runForProducts(input.runId)
  const selection: BriefingSelection = input.selection ?? { leadFrom: 0, leadTo: run.leadTimes.length - 1, areaIds: [], thresholds: [], kinds: ['anywhere', 'fraction'] }
  checkWindow(run, selection)
  const scale: LikelihoodScaleKey = DEFAULT_LIKELIHOOD_SCALE
  const { statements } = selection.areaIds.length && selection.thresholds.length
    ? await computeBriefingStatements(run, selection, scale, [])
    : { statements: [] as BriefingStatement[] }
  const method = await briefingMethodFacts(run)
  const libraryIds = (await listCaveats(false)).map((c) => c.id)
  const caveats = { libraryIds, free: [], snapshot: await snapshotCaveats(libraryIds) }
  const bounds = briefingWindowBounds(run, selection.leadFrom, selection.leadTo)
  const local = defaultLocalTime(run)
  const db = useDB()
  return db.transaction(async (tx) => {
    // The first version's id doubles as the series id, so take it from the sequence first.
    const { rows } = await tx.execute(sql`select nextval(pg_get_serial_sequence('briefings', 'id'))::int as id`)
    const id = (rows[0] as { id: number }).id
    const [row] = await tx.insert(b).values({
      id, seriesId: id, version: 1, status: 'draft',
      title: input.title ?? `${run.name.replace(/\s*\(invented demo\)\s*$/, '')}: briefing`,
      runId: run.id, windowStart: bounds.start, windowEnd: bounds.end, likelihoodScale: scale, selection,
      narrative: { headline: '', summary: '', details: '' }, confidenceNote: '', nextUpdateAt: null,
      contact: `${user.displayName}, ${user.email}`, caveats, statements, figures: defaultFigures(selection), recipients: [], method,
      localTimeName: local.name, utcOffsetMinutes: local.offsetMinutes, authorId: user.id, editorIds: [user.id],
    }).returning(briefingColumns)
    await recordBriefingEvent(tx, { briefingId: id, actor: user, action: 'created', to: 'draft', comment: `From run ${run.id} (“${run.name}”).` })
    await recordAudit({ actor: user, action: 'briefing.create', entityType: 'briefing', entityId: id, after: briefingAuditForm(row!) }, event, tx)
    return row!
  })
}

/** Applies wording edits: numbers never change; wording that states another number is refused (422). */
function applyStatementEdits(statements: BriefingStatement[], edits: NonNullable<UpdateBriefingInput['statementEdits']>, scaleKey: LikelihoodScaleKey, user: User): BriefingStatement[] {
  const scale = LIKELIHOOD_SCALES[scaleKey]
  const byKey = new Map(statements.map((s) => [s.key, { ...s }]))
  for (const edit of edits) {
    const s = byKey.get(edit.key)
    if (!s) throw briefingConflict('A statement you edited is no longer part of the briefing (the selection changed); reload to see the current statements.')
    if (edit.included !== undefined) s.included = edit.included
    if (edit.text === null) { s.text = s.generatedText; s.edited = null }
    else if (edit.text !== undefined && edit.text !== s.text) {
      const problem = wordingNumberProblem(edit.text, scale, s)
      if (problem) throw unprocessable(problem)
      if (edit.text === s.generatedText) { s.text = s.generatedText; s.edited = null }
      else { s.text = edit.text; s.edited = { byId: user.id, byName: user.displayName, at: new Date().toISOString() } }
    }
  }
  return statements.map((s) => byKey.get(s.key)!)
}

/** JSON with object keys sorted (jsonb hands keys back in its own order). */
function canonicalJson(value: unknown): string {
  return JSON.stringify(value, (_k, v: unknown) => (v && typeof v === 'object' && !Array.isArray(v)
    ? Object.fromEntries(Object.entries(v as Record<string, unknown>).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)))
    : v))
}
const sameJson = (a: unknown, b: unknown) => canonicalJson(a) === canonicalJson(b)

/**
 * Autosave and every other edit. Any edit returns the briefing to draft (clearing a submission or
 * an approval); the editor joins the version's editors, so they cannot approve it.
 */
export async function updateBriefing(event: H3Event, user: User, id: number, input: UpdateBriefingInput) {
  const row = await loadBriefing(id)
  assertBriefingFresh(row, input.lockVersion)
  assertBriefingAllowed('edit', row, user)
  const set: Partial<typeof b.$inferInsert> = {}
  const changed: string[] = []
  const scale = input.likelihoodScale ?? (isLikelihoodScaleKey(row.likelihoodScale) ? row.likelihoodScale : DEFAULT_LIKELIHOOD_SCALE)
  let statements = row.statements
  const selectionChanged = input.selection && !sameJson(input.selection, row.selection)
  const figuresChanged = input.figures && !sameJson(input.figures, row.figures)
  if (selectionChanged || figuresChanged) {
    if (row.runId == null) throw briefingConflict('The forecast run of this briefing was deleted; its statements and maps can no longer be recomputed.')
    const run = await runForProducts(row.runId)
    if (selectionChanged) {
      checkWindow(run, input.selection!)
      statements = (await computeBriefingStatements(run, input.selection!, scale, statements)).statements
      const bounds = briefingWindowBounds(run, input.selection!.leadFrom, input.selection!.leadTo)
      Object.assign(set, { selection: input.selection, windowStart: bounds.start, windowEnd: bounds.end, method: await briefingMethodFacts(run) })
      changed.push('selection')
    }
    if (figuresChanged) { checkFigures(run, input.figures!); set.figures = input.figures; changed.push('figures') }
    // The first thresholds chosen bring a default map each, until the forecaster arranges the maps.
    else if (selectionChanged && !input.figures && row.figures.length === 0) set.figures = defaultFigures(input.selection!)
  }
  if (input.likelihoodScale && input.likelihoodScale !== row.likelihoodScale) {
    statements = rewordStatements(statements, input.likelihoodScale)
    set.likelihoodScale = input.likelihoodScale
    changed.push('likelihoodScale')
  }
  if (input.statementEdits?.length) { statements = applyStatementEdits(statements, input.statementEdits, scale, user); changed.push('statements') }
  if (statements !== row.statements) set.statements = statements
  if (input.title !== undefined && input.title !== row.title) { set.title = input.title; changed.push('title') }
  if (input.narrative && !sameJson(input.narrative, row.narrative)) { set.narrative = input.narrative; changed.push('narrative') }
  if (input.confidenceNote !== undefined && input.confidenceNote !== row.confidenceNote) { set.confidenceNote = input.confidenceNote; changed.push('confidenceNote') }
  if (input.contact !== undefined && input.contact !== row.contact) { set.contact = input.contact; changed.push('contact') }
  if (input.nextUpdateAt !== undefined) {
    const next = input.nextUpdateAt ? new Date(input.nextUpdateAt) : null
    if ((next?.getTime() ?? null) !== (row.nextUpdateAt?.getTime() ?? null)) { set.nextUpdateAt = next; changed.push('nextUpdateAt') }
  }
  if (input.caveats) {
    const caveats = { libraryIds: input.caveats.libraryIds, free: input.caveats.free, snapshot: await snapshotCaveats(input.caveats.libraryIds) }
    if (!sameJson(caveats, row.caveats)) { set.caveats = caveats; changed.push('caveats') }
  }
  if (input.recipientKeys) {
    // Distribution (issue 7): the lists of the stakeholder directory (server/utils/briefingMail.ts).
    const options = await recipientListOptions()
    const unknown = input.recipientKeys.filter((k) => !options.some((l) => l.key === k))
    if (unknown.length) throw unprocessable(`Unknown recipient list: ${unknown.join(', ')}.`)
    const recipients = options.filter((l) => input.recipientKeys!.includes(l.key))
    if (!sameJson(recipients, row.recipients)) { set.recipients = recipients; changed.push('recipients') }
  }
  if (input.localTime && (input.localTime.name !== row.localTimeName || input.localTime.offsetMinutes !== row.utcOffsetMinutes)) {
    Object.assign(set, { localTimeName: input.localTime.name, utcOffsetMinutes: input.localTime.offsetMinutes })
    changed.push('localTime')
  }
  // Nothing changed (an autosave of the same content): no new version, no history entry.
  if (changed.length === 0) return row
  Object.assign(set, {
    status: 'draft',
    editorIds: row.editorIds.includes(user.id) ? row.editorIds : [...row.editorIds, user.id],
    ...(row.status !== 'draft' ? { submittedAt: null, submittedById: null, approvedAt: null, approvedById: null, approvedPdfSha256: null } : {}),
  })
  return useDB().transaction(async (tx) => {
    const after = await updateBriefingIfUnchanged(tx, id, input.lockVersion, set)
    const comment = row.status === 'approved' ? 'Edited after approval: the approval was cleared.'
      : row.status === 'awaiting_approval' ? 'Edited while awaiting approval: taken back to draft.' : null
    await recordBriefingEvent(tx, { briefingId: id, actor: user, action: 'edited', from: row.status, to: 'draft', comment })
    await recordAudit({ actor: user, action: 'briefing.edit', entityType: 'briefing', entityId: id, before: { status: row.status, lockVersion: row.lockVersion }, after: { status: 'draft', lockVersion: after.lockVersion, changed } }, event, tx)
    return after
  })
}

/** The list: newest first; the duty lead's queue is `status=awaiting_approval` (oldest submission first). */
export async function listBriefings(user: User, query: { status?: BriefingRecord['status']; mine?: '0' | '1' }) {
  const conditions = [
    ...(query.status ? [eq(b.status, query.status)] : []),
    ...(query.mine === '1' ? [sql`(${b.authorId} = ${user.id} or ${user.id} = any(${b.editorIds}))`] : []),
  ]
  const order = query.status === 'awaiting_approval' ? [asc(b.submittedAt), asc(b.id)] : [desc(b.updatedAt), desc(b.id)]
  const rows = await useDB().select({
    id: b.id, seriesId: b.seriesId, version: b.version, status: b.status, title: b.title, runId: b.runId,
    windowStart: b.windowStart, windowEnd: b.windowEnd, authorId: b.authorId, editorIds: b.editorIds, submittedAt: b.submittedAt,
    approvedAt: b.approvedAt, issuedAt: b.issuedAt, updatedAt: b.updatedAt, lockVersion: b.lockVersion,
    runName: tables.runs.name, areaCount: sql<number>`jsonb_array_length(${b.selection} -> 'areaIds')::int`,
  }).from(b).leftJoin(tables.runs, eq(tables.runs.id, b.runId)).where(conditions.length ? and(...conditions) : undefined).orderBy(...order).limit(500)
  const names = await displayNamesOf(rows.map((r) => r.authorId))
  return rows.map((r) => ({ ...r, authorName: r.authorId ? names.get(r.authorId) ?? null : null, mayApprove: user.role === 'duty_lead' && r.authorId !== user.id && !r.editorIds.includes(user.id) }))
}

/** Everything the briefing page shows: the record (no PDF bytes), names, history, other versions, allowed actions, readiness. */
export async function briefingView(user: User, id: number) {
  const row = await loadBriefing(id)
  const [events, versions] = await Promise.all([
    briefingHistory(id),
    useDB().select({ id: b.id, version: b.version, status: b.status, issuedAt: b.issuedAt }).from(b).where(eq(b.seriesId, row.seriesId)).orderBy(asc(b.version)),
  ])
  const names = await displayNamesOf([row.authorId, ...row.editorIds, row.submittedById, row.approvedById, row.issuedById, row.withdrawnById])
  const name = (uid: number | null) => (uid ? names.get(uid) ?? null : null)
  const areaNames = Object.fromEntries(row.statements.map((s) => [s.areaId, s.areaName]))
  return {
    briefing: {
      ...row,
      authorName: name(row.authorId), editorNames: row.editorIds.map((e) => names.get(e) ?? `#${e}`),
      submittedByName: name(row.submittedById), approvedByName: name(row.approvedById), issuedByName: name(row.issuedById), withdrawnByName: name(row.withdrawnById),
      pdfCurrent: row.pdfSha256 != null && row.pdfLockVersion === row.lockVersion,
    },
    events, versions,
    actions: availableBriefingActions({ status: row.status, authorId: row.authorId, editorIds: row.editorIds, pdfSha256: row.pdfSha256 }, user),
    problems: briefingReadiness(row, areaNames),
  }
}

/**
 * The PDF to show: a draft is (re-)rendered as a preview when its stored copy is older than its
 * content; every other state returns the stored copy (the one submitted, approved or issued).
 */
export async function briefingPdfBytes(id: number): Promise<{ bytes: Buffer; sha256: string; row: BriefingRecord }> {
  const row = await loadBriefing(id)
  if (row.status === 'draft' && (row.pdfLockVersion !== row.lockVersion || !row.pdfSha256)) {
    const rendered = await renderBriefingRecord(row, { kind: 'preview', at: new Date() })
    // Stored only if nothing changed meanwhile; a preview never moves lock_version (it is derived data).
    await useDB().update(b).set({ pdf: rendered.bytes, pdfSha256: rendered.sha256, pdfRenderedAt: new Date(), pdfLockVersion: row.lockVersion })
      .where(and(eq(b.id, id), eq(b.lockVersion, row.lockVersion), eq(b.status, 'draft')))
    return { bytes: rendered.bytes, sha256: rendered.sha256, row: { ...row, pdfSha256: rendered.sha256 } }
  }
  const [stored] = await useDB().select({ pdf: b.pdf }).from(b).where(eq(b.id, id))
  if (!stored?.pdf || !row.pdfSha256) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: 'This briefing has no PDF yet.' })
  return { bytes: stored.pdf, sha256: row.pdfSha256, row }
}

/** What the builder offers for a run: areas, thresholds of its hazards, lead times, lists, scales and caveats. */
export async function briefingSources(runId: number) {
  const run = await runForProducts(runId)
  if (run.isDemo) await ensureDemoAreas()
  const hazards = hazardsForRun(run.standardName, run.canonicalUnits)
  const thresholds = hazards.length
    ? await useDB().select().from(tables.hazardThresholds).where(inArray(tables.hazardThresholds.hazard, hazards)).orderBy(asc(tables.hazardThresholds.hazard), asc(tables.hazardThresholds.position))
    : []
  const areas = (await listAreas()).map((a) => ({ id: a.id, name: a.name, tags: a.tags, isDemo: a.isDemo }))
  return {
    run: { id: run.id, name: run.name, status: run.status, isDemo: run.isDemo, displayUnits: run.displayUnits, leadTimes: run.leadTimes, members: run.members, samplesPerMember: run.settings.samplesPerMember },
    leads: run.leadTimes.map((t, k) => ({ index: k, validTime: t, text: briefingWhenText(run, k, k) })),
    hazards: hazards.map((h) => ({ hazard: h, label: HAZARD_DEFINITIONS[h].label, direction: HAZARD_DEFINITIONS[h].direction })),
    thresholds: thresholds.map((t) => ({ id: t.id, hazard: t.hazard, label: t.label, value: t.value, direction: t.direction, isDefault: t.isDefault })),
    areas,
    recipientLists: await recipientListOptions(),
    scales: Object.values(LIKELIHOOD_SCALES),
    caveats: await listCaveats(false),
    localTime: defaultLocalTime(run),
  }
}
