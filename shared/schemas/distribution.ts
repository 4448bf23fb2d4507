import { z } from 'zod'
import { emailSchema } from './auth'
import { HAZARDS } from './products'

// --- Stakeholder directory -----------------------------------------------------------------------

const name = (what: string, max = 160) => z.string().trim().min(1, `Enter the ${what}.`).max(max, `Use at most ${max} characters.`)
const description = z.string().trim().max(600, 'Use at most 600 characters.')

// Update schemas are built from the fields without defaults, so an empty change stays empty.
const organisationFields = { name: name('organisation\'s name'), description, active: z.boolean() }
export const organisationSchema = z.object({ ...organisationFields, description: description.default(''), active: z.boolean().default(true) })
export const organisationUpdateSchema = z.object(organisationFields).partial().refine((v) => Object.keys(v).length > 0, 'Nothing to change.')

const contactFields = {
  organisationId: z.number().int().positive({ error: 'Choose the organisation.' }),
  name: name('person\'s name', 120),
  email: emailSchema,
  /** A stakeholder account that sees this contact's briefings in the portal. */
  userId: z.number().int().positive().nullable(),
  active: z.boolean(),
}
export const contactSchema = z.object({ ...contactFields, userId: contactFields.userId.default(null), active: z.boolean().default(true) })
export const contactUpdateSchema = z.object(contactFields).partial().refine((v) => Object.keys(v).length > 0, 'Nothing to change.')
export const contactListQuerySchema = z.object({ organisationId: z.coerce.number().int().positive().optional() })

export const LIST_KEY_PATTERN = /^[a-z0-9][a-z0-9-]{1,78}$/
const listFields = {
  name: name('list\'s name'),
  description,
  organisationId: z.number().int().positive().nullable(),
  active: z.boolean(),
  memberIds: z.array(z.number().int().positive()).max(500).transform((l) => [...new Set(l)]),
}
export const distributionListSchema = z.object({
  ...listFields,
  key: z.string().trim().toLowerCase().regex(LIST_KEY_PATTERN, 'Use 2–79 lower-case letters, digits and hyphens for the key.').optional(),
  description: description.default(''),
  organisationId: listFields.organisationId.default(null),
  active: z.boolean().default(true),
  memberIds: listFields.memberIds.default([]),
})
export const distributionListUpdateSchema = z.object(listFields).partial().refine((v) => Object.keys(v).length > 0, 'Nothing to change.')

/** A list key from a name: "Serevan Grid — line crews" → "serevan-grid-line-crews". */
export function listKeyFromName(text: string): string {
  const slug = text.toLowerCase().normalize('NFKD').replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 70)
  return slug.length >= 2 ? slug : `list-${slug || 'x'}`
}

// --- Mail -----------------------------------------------------------------------------------------

export const pageQuerySchema = z.object({
  limit: z.coerce.number().int().min(1).max(100).default(25),
  offset: z.coerce.number().int().min(0).default(0),
})
export const attachmentParamsSchema = z.object({ id: z.coerce.number().int().positive(), index: z.coerce.number().int().min(0).max(100) })

// --- Archive search --------------------------------------------------------------------------------

export const ARCHIVE_STATUSES = ['issued', 'withdrawn', 'superseded'] as const
export const ARCHIVE_ORDERS = ['relevance', 'newest', 'oldest'] as const
export const ARCHIVE_PAGE_SIZE = 20

const dateOnly = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'Give the date as YYYY-MM-DD.')
const optionalId = z.coerce.number().int().positive().optional()

/** A drawn area: a GeoJSON Polygon or MultiPolygon geometry, WGS 84 lon-lat. */
const position = z.tuple([z.number().min(-180).max(180), z.number().min(-90).max(90)])
const ring = z.array(position).min(4, 'A ring needs at least four positions (the first repeated at the end).').max(2000)
export const searchAreaSchema = z.discriminatedUnion('type', [
  z.object({ type: z.literal('Polygon'), coordinates: z.array(ring).min(1).max(20) }),
  z.object({ type: z.literal('MultiPolygon'), coordinates: z.array(z.array(ring).min(1).max(20)).min(1).max(20) }),
])

export const archiveQuerySchema = z.object({
  q: z.string().trim().max(200, 'Use at most 200 characters.').default(''),
  from: dateOnly.optional(),
  to: dateOnly.optional(),
  hazard: z.enum(HAZARDS).optional(),
  status: z.enum(ARCHIVE_STATUSES).optional(),
  author: optionalId,
  approver: optionalId,
  list: optionalId,
  /** JSON text of a Polygon / MultiPolygon geometry. */
  area: z.string().max(60_000).optional().transform((text, ctx) => {
    if (!text) return undefined
    let value: unknown
    try { value = JSON.parse(text) } catch {
      ctx.addIssue({ code: 'custom', message: 'The area is not valid JSON.' })
      return z.NEVER
    }
    const parsed = searchAreaSchema.safeParse(value)
    if (!parsed.success) {
      ctx.addIssue({ code: 'custom', message: `The area is not a GeoJSON polygon: ${parsed.error.issues[0]?.message ?? 'unknown problem'}` })
      return z.NEVER
    }
    return parsed.data
  }),
  order: z.enum(ARCHIVE_ORDERS).optional(),
  page: z.coerce.number().int().min(1).max(10_000).default(1),
}).refine((v) => !v.from || !v.to || v.from <= v.to, 'The first date must not be after the last date.')
export type ArchiveQuery = z.infer<typeof archiveQuerySchema>

export const EXPORT_FORMATS = ['cap', 'geojson', 'csv'] as const
export const exportParamsSchema = z.object({ id: z.coerce.number().int().positive(), format: z.enum(EXPORT_FORMATS) })
