/**
 * The transitions of a briefing (see shared/utils/briefingStates.ts): submit, return, approve,
 * issue, withdraw and amend. Each one: the client's lockVersion must be current, the state rules
 * must allow it, and the write is conditional on lock_version (a racing request gets 409).
 * History and audit entries are written in the same transaction.
 */
import type { H3Event } from 'h3'
import { createError } from 'h3'
import { and, eq, inArray, sql } from 'drizzle-orm'
import type { User } from '#auth-utils'
import { briefingReadiness } from '../../shared/utils/briefingReadiness'
import type { BriefingActionInput, BriefingEventAction, BriefingStatus } from '../../shared/utils/briefingStates'
import { useDB, tables } from './db'
import { recordAudit } from './audit'
import { snapshotCaveats } from './caveats'
import { renderBriefingRecord } from './briefingRender'
import {
  assertBriefingAllowed, assertBriefingFresh, briefingAuditForm, briefingColumns, briefingConflict, displayNamesOf, loadBriefing, recordBriefingEvent,
  updateBriefingIfUnchanged, type BriefingRecord,
} from './briefingRecords'
import { queueBriefingMail } from './briefingMail'
import { baseUrl } from './users'

const b = tables.briefings

type Tx = Parameters<Parameters<ReturnType<typeof useDB>['transaction']>[0]>[0]
type SimpleAction = 'submit' | 'return' | 'approve' | 'issue' | 'withdraw'
const EVENT_OF: Record<SimpleAction, BriefingEventAction> = { submit: 'submitted', return: 'returned', approve: 'approved', issue: 'issued', withdraw: 'withdrawn' }

/** What a transition writes: the columns, the history comment and fingerprint, extra audit fields, follow-up writes. */
interface TransitionStep {
  set: Partial<typeof b.$inferInsert>
  comment?: string | null
  pdfSha256?: string | null
  audit?: Record<string, unknown>
  afterWrite?: (tx: Tx) => Promise<void>
}

/**
 * The shape every transition shares: fresh lockVersion, the state rules, the preparation (checks,
 * rendering) outside the transaction, then one conditional write with its history and audit entries.
 */
async function transition(event: H3Event, user: User, id: number, lockVersion: number, action: SimpleAction, input: BriefingActionInput,
  prepare: (row: BriefingRecord, to: BriefingStatus) => Promise<TransitionStep> | TransitionStep) {
  const row = await loadBriefing(id)
  assertBriefingFresh(row, lockVersion)
  const to = assertBriefingAllowed(action, row, user, input)
  const step = await prepare(row, to)
  return useDB().transaction(async (tx) => {
    const after = await updateBriefingIfUnchanged(tx, id, lockVersion, { status: to, ...step.set })
    await recordBriefingEvent(tx, { briefingId: id, actor: user, action: EVENT_OF[action], from: row.status, to, comment: step.comment ?? null, pdfSha256: step.pdfSha256 ?? null })
    await step.afterWrite?.(tx)
    await recordAudit({ actor: user, action: `briefing.${action}`, entityType: 'briefing', entityId: id, before: briefingAuditForm(row), after: { ...briefingAuditForm(after), ...step.audit } }, event, tx)
    return after
  })
}

/**
 * Submission: the readiness checks, the caveat texts refreshed from the library (standing ones
 * always), and the PDF rendered for review; the duty lead approves exactly that PDF.
 */
export function submitBriefing(event: H3Event, user: User, id: number, lockVersion: number) {
  return transition(event, user, id, lockVersion, 'submit', {}, async (row, to) => {
    const caveats = { ...row.caveats, snapshot: await snapshotCaveats(row.caveats.libraryIds) }
    const candidate = { ...row, caveats }
    const problems = briefingReadiness(candidate, Object.fromEntries(row.statements.map((s) => [s.areaId, s.areaName])))
    if (problems.length) {
      throw createError({
        statusCode: 422, statusMessage: 'Not ready',
        message: `The briefing is not ready to submit:\n${problems.map((p) => `• ${p.message}`).join('\n')}`,
        data: { problems },
      })
    }
    const now = new Date()
    const pdf = await renderBriefingRecord({ ...candidate, status: to }, { kind: 'review', at: now })
    return {
      set: { caveats, submittedAt: now, submittedById: user.id, pdf: pdf.bytes, pdfSha256: pdf.sha256, pdfRenderedAt: now, pdfLockVersion: lockVersion + 1 },
      pdfSha256: pdf.sha256,
    }
  })
}

/** Returned for changes: back to draft with the duty lead's comment in the history. */
export function returnBriefing(event: H3Event, user: User, id: number, lockVersion: number, comment: string) {
  return transition(event, user, id, lockVersion, 'return', { comment }, () => ({ set: { submittedAt: null, submittedById: null }, comment, audit: { comment } }))
}

/** Approval (four eyes, bound to the SHA-256 of the PDF the duty lead reviewed). */
export function approveBriefing(event: H3Event, user: User, id: number, lockVersion: number, pdfSha256: string) {
  return transition(event, user, id, lockVersion, 'approve', { pdfSha256 }, (row) => ({
    set: { approvedAt: new Date(), approvedById: user.id, approvedPdfSha256: row.pdfSha256 },
    pdfSha256: row.pdfSha256, audit: { approvedPdfSha256: row.pdfSha256 },
  }))
}

/**
 * Issue: the approved content rendered once more with the issue time and without the review
 * watermark; that copy is stored and sent. The version it amends (if any) becomes superseded.
 */
export function issueBriefing(event: H3Event, user: User, id: number, lockVersion: number) {
  return transition(event, user, id, lockVersion, 'issue', {}, async (row, to) => {
    const now = new Date()
    const names = await displayNamesOf([row.approvedById])
    const pdf = await renderBriefingRecord({ ...row, status: to }, {
      kind: 'issued', at: now, issuerName: user.displayName, approverName: row.approvedById ? names.get(row.approvedById) ?? null : null,
    })
    return {
      set: { issuedAt: now, issuedById: user.id, pdf: pdf.bytes, pdfSha256: pdf.sha256, pdfRenderedAt: now, pdfLockVersion: lockVersion + 1 },
      pdfSha256: pdf.sha256,
      comment: `Approved copy ${row.approvedPdfSha256?.slice(0, 12) ?? '?'}…; the issued copy adds the issue time and drops the review watermark.`,
      afterWrite: async (tx) => {
        // Distribution (issue 7): one outbox row per recipient, written in this transaction; the worker sends them.
        await queueBriefingMail(tx, id, row.supersedesId ? 'amended' : 'issue', { actorId: user.id, baseUrl: baseUrl(event) })
        if (!row.supersedesId) return
        const [old] = await tx.update(b).set({ status: 'superseded', lockVersion: sql`${b.lockVersion} + 1`, updatedAt: now })
          .where(and(eq(b.id, row.supersedesId), eq(b.status, 'issued'))).returning({ id: b.id })
        if (!old) return
        await recordBriefingEvent(tx, { briefingId: old.id, actor: user, action: 'superseded', from: 'issued', to: 'superseded', comment: `Superseded by version ${row.version}.` })
        await recordAudit({ actor: user, action: 'briefing.supersede', entityType: 'briefing', entityId: old.id, before: { status: 'issued' }, after: { status: 'superseded', supersededBy: id } }, event, tx)
      },
    }
  })
}

export function withdrawBriefing(event: H3Event, user: User, id: number, lockVersion: number, reason: string) {
  return transition(event, user, id, lockVersion, 'withdraw', { reason }, () => ({
    set: { withdrawnAt: new Date(), withdrawnById: user.id, withdrawnReason: reason }, comment: reason, audit: { reason },
    // Distribution (issue 7): the withdrawal notice to everyone the version was sent to.
    afterWrite: async (tx) => { await queueBriefingMail(tx, id, 'withdrawn', { actorId: user.id, baseUrl: baseUrl(event) }) },
  }))
}

/**
 * Amendment: a new draft version of an issued briefing, with the same content and a pointer to
 * the version it supersedes. One amendment at a time per briefing (a second one answers 409).
 */
export async function amendBriefing(event: H3Event, user: User, id: number, lockVersion: number) {
  const row = await loadBriefing(id)
  assertBriefingFresh(row, lockVersion)
  assertBriefingAllowed('amend', row, user)
  try {
    return await useDB().transaction(async (tx) => {
      const open = await tx.select({ id: b.id, version: b.version }).from(b)
        .where(and(eq(b.seriesId, row.seriesId), inArray(b.status, ['draft', 'awaiting_approval', 'approved'])))
      if (open.length) throw briefingConflict(`Version ${open[0]!.version} of this briefing is already being prepared (briefing ${open[0]!.id}); continue there.`)
      const [{ next }] = (await tx.select({ next: sql<number>`max(${b.version})::int + 1` }).from(b).where(eq(b.seriesId, row.seriesId))) as [{ next: number }]
      const {
        id: _id, version: _v, status: _s, createdAt: _c, updatedAt: _u, lockVersion: _l, submittedAt: _sa, submittedById: _sb, approvedAt: _aa, approvedById: _ab,
        approvedPdfSha256: _ah, issuedAt: _ia, issuedById: _ib, withdrawnAt: _wa, withdrawnById: _wb, withdrawnReason: _wr, pdfSha256: _ph, pdfRenderedAt: _pr,
        pdfLockVersion: _pl, ...content
      } = row
      const [created] = await tx.insert(b).values({
        ...content, version: next, supersedesId: row.id, status: 'draft', authorId: user.id, editorIds: [user.id],
      }).returning(briefingColumns)
      await recordBriefingEvent(tx, { briefingId: row.id, actor: user, action: 'amended', from: 'issued', to: 'issued', comment: `Version ${next} started (briefing ${created!.id}).` })
      await recordBriefingEvent(tx, { briefingId: created!.id, actor: user, action: 'created', to: 'draft', comment: `Amendment of version ${row.version}.` })
      await recordAudit({ actor: user, action: 'briefing.amend', entityType: 'briefing', entityId: created!.id, before: briefingAuditForm(row), after: briefingAuditForm(created!) }, event, tx)
      return created!
    })
  } catch (err) {
    // Two amendments at the same moment: the unique (series, version) index lets one through.
    if ((err as { code?: string }).code === '23505') throw briefingConflict('Another amendment of this briefing was started a moment ago; reload to see it.')
    throw err
  }
}
