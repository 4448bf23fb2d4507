import { z } from 'zod'
import type { MultiPolygon } from 'geojson'

export const AREA_KINDS = ['polygon', 'rectangle', 'circle'] as const
export type AreaKind = (typeof AREA_KINDS)[number]

const name = z.string().trim().min(1, 'Give the area a name.').max(120, 'Use at most 120 characters for the name.')
const tags = z.array(z.string().trim().min(1).max(40, 'Use at most 40 characters per tag.'))
  .max(12, 'At most 12 tags per area.')
  .transform((list) => [...new Set(list)])
const lon = z.number().min(-180, 'Longitude is between −180 and 180.').max(180, 'Longitude is between −180 and 180.')
const lat = z.number().min(-90, 'Latitude is between −90 and 90.').max(90, 'Latitude is between −90 and 90.')

/** A circle by centre and radius (the server turns it into a 64-vertex geodesic polygon). */
export const circleSchema = z.object({
  centre: z.tuple([lon, lat]),
  radiusKm: z.number().positive('The radius must be more than 0 km.').max(2000, 'The radius is at most 2000 km.'),
})
/** A longitude–latitude rectangle. */
export const rectangleSchema = z.object({ west: lon, south: lat, east: lon, north: lat })
  .refine((r) => r.west < r.east && r.south < r.north, 'The rectangle needs west < east and south < north.')

/** The shape of an area: exactly one of a GeoJSON geometry, a circle or a rectangle. */
const shape = {
  /** GeoJSON Polygon or MultiPolygon (checked in full on the server, RFC 7946). */
  geometry: z.object({ type: z.enum(['Polygon', 'MultiPolygon']), coordinates: z.array(z.unknown()) }).optional(),
  circle: circleSchema.optional(),
  rectangle: rectangleSchema.optional(),
}
const oneShape = (v: { geometry?: unknown; circle?: unknown; rectangle?: unknown }) =>
  [v.geometry, v.circle, v.rectangle].filter((s) => s !== undefined).length

export const createAreaSchema = z.object({ name, tags: tags.default([]), ...shape })
  .refine((v) => oneShape(v) === 1, 'Give the area exactly one shape: a geometry, a circle or a rectangle.')
export type CreateAreaInput = z.infer<typeof createAreaSchema>

export const updateAreaSchema = z.object({ name: name.optional(), tags: tags.optional(), ...shape })
  .refine((v) => oneShape(v) <= 1, 'Give at most one new shape: a geometry, a circle or a rectangle.')
  .refine((v) => Object.values(v).some((x) => x !== undefined), 'Nothing to change.')
export type UpdateAreaInput = z.infer<typeof updateAreaSchema>

/** An upload: any GeoJSON object with a type; its full validation (RFC 7946) gives 422 with the place of each problem. */
export const importAreasSchema = z.object({ type: z.string().min(1, 'The upload is not GeoJSON: it has no "type".') }).passthrough()
export const importAreasQuerySchema = z.object({ tag: z.string().trim().min(1).max(40).optional() })

/** Feature properties tried, in order, for an imported area's name. */
export const NAME_PROPERTIES = ['name', 'title', 'label', 'NAME']

/** A stored area as the server returns it (dates as Date on the server, strings once serialised). */
export interface AreaRecord<TDate = Date> {
  id: number
  name: string
  tags: string[]
  kind: AreaKind
  circle: { centre: [number, number]; radiusKm: number } | null
  geometry: MultiPolygon
  ownerId: number | null
  ownerName: string | null
  isDemo: boolean
  createdAt: TDate
  updatedAt: TDate
}
