/** Words and tones for briefing statuses and history entries (a word and an icon, never colour alone). */
import type { BriefingEventAction, BriefingStatus } from '#shared/utils/briefingStates'
import { STATUS_TONES, type StatusInfo } from '~/composables/runs/display'

const { neutral: NEUTRAL, active: ACTIVE, done: DONE, error: ENDED } = STATUS_TONES

export const BRIEFING_STATUS_INFO: Record<BriefingStatus, StatusInfo> = {
  draft: { label: 'Draft', icon: 'circle', tone: NEUTRAL, explanation: 'Being written; not yet submitted for approval.' },
  awaiting_approval: { label: 'Awaiting approval', icon: 'clock', tone: ACTIVE, explanation: 'Submitted; a duty lead who did not write or edit it has to review and approve the PDF.' },
  approved: { label: 'Approved', icon: 'check', tone: DONE, explanation: 'Approved by a duty lead; ready to issue. Any edit takes it back to draft.' },
  issued: { label: 'Issued', icon: 'upload', tone: DONE, explanation: 'Issued to its recipients. It can no longer change; corrections are new versions.' },
  withdrawn: { label: 'Withdrawn', icon: 'cross', tone: ENDED, explanation: 'Withdrawn after issue; recipients should no longer use it.' },
  superseded: { label: 'Superseded', icon: 'stop', tone: NEUTRAL, explanation: 'Replaced by a newer version.' },
}

export const BRIEFING_EVENT_LABELS: Record<BriefingEventAction, string> = {
  created: 'Created', edited: 'Edited', submitted: 'Submitted for approval', returned: 'Returned for changes', approved: 'Approved',
  issued: 'Issued', amended: 'Amendment started', withdrawn: 'Withdrawn', superseded: 'Superseded',
}

/** "a1b2c3d4 e5f6…": the start of a SHA-256 in groups, enough to compare by eye. */
export function shortHash(hash: string | null | undefined): string {
  if (!hash) return '—'
  return `${hash.slice(0, 8)} ${hash.slice(8, 16)}…`
}
