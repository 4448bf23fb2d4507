import { createAreaSchema } from '#shared/schemas/areas'

/** Saves a drawn or typed area: a GeoJSON polygon, a circle (centre, radius) or a rectangle. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const input = await readValidatedBody(event, createAreaSchema.parse)
  const area = await createArea(event, user, input)
  setResponseStatus(event, 201)
  return { area: { ...area, canEdit: true } }
})
