import { describe, expect, it } from 'vitest'
import {
  BRIEFING_ACTIONS, BRIEFING_STATUSES, availableBriefingActions, ruleOnBriefingAction, type BriefingFacts, type BriefingStatus,
} from '../../../shared/utils/briefingStates'

const HASH = 'a'.repeat(64)
const author = { id: 1, role: 'forecaster' as const }
const editorLead = { id: 2, role: 'duty_lead' as const }
const otherLead = { id: 3, role: 'duty_lead' as const }
const admin = { id: 4, role: 'admin' as const }
const stakeholder = { id: 5, role: 'stakeholder' as const }

const facts = (status: BriefingStatus, over: Partial<BriefingFacts> = {}): BriefingFacts =>
  ({ status, authorId: author.id, editorIds: [author.id, editorLead.id], pdfSha256: HASH, ...over })

const inputs = { pdfSha256: HASH, comment: 'Tighten the headline.', reason: 'Issued for the wrong day.' }

describe('briefing state rules', () => {
  // The whole transition table (role and four eyes aside): action → from-states → result.
  const legal: Record<string, [BriefingStatus[], BriefingStatus]> = {
    edit: [['draft', 'awaiting_approval', 'approved'], 'draft'],
    submit: [['draft'], 'awaiting_approval'],
    return: [['awaiting_approval'], 'draft'],
    approve: [['awaiting_approval'], 'approved'],
    issue: [['approved'], 'issued'],
    amend: [['issued'], 'draft'],
    withdraw: [['issued'], 'withdrawn'],
  }

  for (const action of BRIEFING_ACTIONS) {
    for (const status of BRIEFING_STATUSES) {
      const [from, to] = legal[action]!
      const actor = ['return', 'approve', 'issue', 'withdraw'].includes(action) ? otherLead : author
      it(`${action} from ${status} → ${from.includes(status) ? to : '409'}`, () => {
        const ruling = ruleOnBriefingAction(action, facts(status), actor, inputs)
        if (from.includes(status)) expect(ruling).toEqual({ ok: true, to })
        else expect(ruling).toMatchObject({ ok: false, status: 409 })
      })
    }
  }

  it('keeps issued briefings unchangeable and points to amending', () => {
    const ruling = ruleOnBriefingAction('edit', facts('issued'), author)
    expect(ruling).toMatchObject({ ok: false, status: 409 })
    expect(!ruling.ok && ruling.message).toMatch(/Amend it/)
  })

  it('lets only duty leads return, approve, issue and withdraw', () => {
    for (const action of ['return', 'approve', 'issue', 'withdraw'] as const) {
      for (const who of [author, admin, stakeholder]) {
        expect(ruleOnBriefingAction(action, facts('awaiting_approval'), who, inputs)).toMatchObject({ ok: false, status: 403 })
      }
    }
  })

  it('lets no admin or stakeholder write briefings', () => {
    for (const who of [admin, stakeholder]) {
      expect(ruleOnBriefingAction('edit', facts('draft'), who)).toMatchObject({ ok: false, status: 403 })
      expect(ruleOnBriefingAction('submit', facts('draft'), who)).toMatchObject({ ok: false, status: 403 })
    }
  })

  it('enforces four eyes: neither the author nor an editor of this version may approve', () => {
    const asAuthorLead = ruleOnBriefingAction('approve', facts('awaiting_approval', { authorId: otherLead.id, editorIds: [otherLead.id] }), otherLead, inputs)
    expect(asAuthorLead).toMatchObject({ ok: false, status: 403 })
    expect(!asAuthorLead.ok && asAuthorLead.message).toMatch(/wrote this briefing/)
    const asEditor = ruleOnBriefingAction('approve', facts('awaiting_approval'), editorLead, inputs)
    expect(asEditor).toMatchObject({ ok: false, status: 403 })
    expect(!asEditor.ok && asEditor.message).toMatch(/edited this version/)
    expect(ruleOnBriefingAction('approve', facts('awaiting_approval'), otherLead, inputs)).toEqual({ ok: true, to: 'approved' })
  })

  it('ties approval to the reviewed PDF', () => {
    expect(ruleOnBriefingAction('approve', facts('awaiting_approval'), otherLead, {})).toMatchObject({ ok: false, status: 422 })
    expect(ruleOnBriefingAction('approve', facts('awaiting_approval'), otherLead, { pdfSha256: 'b'.repeat(64) })).toMatchObject({ ok: false, status: 409 })
    expect(ruleOnBriefingAction('approve', facts('awaiting_approval', { pdfSha256: null }), otherLead, inputs)).toMatchObject({ ok: false, status: 409 })
    expect(ruleOnBriefingAction('approve', facts('awaiting_approval'), otherLead, { pdfSha256: HASH.toUpperCase() })).toEqual({ ok: true, to: 'approved' })
  })

  it('needs a comment to return and a reason to withdraw', () => {
    expect(ruleOnBriefingAction('return', facts('awaiting_approval'), otherLead, { comment: '  ' })).toMatchObject({ ok: false, status: 422 })
    expect(ruleOnBriefingAction('withdraw', facts('issued'), otherLead, {})).toMatchObject({ ok: false, status: 422 })
  })

  it('offers each person only what they may do now', () => {
    expect(availableBriefingActions(facts('draft'), author)).toEqual(['edit', 'submit'])
    expect(availableBriefingActions(facts('awaiting_approval'), otherLead)).toEqual(['edit', 'return', 'approve'])
    expect(availableBriefingActions(facts('awaiting_approval'), editorLead)).toEqual(['edit', 'return'])
    expect(availableBriefingActions(facts('approved'), otherLead)).toEqual(['edit', 'issue'])
    expect(availableBriefingActions(facts('issued'), otherLead)).toEqual(['amend', 'withdraw'])
    expect(availableBriefingActions(facts('issued'), admin)).toEqual([])
    expect(availableBriefingActions(facts('superseded'), otherLead)).toEqual([])
  })
})
