import { briefingIdSchema } from '#shared/schemas/briefings'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { id } = await getValidatedRouterParams(event, briefingIdSchema.parse)
  return briefingView(user, id)
})
