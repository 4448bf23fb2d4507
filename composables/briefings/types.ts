/**
 * Shapes of the briefings API as the pages use them (server/utils/briefings.ts). Times arrive as
 * ISO 8601 strings.
 */
import type {
  BriefingCaveats, BriefingFigure, BriefingMethod, BriefingNarrative, BriefingRecipient, BriefingSelection, BriefingStatement,
} from '#shared/schemas/briefings'
import type { BriefingAction, BriefingEventAction, BriefingStatus } from '#shared/utils/briefingStates'
import type { BriefingProblem } from '#shared/utils/briefingReadiness'
import type { LikelihoodScale } from '#shared/utils/likelihood'

export interface BriefingDto {
  id: number
  seriesId: number
  version: number
  supersedesId: number | null
  status: BriefingStatus
  title: string
  runId: number | null
  windowStart: string | null
  windowEnd: string | null
  likelihoodScale: string
  selection: BriefingSelection
  narrative: BriefingNarrative
  confidenceNote: string
  nextUpdateAt: string | null
  contact: string
  caveats: BriefingCaveats
  statements: BriefingStatement[]
  figures: BriefingFigure[]
  recipients: BriefingRecipient[]
  method: BriefingMethod | null
  localTimeName: string
  utcOffsetMinutes: number
  authorId: number | null
  editorIds: number[]
  authorName: string | null
  editorNames: string[]
  submittedAt: string | null
  submittedByName: string | null
  approvedAt: string | null
  approvedByName: string | null
  approvedPdfSha256: string | null
  issuedAt: string | null
  issuedByName: string | null
  withdrawnAt: string | null
  withdrawnByName: string | null
  withdrawnReason: string | null
  pdfSha256: string | null
  pdfRenderedAt: string | null
  pdfCurrent: boolean
  lockVersion: number
  createdAt: string
  updatedAt: string
}

export interface BriefingEventDto {
  id: number
  at: string
  actorId: number | null
  actorName: string | null
  action: BriefingEventAction
  comment: string | null
  fromStatus: BriefingStatus | null
  toStatus: BriefingStatus | null
  pdfSha256: string | null
}

export interface BriefingView {
  briefing: BriefingDto
  events: BriefingEventDto[]
  versions: { id: number; version: number; status: BriefingStatus; issuedAt: string | null }[]
  actions: BriefingAction[]
  problems: BriefingProblem[]
}

export interface BriefingListItem {
  id: number
  seriesId: number
  version: number
  status: BriefingStatus
  title: string
  runId: number | null
  runName: string | null
  windowStart: string | null
  windowEnd: string | null
  authorName: string | null
  submittedAt: string | null
  approvedAt: string | null
  issuedAt: string | null
  updatedAt: string
  areaCount: number
  mayApprove: boolean
}

export interface CaveatDto { id: number; title: string; text: string; standing: boolean; active: boolean; sort: number }

export interface BriefingSources {
  run: { id: number; name: string; status: string; isDemo: boolean; displayUnits: string; leadTimes: string[]; members: number; samplesPerMember: number }
  leads: { index: number; validTime: string; text: string }[]
  hazards: { hazard: string; label: string; direction: 'above' | 'below' }[]
  thresholds: { id: number; hazard: string; label: string; value: number; direction: 'above' | 'below'; isDefault: boolean }[]
  areas: { id: number; name: string; tags: string[]; isDemo: boolean }[]
  recipientLists: BriefingRecipient[]
  scales: LikelihoodScale[]
  caveats: CaveatDto[]
  localTime: { name: string; offsetMinutes: number }
}
