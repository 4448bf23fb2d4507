import { z } from 'zod'
import { DEMO_STAKEHOLDERS } from '../demo/region'
import { HAZARDS, type Hazard } from './products'
import { LIKELIHOOD_SCALE_KEYS, STATEMENT_KINDS, type LikelihoodScaleKey, type StatementKind } from '../utils/likelihood'
import { BRIEFING_STATUSES, type BriefingStatus } from '../utils/briefingStates'

// --- Stored shapes (jsonb columns of `briefings`) ------------------------------------------------

export interface BriefingNarrative { headline: string; summary: string; details: string }

/** A threshold a briefing speaks about: canonical units of the run, inclusive (≥ above, ≤ below). */
export interface BriefingThreshold { hazard: Hazard | null; label: string; value: number; direction: 'above' | 'below' }

/** What the statements are computed from. Lead indices refer to the run's lead times. */
export interface BriefingSelection {
  leadFrom: number
  leadTo: number
  areaIds: number[]
  thresholds: BriefingThreshold[]
  kinds: StatementKind[]
}

/**
 * One key statement. The numbers are computed from the run's joint samples and never edited;
 * `text` is the printed wording (the generated sentence unless a person edited it).
 */
export interface BriefingStatement {
  key: string
  areaId: number
  areaName: string
  threshold: BriefingThreshold
  kind: StatementKind
  /** Probability (anywhere, areaMean) or expected share of the area (fraction), in [0, 1]. */
  value: number
  /** k of N scenarios (null for fraction). */
  count: number | null
  /** N = members × samples per member. */
  scenarios: number
  members: number
  samplesPerMember: number | null
  /** Members with at least one scenario showing the event (null for fraction). */
  membersShowing: number | null
  /** "gusts reach 20 m/s or more". */
  event: string
  /** "at one or more of the valid times 06 UTC and 12 UTC 14 Nov 2031". */
  when: string
  /** Fine cells of the area used, and a note when the area is small or partly off the grid. */
  cells: number
  note: string | null
  generatedText: string
  text: string
  edited: { byId: number; byName: string; at: string } | null
  included: boolean
}

/** A map figure: one product of one lead time or time window, rendered by the product renderer into the PDF. */
export interface BriefingFigure {
  leadIndex: number
  /** Last lead index of a window from leadIndex (event at any of its valid times); null or absent = one lead time. */
  windowTo?: number | null
  product: 'probability' | 'nmep' | 'nep'
  threshold: number
  direction: 'above' | 'below'
  radiusKm: number
  caption: string
}

export interface BriefingCaveatSnapshot { id: number; title: string; text: string; standing: boolean }
export interface BriefingCaveats {
  libraryIds: number[]
  free: string[]
  /** The library texts as they were when last saved (an issued briefing keeps its words). */
  snapshot: BriefingCaveatSnapshot[]
}

export interface BriefingRecipient { key: string; name: string }

/** What the method section of the PDF says, captured when the statements were computed. */
export interface BriefingMethod {
  runId: number
  runName: string
  referenceTime: string | null
  isDemo: boolean
  members: number
  samplesPerMember: number | null
  scenarios: number
  factor: number
  coarseSpacingKm: number
  fineSpacingKm: number
  kernels: string[]
  lengthScaleKm: [number, number] | null
  quantity: string
  units: string
  leadTimes: string[]
  /**
   * Engine extensions the run used (absent in briefings written before they existed): the latent
   * transforms of the member fits, how many fits adopted a stretched (anisotropic) correlation, how
   * many used locally fitted regimes, and the decorrelation time of time-coherent noise (null = none).
   */
  extensions?: {
    transforms: string[]
    anisotropicFits: number
    regimeFits: number
    fits: number
    timeScaleHours: number | null
  }
}

export interface BriefingLocalTime { name: string; offsetMinutes: number }

/**
 * Distribution lists until the stakeholder directory exists: fixed names a briefing can pick.
 * The demo organisations are invented (shared/demo/region.ts).
 */
export const PLACEHOLDER_RECIPIENT_LISTS: BriefingRecipient[] = [
  { key: 'duty-team', name: 'Forecasting office duty team (internal copy)' },
  ...DEMO_STAKEHOLDERS.map((s) => ({ key: `demo-${s.name.toLowerCase().replace(/[^a-z0-9]+/g, '-')}`, name: `${s.name} (invented demo organisation)` })),
]

// --- Requests ------------------------------------------------------------------------------------

const lockVersion = z.number({ error: 'The request needs the lockVersion of the briefing you are changing.' }).int().min(1)
const text = (max: number) => z.string().max(max, `Use at most ${max} characters.`)
const isoTime = z.string().refine((s) => !Number.isNaN(Date.parse(s)), 'Give a date and time (ISO 8601).')

export const briefingIdSchema = z.object({ id: z.coerce.number().int().positive() })

export const thresholdSchema = z.object({
  hazard: z.enum(HAZARDS).nullable().default(null),
  label: z.string().trim().min(1).max(60),
  value: z.number().refine(Number.isFinite, 'Enter a finite number.'),
  direction: z.enum(['above', 'below']),
})

export const selectionSchema = z.object({
  leadFrom: z.number().int().min(0),
  leadTo: z.number().int().min(0),
  areaIds: z.array(z.number().int().positive()).max(12, 'At most 12 areas per briefing.').transform((l) => [...new Set(l)]),
  thresholds: z.array(thresholdSchema).max(6, 'At most 6 thresholds per briefing.'),
  kinds: z.array(z.enum(STATEMENT_KINDS)).min(1, 'Choose at least one kind of statement.').transform((l) => [...new Set(l)]),
}).refine((s) => s.leadFrom <= s.leadTo, 'The time window must start before it ends.')

export const figureSchema = z.object({
  leadIndex: z.number().int().min(0),
  /** Last lead index of a time window from leadIndex ("at any of its valid times"); null = leadIndex alone. */
  windowTo: z.number().int().min(0).nullable().default(null),
  product: z.enum(['probability', 'nmep', 'nep']),
  threshold: z.number().refine(Number.isFinite),
  direction: z.enum(['above', 'below']),
  radiusKm: z.number().min(0).max(200).default(0),
  caption: text(300).default(''),
}).refine((f) => f.windowTo === null || f.windowTo >= f.leadIndex, 'A map\'s time window must end at or after its first valid time.')

export const createBriefingSchema = z.object({
  runId: z.number().int().positive(),
  title: z.string().trim().min(1, 'Give the briefing a title.').max(160).optional(),
  selection: selectionSchema.optional(),
})
export type CreateBriefingInput = z.infer<typeof createBriefingSchema>

export const updateBriefingSchema = z.object({
  lockVersion,
  title: z.string().trim().max(160).optional(),
  likelihoodScale: z.enum(LIKELIHOOD_SCALE_KEYS).optional(),
  narrative: z.object({ headline: text(200), summary: text(2000), details: text(8000) }).optional(),
  confidenceNote: text(1000).optional(),
  nextUpdateAt: isoTime.nullable().optional(),
  contact: text(300).optional(),
  caveats: z.object({
    libraryIds: z.array(z.number().int().positive()).max(30).transform((l) => [...new Set(l)]),
    free: z.array(z.string().trim().min(1).max(600)).max(10, 'At most 10 free-text caveats.'),
  }).optional(),
  recipientKeys: z.array(z.string().min(1).max(80)).max(20).optional(),
  figures: z.array(figureSchema).max(6, 'At most 6 map figures.').optional(),
  selection: selectionSchema.optional(),
  statementEdits: z.array(z.object({
    key: z.string().min(1).max(200),
    /** New wording; null restores the generated sentence. */
    text: z.string().trim().min(1, 'A statement needs some words.').max(600).nullable().optional(),
    included: z.boolean().optional(),
  })).max(200).optional(),
  localTime: z.object({
    name: z.string().trim().min(1).max(60),
    offsetMinutes: z.number().int().min(-14 * 60).max(14 * 60),
  }).optional(),
})
export type UpdateBriefingInput = z.infer<typeof updateBriefingSchema>

export const lockOnlySchema = z.object({ lockVersion })
export const approveBriefingSchema = z.object({
  lockVersion,
  pdfSha256: z.string({ error: 'Approval needs the SHA-256 of the PDF you reviewed.' }).regex(/^[0-9a-fA-F]{64}$/, 'The PDF fingerprint is a 64-character SHA-256.'),
})
export const returnBriefingSchema = z.object({ lockVersion, comment: z.string().trim().min(1, 'Say what should change.').max(2000) })
export const withdrawBriefingSchema = z.object({ lockVersion, reason: z.string().trim().min(1, 'Give the reason for withdrawing.').max(2000) })

export const briefingListQuerySchema = z.object({
  status: z.enum(BRIEFING_STATUSES).optional(),
  mine: z.enum(['0', '1']).optional(),
})

export const briefingSourcesQuerySchema = z.object({ runId: z.coerce.number().int().positive() })

export const caveatSchema = z.object({
  title: z.string().trim().min(1, 'Give the caveat a title.').max(120),
  text: z.string().trim().min(1, 'Write the caveat.').max(1200),
  standing: z.boolean().default(false),
  active: z.boolean().default(true),
  sort: z.number().int().min(0).max(1000).default(100),
})
export const caveatUpdateSchema = caveatSchema.partial()
export const caveatIdSchema = z.object({ id: z.coerce.number().int().positive() })

export type { BriefingStatus, LikelihoodScaleKey }
