import { importAreasQuerySchema, importAreasSchema } from '#shared/schemas/areas'

/**
 * Imports the areas of a GeoJSON upload (FeatureCollection, Feature, Polygon or MultiPolygon).
 * All or nothing: one invalid feature gives 422 naming each problem, and nothing is stored.
 */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { tag } = await getValidatedQuery(event, importAreasQuerySchema.parse)
  const document = await readValidatedBody(event, importAreasSchema.parse)
  const areas = await importAreas(event, user, document, tag)
  setResponseStatus(event, 201)
  return { areas: areas.map((a) => ({ ...a, canEdit: true })) }
})
