/**
 * The life of a briefing, as one pure table of rules the server enforces on every route and the
 * pages use to decide which buttons to offer.
 *
 *   draft ──submit──▶ awaiting_approval ──approve──▶ approved ──issue──▶ issued
 *     ▲                    │  return (comment)           │                  │ amend → new draft version
 *     └────────────────────┴──── any edit ◀──────────────┘                  │ withdraw (reason)
 *                                                                           ▼
 *   an issued version becomes superseded when its amendment is issued; withdrawn and superseded are final.
 *
 * Four eyes: the duty lead who approves is neither the author nor anyone who edited this version,
 * and approves exactly the PDF they reviewed (its SHA-256 must match the stored one).
 */
import type { Role } from './roles'

export const BRIEFING_STATUSES = ['draft', 'awaiting_approval', 'approved', 'issued', 'withdrawn', 'superseded'] as const
export type BriefingStatus = (typeof BRIEFING_STATUSES)[number]

export const BRIEFING_STATUS_LABELS: Record<BriefingStatus, string> = {
  draft: 'Draft',
  awaiting_approval: 'Awaiting approval',
  approved: 'Approved',
  issued: 'Issued',
  withdrawn: 'Withdrawn',
  superseded: 'Superseded',
}

export const BRIEFING_ACTIONS = ['edit', 'submit', 'return', 'approve', 'issue', 'amend', 'withdraw'] as const
export type BriefingAction = (typeof BRIEFING_ACTIONS)[number]

/** What is recorded in the briefing's history (the actions, plus creation). */
export const BRIEFING_EVENT_ACTIONS = ['created', 'edited', 'submitted', 'returned', 'approved', 'issued', 'amended', 'withdrawn', 'superseded'] as const
export type BriefingEventAction = (typeof BRIEFING_EVENT_ACTIONS)[number]

/** Who may write and change briefings; duty leads alone review, approve, issue and withdraw. */
export const BRIEFING_AUTHOR_ROLES: readonly Role[] = ['forecaster', 'duty_lead']
export const BRIEFING_READER_ROLES: readonly Role[] = ['admin', 'duty_lead', 'forecaster']

const ROLES_FOR: Record<BriefingAction, readonly Role[]> = {
  edit: BRIEFING_AUTHOR_ROLES,
  submit: BRIEFING_AUTHOR_ROLES,
  amend: BRIEFING_AUTHOR_ROLES,
  return: ['duty_lead'],
  approve: ['duty_lead'],
  issue: ['duty_lead'],
  withdraw: ['duty_lead'],
}

/** The states each action starts from, and where it leads (edit and amend keep or create a draft). */
const FROM: Record<BriefingAction, readonly BriefingStatus[]> = {
  edit: ['draft', 'awaiting_approval', 'approved'],
  submit: ['draft'],
  return: ['awaiting_approval'],
  approve: ['awaiting_approval'],
  issue: ['approved'],
  amend: ['issued'],
  withdraw: ['issued'],
}

const TO: Record<BriefingAction, BriefingStatus> = {
  edit: 'draft',
  submit: 'awaiting_approval',
  return: 'draft',
  approve: 'approved',
  issue: 'issued',
  // The issued version stays issued; amend creates a new draft version (the new row's status).
  amend: 'draft',
  withdraw: 'withdrawn',
}

export interface BriefingFacts {
  status: BriefingStatus
  authorId: number | null
  editorIds: readonly number[]
  /** SHA-256 of the PDF stored with the briefing (rendered at submission). */
  pdfSha256: string | null
}

export interface BriefingActor {
  id: number
  role: Role
}

export interface BriefingActionInput {
  /** approve: the SHA-256 of the PDF the duty lead reviewed. */
  pdfSha256?: string
  /** return: what to change. */
  comment?: string
  /** withdraw: why. */
  reason?: string
}

export type BriefingRuling =
  | { ok: true; to: BriefingStatus }
  | { ok: false; status: 403 | 409 | 422; message: string }

const refuse = (status: 403 | 409 | 422, message: string): BriefingRuling => ({ ok: false, status, message })

const VERB: Record<BriefingAction, string> = {
  edit: 'changed', submit: 'submitted for approval', return: 'returned for changes', approve: 'approved',
  issue: 'issued', amend: 'amended', withdraw: 'withdrawn',
}

function wrongState(action: BriefingAction, status: BriefingStatus): string {
  const now = BRIEFING_STATUS_LABELS[status].toLowerCase()
  if (action === 'edit' && (status === 'issued' || status === 'withdrawn' || status === 'superseded')) {
    return status === 'issued'
      ? 'This briefing has been issued and can no longer be changed. Amend it to make a corrected version.'
      : `This briefing is ${now} and can no longer be changed.`
  }
  const from = FROM[action].map((s) => BRIEFING_STATUS_LABELS[s].toLowerCase()).join(' or ')
  return `This briefing is ${now}; it can only be ${VERB[action]} when it is ${from}.`
}

/**
 * Whether `actor` may take `action` on a briefing in the state `facts`, and the resulting status.
 * Order of checks: role (403), state (409), four eyes (403), inputs and the PDF hash (422 / 409).
 */
export function ruleOnBriefingAction(action: BriefingAction, facts: BriefingFacts, actor: BriefingActor, input: BriefingActionInput = {}): BriefingRuling {
  if (!ROLES_FOR[action].includes(actor.role)) {
    const who = ROLES_FOR[action].length === 1 ? 'a duty lead' : 'a forecaster or a duty lead'
    return refuse(403, `Only ${who} can do this: a briefing is ${VERB[action]} by ${who}.`)
  }
  if (!FROM[action].includes(facts.status)) return refuse(409, wrongState(action, facts.status))
  switch (action) {
    case 'approve': {
      if (facts.authorId === actor.id) return refuse(403, 'You wrote this briefing, so another duty lead has to approve it (four-eyes rule).')
      if (facts.editorIds.includes(actor.id)) return refuse(403, 'You edited this version of the briefing, so another duty lead has to approve it (four-eyes rule).')
      if (!input.pdfSha256) return refuse(422, 'Approval needs the fingerprint (SHA-256) of the PDF you reviewed.')
      if (!facts.pdfSha256 || input.pdfSha256.toLowerCase() !== facts.pdfSha256.toLowerCase()) {
        return refuse(409, 'The PDF you reviewed is not the current one: the briefing was re-rendered since you opened it. Reload and review the current PDF.')
      }
      break
    }
    case 'return':
      if (!input.comment?.trim()) return refuse(422, 'Say what should change: returning a briefing needs a comment.')
      break
    case 'withdraw':
      if (!input.reason?.trim()) return refuse(422, 'Give the reason for withdrawing: recipients will see it.')
      break
    default:
      break
  }
  return { ok: true, to: TO[action] }
}

/** The actions `actor` may take now (for showing buttons; the server rules again on each request). */
export function availableBriefingActions(facts: BriefingFacts, actor: BriefingActor): BriefingAction[] {
  return BRIEFING_ACTIONS.filter((action) => {
    // Inputs are supplied at the time of the request; here only role, state and four eyes count.
    const ruling = ruleOnBriefingAction(action, facts, actor, { pdfSha256: facts.pdfSha256 ?? 'x', comment: 'x', reason: 'x' })
    return ruling.ok
  })
}

/** Whether a status is final for its version (no further change of content). */
export function isBriefingFrozen(status: BriefingStatus): boolean {
  return status === 'issued' || status === 'withdrawn' || status === 'superseded'
}
